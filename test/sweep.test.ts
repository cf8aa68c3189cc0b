import { spawn } from "node:child_process";
import { mkdtempSync, readFileSync, statSync, truncateSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { mergeShards } from "../src/cli/sweep.js";
import { checkDefinition } from "../src/sweep/check.js";
import { caseCount, caseMaker, parseShard, shardIds, type Design } from "../src/sweep/design.js";
import { resolveShard } from "../src/sweep/shard.js";
import { levelAt, parseAxis, type Axis } from "../src/sweep/spec.js";
import { calorbit, CLI } from "./sweepCli.js";


const BASE = {
  name: "sweep base",
  star: { luminosity: "1 Lsun", mass: "1 Msun" },
  orbit: { semiMajorAxis: "1 au", eccentricity: 0.1 },
  body: { albedo: 0.3, emissivity: 0.95, heatCapacity: "1e8 J/m2/K" },
  thresholds: ["273.15 K", "373.15 K"],
};
let dir: string;
let scenario: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "calorbit-sweep-"));
  scenario = join(dir, "base.json");
  writeFileSync(scenario, JSON.stringify(BASE));
});

const sweep = (...args: string[]) => calorbit(["sweep", ...args]);
const rowsOf = (path: string) => readFileSync(path, "utf8").split("\n").filter((l) => l !== "" && !l.startsWith("#") && !l.startsWith("case_id"));
const idsOf = (path: string) => rowsOf(path).map((l) => Number(l.split(",")[0]));
const levels = (a: Axis) => Array.from({ length: a.count }, (_, k) => levelAt(a, k));
const range = (n: number) => Array.from({ length: n }, (_, i) => i);

describe("axis specs", () => {
  it("expands a list, a linear range and a logarithmic range, keeping units", () => {
    expect(levels(parseAxis("body.albedo=0.1,0.3,0.5"))).toEqual([0.1, 0.3, 0.5]);
    expect(levels(parseAxis("regime=global,dayside"))).toEqual(["global", "dayside"]);
    expect(levels(parseAxis("orbit.eccentricity=0:0.9:10"))).toHaveLength(10);
    expect(levels(parseAxis("orbit.eccentricity=0:0.9:10")).at(-1)).toBe(0.9);
    const a = levels(parseAxis("orbit.semiMajorAxis=0.5 au..2 au:7"));
    expect(parseAxis("orbit.semiMajorAxis=0.5 au..2 au:7").unit).toBe("au");
    expect([a[0], a[2], a[6]]).toEqual(["0.5 au", "1 au", "2 au"]);
    const log = levels(parseAxis("body.heatCapacity=1e5..1e9:9 log"));
    expect(log[0]).toBe(1e5);
    expect(log[8]).toBe(1e9);
    log.forEach((v, k) => expect(Math.abs(Number(v) / 10 ** (5 + k / 2) - 1)).toBeLessThan(1e-13));
  });

  it("computes a range's levels on demand: a billion-level axis costs nothing", () => {
    const a = parseAxis("body.albedo=0..1:1000000001");
    expect(a.count).toBe(1_000_000_001);
    expect(levelAt(a, 500_000_000)).toBe(0.5);
  });

  it("rejects a malformed spec with a one-line reason naming the axis", () => {
    expect(() => parseAxis("orbit.eccentricity")).toThrowError(/PATH=SPEC/);
    expect(() => parseAxis("orbit.semiMajorAxis=1 au..2 km:3")).toThrowError(/same unit/);
    expect(() => parseAxis("body.heatCapacity=0..1e9:9 log")).toThrowError(/both ends > 0/);
    // Was read as one garbled case (0 in the "unit" "..1:1e9"); a count is a whole number written out.
    expect(() => parseAxis("body.albedo=0..1:1e9")).toThrowError(/^--vary body\.albedo: .*a whole number of levels/);
    expect(() => parseAxis("body.albedo=0..1:2.5")).toThrowError(/a whole number of levels/);
    expect(() => parseAxis("body.albedo=0..1")).toThrowError(/FROM\.\.TO:COUNT/);
  });
});

