/**
 * The calorbit command line. Parses flags, loads the scenario, calls the engine, prints or
 * writes the report. Bad input: one line per problem on stderr, exit status 2, no stack trace.
 */
import { Command, CommanderError, Option } from "commander";
import { CalorbitError, formatProblem } from "../errors.js";
import { equilibriumTemperature, GEOMETRY_FACTOR, LUMPED_REGIMES, stellarFlux, wienPeakWavelengthM, type LumpedRegime } from "../physics/flux.js";
import { luminosityFromRadiusTemperature } from "../physics/star.js";
import { buildThermalModel } from "../thermalModel.js";
import { resultDocument } from "../report/document.js";
import { seriesCsv } from "../report/csv.js";
import { columnCsv, columnDocument, columnText } from "../report/columnReport.js";
import { columnToleranceFor, simulateColumn } from "../simulateColumn.js";
import { specificHeatAt } from "../physics/column.js";
import { parseSweepText } from "../view/sweepData.js";
import { temperatureSvg } from "../report/svg.js";
import { describeScenario, summaryText } from "../report/text.js";
import { duration, sig } from "../report/format.js";
import { scenarioJsonSchema } from "../scenario/schema.js";
import { parseQuantity, type QuantityKind } from "../scenario/units.js";
import { DEFAULT_RELATIVE_TOLERANCE, DEFAULT_SAMPLES, INTEGRATORS, simulate, type IntegratorName, type SimulateOptions } from "../simulate.js";
import { VERSION } from "../version.js";
import { readFileSync } from "node:fs";
import { loadScenario, loadScenarioDocument, writeFileAtomic } from "./io.js";
import { startViewServer } from "./viewServer.js";
import { defaultWorkers, mergeShards, runSweep } from "./sweep.js";
import { caseCount, parseShard } from "../sweep/design.js";
import { parseAxis } from "../sweep/spec.js";
import type { SweepDefinition } from "../sweep/runCase.js";
import { insolationMap } from "../analysis/insolationMap.js";
import { compareRegimes } from "../compare.js";
import { REGIMES, type Regime } from "../model.js";
import { compareCsv, compareDocument, compareTable, insolationCsv } from "../report/compareReport.js";

const EXIT_BAD_INPUT = 2;
const EXIT_FAILURE = 1;

function usage(path: string, given: string, allowed: string): CalorbitError {
  return new CalorbitError("USAGE", `${path}: given ${given}; allowed: ${allowed}`, [{ path, given, allowed }]);
}

function integerFlag(name: string, raw: string, min: number, max: number): number {
  const v = Number(raw);
  if (!Number.isInteger(v) || v < min || v > max) throw usage(name, JSON.stringify(raw), `an integer from ${min} to ${max}`);
  return v;
}

function quantityFlag(name: string, kind: QuantityKind, raw: string): number {
  const parsed = parseQuantity(kind, /^[+-]?[\d.]+([eE][+-]?\d+)?$/.test(raw.trim()) ? Number(raw) : raw);
  if (!parsed.ok) throw usage(name, JSON.stringify(raw), parsed.allowed);
  return parsed.valueSI;
}

function toleranceFlag(raw: string): number {
  const v = Number(raw);
  if (!Number.isFinite(v) || v < 1e-13 || v > 1e-2) throw usage("--tolerance", JSON.stringify(raw), "a number from 1e-13 to 1e-2");
  return v;
}

function integratorFlag(raw: string | undefined): IntegratorName | undefined {
  if (raw === undefined) return undefined;
  if (!(INTEGRATORS as readonly string[]).includes(raw)) throw usage("--integrator", JSON.stringify(raw), INTEGRATORS.join(", "));
  return raw as IntegratorName;
}

interface RunFlags {
  integrator?: string;
  json?: boolean;
  series?: boolean;
  csv?: string;
  svg?: string;
  samples: string;
  from?: string;
  orbits?: string;
  tolerance: string;
}

