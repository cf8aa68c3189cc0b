/**
 * Job files for a cluster scheduler, written for one sweep definition:
 * - a Slurm batch script that is also its own submitter: run with `bash`, it submits itself as a job
 *   array and the merge as a job that starts only after every array task has succeeded
 *   (`--dependency=afterok`); run by Slurm as an array task, it runs that task's shard with
 *   `--shard auto`. Tasks are requeueable, and a requeued or rerun task resumes its own file.
 * - a Kubernetes indexed Job (completionMode: Indexed), whose pods take their shard from
 *   JOB_COMPLETION_INDEX, writing to a shared volume; the merge runs once the Job is complete.
 * The array never exceeds the cluster's array-size limit (--max-array): past it, each task takes more cases.
 * Pure text generation: nothing here touches a file or the environment.
 */
import type { SweepFormat } from "./runCase.js";

export interface JobPlan {
  /** The sweep command's arguments after `sweep` (scenario and definition flags), as the user gave them. */
  sweepArgs: string[];
  /** Cases in the sweep. */
  totalCases: number;
  format: SweepFormat;
  /** Cases one array task should run (the array shrinks to fit maxArray, then tasks take more). */
  casesPerTask: number;
  /** The scheduler's cap on tasks in one array (Slurm's MaxArraySize − 1 for 0-based arrays, or a site policy). */
  maxArray: number;
  /** At most this many tasks running at once (0: no limit). */
  maxRunning: number;
  /** Cores per task (the sweep's --workers). */
  cpusPerTask: number;
  /** Wall-clock limit per task, "HH:MM:SS" or "D-HH:MM:SS". */
  timeLimit: string;
  /** File name stem of the shard files and the merged file. */
  prefix: string;
  jobName: string;
  /** Kubernetes only: container image, persistent volume claim and mount path. */
  image: string;
  claim: string;
  mountPath: string;
  /** How to run calorbit where the job runs (default "npx calorbit"). */
  command: string;
  /** The job file's own name, for the instructions in it. */
  fileName?: string;
}

/** The number of array tasks: enough for casesPerTask each, but never more than maxArray or the cases. */
export function arrayTasks(plan: Pick<JobPlan, "totalCases" | "casesPerTask" | "maxArray">): number {
  return Math.max(1, Math.min(plan.maxArray, plan.totalCases, Math.ceil(plan.totalCases / plan.casesPerTask)));
}