describe("designs", () => {
  it("numbers a grid row-major with the last axis fastest", () => {
    const design = { axes: [parseAxis("a=1,2"), parseAxis("b=10,20,30")] };
    const make = caseMaker(design);
    expect(caseCount(design)).toBe(6);
    expect([0, 1, 2, 3, 5].map((id) => make(id).values)).toEqual([[1, 10], [1, 20], [1, 30], [2, 10], [2, 30]]);
  });

  it("draws a Latin hypercube with one sample per stratum in every dimension, reproducibly (McKay et al. 1979)", () => {
    const design = { axes: [parseAxis("x=0..1:2"), parseAxis("y=1..1000:2 log")], random: { count: 50, seed: 42 } };
    const draws = Array.from({ length: 50 }, (_, id) => caseMaker(design)(id).values as number[]);
    const xs = draws.map((d) => Math.floor(d[0]! * 50));
    const ys = draws.map((d) => Math.floor((Math.log10(d[1]!) / 3) * 50));
    expect(new Set(xs).size).toBe(50);
    expect(new Set(ys).size).toBe(50);
    expect(caseMaker(design)(17).values).toEqual(draws[17]);
    expect(caseMaker({ ...design, random: { count: 50, seed: 43 } })(17).values).not.toEqual(draws[17]);
  });

  it("splits a sweep into disjoint shards whose union is the whole", () => {
    const seen = new Map<number, number>();
    for (let i = 1; i <= 7; i++) for (const id of shardIds(100, parseShard(`${i}/7`))) seen.set(id, (seen.get(id) ?? 0) + 1);
    expect(seen.size).toBe(100);
    expect([...seen.values()].every((c) => c === 1)).toBe(true);
    expect(() => parseShard("0/3")).toThrowError(/1 ≤ i ≤ N/);
  });
});