function runCommand(scenarioPath: string | undefined, flags: RunFlags): void {
  const options: SimulateOptions = {
    relativeTolerance: toleranceFlag(flags.tolerance),
    samples: integerFlag("--samples", flags.samples, 2, 10_000_000),
  };
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
  const { resolved } = loadScenario(scenarioPath);
  if (resolved.thermal.column) {
    if (options.transient) throw usage("--from", JSON.stringify(flags.from ?? ""), "no transient mode for a conduction column yet (it runs to its periodic state)");
    // The column's periodicity and energy tolerance: 1e-6 unless --tolerance says otherwise.
    const columnTolerance = columnToleranceFor(options.relativeTolerance!, DEFAULT_RELATIVE_TOLERANCE);
    const col = simulateColumn(resolved.thermal, resolved.thermal.column, { relativeTolerance: columnTolerance, samples: options.samples ?? 1000 });
    if (flags.csv !== undefined) writeFileAtomic(flags.csv, columnCsv(resolved, col));
    if (flags.json) process.stdout.write(JSON.stringify(columnDocument(resolved, col, flags.series === true), null, 2) + "\n");
    else process.stdout.write(columnText(resolved, col));
    return;
  }
  const sim = simulate(resolved.thermal, options);
  if (flags.csv !== undefined) writeFileAtomic(flags.csv, seriesCsv(resolved, sim));
  if (flags.svg !== undefined) writeFileAtomic(flags.svg, temperatureSvg(resolved.thermal.name, sim.series, sim.summary));
  if (flags.json) {
    process.stdout.write(JSON.stringify(resultDocument(resolved, sim, flags.series === true), null, 2) + "\n");
  } else {
    process.stdout.write(summaryText(resolved, sim));
    if (flags.csv !== undefined) process.stdout.write(`\nseries written to ${flags.csv} (${sim.series.timeSeconds.length} rows)\n`);
    if (flags.svg !== undefined) process.stdout.write(`chart written to ${flags.svg}\n`);
  }
}

function checkCommand(scenarioPath: string): void {
  const { resolved, file } = loadScenario(scenarioPath);
  const { thermal } = resolved;
  const model = buildThermalModel(thermal);
  const tau = model.radiativeTimeSeconds;
  const lines = [
    `${file}: valid scenario "${thermal.name}"`,
    ...describeScenario(resolved),
    `  derived   period ${duration(thermal.orbit.periodSeconds)} (${sig(thermal.orbit.periodSeconds, 6)} s), equilibrium of the cycle-mean flux ${model.meanFluxEquilibriumK.toFixed(2)} K,`,
  ];
  if (thermal.column) {
    const p = thermal.column.properties;
    const c = specificHeatAt(p, model.meanFluxEquilibriumK);
    lines.push(`            conduction column: thermal inertia at the surface ${sig(Math.sqrt(p.conductivitySurface * p.densitySurface * c))} J m⁻² K⁻¹ s⁻½ (at ${model.meanFluxEquilibriumK.toFixed(0)} K)`);
  } else {
    lines.push(`            radiative time τ = ${duration(tau)}, τ/P = ${sig(tau / thermal.orbit.periodSeconds)}`);
  }
  if (model.solarDaySeconds !== undefined) {
    lines.push(`            solar day ${model.solarDaySeconds === null ? "none (synchronous)" : duration(model.solarDaySeconds)}, cycle ${model.cycleOrbits} orbit(s)${model.commensurate ? "" : " (not commensurate: seasonal convergence)"}`);
  }
  process.stdout.write(lines.join("\n") + "\n");
}

interface EquilibriumFlags {
  luminosity?: string;
  radius?: string;
  temperature?: string;
  distance: string;
  albedo: string;
  emissivity: string;
  regime: LumpedRegime;
  internalFlux: string;
}

