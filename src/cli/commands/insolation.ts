/** `calorbit insolation`: the latitude × orbital-phase daily-mean insolation table as CSV. */
import type { Command } from "commander";
import { integerFlag } from "../flags.js";
import { refuseClobber } from "../outputPaths.js";
import type { ThermalCase } from "../../model/thermalCase.js";
import { out, warn } from "../output.js";

/** Fewer solar days per orbit than this, and a daily mean no longer describes what a place sees. */
const MIN_SOLAR_DAYS_PER_ORBIT = 10;

/** A daily mean averages over many days of one season; a slow or resonant rotator has few or none. */
function slowRotatorWarning(thermal: ThermalCase, solarDay: (spin: number, n: number) => number | null): string | undefined {
  const periodSeconds = thermal.orbit.periodSeconds;
  const day = solarDay(thermal.spin?.rateRadPerSecond ?? (2 * Math.PI) / periodSeconds, (2 * Math.PI) / periodSeconds);
  if (day !== null && periodSeconds / day >= MIN_SOLAR_DAYS_PER_ORBIT) return undefined;
  const what = day === null ? "its spin is synchronous (no solar day at all)" : `its solar day is ${(day / periodSeconds).toPrecision(3)} orbits long`;
  return `these daily means assume many solar days per orbit, but ${what}, so a place on the surface does not see a daily mean: for one place use calorbit run with regime: point`;
}

interface InsolationFlags {
  latitudes: string;
  phases: string;
  out?: string;
}

async function insolationCommand(scenarioPath: string | undefined, flags: InsolationFlags): Promise<void> {
  const latitudes = integerFlag("--latitudes", flags.latitudes, 2, 1801);
  const phases = integerFlag("--phases", flags.phases, 1, 100_000);
  refuseClobber("insolation", [scenarioPath], [["--out", flags.out]]);
  const [{ insolationMap }, { insolationCsv }, { loadScenario, writeFileAtomic }, { solarDaySeconds }] = await Promise.all([
    import("../../analysis/insolationMap.js"),
    import("../../report/compareReport.js"),
    import("../io.js"),
    import("../../physics/geometry.js"),
  ]);
  const { resolved } = loadScenario(scenarioPath);
  const csv = insolationCsv(resolved, insolationMap(resolved.thermal, latitudes, phases));
  const slow = slowRotatorWarning(resolved.thermal, (spin, n) => solarDaySeconds(spin, n, resolved.thermal.spin?.obliquityRad ?? 0));
  for (const w of [...(resolved.warnings ?? []), ...(slow !== undefined ? [slow] : [])]) warn(w);
  if (flags.out !== undefined) {
    writeFileAtomic(flags.out, csv);
    out(`insolation map written to ${flags.out} (${latitudes} latitudes × ${phases} phases)\n`);
  } else {
    out(csv);
  }
}

export function registerInsolation(program: Command): void {
  program
    .command("insolation")
    .description("daily-mean insolation as a latitude × orbital-phase table (CSV), from the scenario's orbit and spin axis")
    .argument("[scenario]", "scenario file (YAML or JSON); the bundled demo when omitted")
    .option("--latitudes <n>", "latitudes from −90° to 90°", "19")
    .option("--phases <n>", "orbital phases from periastron, equal steps in time", "36")
    .option("--out <file>", "write the table to a file instead of stdout")
    .addHelpText("after", `\nExample:\n  calorbit insolation scenarios/ilvane-tilted.yaml --latitudes 37 --phases 72 --out map.csv`)
    .action((scenario: string | undefined, flags: InsolationFlags) => insolationCommand(scenario, flags));
}
