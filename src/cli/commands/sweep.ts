/**
 * `calorbit sweep` and `sweep merge`: the command's flags and action (moved verbatim from program.ts;
 * the cluster helper owns this file and the sweep runner behind it).
 */
import type { Command } from "commander";
import { DEFAULT_RELATIVE_TOLERANCE } from "../../defaults.js";
import type { SweepDefinition } from "../../sweep/runCase.js";
import { integerFlag, toleranceFlag, usage } from "../flags.js";
import { err, out } from "../output.js";

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

/** The number of cases a shard file's definition line describes (sweep modules passed in: they load lazily). */
function definitionTotalWith(caseCount: typeof import("../../sweep/design.js").caseCount, parseAxis: typeof import("../../sweep/spec.js").parseAxis, definitionJson: string): number {
  const d = JSON.parse(definitionJson) as { axes: { path: string; spec: string }[]; random: { count: number; seed: number } | null };
  return caseCount({ axes: d.axes.map((a) => parseAxis(`${a.path}=${a.spec}`)), ...(d.random ? { random: d.random } : {}) });
}

async function sweepCommand(args: string[], flags: SweepFlags): Promise<void> {
  // The sweep runner (worker threads, progress bar) and the scenario reader load only when a sweep runs.
  const [{ caseCount, parseShard }, { parseAxis }, { loadScenarioDocument }, { defaultWorkers, mergeShards, runSweep }] = await Promise.all([
    import("../../sweep/design.js"),
    import("../../sweep/spec.js"),
    import("../io.js"),
    import("../sweep.js"),
  ]);
  const definitionTotal = (definitionJson: string) => definitionTotalWith(caseCount, parseAxis, definitionJson);
  if (args[0] === "merge") {
    if (flags.out === undefined) throw usage("--out", "missing", "the merged file to write, e.g. --out all.csv");
    const { cases } = mergeShards(args.slice(1), flags.out, definitionTotal);
    out(`merged ${args.length - 1} shard files: ${cases} cases, each once, into ${flags.out}\n`);
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
    err(`${flags.out}: ${result.written} cases written${result.skipped ? `, ${result.skipped} already there (resumed)` : ""}\n`);
  }
}

export function registerSweep(program: Command): void {
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
}