function equilibriumCommand(flags: EquilibriumFlags): void {
  let luminosityW: number;
  if (flags.luminosity !== undefined) {
    if (flags.radius !== undefined || flags.temperature !== undefined) {
      throw usage("--luminosity", JSON.stringify(flags.luminosity), "either --luminosity or --radius with --temperature, not both");
    }
    luminosityW = quantityFlag("--luminosity", "luminosity", flags.luminosity);
  } else if (flags.radius !== undefined && flags.temperature !== undefined) {
    luminosityW = luminosityFromRadiusTemperature(
      quantityFlag("--radius", "length", flags.radius),
      quantityFlag("--temperature", "temperature", flags.temperature),
    );
  } else {
    throw usage("--luminosity", "missing", "a luminosity (e.g. 0.8Lsun), or --radius and --temperature");
  }
  if (!(luminosityW > 0)) throw usage("--luminosity", String(luminosityW), "a luminosity > 0 W");
  const distanceM = quantityFlag("--distance", "length", flags.distance);
  if (!(distanceM > 0)) throw usage("--distance", JSON.stringify(flags.distance), "a distance > 0 m");
  const albedo = Number(flags.albedo);
  if (!(albedo >= 0 && albedo <= 1)) throw usage("--albedo", JSON.stringify(flags.albedo), "a number with 0 ≤ A ≤ 1");
  const emissivity = Number(flags.emissivity);
  if (!(emissivity > 0 && emissivity <= 1)) throw usage("--emissivity", JSON.stringify(flags.emissivity), "a number with 0 < ε ≤ 1");
  const q = quantityFlag("--internal-flux", "flux", flags.internalFlux);
  if (!(q >= 0)) throw usage("--internal-flux", JSON.stringify(flags.internalFlux), "a flux ≥ 0 W/m2");
  const s = stellarFlux(luminosityW, distanceM);
  const absorbed = GEOMETRY_FACTOR[flags.regime] * (1 - albedo) * s + q;
  const t = equilibriumTemperature(absorbed, emissivity);
  process.stdout.write(
    [
      `stellar flux        ${s.toFixed(3)} W m⁻²`,
      `absorbed (${flags.regime}, f = ${GEOMETRY_FACTOR[flags.regime]})   ${absorbed.toFixed(3)} W m⁻²`,
      `equilibrium         ${t.toFixed(2)} K`,
      `Wien peak           ${sig(wienPeakWavelengthM(t) * 1e6, 4)} µm`,
    ].join("\n") + "\n",
  );
}

interface CompareFlags {
  regimes: string;
  json?: boolean;
  csv?: string;
  samples: string;
  tolerance: string;
}

function compareCommand(scenarioPath: string | undefined, flags: CompareFlags): void {
  const regimes = flags.regimes.split(",").map((r) => r.trim()).filter((r) => r.length > 0);
  const unknown = regimes.filter((r) => !(REGIMES as readonly string[]).includes(r));
  if (regimes.length === 0 || unknown.length > 0) {
    throw usage("--regimes", JSON.stringify(flags.regimes), `a comma-separated list of ${REGIMES.join(", ")}`);
  }
  const samples = integerFlag("--samples", flags.samples, 2, 10_000_000);
  const relativeTolerance = toleranceFlag(flags.tolerance);
  const { resolved } = loadScenario(scenarioPath);
  const comparison = compareRegimes(resolved.thermal, regimes as Regime[], { samples, relativeTolerance });
  if (flags.csv !== undefined) writeFileAtomic(flags.csv, compareCsv(resolved, comparison));
  if (flags.json) process.stdout.write(JSON.stringify(compareDocument(resolved, comparison), null, 2) + "\n");
  else process.stdout.write(compareTable(resolved, comparison));
}

interface InsolationFlags {
  latitudes: string;
  phases: string;
  out?: string;
}

function insolationCommand(scenarioPath: string | undefined, flags: InsolationFlags): void {
  const latitudes = integerFlag("--latitudes", flags.latitudes, 2, 1801);
  const phases = integerFlag("--phases", flags.phases, 1, 100_000);
  const { resolved } = loadScenario(scenarioPath);
  const csv = insolationCsv(resolved, insolationMap(resolved.thermal, latitudes, phases));
  if (flags.out !== undefined) {
    writeFileAtomic(flags.out, csv);
    process.stdout.write(`insolation map written to ${flags.out} (${latitudes} latitudes × ${phases} phases)\n`);
  } else {
    process.stdout.write(csv);
  }
}

interface SweepFlags {
  vary?: string[];
  random?: string;
  seed: string;
  out?: string;
  format: string;
  workers?: string;
  shard: string;
  quiet?: boolean;
  tolerance: string;
}

function definitionTotal(definitionJson: string): number {
  const d = JSON.parse(definitionJson) as { axes: { path: string; spec: string }[]; random: { count: number; seed: number } | null };
  return caseCount({ axes: d.axes.map((a) => parseAxis(`${a.path}=${a.spec}`)), ...(d.random ? { random: d.random } : {}) });
}

