/**
 * `calorbit sweep`: a scenario over a grid or a Latin hypercube of parameters, checked before it
 * starts, run across worker threads, resumable; `sweep merge` joins shard files; `sweep jobscript`
 * writes the job files that run a sweep on a Slurm cluster or as a Kubernetes indexed Job.
 */
import type { Command } from "commander";
import { CalorbitError } from "../../errors.js";
import { DEFAULT_RELATIVE_TOLERANCE } from "../../defaults.js";
import type { Design } from "../../sweep/design.js";
import type { JobPlan } from "../../sweep/jobScript.js";
import { DEFAULT_MAX_CASES } from "../../sweep/limits.js";
import type { SweepDefinition, SweepFormat } from "../../sweep/runCase.js";
import { integerFlag, toleranceFlag, usage } from "../flags.js";
import { err, out } from "../output.js";
import { resolve as resolvePath } from "node:path";


/** The sweep modules, loaded only when a sweep command runs (help and other commands start light). */
async function sweepModules() {
  const [design, spec, check, shard, jobScript, io, runner, parquet] = await Promise.all([
    import("../../sweep/design.js"),
    import("../../sweep/spec.js"),
    import("../../sweep/check.js"),
    import("../../sweep/shard.js"),
    import("../../sweep/jobScript.js"),
    import("../io.js"),
    import("../sweep.js"),
    import("../sweepParquet.js"),
  ]);
  return { ...design, ...spec, ...check, ...shard, ...jobScript, ...io, ...runner, ...parquet };
}
type SweepModules = Awaited<ReturnType<typeof sweepModules>>;

const FORMATS: readonly SweepFormat[] = ["csv", "jsonl", "parquet"];

interface SweepFlags {
  vary?: string[];
  random?: string;
  seed: string;
  out?: string;
  format: string;
  workers?: string;
  shard: string;
  shards?: string;
  shardIndex?: string;
  maxCases?: string;
  quiet?: boolean;
  tolerance?: string;
  // jobscript
  scheduler: string;
  maxArray: string;
  maxRunning: string;
  casesPerTask: string;
  cpusPerTask: string;
  time: string;
  prefix: string;
  jobName: string;
  image: string;
  claim: string;
  mountPath: string;
  command: string;
}

function definitionTotal(m: SweepModules, definitionJson: string): number {
  const d = JSON.parse(definitionJson) as { axes: { path: string; spec: string }[]; random: { count: number; seed: number } | null };
  return m.caseCount({ axes: d.axes.map((a) => m.parseAxis(`${a.path}=${a.spec}`)), ...(d.random ? { random: d.random } : {}) });
}

/** The definition from the flags, checked: every mistake is refused here, before a case runs. */
function sweepDefinition(m: SweepModules, scenarioPath: string | undefined, flags: SweepFlags): SweepDefinition {
  const axes = (flags.vary ?? []).map(m.parseAxis);
  if (axes.length === 0) throw usage("--vary", "missing", "at least one PATH=SPEC, e.g. --vary orbit.eccentricity=0:0.9:10");
  const format = flags.format as SweepFormat;
  if (!FORMATS.includes(format)) throw usage("--format", JSON.stringify(flags.format), FORMATS.join(", "));
  const random =
    flags.random !== undefined ? { count: integerFlag("--random", flags.random, 1, 100_000_000), seed: integerFlag("--seed", flags.seed, 0, 4_294_967_295) } : undefined;
  const design: Design = { axes, ...(random ? { random } : {}) };
  const maxCases = flags.maxCases === undefined ? DEFAULT_MAX_CASES : integerFlag("--max-cases", flags.maxCases, 1, Number.MAX_SAFE_INTEGER);
  const scenario = m.loadScenarioDocument(scenarioPath).document as Record<string, unknown>;
  m.checkDefinition(scenario, design, maxCases);
  return {
    scenario,
    design,
    relativeTolerance: toleranceFlag(flags.tolerance ?? String(DEFAULT_RELATIVE_TOLERANCE)),
    ...(flags.tolerance !== undefined ? { toleranceGiven: true as const } : {}),
    format,
  };
}

/** The definition's own flags, as given, for a job file to repeat. */
function definitionArgs(scenarioPath: string | undefined, flags: SweepFlags): string[] {
  return [
    ...(scenarioPath !== undefined ? [scenarioPath] : []),
    ...(flags.vary ?? []).flatMap((v) => ["--vary", v]),
    ...(flags.random !== undefined ? ["--random", flags.random, "--seed", flags.seed] : []),
    ...(flags.format !== "csv" ? ["--format", flags.format] : []),
    ...(flags.tolerance !== undefined ? ["--tolerance", flags.tolerance] : []),
    ...(flags.maxCases !== undefined ? ["--max-cases", flags.maxCases] : []),
  ];
}

