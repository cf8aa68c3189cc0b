/**
 * A sweep through a real one-node Slurm cluster (Debian's slurmctld and slurmd, started here and
 * stopped at the end): `calorbit sweep jobscript` writes the batch script, `bash` on it submits a
 * 4-task job array whose tasks take their shard with `--shard auto`, and the merge as a job that
 * depends on the array (afterok). The merged rows must be the serial run's, every case once.
 * Skipped, loudly, where Slurm is not installed or cannot start; with CI=true it must run.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import { hostname, tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { calorbit, CLI } from "./sweepCli.js";


const IN_CI = process.env.CI === "true";
/** Bounds on waiting for the cluster: generous (a loaded machine is slow), but finite. */
const START_WAIT_MS = 90_000;
const JOB_WAIT_MS = 300_000;
const POLL_MS = 500;

let dir = "";
let conf = "";
const daemons: ChildProcess[] = [];
let unavailable: string | null = null;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** A port that is free now (the kernel picks it), so that runs side by side never share a cluster. */
function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      server.close(() => resolve(typeof address === "object" && address ? address.port : 0));
    });
  });
}

function slurm(command: string, args: string[]) {
  return spawnSync(command, args, { encoding: "utf8", env: { ...process.env, SLURM_CONF: conf }, cwd: dir, timeout: 60_000 });
}

async function startCluster(): Promise<string | null> {
  for (const tool of ["slurmctld", "slurmd", "sbatch", "sinfo", "squeue"]) {
    if (spawnSync("sh", ["-c", `command -v ${tool}`]).status !== 0) return `${tool} is not installed (.ci/run installs Debian's slurmctld, slurmd and slurm-client)`;
  }
  if (process.getuid?.() !== 0) return "the one-node cluster runs its daemons as root, and this is not root";
  dir = mkdtempSync(join(tmpdir(), "calorbit-slurm-"));
  for (const sub of ["ctld", "d"]) mkdirSync(join(dir, sub));
  const host = hostname().split(".")[0]!;
  const [ctldPort, dPort] = [await freePort(), await freePort()];
  conf = join(dir, "slurm.conf");
  // The configuration of shared/notes/one-node-slurm.md (measured to work on a machine of this kind).
  writeFileSync(
    conf,
    `ClusterName=calorbittest
SlurmctldHost=${host}(127.0.0.1)
SlurmctldPort=${ctldPort}
SlurmdPort=${dPort}
SlurmUser=root
AuthType=auth/none
CredType=cred/none
StateSaveLocation=${dir}/ctld
SlurmdSpoolDir=${dir}/d
SlurmctldPidFile=${dir}/slurmctld.pid
SlurmdPidFile=${dir}/slurmd.pid
SlurmctldLogFile=${dir}/slurmctld.log
SlurmdLogFile=${dir}/slurmd.log
ProctrackType=proctrack/pgid
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
MpiDefault=none
ReturnToService=2
NodeName=${host} NodeAddr=127.0.0.1 CPUs=2 RealMemory=2000 State=UNKNOWN
PartitionName=debug Nodes=${host} Default=YES MaxTime=INFINITE State=UP
`,
  );
  const env = { ...process.env, SLURM_CONF: conf };
  daemons.push(spawn("slurmctld", ["-D", "-i", "-f", conf], { env, stdio: "ignore" }));
  daemons.push(spawn("slurmd", ["-D", "-f", conf], { env, stdio: "ignore" }));
  const deadline = Date.now() + START_WAIT_MS;
  let state = "";
  while (Date.now() < deadline) {
    if (daemons.some((d) => d.exitCode !== null)) break;
    state = slurm("sinfo", ["-h", "-o", "%T"]).stdout?.trim() ?? "";
    if (state === "idle") return null;
    await sleep(POLL_MS);
  }
  const log = (f: string) => (existsSync(join(dir, f)) ? readFileSync(join(dir, f), "utf8").trim().split("\n").slice(-3).join(" | ") : "");
  return `the daemons did not bring the node up (sinfo: "${state}"; slurmctld: ${log("slurmctld.log")}; slurmd: ${log("slurmd.log")})`;
}

async function stopCluster(): Promise<void> {
  if (conf !== "") slurm("scancel", ["--full", "--user=root"]);
  for (const d of daemons) {
    if (d.exitCode === null && d.signalCode === null) d.kill("SIGTERM");
  }
  for (const d of daemons) {
    if (d.exitCode !== null || d.signalCode !== null) continue;
    const exited = await Promise.race([new Promise((r) => d.once("exit", () => r(true))), sleep(20_000).then(() => false)]);
    if (!exited) d.kill("SIGKILL");
  }
}

