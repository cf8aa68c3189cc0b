/** `calorbit run`: one scenario to its periodic steady state (or a transient), as text, JSON, CSV, SVG. */
import type { Command } from "commander";
import { DEFAULT_COLUMN_TOLERANCE, DEFAULT_RELATIVE_TOLERANCE, DEFAULT_SAMPLES, INTEGRATORS, MAP_DEFAULT_TOLERANCE } from "../../defaults.js";
import type { SimulateOptions } from "../../run/simulate.js";
import type { ResolvedScenario } from "../../scenario/resolve.js";
import { integerFlag, integratorFlag, quantityFlag, toleranceFlag, usage } from "../flags.js";
import { refuseClobber } from "../outputPaths.js";
import { err, out, warn } from "../output.js";
import { withProgressLine } from "../progressLine.js";

interface RunFlags {
  integrator?: string;
  json?: boolean;
  series?: boolean;
  csv?: string;
  svg?: string;
  samples: string;
  from?: string;
  orbits?: string;
  tolerance?: string;
  mapCsv?: string;
  mapAt?: string;
  celsius?: boolean;
  quiet?: boolean;
}

async function runCommand(scenarioPath: string | undefined, flags: RunFlags): Promise<void> {
  const options: SimulateOptions = { samples: integerFlag("--samples", flags.samples, 2, 10_000_000) };
  // Left out unless given, so each heat store and the map take their own default (a column's 1e-6
  // is not the slab's 1e-8, and an explicit 1e-8 must stay 1e-8).
  if (flags.tolerance !== undefined) options.relativeTolerance = toleranceFlag(flags.tolerance);
  if (flags.celsius && flags.json) throw usage("--celsius", "with --json", "--celsius only with the text report (JSON keeps kelvin: minK, maxK …)");
  if (flags.series && !flags.json) throw usage("--series", "without --json", "--series only with --json (it adds the series to the JSON document; for a table use --csv FILE)");
  refuseClobber("run", [scenarioPath], [["--csv", flags.csv], ["--svg", flags.svg]]);
  const integrator = integratorFlag(flags.integrator);
  if (integrator) options.integrator = integrator;
  if (flags.from !== undefined || flags.orbits !== undefined) {
    if (flags.from === undefined) throw usage("--from", "missing", "a start temperature with --orbits, e.g. --from 150K");
    options.transient = {
      startK: quantityFlag("--from", "temperature", flags.from),
      orbits: flags.orbits === undefined ? 1 : integerFlag("--orbits", flags.orbits, 1, 100_000),
    };
    if (!(options.transient.startK > 0)) throw usage("--from", JSON.stringify(flags.from), "a temperature > 0 K");
  }
  // Loaded here, not at start-up: the scenario reader, the solvers and the writers.
  const [{ loadScenario, writeFilesAtomic }, { simulate }, { longCycleNote }, { heatStoreOf }, { REGIME_TABLE }, { seriesCsv }, { resultDocument }, { temperatureSvg }, { summaryText }, { resultWarnings }] =
    await Promise.all([
      import("../io.js"),
      import("../../run/simulate.js"),
      import("../../run/workload.js"),
      import("../../model/heatStore.js"),
      import("../../model/regimes.js"),
      import("../../report/csv.js"),
      import("../../report/document.js"),
      import("../../report/svg.js"),
      import("../../report/text.js"),
      import("../../analysis/sanity.js"),
    ]);
  const { resolved, file } = loadScenario(scenarioPath);
  const warnings = [...(resolved.warnings ?? [])];
  const report = (found: string[]) => {
    warnings.push(...found);
    // Warnings go to stderr, never into the data on stdout; the JSON result lists them too.
    for (const w of warnings) warn(w);
  };
  switch (REGIME_TABLE[resolved.thermal.regime].pipeline) {
    case "zonal":
      return runZonal(resolved, flags, options, writeFilesAtomic, () => report([]));
    case "map": {
      if (options.transient) throw usage("--from", JSON.stringify(flags.from ?? ""), "no transient mode for the map regime (it runs to its periodic state)");
      if (integrator) throw usage("--integrator", JSON.stringify(flags.integrator), "the map regime chooses its integrator per cell");
      const { runMap } = await import("./runMap.js");
      await runMap(resolved, file, {
        ...flags,
        samples: options.samples ?? DEFAULT_SAMPLES,
        tolerance: options.relativeTolerance ?? null,
      });
      return;
    }
    case "surface":
      break;
  }
  if (flags.mapCsv !== undefined || flags.mapAt !== undefined) {
    throw usage(flags.mapCsv !== undefined ? "--map-csv" : "--map-at", JSON.stringify(flags.mapCsv ?? flags.mapAt), "only for a scenario with regime: map");
  }
  if (heatStoreOf(resolved.thermal).kind === "column") {
    if (options.transient) throw usage("--from", JSON.stringify(flags.from ?? ""), "no transient mode for a conduction column yet (it runs to its periodic state)");
    if (integrator !== undefined) throw usage("--integrator", JSON.stringify(integrator), "none for a conduction column (its own Crank–Nicolson stepper solves it)");
  }
  const note = longCycleNote(resolved.thermal);
  if (note !== undefined) err(`calorbit: note: ${note}\n`);
  const sim = withProgressLine("run", flags.quiet, (onProgress) => simulate(resolved.thermal, onProgress ? { ...options, onProgress } : options));
  report(resultWarnings(resolved.thermal, sim.summary, { periodic: sim.solver.mode === "periodic", singleState: sim.series.states.length === 1 }));
  // Every output built first, then all written together: a failure leaves none of them half done.
  const files: [string, string][] = [];
  if (flags.csv !== undefined) files.push([flags.csv, seriesCsv(resolved, sim)]);
  if (flags.svg !== undefined) files.push([flags.svg, temperatureSvg(resolved.thermal.name, sim.series, sim.summary)]);
  writeFilesAtomic(files);
  if (flags.json) {
    out(JSON.stringify({ ...resultDocument(resolved, sim, flags.series === true), warnings }, null, 2) + "\n");
  } else {
    out(summaryText(resolved, sim, { celsius: flags.celsius === true }));
    if (flags.csv !== undefined) out(`\nseries written to ${flags.csv} (${sim.series.timeSeconds.length} rows)\n`);
    if (flags.svg !== undefined) out(`chart written to ${flags.svg}\n`);
  }
}