describe("--shard auto: the scheduler's own task numbering", () => {
  /** Every case id exactly once over the shards the given environments resolve to. */
  function coverage(total: number, envs: Record<string, string>[], flags: { shards?: number; shardIndex?: number }[] = []): number[] {
    const counts = new Array<number>(total).fill(0);
    envs.forEach((env, t) => {
      for (const id of shardIds(total, resolveShard({ shard: "auto", ...(flags[t] ?? {}) }, env))) counts[id]!++;
    });
    return counts;
  }

  it("Slurm arrays 0-based and 1-based (Slurm 'Job Array Support': SLURM_ARRAY_TASK_ID from SLURM_ARRAY_TASK_MIN to _MAX) each cover a sweep once", () => {
    const slurm = (base: number, n: number, withCount: boolean) =>
      range(n).map((t) => ({
        SLURM_ARRAY_TASK_ID: String(base + t),
        SLURM_ARRAY_TASK_MIN: String(base),
        ...(withCount ? { SLURM_ARRAY_TASK_COUNT: String(n) } : { SLURM_ARRAY_TASK_MAX: String(base + n - 1) }),
      }));
    expect(coverage(103, slurm(0, 8, false))).toEqual(new Array(103).fill(1));
    expect(coverage(103, slurm(1, 8, true))).toEqual(new Array(103).fill(1));
    // --array=0-63 and --array=1-64 give the same shards, by place in the array.
    expect(resolveShard({ shard: "auto" }, slurm(0, 64, false)[9]!)).toMatchObject({ index: 10, count: 64, source: "slurm" });
    expect(resolveShard({ shard: "auto" }, slurm(1, 64, false)[9]!)).toMatchObject({ index: 10, count: 64 });
    // A stepped array (--array=0-30:10 is 0, 10, 20, 30: SLURM_ARRAY_TASK_STEP=10).
    const stepped = [0, 10, 20, 30].map((id) => ({ SLURM_ARRAY_TASK_ID: String(id), SLURM_ARRAY_TASK_MIN: "0", SLURM_ARRAY_TASK_MAX: "30", SLURM_ARRAY_TASK_STEP: "10" }));
    expect(coverage(21, stepped)).toEqual(new Array(21).fill(1));
  });

  it("refuses a Slurm array that is not an evenly spaced range, and a --shards that disagrees with it", () => {
    // --array=1,3,7: MIN 1, MAX 7, COUNT 3.
    expect(() => resolveShard({ shard: "auto" }, { SLURM_ARRAY_TASK_ID: "3", SLURM_ARRAY_TASK_MIN: "1", SLURM_ARRAY_TASK_MAX: "7", SLURM_ARRAY_TASK_COUNT: "3" })).toThrowError(
      /not an evenly spaced range/,
    );
    // A lone resubmitted task (--array=5) of a 64-task sweep would otherwise run the whole sweep as 1/1.
    expect(() => resolveShard({ shard: "auto", shards: 64 }, { SLURM_ARRAY_TASK_ID: "5", SLURM_ARRAY_TASK_MIN: "5", SLURM_ARRAY_TASK_MAX: "5" })).toThrowError(
      /--shards: given 64, but this Slurm array has 1 tasks/,
    );
  });

  it("Kubernetes indexed Jobs (JOB_COMPLETION_INDEX from 0 to completions − 1, 'Indexed Job') cover a sweep once, with --shards", () => {
    const envs = range(5).map((i) => ({ JOB_COMPLETION_INDEX: String(i) }));
    expect(coverage(37, envs, envs.map(() => ({ shards: 5 })))).toEqual(new Array(37).fill(1));
    expect(() => resolveShard({ shard: "auto" }, { JOB_COMPLETION_INDEX: "2" })).toThrowError(/without --shards/);
    expect(() => resolveShard({ shard: "auto", shards: 5 }, { JOB_COMPLETION_INDEX: "5" })).toThrowError(/an index from 0 to 4/);
  });

  it("HTCondor's $(Process) (from 0 in each cluster, HTCondor manual) as --shard-index covers a sweep once", () => {
    const flags = range(6).map((p) => ({ shardIndex: p, shards: 6 }));
    expect(coverage(40, flags.map(() => ({})), flags)).toEqual(new Array(40).fill(1));
    expect(() => resolveShard({ shard: "1/1", shardIndex: 2 }, {})).toThrowError(/--shard-index K together with --shards N/);
  });

  it("says clearly when no scheduler index is present", () => {
    expect(() => resolveShard({ shard: "auto" }, {})).toThrowError(/^--shard auto: given no scheduler task index \(neither SLURM_ARRAY_TASK_ID nor JOB_COMPLETION_INDEX is set\)/);
  });
});