function jobScriptCommand(m: SweepModules, args: string[], flags: SweepFlags): void {
  if (args.length > 1) throw usage("sweep jobscript", JSON.stringify(args.join(" ")), "one scenario file (the bundled demo when omitted)");
  const scenarioPath = args[0];
  const definition = sweepDefinition(m, scenarioPath, flags);
  const scheduler = flags.scheduler;
  if (scheduler !== "slurm" && scheduler !== "kubernetes") throw usage("--scheduler", JSON.stringify(scheduler), "slurm or kubernetes");
  if (!/^(\d+-)?\d{1,3}:\d{2}:\d{2}$/.test(flags.time)) throw usage("--time", JSON.stringify(flags.time), "a wall-clock limit HH:MM:SS or D-HH:MM:SS");
  if (!/^[A-Za-z0-9][A-Za-z0-9_.-]*$/.test(flags.prefix)) throw usage("--prefix", JSON.stringify(flags.prefix), "a file name stem of letters, digits, _ . -");
  if (!/^[a-z0-9]([a-z0-9-]{0,50}[a-z0-9])?$/.test(flags.jobName)) throw usage("--job-name", JSON.stringify(flags.jobName), "lower-case letters, digits and -, as Kubernetes names allow");
  const plan: JobPlan = {
    sweepArgs: definitionArgs(scenarioPath, flags),
    totalCases: m.caseCount(definition.design),
    format: definition.format,
    casesPerTask: integerFlag("--cases-per-task", flags.casesPerTask, 1, Number.MAX_SAFE_INTEGER),
    maxArray: integerFlag("--max-array", flags.maxArray, 1, 10_000_000),
    maxRunning: integerFlag("--max-running", flags.maxRunning, 0, 10_000_000),
    cpusPerTask: integerFlag("--cpus-per-task", flags.cpusPerTask, 1, 256),
    timeLimit: flags.time,
    prefix: flags.prefix,
    jobName: flags.jobName,
    image: flags.image,
    claim: flags.claim,
    mountPath: flags.mountPath,
    command: flags.command,
    ...(flags.out !== undefined ? { fileName: flags.out } : {}),
  };
  const text = scheduler === "slurm" ? m.slurmScript(plan) : m.kubernetesJob(plan);
  if (flags.out === undefined) {
    out(text);
    return;
  }
  if (scenarioPath !== undefined && resolvePath(scenarioPath) === resolvePath(flags.out)) throw usage("--out", JSON.stringify(flags.out), "a file other than the scenario");
  m.writeFileAtomic(flags.out, text);
  out(`${flags.out}: ${scheduler === "slurm" ? `Slurm job script; submit it with: bash ${flags.out}` : `Kubernetes indexed Job; apply it with: kubectl apply -f ${flags.out}`}\n`);
}

async function sweepCommand(args: string[], flags: SweepFlags): Promise<void> {
  const m = await sweepModules();
  if (args[0] === "merge") {
    if (flags.out === undefined) throw usage("--out", "missing", "the merged file to write, e.g. --out all.csv");
    const files = args.slice(1);
    const parquet = files.length > 0 && files.every((f) => m.isParquetFile(f));
    const total = (d: string) => definitionTotal(m, d);
    if (parquet && files.some((f) => resolvePath(f) === resolvePath(flags.out!))) throw usage("--out", JSON.stringify(flags.out), "a new file name (an input is never overwritten)");
    const { cases } = parquet ? await m.mergeParquetShards(files, flags.out, total) : m.mergeShards(files, flags.out, total);
    out(`merged ${args.length - 1} shard files: ${cases} cases, each once, into ${flags.out}\n`);
    return;
  }
  if (args[0] === "jobscript") {
    jobScriptCommand(m, args.slice(1), flags);
    return;
  }
  if (args.length > 1) {
    // The usual slip: a log range's " log" split off by the shell.
    const hint = args.includes("log") ? `; quote a log range, e.g. --vary "body.heatCapacity=1e5..1e9:9 log"` : "";
    throw usage("sweep", JSON.stringify(args.join(" ")), `one scenario file (or 'merge' followed by shard files, or 'jobscript')${hint}`);
  }
  const scenarioPath = args[0];
  const shard = m.resolveShard(
    {
      shard: flags.shard,
      ...(flags.shards !== undefined ? { shards: integerFlag("--shards", flags.shards, 1, 10_000_000) } : {}),
      ...(flags.shardIndex !== undefined ? { shardIndex: integerFlag("--shard-index", flags.shardIndex, 0, 10_000_000) } : {}),
    },
    process.env,
  );
  const definition = sweepDefinition(m, scenarioPath, flags);
  if (definition.format === "parquet" && flags.out === undefined) throw usage("--out", "missing", "a file for --format parquet (it is not written to stdout)");
  if (flags.out !== undefined && scenarioPath !== undefined && resolvePath(scenarioPath) === resolvePath(flags.out)) {
    throw usage("--out", JSON.stringify(flags.out), "a file other than the scenario");
  }
  const workers = flags.workers === undefined ? m.defaultWorkers() : integerFlag("--workers", flags.workers, 1, 256);
  const result = await m.runSweep({ definition, shard, workers, quiet: flags.quiet === true, ...(flags.out !== undefined ? { out: flags.out } : {}) });
  const cases = result.written + result.skipped;
  if (flags.out !== undefined && !flags.quiet) {
    const where = shard.count > 1 ? ` (shard ${shard.index}/${shard.count}${shard.source !== "--shard" ? `, from ${shard.source}` : ""})` : "";
    err(`${flags.out}: ${result.written} cases written${result.skipped ? `, ${result.skipped} already there (resumed)` : ""}${where}\n`);
  }
  if (result.failed > 0 && result.failed === cases) {
    throw new CalorbitError("SWEEP_CASES_FAILED", `every one of the ${cases} cases failed; the first: ${result.firstFailure ?? "?"}`);
  }
  if (result.failed > 0) {
    err(`calorbit: ${result.failed} of ${cases} cases failed (their status column says why; the first: ${result.firstFailure ?? "?"})\n`);
  }
}