async function sweepCommand(args: string[], flags: SweepFlags): Promise<void> {
  if (args[0] === "merge") {
    if (flags.out === undefined) throw usage("--out", "missing", "the merged file to write, e.g. --out all.csv");
    const { cases } = mergeShards(args.slice(1), flags.out, definitionTotal);
    process.stdout.write(`merged ${args.length - 1} shard files: ${cases} cases, each once, into ${flags.out}\n`);
    return;
  }
  if (args.length > 1) {
    // The usual slip: a log range's " log" split off by the shell.
    const hint = args.includes("log") ? `; quote a log range, e.g. --vary "body.heatCapacity=1e5..1e9:9 log"` : "";
    throw usage("sweep", JSON.stringify(args.join(" ")), `one scenario file (or 'merge' followed by shard files)${hint}`);
  }
  const axes = (flags.vary ?? []).map(parseAxis);
  if (axes.length === 0) throw usage("--vary", "missing", "at least one PATH=SPEC, e.g. --vary orbit.eccentricity=0:0.9:10");
  const format = flags.format;
  if (format !== "csv" && format !== "jsonl") throw usage("--format", JSON.stringify(format), "csv or jsonl");
  const random =
    flags.random !== undefined ? { count: integerFlag("--random", flags.random, 1, 100_000_000), seed: integerFlag("--seed", flags.seed, 0, 4_294_967_295) } : undefined;
  const definition: SweepDefinition = {
    scenario: loadScenarioDocument(args[0]).document as Record<string, unknown>,
    design: { axes, ...(random ? { random } : {}) },
    relativeTolerance: toleranceFlag(flags.tolerance),
    format,
  };
  const workers = flags.workers === undefined ? defaultWorkers() : integerFlag("--workers", flags.workers, 1, 256);
  const shard = parseShard(flags.shard);
  const result = await runSweep({ definition, shard, workers, quiet: flags.quiet === true, ...(flags.out !== undefined ? { out: flags.out } : {}) });
  if (flags.out !== undefined && !flags.quiet) {
    process.stderr.write(`${flags.out}: ${result.written} cases written${result.skipped ? `, ${result.skipped} already there (resumed)` : ""}\n`);
  }
}

interface ViewFlags {
  port: string;
}

async function viewCommand(path: string | undefined, flags: ViewFlags): Promise<void> {
  const port = integerFlag("--port", flags.port, 0, 65535);
  let resultJson: string;
  if (path !== undefined && isSweepFile(path)) {
    resultJson = JSON.stringify({ kind: "sweep", file: path, table: parseSweepText(readFileSync(path, "utf8")) });
  } else if (path !== undefined && path.toLowerCase().endsWith(".json") && looksLikeResult(path)) {
    resultJson = readFileSync(path, "utf8");
  } else {
    const { resolved } = loadScenario(path);
    if (resolved.thermal.column) {
      const col = simulateColumn(resolved.thermal, resolved.thermal.column, { samples: 400 });
      resultJson = JSON.stringify({ kind: "column", ...columnDocument(resolved, col, true), heatMap: columnHeatMap(col) });
    } else {
      resultJson = JSON.stringify(resultDocument(resolved, simulate(resolved.thermal, { samples: 2000 }), true));
    }
  }
  const viewer = await startViewServer(resultJson, port);
  process.stdout.write(`calorbit viewer at ${viewer.url}  (Ctrl-C stops it)\n`);
  await new Promise<void>((resolve) => {
    const stop = () => {
      process.stdout.write("stopping the viewer\n");
      void viewer.close().then(resolve);
      // Keep-alive connections from a browser would hold close() open; do not wait for them.
      viewer.server.closeAllConnections();
    };
    process.once("SIGINT", stop);
    process.once("SIGTERM", stop);
  });
}

/** A file written by `calorbit sweep` (its first line says so). */
function isSweepFile(path: string): boolean {
  try {
    const head = readFileSync(path, "utf8").slice(0, 200);
    return /^# calorbit [^\n]* sweep\n/.test(head);
  } catch {
    return false;
  }
}

/** Temperature against depth and time for the viewer's heat map: layer centres × the cycle's steps (thinned). */
function columnHeatMap(col: ReturnType<typeof simulateColumn>) {
  return { depthsM: col.summary.depthProfile.map((r) => r.depthM), timesSeconds: col.heatMap.timesSeconds, temperatureK: col.heatMap.temperatureK };
}

/** A result file from `run --json --series` (not a scenario written as JSON). */
function looksLikeResult(path: string): boolean {
  try {
    const doc = JSON.parse(readFileSync(path, "utf8")) as Record<string, unknown>;
    if ("summary" in doc && "scenario" in doc) {
      if (!("series" in doc)) throw usage("view", JSON.stringify(path), "a result written with run --json --series (this one has no series)");
      return true;
    }
    return false;
  } catch (err) {
    if (err instanceof CalorbitError) throw err;
    return false;
  }
}