/** The zonal climate: its own solver and writers (one or two climates). */
async function runZonal(
  resolved: ResolvedScenario,
  flags: RunFlags,
  options: SimulateOptions,
  writeFilesAtomic: (files: readonly (readonly [string, string])[]) => void,
  reportWarnings: () => void,
): Promise<void> {
  if (options.transient) throw usage("--from", JSON.stringify(flags.from ?? ""), "no transient mode for the zonal climate (it runs to its periodic climates from a warm and/or a cold start)");
  if (options.integrator) throw usage("--integrator", JSON.stringify(flags.integrator), "none for the zonal climate (it has its own implicit stepper)");
  if (flags.tolerance !== undefined) throw usage("--tolerance", JSON.stringify(flags.tolerance), "none for the zonal climate (its periodic solve has its own convergence test, in kelvin)");
  const [{ simulateZonal, zonalCaseOf }, { zonalCsv, zonalDocument, zonalProfileSvg, zonalText }] = await Promise.all([
    import("../../run/zonal.js"),
    import("../../report/zonalReport.js"),
  ]);
  const zonal = zonalCaseOf(resolved.thermal);
  const sim = withProgressLine("run", flags.quiet, (onProgress) => simulateZonal(zonal, onProgress ? { onProgress } : {}));
  const climate = resolved.thermal.climate!;
  const samples = options.samples ?? DEFAULT_SAMPLES;
  const files: [string, string][] = [];
  if (flags.csv !== undefined) files.push([flags.csv, zonalCsv(resolved, zonal, sim, samples)]);
  if (flags.svg !== undefined) files.push([flags.svg, zonalProfileSvg(resolved.thermal.name, sim)]);
  writeFilesAtomic(files);
  reportWarnings();
  if (flags.json) {
    out(JSON.stringify({ ...zonalDocument(resolved, sim, climate), warnings: resolved.warnings ?? [] }, null, 2) + "\n");
    return;
  }
  out(zonalText(resolved, sim, climate));
  if (flags.csv !== undefined) out(`\nT(latitude, time) written to ${flags.csv} (${sim.climates.length * samples * sim.grid.count} rows)\n`);
  if (flags.svg !== undefined) out(`annual-mean profile written to ${flags.svg}\n`);
}

export function registerRun(program: Command): void {
  program
    .command("run")
    .description("integrate a scenario to its periodic steady state (or a transient) and summarise it")
    .argument("[scenario]", "scenario file (YAML or JSON); the bundled demo when omitted")
    .option("--json", "print one JSON document (summary, solver work, resolved scenario in SI units)")
    .option("--series", "with --json: include the sampled series as columnar arrays")
    .option("--csv <file>", "write the series (time, phase, true anomaly, distance, flux, T, T_eq) as CSV")
    .option("--svg <file>", "write the T and T_eq chart as a standalone SVG")
    .option("--samples <n>", "points in the series, uniform in time", String(DEFAULT_SAMPLES))
    .option("--celsius", "text report: the temperatures in °C as well as K")
    .option("--from <temperature>", "transient mode: start at this temperature (e.g. 150K, -20degC)")
    .option("--orbits <n>", "transient mode: number of orbits to integrate (default 1)")
    .option("--tolerance <x>", `relative tolerance of the temperatures (default: ${DEFAULT_RELATIVE_TOLERANCE.toExponential()} for a slab, ${DEFAULT_COLUMN_TOLERANCE.toExponential()} for a conduction column, ${MAP_DEFAULT_TOLERANCE.toExponential()} for a map)`)
    .option("--map-csv <file>", "map regime: write the surface temperature map at one moment (--map-at) as CSV")
    .option("--map-at <time>", "map regime: the moment of the map in --map-csv and --svg (e.g. 2.5d; default: the phase curve's maximum)")
    .option("--quiet", "no progress line on stderr (it is drawn only on a terminal, and only for a run that lasts over a second)")
    .option("--integrator <name>", `force an integrator, e.g. odex to cross-check a result (${INTEGRATORS.join(", ")}; default: chosen by stiffness)`)
    .addHelpText(
      "after",
      `
Examples:
  calorbit run                                   the bundled demo
  calorbit run scenarios/orvalle-rock.yaml --json
  calorbit run my.yaml --csv history.csv --samples 2000
  calorbit run my.yaml --from 150K --orbits 5    spin-up from a cold start
  calorbit run my.yaml --integrator odex         the same case with an independent integrator`,
    )
    .action((scenario: string | undefined, flags: RunFlags) => runCommand(scenario, flags));
}