describe("a sweep definition checked before any case runs", () => {
  const check = (vary: string[], maxCases?: number, random?: Design["random"]) => () =>
    checkDefinition(structuredClone(BASE), { axes: vary.map(parseAxis), ...(random ? { random } : {}) }, maxCases);
  const problemsOf = (f: () => void): string[] => {
    try {
      f();
    } catch (err) {
      return (err as { problems: { path: string; given: string; allowed: string }[] }).problems.map((p) => `${p.path}: given ${p.given}; allowed: ${p.allowed}`);
    }
    return [];
  };

  it("accepts a good definition", () => {
    expect(check(["orbit.eccentricity=0:0.9:10", "body.albedo=0.1,0.5", "regime=global,dayside"])).not.toThrow();
  });

  it("refuses an unknown path, naming the axis and the keys allowed there", () => {
    expect(problemsOf(check(["body.albedoo=0.1,0.2"]))).toEqual([
      expect.stringMatching(/^--vary body\.albedoo: given "body\.albedoo"; allowed: a scenario key; keys under body: name, albedo, emissivity/),
    ]);
    expect(problemsOf(check(["orbitt.eccentricity=0.1"]))[0]).toMatch(/keys: name, description, star, orbit, body/);
  });

  it("refuses a value out of range on any level, with the scenario's other keys", () => {
    expect(problemsOf(check(["orbit.eccentricity=0.3,1.2,0.5"]))).toEqual(["--vary orbit.eccentricity: given 1.2 (level 2 of 3); allowed: a number with 0 ≤ e < 1"]);
    expect(problemsOf(check(["body.albedo=0..1.5:4"]))).toEqual(["--vary body.albedo: given 1.5 (level 4 of 4); allowed: a number with 0 ≤ A ≤ 1"]);
    expect(problemsOf(check(["regime=global,daysid"]))[0]).toMatch(/^--vary regime: given "daysid" \(level 2 of 2\); allowed: one of global, dayside/);
  });

  it("refuses a repeated key (whose rows were mislabelled) and keys that replace each other", () => {
    expect(problemsOf(check(["body.albedo=0.1,0.2", "body.albedo=0.3"]))).toEqual([
      '--vary body.albedo: given twice ("0.1,0.2" and "0.3"); allowed: each key varied once (list every value in one --vary)',
    ]);
    expect(problemsOf(check(["body.heatCapacity=1e6,1e7", "body.layer.thickness=1,2"]))[0]).toMatch(/one of body\.layer and body\.heatCapacity/);
  });

  it("refuses a grid larger than the limit, with its size; the limit can be raised", () => {
    expect(problemsOf(check(["body.albedo=0..1:1000000", "orbit.eccentricity=0..0.9:1000000"]))).toEqual([
      "--vary: given a grid of 1,000,000 × 1,000,000 = 1,000,000,000,000 cases; allowed: at most 1,000,000,000 cases (split the sweep, or raise the limit with --max-cases N)",
    ]);
    expect(problemsOf(check(["body.albedo=0..1:101"], 100))[0]).toMatch(/a grid of 101 = 101 cases; allowed: at most 100 cases/);
    expect(check(["body.albedo=0..1:101"], 101)).not.toThrow();
  });

  it("replaces a body.layer by a body.heatCapacity axis (and the reverse), as the user means it", () => {
    const layered = { ...structuredClone(BASE), body: { albedo: 0.3, layer: { material: "water", thickness: "10 m" } } };
    expect(() => checkDefinition(layered, { axes: [parseAxis("body.heatCapacity=1e6..1e9:4 log")] })).not.toThrow();
    expect(() => checkDefinition(structuredClone(BASE), { axes: [parseAxis("body.layer.material=rock,ice"), parseAxis("body.layer.thickness=1 m,2 m")] })).not.toThrow();
    // A layer axis alone on a scenario without a layer still needs the layer's material: named on that axis.
    expect(problemsOf(check(["body.layer.thickness=1 m,2 m"]))[0]).toMatch(/^--vary body\.layer\.thickness: given "1 m" \(level 1 of 2\); allowed: body\.layer\.material: given missing/);
  });
});