/** POSIX shell quoting: a word left as it is when it is safe, else in single quotes. */
export function shellQuote(word: string): string {
  return /^[A-Za-z0-9_\/.,:=@%+-]+$/.test(word) ? word : `'${word.replace(/'/g, `'\\''`)}'`;
}

const extension: Record<SweepFormat, string> = { csv: "csv", jsonl: "jsonl", parquet: "parquet" };

function describe(plan: JobPlan, tasks: number): string {
  const per = Math.ceil(plan.totalCases / tasks);
  const capped = Math.ceil(plan.totalCases / plan.casesPerTask) > tasks ? ` (capped by --max-array ${plan.maxArray}: about ${per.toLocaleString("en-US")} cases per task instead of ${plan.casesPerTask.toLocaleString("en-US")})` : "";
  return `${plan.totalCases.toLocaleString("en-US")} cases in ${tasks} tasks of at most ${per.toLocaleString("en-US")}${capped}`;
}

/** The Slurm batch script (bash). */
export function slurmScript(plan: JobPlan): string {
  const tasks = arrayTasks(plan);
  const ext = extension[plan.format];
  const sweep = plan.sweepArgs.map(shellQuote).join(" ");
  const throttle = plan.maxRunning > 0 && plan.maxRunning < tasks ? `%${plan.maxRunning}` : "";
  const merged = `${plan.prefix}.${ext}`;
  return `#!/bin/bash
# A calorbit sweep as a Slurm job array: ${describe(plan, tasks)}.
# Submit it with: bash ${shellQuote(plan.fileName ?? "THIS-FILE")} (it submits itself as the array, then the merge after it)
# Each task runs one shard (--shard auto reads SLURM_ARRAY_TASK_ID); a requeued or rerun task resumes
# its own file (finished cases kept, a torn last row cut off). CALORBIT overrides how calorbit is run.
#SBATCH --job-name=${plan.jobName}
#SBATCH --array=0-${tasks - 1}${throttle}
#SBATCH --cpus-per-task=${plan.cpusPerTask}
#SBATCH --time=${plan.timeLimit}
#SBATCH --requeue
#SBATCH --open-mode=append
#SBATCH --output=${plan.prefix}-%a.log
set -euo pipefail
CALORBIT="${"$"}{CALORBIT:-${plan.command}}"
if [ -z "${"$"}{SLURM_ARRAY_TASK_ID:-}" ]; then
  array=$(sbatch --parsable "$0")
  array=${"$"}{array%%;*}
  merge=$(sbatch --parsable --dependency=afterok:${"$"}array --kill-on-invalid-dep=yes --job-name=${plan.jobName}-merge \\
    --output=${plan.prefix}-merge.log --time=${plan.timeLimit} \\
    --wrap "${"$"}CALORBIT sweep merge ${plan.prefix}-*.${ext} --out ${merged}")
  echo "submitted array job ${"$"}array (${tasks} tasks) and merge job ${"$"}merge (runs after all of them succeed, writes ${merged})"
  exit 0
fi
${"$"}CALORBIT sweep ${sweep} \\
  --workers "${"$"}{SLURM_CPUS_PER_TASK:-${plan.cpusPerTask}}" --quiet --shard auto --shards ${tasks} \\
  --out "${plan.prefix}-${"$"}{SLURM_ARRAY_TASK_ID}.${ext}"
`;
}

/** The Kubernetes indexed Job (YAML). */
export function kubernetesJob(plan: JobPlan): string {
  const tasks = arrayTasks(plan);
  const ext = extension[plan.format];
  const parallelism = plan.maxRunning > 0 ? Math.min(plan.maxRunning, tasks) : tasks;
  const sweep = plan.sweepArgs.map(shellQuote).join(" ");
  const script = `${plan.command} sweep ${sweep} --workers ${plan.cpusPerTask} --quiet --shard auto --shards ${tasks} --out ${plan.prefix}-$JOB_COMPLETION_INDEX.${ext}`;
  return `# A calorbit sweep as a Kubernetes indexed Job: ${describe(plan, tasks)}.
# Apply it with: kubectl apply -f ${plan.fileName ?? "THIS-FILE"} (the scenario file must be on the volume, in ${plan.mountPath}).
# Each pod runs the shard of its JOB_COMPLETION_INDEX (0 to ${tasks - 1}) and writes it to the shared volume;
# a restarted pod resumes its own file. When the Job is complete, merge the shards:
#   kubectl wait --for=condition=complete --timeout=-1s job/${plan.jobName}
#   (in a pod with the volume, in ${plan.mountPath}) ${plan.command} sweep merge ${plan.prefix}-*.${ext} --out ${plan.prefix}.${ext}
apiVersion: batch/v1
kind: Job
metadata:
  name: ${plan.jobName}
spec:
  completionMode: Indexed
  completions: ${tasks}
  parallelism: ${parallelism}
  backoffLimit: ${Math.max(6, tasks)}
  template:
    spec:
      restartPolicy: OnFailure
      containers:
        - name: sweep
          image: ${JSON.stringify(plan.image)}
          workingDir: ${JSON.stringify(plan.mountPath)}
          command: ["sh", "-c", ${JSON.stringify(script)}]
          resources:
            requests:
              cpu: "${plan.cpusPerTask}"
          volumeMounts:
            - name: sweep-data
              mountPath: ${JSON.stringify(plan.mountPath)}
      volumes:
        - name: sweep-data
          persistentVolumeClaim:
            claimName: ${JSON.stringify(plan.claim)}
`;
}