beforeAll(async () => {
  unavailable = await startCluster();
  if (unavailable !== null) {
    if (IN_CI) throw new Error(`Slurm must run in CI (CI=true), but: ${unavailable}`);
    console.warn(`\n*** SKIPPING the Slurm test: ${unavailable} ***\n`);
  }
}, START_WAIT_MS + 30_000);

afterAll(stopCluster, 60_000);

const rowsOf = (path: string) => readFileSync(path, "utf8").split("\n").filter((l) => l !== "" && !l.startsWith("#") && !l.startsWith("case_id"));

describe("a sweep on a real Slurm cluster", () => {
  it(
    "runs a 4-task job array with --shard auto and a dependent merge whose rows equal a serial run's, every case once",
    async (ctx) => {
      if (unavailable !== null) ctx.skip();
      const scenario = join(dir, "tarvel.yaml");
      writeFileSync(
        scenario,
        `name: Tarvel b
star: { luminosity: 0.6 Lsun, mass: 0.85 Msun }
orbit: { semiMajorAxis: 0.7 au, eccentricity: 0.15 }
body: { albedo: 0.25, emissivity: 0.9, layer: { material: rock, thickness: 2 m } }
`,
      );
      // The README's case: a heat-capacity axis on a scenario whose heat is in a layer (it replaces the layer).
      const definition = [scenario, "--vary", "orbit.eccentricity=0:0.6:5", "--vary", "body.heatCapacity=1e6..1e9:6 log"];
      const script = join(dir, "sweep.sh");
      const written = await calorbit(["sweep", "jobscript", ...definition, "--max-array", "4", "--cases-per-task", "5", "--cpus-per-task", "1", "--time", "00:10:00", "--prefix", "tarvel", "--out", script]);
      expect(written.status).toBe(0);
      const text = readFileSync(script, "utf8");
      expect(text).toContain("#SBATCH --array=0-3\n"); // 30 cases at 5 per task would be 6 tasks: capped at 4
      expect(text).toContain("--shard auto --shards 4");

      const submit = spawnSync("bash", [script], { encoding: "utf8", cwd: dir, env: { ...process.env, SLURM_CONF: conf, CALORBIT: `${process.execPath} ${CLI}` }, timeout: 60_000 });
      expect(submit.stderr).toBe("");
      expect(submit.stdout).toMatch(/^submitted array job \d+ \(4 tasks\) and merge job \d+/);

      const merged = join(dir, "tarvel.csv");
      const deadline = Date.now() + JOB_WAIT_MS;
      let queue = "";
      while (Date.now() < deadline) {
        queue = slurm("squeue", ["-h", "-o", "%i %T"]).stdout.trim();
        if (queue === "" && existsSync(merged)) break;
        await sleep(POLL_MS);
      }
      const logs = readdirSync(dir).filter((f) => f.endsWith(".log") && f.startsWith("tarvel"));
      const logText = logs.map((f) => `${f}: ${readFileSync(join(dir, f), "utf8").trim()}`).join("\n");
      expect(queue, `jobs still queued after ${JOB_WAIT_MS / 1000} s; logs:\n${logText}`).toBe("");
      expect(existsSync(merged), `no merged file; logs:\n${logText}`).toBe(true);

      // Each task's file holds its own shard, numbered by the task's place in the array.
      for (let task = 0; task < 4; task++) {
        expect(readFileSync(join(dir, `tarvel-${task}.csv`), "utf8")).toContain(`# shard: ${task + 1}/4\n`);
      }
      expect(readFileSync(join(dir, "tarvel-merge.log"), "utf8")).toContain("merged 4 shard files: 30 cases, each once");

      const serial = join(dir, "serial.csv");
      expect((await calorbit(["sweep", ...definition, "--workers", "1", "--quiet", "--out", serial])).status).toBe(0);
      const rows = rowsOf(merged);
      expect(rows.map((r) => Number(r.split(",")[0]))).toEqual(Array.from({ length: 30 }, (_, i) => i));
      expect(rows).toEqual(rowsOf(serial));
      expect(rows.every((r) => r.split(",")[3] === "ok")).toBe(true);
    },
    START_WAIT_MS + JOB_WAIT_MS,
  );
});