describe("calorbit sweep", () => {
  const grid = ["--vary", "orbit.eccentricity=0,0.2,0.4,0.6", "--vary", "body.heatCapacity=1e6..1e9:4 log", "--quiet"];

  it("writes one row per case in id order with inputs, status, metrics and solver work", async () => {
    const out = join(dir, "grid.csv");
    const r = await sweep(scenario, ...grid, "--out", out);
    expect(r.status).toBe(0);
    const header = readFileSync(out, "utf8").split("\n").find((l) => l.startsWith("case_id"))!;
    expect(header.startsWith("case_id,orbit.eccentricity,body.heatCapacity,status,temperature_min_K,temperature_max_K,temperature_mean_K")).toBe(true);
    expect(header).toContain("evaluations");
    expect(idsOf(out)).toEqual(range(16));
    expect(rowsOf(out).every((l) => l.split(",")[3] === "ok")).toBe(true);
  });

  it("gives identical rows with one worker and with two, in case-id order", async () => {
    // 100 cases: four chunks, so both workers take several and may finish out of order.
    const many = ["--vary", "orbit.eccentricity=0:0.9:10", "--vary", "body.heatCapacity=1e5..1e9:10 log", "--quiet"];
    const one = join(dir, "w1.csv");
    const two = join(dir, "w2.csv");
    await sweep(scenario, ...many, "--workers", "1", "--out", one);
    await sweep(scenario, ...many, "--workers", "2", "--out", two);
    expect(rowsOf(one)).toHaveLength(100);
    expect(idsOf(two)).toEqual(range(100));
    expect(rowsOf(two)).toEqual(rowsOf(one));
  });

  it("sweeps a conduction column: each row is the column run of that case, with its skin depths and deep temperature", async () => {
    const column = join(import.meta.dirname, "..", "scenarios", "sarvek-regolith.yaml");
    const out = join(dir, "column.csv");
    const r = await sweep(column, "--vary", "body.albedo=0.11,0.3", "--quiet", "--out", out);
    expect(r.status).toBe(0);
    const header = readFileSync(out, "utf8").split("\n").find((l) => l.startsWith("case_id"))!.split(",");
    const rows = rowsOf(out).map((l) => Object.fromEntries(l.split(",").map((v, i) => [header[i]!, v])));
    expect(rows.map((row) => row.status)).toEqual(["ok", "ok"]);
    const run = await calorbit(["run", column, "--json"]);
    const doc = JSON.parse(run.stdout) as { summary: { temperature: { minK: number; meanK: number }; skinDepths: { diurnalM: number; orbitalM: number }; depthProfile: { meanK: number }[] } };
    // The scenario's own albedo is 0.11: the first row must be that run, number for number.
    expect(Number(rows[0]!.temperature_min_K)).toBe(doc.summary.temperature.minK);
    expect(Number(rows[0]!.temperature_mean_K)).toBe(doc.summary.temperature.meanK);
    expect(Number(rows[0]!.skin_depths_diurnal_m)).toBe(doc.summary.skinDepths.diurnalM);
    expect(Number(rows[0]!.skin_depths_orbital_m)).toBe(doc.summary.skinDepths.orbitalM);
    expect(Number(rows[0]!.deep_mean_K)).toBe(doc.summary.depthProfile.at(-1)!.meanK);
    expect(rows[0]!.integrator).toBe("crank-nicolson");
    expect(rows[0]!.tau_over_period).toBe("");
    // A brighter surface absorbs less: colder at the surface and at depth.
    expect(Number(rows[1]!.temperature_mean_K)).toBeLessThan(Number(rows[0]!.temperature_mean_K));
    expect(Number(rows[1]!.deep_mean_K)).toBeLessThan(Number(rows[0]!.deep_mean_K));
  });

  it("keeps an explicit --tolerance 1e-8 for a conduction column, as run does (it was taken for 'not given' and replaced by 1e-6)", async () => {
    const column = join(import.meta.dirname, "..", "scenarios", "sarvek-regolith.yaml");
    const out = join(dir, "column-tight.csv");
    const r = await sweep(column, "--vary", "body.albedo=0.11", "--tolerance", "1e-8", "--quiet", "--out", out);
    expect(r.status).toBe(0);
    const header = readFileSync(out, "utf8").split("\n").find((l) => l.startsWith("case_id"))!.split(",");
    const row = Object.fromEntries(rowsOf(out)[0]!.split(",").map((v, i) => [header[i]!, v]));
    const run = JSON.parse((await calorbit(["run", column, "--json", "--tolerance", "1e-8"])).stdout) as { summary: { temperature: { minK: number; meanK: number } }; solver: { iterations: number } };
    expect(Number(row.temperature_min_K)).toBe(run.summary.temperature.minK);
    expect(Number(row.temperature_mean_K)).toBe(run.summary.temperature.meanK);
    expect(Number(row.iterations)).toBe(run.solver.iterations);
  });

  it("tells a user whose shell split off a log range's \"log\" to quote it", async () => {
    const r = await sweep(scenario, "--vary", "body.heatCapacity=1e7..1e9:3", "log", "--quiet");
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toContain('quote a log range, e.g. --vary "body.heatCapacity=1e5..1e9:9 log"');
  });

  it("refuses a bad definition with exit 2 and one line per problem before any case runs (no file written)", async () => {
    for (const [vary, message] of [
      [["body.albedoo=0.1"], /^calorbit: --vary body\.albedoo: given "body\.albedoo"; allowed: a scenario key/],
      [["orbit.eccentricity=0.3,1.2"], /^calorbit: --vary orbit\.eccentricity: given 1\.2 \(level 2 of 2\); allowed: a number with 0 ≤ e < 1$/],
      [["body.albedo=0.1", "body.albedo=0.2"], /^calorbit: --vary body\.albedo: given twice/],
      [["body.albedo=0..1:1e9"], /^calorbit: --vary body\.albedo: given "body\.albedo=0\.\.1:1e9"; allowed: a whole number of levels/],
      [["body.albedo=0..1:100000", "orbit.eccentricity=0..0.9:100000"], /^calorbit: --vary: given a grid of 100,000 × 100,000 = 10,000,000,000 cases/],
    ] as const) {
      const out = join(dir, "refused.csv");
      const r = await sweep(scenario, ...vary.flatMap((v) => ["--vary", v]), "--quiet", "--out", out);
      expect(r.status).toBe(2);
      expect(r.stderr.trim().split("\n")).toHaveLength(1);
      expect(r.stderr.trim()).toMatch(message);
      expect(() => statSync(out)).toThrow();
    }
  });

  it("reports the failed cases on stderr at the end, and exits non-zero when every case fails", async () => {
    // Valid on each axis with the other's first level, but low ≥ high in one combination: that case fails.
    const some = join(dir, "some-failed.csv");
    const r = await sweep(scenario, "--vary", "thresholds.0=200 K,300 K", "--vary", "thresholds.1=350 K,250 K", "--out", some);
    expect(r.status).toBe(0);
    const rows = rowsOf(some);
    expect(rows).toHaveLength(4);
    expect(rows[3]).toMatch(/^3,300,250,"?error: thresholds: given \[/);
    expect(r.stderr).toMatch(/^calorbit: 1 of 4 cases failed \(their status column says why; the first: error: thresholds/m);
    // A star too faint to light the surface passes the schema but fails every case when it runs.
    const all = await sweep(scenario, "--vary", "star.luminosity=1e-300,2e-300", "--quiet", "--out", join(dir, "all-failed.csv"));
    expect(all.status).toBe(1);
    expect(all.stderr).toMatch(/^calorbit: every one of the 2 cases failed; the first: error: /);
  });

  it("resumes after a crash that tore the last line, ending with every case exactly once", async () => {
    const whole = join(dir, "whole.csv");
    const torn = join(dir, "torn.csv");
    await sweep(scenario, ...grid, "--out", whole);
    await sweep(scenario, ...grid, "--out", torn);
    const text = readFileSync(torn, "utf8");
    const cut = text.indexOf("\n", text.indexOf("\n7,")) - 20; // in the middle of case 7's row
    truncateSync(torn, Buffer.byteLength(text.slice(0, cut)));
    const r = await sweep(scenario, ...grid, "--out", torn);
    expect(r.status).toBe(0);
    expect(idsOf(torn)).toEqual(range(16));
    expect(readFileSync(torn, "utf8")).toBe(readFileSync(whole, "utf8"));
  });

  it("resumes after SIGKILL of the whole process group at an arbitrary moment", async () => {
    // A conduction column's cases take long enough (each many steps of a column) that a kill as soon as the
    // first rows land comes well before the end on any machine, loaded or not: the slower the machine, the
    // slower the sweep too.
    const column = join(import.meta.dirname, "..", "scenarios", "sarvek-regolith.yaml");
    const out = join(dir, "killed.jsonl");
    const args = [column, "--vary", "body.albedo=0.05:0.35:8", "--format", "jsonl", "--workers", "2", "--quiet", "--out", out];
    const child = spawn(process.execPath, [CLI, "sweep", ...args], { detached: true, stdio: "ignore" });
    const rowCount = () => {
      try {
        return readFileSync(out, "utf8").split("\n").filter((l) => l.startsWith('{"case_id"')).length;
      } catch {
        return 0;
      }
    };
    for (let i = 0; i < 1200 && rowCount() === 0; i++) await new Promise((r) => setTimeout(r, 50));
    process.kill(-child.pid!, "SIGKILL");
    await new Promise((r) => child.on("exit", r));
    const before = rowCount();
    expect(before).toBeGreaterThan(0);
    expect(before).toBeLessThan(8);
    expect((await sweep(...args)).status).toBe(0);
    const ids = readFileSync(out, "utf8").split("\n").filter((l) => l.startsWith('{"case_id"')).map((l) => JSON.parse(l).case_id);
    expect(ids).toEqual(range(8));
  });

  it("refuses to resume a file written by a different sweep", async () => {
    const out = join(dir, "other.csv");
    await sweep(scenario, ...grid, "--out", out);
    const r = await sweep(scenario, "--vary", "orbit.eccentricity=0,0.5", "--quiet", "--out", out);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^calorbit: .*other\.csv: refusing to resume: it was written by a different sweep definition or shard/m);
  });

  it("runs shards that merge into the whole sweep, and reports missing cases", async () => {
    const whole = join(dir, "m-whole.csv");
    await sweep(scenario, ...grid, "--out", whole);
    const parts = [1, 2, 3].map((i) => join(dir, `m-part-${i}.csv`));
    for (const [i, p] of parts.entries()) expect((await sweep(scenario, ...grid, "--shard", `${i + 1}/3`, "--out", p)).status).toBe(0);
    expect(idsOf(parts[1]!)).toEqual([1, 4, 7, 10, 13]);
    const merged = join(dir, "m-merged.csv");
    const r = await sweep("merge", ...parts, "--out", merged);
    expect(r.status).toBe(0);
    expect(rowsOf(merged)).toEqual(rowsOf(whole));
    const missing = await sweep("merge", parts[0]!, parts[2]!, "--out", join(dir, "m-bad.csv"));
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/5 missing \(case ids 1, 4, 7, 10, 13\); nothing written/);
    const onto = await sweep("merge", ...parts, "--out", parts[0]!);
    expect(onto.status).toBe(2);
    expect(onto.stderr).toMatch(/is one of the shard files/);
  });

  it("runs Kubernetes-style shards (JOB_COMPLETION_INDEX from 0) with --shard auto that merge into the whole", async () => {
    const whole = join(dir, "k-whole.csv");
    await sweep(scenario, ...grid, "--out", whole);
    const parts = [0, 1].map((i) => join(dir, `k-part-${i}.csv`));
    for (const [i, p] of parts.entries()) {
      expect((await calorbit(["sweep", scenario, ...grid, "--shard", "auto", "--shards", "2", "--out", p], { JOB_COMPLETION_INDEX: String(i) })).status).toBe(0);
    }
    expect(readFileSync(parts[0]!, "utf8")).toContain("# shard: 1/2");
    const merged = join(dir, "k-merged.csv");
    expect((await sweep("merge", ...parts, "--out", merged)).status).toBe(0);
    expect(rowsOf(merged)).toEqual(rowsOf(whole));
  });
});

