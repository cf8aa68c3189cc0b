/** `calorbit compare`: one scenario under several regimes, side by side. */
import type { Command } from "commander";
import { DEFAULT_RELATIVE_TOLERANCE, DEFAULT_SAMPLES } from "../../defaults.js";
import { REGIME_TABLE, REGIMES, SURFACE_REGIMES, type Regime } from "../../model/regimes.js";
import { CalorbitError } from "../../errors.js";
import { integerFlag, toleranceFlag, usage } from "../flags.js";
import { refuseClobber } from "../outputPaths.js";
import { out, warn } from "../output.js";
import { withProgressLine } from "../progressLine.js";

interface CompareFlags {
  regimes: string;
  json?: boolean;
  csv?: string;
  samples: string;
  tolerance: string;
  quiet?: boolean;
}

async function compareCommand(scenarioPath: string | undefined, flags: CompareFlags): Promise<void> {
  const regimes = flags.regimes.split(",").map((r) => r.trim()).filter((r) => r.length > 0);
  const unknown = regimes.filter((r) => !(REGIMES as readonly string[]).includes(r));
  if (regimes.length === 0 || unknown.length > 0) {
    throw usage("--regimes", JSON.stringify(flags.regimes), `a comma-separated list of ${SURFACE_REGIMES.join(", ")}`);
  }
  // The map and the zonal climate have solves of their own, with outputs of their own: not a column beside the others.
  const own = regimes.filter((r) => REGIME_TABLE[r as Regime].pipeline !== "surface");
  if (own.length > 0) {
    throw usage("--regimes", JSON.stringify(flags.regimes), `a comma-separated list of ${SURFACE_REGIMES.join(", ")} (${own.join(" and ")} ${own.length > 1 ? "have solves" : "has a solve"} of ${own.length > 1 ? "their" : "its"} own: use calorbit run)`);
  }
  const samples = integerFlag("--samples", flags.samples, 2, 10_000_000);
  refuseClobber("compare", [scenarioPath], [["--csv", flags.csv]]);
  const relativeTolerance = toleranceFlag(flags.tolerance);
  const [{ loadScenario, writeFileAtomic }, { compareRegimes }, { compareCsv, compareDocument, compareTable }] = await Promise.all([
    import("../io.js"),
    import("../../run/compare.js"),
    import("../../report/compareReport.js"),
  ]);
  const { resolved } = loadScenario(scenarioPath);
  const comparison = withProgressLine("compare", flags.quiet, (onProgress) =>
    compareRegimes(resolved.thermal, regimes as Regime[], { samples, relativeTolerance, ...(onProgress ? { onProgress } : {}) }),
  );
  const failed = comparison.rows.filter((row) => row.error !== undefined);
  const noneRan = failed.length === comparison.rows.length;
  // With no regime to show, no CSV is written; the report still says, per regime, why.
  if (flags.csv !== undefined && !noneRan) writeFileAtomic(flags.csv, compareCsv(resolved, comparison));
  // A bare-number luminosity: on stderr, never in the data; the JSON result lists it too.
  const warnings = resolved.warnings ?? [];
  for (const w of warnings) warn(w);
  if (flags.json) out(JSON.stringify({ ...compareDocument(resolved, comparison), warnings }, null, 2) + "\n");
  else out(compareTable(resolved, comparison));
  if (noneRan) throw new CalorbitError("USAGE", noRegimeRan(failed.map((row) => ({ regime: row.regime, error: row.error! }))));
}

/** One sentence for a comparison in which no regime could run: each distinct reason once. */
export function noRegimeRan(failures: readonly { regime: string; error: string }[]): string {
  const reasons = [...new Set(failures.map((f) => f.error))];
  if (reasons.length === 1) return `compare: no regime could run for this scenario, because ${reasons[0]}`;
  return `compare: no regime could run for this scenario (${failures.map((f) => `${f.regime}: ${f.error}`).join("; ")})`;
}

export function registerCompare(program: Command): void {
  program
    .command("compare")
    .description("run one scenario under several regimes and put them side by side")
    .argument("[scenario]", "scenario file (YAML or JSON); the bundled demo when omitted")
    .option("--regimes <list>", "comma-separated regimes", SURFACE_REGIMES.join(","))
    .option("--json", 'print { "results": [ { "regime", "summary" }, … ] }')
    .option("--csv <file>", "write T and T_eq of every regime on a shared time axis")
    .option("--samples <n>", "points on the shared time axis", String(DEFAULT_SAMPLES))
    .option("--tolerance <x>", "relative tolerance of the temperatures", String(DEFAULT_RELATIVE_TOLERANCE))
    .option("--quiet", "no progress line on stderr (it is drawn only on a terminal, and only for work that lasts over a second)")
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
}
