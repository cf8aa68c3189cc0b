/**
 * `--shard auto`: the shard a task of a cluster job runs, read from the scheduler's own numbering.
 * - Slurm job arrays ("Job Array Support" in the Slurm documentation): SLURM_ARRAY_TASK_ID runs from
 *   SLURM_ARRAY_TASK_MIN to SLURM_ARRAY_TASK_MAX in steps of SLURM_ARRAY_TASK_STEP (default 1), and
 *   SLURM_ARRAY_TASK_COUNT tasks in all; an array may start at 0 or 1 (or anywhere): the shard is the
 *   task's place in the array, so --array=0-63 and --array=1-64 both make shards 1/64 … 64/64.
 * - Kubernetes indexed Jobs ("Indexed Job" in the Kubernetes documentation): JOB_COMPLETION_INDEX runs
 *   from 0 to completions − 1; the Job's completions are not in the pod's environment, so the count is
 *   given with --shards N.
 * - HTCondor (its manual: `queue N` numbers a cluster's jobs by the macro $(Process) from 0 to N − 1):
 *   pass it as --shard-index $(Process) with --shards N. Any other scheduler can use the same flags.
 * Pure: the environment is passed in, so this module imports nothing from Node.
 */
import { CalorbitError } from "../errors.js";
import { parseShard, type Shard } from "./design.js";

export interface ShardFlags {
  /** "i/N" or "auto". */
  shard: string;
  /** --shards N: the task count (Kubernetes, HTCondor; a check against a Slurm array's size). */
  shards?: number;
  /** --shard-index K: a 0-based task index (HTCondor's $(Process)). */
  shardIndex?: number;
}

export interface ResolvedShard extends Shard {
  /** Where the index came from, for the log line: "slurm", "kubernetes", "--shard-index" or "--shard". */
  source: string;
}

function refuse(path: string, given: string, allowed: string): CalorbitError {
  return new CalorbitError("USAGE", `${path}: given ${given}; allowed: ${allowed}`, [{ path, given, allowed }]);
}

function integerVariable(env: Record<string, string | undefined>, name: string): number | undefined {
  const raw = env[name];
  if (raw === undefined || raw === "") return undefined;
  const v = Number(raw);
  if (!Number.isSafeInteger(v) || v < 0) throw refuse(name, JSON.stringify(raw), "a whole number ≥ 0 (as the scheduler sets it)");
  return v;
}

/** From a 0-based task index and a count to the 1-based shard the sweep runs. */
function fromZeroBased(index: number, count: number, source: string, what: string): ResolvedShard {
  if (!(Number.isSafeInteger(index) && index >= 0 && index < count)) {
    throw refuse("--shard auto", `${what} = ${index} with ${count} tasks`, `an index from 0 to ${count - 1}`);
  }
  return { index: index + 1, count, source };
}

function slurmShard(env: Record<string, string | undefined>, taskId: number, shards: number | undefined): ResolvedShard {
  const min = integerVariable(env, "SLURM_ARRAY_TASK_MIN");
  const max = integerVariable(env, "SLURM_ARRAY_TASK_MAX");
  const step = integerVariable(env, "SLURM_ARRAY_TASK_STEP") ?? 1;
  const count = integerVariable(env, "SLURM_ARRAY_TASK_COUNT");
  if (min === undefined || (max === undefined && count === undefined) || step < 1) {
    throw refuse(
      "--shard auto",
      `SLURM_ARRAY_TASK_ID=${taskId} without SLURM_ARRAY_TASK_MIN and SLURM_ARRAY_TASK_MAX or SLURM_ARRAY_TASK_COUNT`,
      "a task of a Slurm job array (sbatch --array=…), which sets them",
    );
  }
  const span = max !== undefined ? Math.floor((max - min) / step) + 1 : count!;
  if ((count !== undefined && count !== span) || (taskId - min) % step !== 0) {
    throw refuse(
      "--shard auto",
      `a Slurm array that is not an evenly spaced range (SLURM_ARRAY_TASK_MIN=${min}, MAX=${max ?? "unset"}, STEP=${step}, COUNT=${count ?? "unset"})`,
      "an array such as --array=0-63 or --array=1-64 (a % throttle is fine), or --shard i/N",
    );
  }
  if (shards !== undefined && shards !== span) {
    throw refuse(
      "--shards",
      `${shards}, but this Slurm array has ${span} tasks (${min}-${max ?? min + (span - 1) * step})`,
      `the array's size; to rerun one task of a ${shards}-task sweep, resubmit the same --array range or run it with --shard i/${shards}`,
    );
  }
  return fromZeroBased((taskId - min) / step, span, "slurm", "SLURM_ARRAY_TASK_ID − SLURM_ARRAY_TASK_MIN");
}

/** The shard to run, from the flags and (for "auto") the scheduler's environment variables. */
export function resolveShard(flags: ShardFlags, env: Record<string, string | undefined>): ResolvedShard {
  const { shards, shardIndex } = flags;
  if (flags.shard.trim() !== "auto") {
    if (shardIndex !== undefined) {
      if (flags.shard.trim() !== "1/1") throw refuse("--shard-index", String(shardIndex), "either --shard i/N or --shard-index K with --shards N, not both");
    } else {
      if (shards !== undefined) throw refuse("--shards", String(shards), "--shards with --shard auto or --shard-index (with --shard i/N the N is the count)");
      return { ...parseShard(flags.shard), source: "--shard" };
    }
  }
  if (shardIndex !== undefined) {
    if (shards === undefined) throw refuse("--shard-index", String(shardIndex), "--shard-index K together with --shards N (K from 0 to N − 1)");
    return fromZeroBased(shardIndex, shards, "--shard-index", "--shard-index");
  }
  const slurmTask = integerVariable(env, "SLURM_ARRAY_TASK_ID");
  if (slurmTask !== undefined) return slurmShard(env, slurmTask, shards);
  const k8sIndex = integerVariable(env, "JOB_COMPLETION_INDEX");
  if (k8sIndex !== undefined) {
    if (shards === undefined) {
      throw refuse("--shard auto", `JOB_COMPLETION_INDEX=${k8sIndex} without --shards`, "--shards N with N the indexed Job's completions");
    }
    return fromZeroBased(k8sIndex, shards, "kubernetes", "JOB_COMPLETION_INDEX");
  }
  throw refuse(
    "--shard auto",
    "no scheduler task index (neither SLURM_ARRAY_TASK_ID nor JOB_COMPLETION_INDEX is set)",
    "a task of a Slurm job array or a Kubernetes indexed Job, --shard-index K --shards N (HTCondor: --shard-index $(Process)), or --shard i/N",
  );
}