describe("calorbit sweep jobscript", () => {
  const definition = () => [scenario, "--vary", "orbit.eccentricity=0:0.9:10", "--vary", "body.albedo=0.1,0.2,0.3"];

  it("sizes a Slurm array to --max-array, throttles it, requeues, resumes by task and merges as a dependent job", async () => {
    const r = await calorbit(["sweep", "jobscript", ...definition(), "--max-array", "7", "--max-running", "3", "--cases-per-task", "2", "--prefix", "grid"]);
    expect(r.status).toBe(0);
    const script = r.stdout;
    // 30 cases at 2 per task would be 15 tasks; the cluster allows 7, so each takes up to 5.
    expect(script).toContain("30 cases in 7 tasks of at most 5 (capped by --max-array 7");
    expect(script).toMatch(/^#SBATCH --array=0-6%3$/m);
    expect(script).toMatch(/^#SBATCH --requeue$/m);
    expect(script).toContain("--dependency=afterok:$array");
    expect(script).toContain('--wrap "$CALORBIT sweep merge grid-*.csv --out grid.csv"');
    expect(script).toContain("--shard auto --shards 7");
    expect(script).toContain('--out "grid-${SLURM_ARRAY_TASK_ID}.csv"');
    // Slurm's variables for --array=0-6 ('Job Array Support') give shards covering the sweep once.
    const counts = new Array<number>(30).fill(0);
    for (let t = 0; t <= 6; t++) {
      for (const id of shardIds(30, resolveShard({ shard: "auto", shards: 7 }, { SLURM_ARRAY_TASK_ID: String(t), SLURM_ARRAY_TASK_MIN: "0", SLURM_ARRAY_TASK_MAX: "6" }))) counts[id]!++;
    }
    expect(counts).toEqual(new Array(30).fill(1));
  });

  it("writes the Kubernetes indexed Job equivalent (completionMode Indexed, completions = tasks, index from JOB_COMPLETION_INDEX)", async () => {
    const r = await calorbit(["sweep", "jobscript", ...definition(), "--scheduler", "kubernetes", "--max-array", "4", "--cases-per-task", "5", "--prefix", "grid", "--claim", "sweep-data"]);
    expect(r.status).toBe(0);
    const { parse } = await import("yaml");
    const job = parse(r.stdout) as {
      kind: string;
      spec: { completionMode: string; completions: number; template: { spec: { restartPolicy: string; containers: { command: string[] }[]; volumes: { persistentVolumeClaim: { claimName: string } }[] } } };
    };
    expect(job.kind).toBe("Job");
    expect(job.spec.completionMode).toBe("Indexed");
    expect(job.spec.completions).toBe(4);
    expect(job.spec.template.spec.restartPolicy).toBe("OnFailure");
    expect(job.spec.template.spec.volumes[0]!.persistentVolumeClaim.claimName).toBe("sweep-data");
    const command = job.spec.template.spec.containers[0]!.command;
    expect(command.slice(0, 2)).toEqual(["sh", "-c"]);
    expect(command[2]).toContain("--shard auto --shards 4 --out grid-$JOB_COMPLETION_INDEX.csv");
  });

  it("refuses a bad definition just as the sweep would", async () => {
    const r = await calorbit(["sweep", "jobscript", scenario, "--vary", "body.albedo=0.5,1.5"]);
    expect(r.status).toBe(2);
    expect(r.stderr.trim()).toBe("calorbit: --vary body.albedo: given 1.5 (level 2 of 2); allowed: a number with 0 ≤ A ≤ 1");
  });
});

describe("reading sweep files in blocks", () => {
  it("keeps multi-byte characters whole across block boundaries (files over 1 MiB)", () => {
    const file = join(dir, "big-shard.csv");
    // Rows dense in "≤" (3 bytes in UTF-8), so that the 1 MiB block boundaries fall inside one.
    const rows = Array.from({ length: 30_000 }, (_, i) => `${i},0.${i % 10},"error: given 1.${i % 7}; allowed: 0 ≤ e < 1 ${"≤".repeat(40)}"`);
    writeFileSync(file, ["# calorbit 0.1.0 sweep", '# definition: {"format":"csv"}', "# shard: 1/1", "case_id,orbit.eccentricity,status", ...rows].join("\n") + "\n");
    expect(statSync(file).size).toBeGreaterThan(4 * 1024 * 1024);
    const out = join(dir, "big-merged.csv");
    expect(mergeShards([file], out, () => rows.length).cases).toBe(30_000);
    expect(readFileSync(out, "utf8").split("\n").filter((l) => /^\d/.test(l))).toEqual(rows);
  });
});