export function registerSweep(program: Command): void {
  program
    .command("sweep")
    .description("run a scenario over a grid or a Latin hypercube of parameters, in parallel, resumable; 'sweep merge' joins shards; 'sweep jobscript' writes a cluster job")
    .argument("[args...]", "a scenario file (the bundled demo when omitted), or: merge SHARD-FILES..., or: jobscript SCENARIO")
    .option("--vary <PATH=SPEC>", "a scenario key and its values (repeat for a grid): list a,b,c | range A..B:N or A:B:N | log range A..B:N log", (v: string, acc: string[] = []) => [...acc, v])
    .option("--random <n>", "draw N cases as a Latin hypercube over the --vary ranges instead of the full grid")
    .option("--seed <s>", "seed of the Latin hypercube", "1")
    .option("--out <file>", "output file (rerunning the same command resumes it); stdout when omitted (not for parquet)")
    .option("--format <f>", "csv, jsonl or parquet", "csv")
    .option("--workers <n>", "worker threads (default: the number of cores)")
    .option("--shard <i/N|auto>", "run only the i-th of N disjoint slices; auto: the task index of a Slurm job array or a Kubernetes indexed Job", "1/1")
    .option("--shards <N>", "with --shard auto or --shard-index: the number of tasks (Kubernetes, HTCondor; checked against a Slurm array)")
    .option("--shard-index <k>", "a 0-based task index, e.g. HTCondor's $(Process), with --shards N")
    .option("--max-cases <n>", `refuse a sweep of more cases than this (default ${DEFAULT_MAX_CASES.toLocaleString("en-US")})`)
    .option("--quiet", "no progress bar or closing line")
    .option("--tolerance <x>", "relative tolerance of the temperatures (a conduction column: 1e-6 unless given)")
    .option("--scheduler <s>", "jobscript: slurm or kubernetes", "slurm")
    .option("--max-array <n>", "jobscript: the cluster's cap on tasks in one array", "1000")
    .option("--max-running <n>", "jobscript: at most this many tasks at once (0: no limit)", "0")
    .option("--cases-per-task <n>", "jobscript: cases one task should run (fewer tasks if --max-array caps them)", "10000")
    .option("--cpus-per-task <n>", "jobscript: cores (worker threads) per task", "4")
    .option("--time <limit>", "jobscript: wall-clock limit per task", "02:00:00")
    .option("--prefix <stem>", "jobscript: file name stem of the shard files and the merged file", "sweep")
    .option("--job-name <name>", "jobscript: the job's name", "calorbit-sweep")
    .option("--image <image>", "jobscript (kubernetes): the container image with node and calorbit", "node:20")
    .option("--claim <name>", "jobscript (kubernetes): the persistent volume claim the shards are written to", "calorbit-sweep-data")
    .option("--mount-path <dir>", "jobscript (kubernetes): where the volume is mounted (the working directory)", "/data")
    .option("--command <cmd>", "jobscript: how calorbit is run on the cluster", "npx calorbit")
    .addHelpText(
      "after",
      `
Examples:
  calorbit sweep my.yaml --vary orbit.eccentricity=0:0.9:10 --vary "body.layer.thickness=1..1000:7 log" --out grid.csv
  calorbit sweep my.yaml --vary orbit.semiMajorAxis="0.5 au..2 au:7" --vary body.albedo=0.1,0.3,0.5 --format parquet --out a.parquet
  calorbit sweep my.yaml --vary orbit.eccentricity=0..0.9:1 --vary body.albedo=0..0.8:1 --random 10000 --seed 7 --out lhs.csv
  calorbit sweep my.yaml --vary ... --shard auto --out part-$SLURM_ARRAY_TASK_ID.csv   (one task of a Slurm job array)
  calorbit sweep my.yaml --vary ... --shard-index $(Process) --shards 16 --out part-$(Process).csv   (HTCondor)
  calorbit sweep scenarios/sarvek-regolith.yaml --vary body.albedo=0.05..0.3:6 --out column.csv   (a conduction column)
  calorbit sweep merge part-*.csv --out all.csv
  calorbit sweep jobscript my.yaml --vary ... --max-array 1000 --cases-per-task 5000 --out sweep.sh   (then: bash sweep.sh)
  calorbit sweep jobscript my.yaml --vary ... --scheduler kubernetes --out sweep-job.yaml`,
    )
    .action((args: string[], flags: SweepFlags) => sweepCommand(args, flags));
}