export function buildProgram(): Command {
  const program = new Command();
  program
    .name("calorbit")
    .description("Temperature histories of bodies on eccentric orbits, against the instantaneous equilibrium.")
    .version(VERSION)
    .showHelpAfterError("(run with --help for usage)")
    .configureOutput({ writeErr: (s) => void process.stderr.write(s) })
    .exitOverride();

  program
    .command("run")
    .description("integrate a scenario to its periodic steady state (or a transient) and summarise it")
    .argument("[scenario]", "scenario file (YAML or JSON); the bundled demo when omitted")
    .option("--json", "print one JSON document (summary, solver work, resolved scenario in SI units)")
    .option("--series", "with --json: include the sampled series as columnar arrays")
    .option("--csv <file>", "write the series (time, phase, true anomaly, distance, flux, T, T_eq) as CSV")
    .option("--svg <file>", "write the T and T_eq chart as a standalone SVG")
    .option("--samples <n>", "points in the series, uniform in time", String(DEFAULT_SAMPLES))
    .option("--from <temperature>", "transient mode: start at this temperature (e.g. 150K, -20degC)")
    .option("--orbits <n>", "transient mode: number of orbits to integrate (default 1)")
    .option("--tolerance <x>", "relative tolerance of the temperatures (a conduction column: 1e-6 unless given)", String(DEFAULT_RELATIVE_TOLERANCE))
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

  program
    .command("compare")
    .description("run one scenario under several regimes and put them side by side")
    .argument("[scenario]", "scenario file (YAML or JSON); the bundled demo when omitted")
    .option("--regimes <list>", "comma-separated regimes", REGIMES.join(","))
    .option("--json", 'print { "results": [ { "regime", "summary" }, … ] }')
    .option("--csv <file>", "write T and T_eq of every regime on a shared time axis")
    .option("--samples <n>", "points on the shared time axis", String(DEFAULT_SAMPLES))
    .option("--tolerance <x>", "relative tolerance of the temperatures", String(DEFAULT_RELATIVE_TOLERANCE))
    .addHelpText(
      "after",
      `
Regimes without the keys they use take defaults: a synchronous spin with no obliquity, the
place at latitude 0 and longitude 0, no day–night exchange.

Examples:
  calorbit compare scenarios/korvath-locked.yaml
  calorbit compare my.yaml --regimes global,daynight,point --csv side-by-side.csv`,
    )
    .action((scenario: string | undefined, flags: CompareFlags) => compareCommand(scenario, flags));

  program
    .command("insolation")
    .description("daily-mean insolation as a latitude × orbital-phase table (CSV), from the scenario's orbit and spin axis")
    .argument("[scenario]", "scenario file (YAML or JSON); the bundled demo when omitted")
    .option("--latitudes <n>", "latitudes from −90° to 90°", "19")
    .option("--phases <n>", "orbital phases from periastron, equal steps in time", "36")
    .option("--out <file>", "write the table to a file instead of stdout")
    .addHelpText("after", `\nExample:\n  calorbit insolation scenarios/ilvane-tilted.yaml --latitudes 37 --phases 72 --out map.csv`)
    .action((scenario: string | undefined, flags: InsolationFlags) => insolationCommand(scenario, flags));

  program
    .command("sweep")
    .description("run a scenario over a grid or a Latin hypercube of parameters, in parallel, resumable; 'sweep merge' joins shards")
    .argument("[args...]", "a scenario file (the bundled demo when omitted), or: merge SHARD-FILES...")
    .option("--vary <PATH=SPEC>", "a scenario key and its values (repeat for a grid): list a,b,c | range A..B:N or A:B:N | log range A..B:N log", (v: string, acc: string[] = []) => [...acc, v])
    .option("--random <n>", "draw N cases as a Latin hypercube over the --vary ranges instead of the full grid")
    .option("--seed <s>", "seed of the Latin hypercube", "1")
    .option("--out <file>", "output file (rerunning the same command resumes it); stdout when omitted")
    .option("--format <f>", "csv or jsonl", "csv")
    .option("--workers <n>", "worker threads (default: the number of cores)")
    .option("--shard <i/N>", "run only the i-th of N disjoint slices (for a cluster job array)", "1/1")
    .option("--quiet", "no progress bar")
    .option("--tolerance <x>", "relative tolerance of the temperatures (a conduction column: 1e-6 unless given)", String(DEFAULT_RELATIVE_TOLERANCE))
    .addHelpText(
      "after",
      `
Examples:
  calorbit sweep my.yaml --vary orbit.eccentricity=0:0.9:10 --vary "body.layer.thickness=1..1000:7 log" --out grid.csv
  calorbit sweep my.yaml --vary orbit.semiMajorAxis="0.5 au..2 au:7" --vary body.albedo=0.1,0.3,0.5 --format jsonl --out a.jsonl
  calorbit sweep my.yaml --vary orbit.eccentricity=0..0.9:1 --vary body.albedo=0..0.8:1 --random 10000 --seed 7 --out lhs.csv
  calorbit sweep my.yaml --vary ... --shard 3/16 --out part-3.csv      (one task of a job array)
  calorbit sweep scenarios/sarvek-regolith.yaml --vary body.albedo=0.05..0.3:6 --out column.csv   (a conduction column)
  calorbit sweep merge part-*.csv --out all.csv`,
    )
    .action((args: string[], flags: SweepFlags) => sweepCommand(args, flags));

  program
    .command("view")
    .description("open the interactive viewer in a browser (a local server on 127.0.0.1)")
    .argument("[file]", "a scenario, a result from run --json --series, or a sweep file; the bundled demo when omitted")
    .option("--port <n>", "port to listen on (0: a free one)", "0")
    .addHelpText("after", `\nExamples:\n  calorbit view\n  calorbit view scenarios/korvath-locked.yaml --port 8765`)
    .action((file: string | undefined, flags: ViewFlags) => viewCommand(file, flags));

  program
    .command("check")
    .description("validate a scenario and print what calorbit understood, with units, the period and τ/P")
    .argument("<scenario>", "scenario file (YAML or JSON)")
    .action((scenario: string) => checkCommand(scenario));

  program
    .command("schema")
    .description("print the scenario format as JSON Schema (for editor validation and completion)")
    .action(() => {
      process.stdout.write(JSON.stringify(scenarioJsonSchema(), null, 2) + "\n");
    });

  program
    .command("equilibrium")
    .description("quick equilibrium temperature from flags, with its Wien peak")
    .option("--luminosity <L>", "stellar luminosity (e.g. 0.8Lsun, 3e26W)")
    .option("--radius <R>", "stellar radius (e.g. 0.9Rsun), with --temperature")
    .option("--temperature <T>", "stellar effective temperature (e.g. 5300K)")
    .requiredOption("--distance <d>", "star–body distance (e.g. 0.7au)")
    .option("--albedo <A>", "Bond albedo", "0")
    .option("--emissivity <e>", "emissivity", "1")
    .option("--internal-flux <q>", "internal heat flux (e.g. 0.1W/m2)", "0")
    .addOption(new Option("--regime <name>", "heat-sharing regime").choices(LUMPED_REGIMES).default("global"))
    .addHelpText("after", `\nExample:\n  calorbit equilibrium --luminosity 1Lsun --distance 1au --albedo 0.3`)
    .action((flags: EquilibriumFlags) => equilibriumCommand(flags));
  return program;
}

/** Runs the CLI on an argv (node, script, ...args); resolves to the exit status. */
export async function main(argv: string[]): Promise<number> {
  const program = buildProgram();
  try {
    await program.parseAsync(argv);
    return 0;
  } catch (err) {
    return reportError(err);
  }
}

function reportError(err: unknown): number {
  if (err instanceof CommanderError) {
    // Help and version are not errors; commander has already printed its message otherwise.
    return err.code === "commander.helpDisplayed" || err.code === "commander.version" || err.exitCode === 0 ? 0 : EXIT_BAD_INPUT;
  }
  if (err instanceof CalorbitError) {
    if (err.problems.length > 0) {
      for (const p of err.problems) process.stderr.write(`calorbit: ${formatProblem(p)}\n`);
    } else {
      process.stderr.write(`calorbit: ${err.message}\n`);
    }
    const badInput = err.code === "SCENARIO_INVALID" || err.code === "SCENARIO_UNREADABLE" || err.code === "USAGE" || err.code === "INVALID_ARGUMENT";
    return badInput ? EXIT_BAD_INPUT : EXIT_FAILURE;
  }
  process.stderr.write(`calorbit: internal error: ${err instanceof Error ? err.message : String(err)}\n`);
  return EXIT_FAILURE;
}

