import { spawn, spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, statSync, truncateSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { mergeShards } from "../src/cli/sweep.js";
import { caseCount, caseMaker, parseShard, shardIds } from "../src/sweep/design.js";
import { parseAxis } from "../src/sweep/spec.js";

const CLI = join(import.meta.dirname, "..", "dist", "src", "cli", "main.js");
let dir: string;
let scenario: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "calorbit-sweep-"));
  scenario = join(dir, "base.yaml");
  writeFileSync(
    scenario,
    `name: sweep base
star: { luminosity: 1 Lsun, mass: 1 Msun }
orbit: { semiMajorAxis: 1 au, eccentricity: 0.1 }
body: { albedo: 0.3, emissivity: 0.95, heatCapacity: 1e8 J/m2/K }
thresholds: [273.15 K, 373.15 K]
`,
  );
});

function sweep(...args: string[]) {
  const r = spawnSync(process.execPath, [CLI, "sweep", ...args], { encoding: "utf8" });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}
const rowsOf = (path: string) => readFileSync(path, "utf8").split("\n").filter((l) => l !== "" && !l.startsWith("#") && !l.startsWith("case_id"));
const idsOf = (path: string) => rowsOf(path).map((l) => Number(l.split(",")[0]));

describe("axis specs", () => {
  it("expands a list, a linear range and a logarithmic range, keeping units", () => {
    expect(parseAxis("body.albedo=0.1,0.3,0.5").levels).toEqual([0.1, 0.3, 0.5]);
    expect(parseAxis("regime=global,dayside").levels).toEqual(["global", "dayside"]);
    expect(parseAxis("orbit.eccentricity=0:0.9:10").levels).toHaveLength(10);
    expect(parseAxis("orbit.eccentricity=0:0.9:10").levels.at(-1)).toBe(0.9);
    const a = parseAxis("orbit.semiMajorAxis=0.5 au..2 au:7");
    expect(a.unit).toBe("au");
    expect(a.levels[0]).toBe("0.5 au");
    expect(a.levels[6]).toBe("2 au");
    expect(a.levels[2]).toBe("1 au");
    const log = parseAxis("body.heatCapacity=1e5..1e9:9 log");
    expect(log.levels[0]).toBe(1e5);
    expect(log.levels[8]).toBe(1e9);
    log.levels.forEach((v, k) => expect(Math.abs(Number(v) / 10 ** (5 + k / 2) - 1)).toBeLessThan(1e-13));
  });
  it("rejects a malformed spec with a one-line reason", () => {
    expect(() => parseAxis("orbit.eccentricity")).toThrowError(/PATH=SPEC/);
    expect(() => parseAxis("orbit.semiMajorAxis=1 au..2 km:3")).toThrowError(/same unit/);
    expect(() => parseAxis("body.heatCapacity=0..1e9:9 log")).toThrowError(/both ends > 0/);
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

describe("calorbit sweep", () => {
  const grid = ["--vary", "orbit.eccentricity=0,0.2,0.4,0.6", "--vary", "body.heatCapacity=1e6..1e9:4 log", "--quiet"];

  it("writes one row per case in id order with inputs, status, metrics and solver work", () => {
    const out = join(dir, "grid.csv");
    const r = sweep(scenario, ...grid, "--out", out);
    expect(r.status).toBe(0);
    const header = readFileSync(out, "utf8").split("\n").find((l) => l.startsWith("case_id"))!;
    expect(header.startsWith("case_id,orbit.eccentricity,body.heatCapacity,status,T_min_K,T_max_K,T_mean_K")).toBe(true);
    expect(header).toContain("evaluations");
    expect(idsOf(out)).toEqual(Array.from({ length: 16 }, (_, i) => i));
    expect(rowsOf(out).every((l) => l.split(",")[3] === "ok")).toBe(true);
  });

  it("gives identical rows with one worker and with two, in case-id order", () => {
    // 300 cases: ten chunks, so both workers take several and finish out of order.
    const many = ["--vary", "orbit.eccentricity=0:0.9:15", "--vary", "body.heatCapacity=1e5..1e9:20 log", "--quiet"];
    const one = join(dir, "w1.csv");
    const two = join(dir, "w2.csv");
    sweep(scenario, ...many, "--workers", "1", "--out", one);
    sweep(scenario, ...many, "--workers", "2", "--out", two);
    expect(rowsOf(one)).toHaveLength(300);
    expect(idsOf(two)).toEqual(Array.from({ length: 300 }, (_, i) => i));
    expect(rowsOf(two)).toEqual(rowsOf(one));
  });

  it("sweeps a conduction column: each row is the column run of that case, with its skin depths and deep temperature", () => {
    const column = join(import.meta.dirname, "..", "scenarios", "sarvek-regolith.yaml");
    const out = join(dir, "column.csv");
    const r = sweep(column, "--vary", "body.albedo=0.11,0.3", "--quiet", "--out", out);
    expect(r.status).toBe(0);
    const header = readFileSync(out, "utf8").split("\n").find((l) => l.startsWith("case_id"))!.split(",");
    const rows = rowsOf(out).map((l) => Object.fromEntries(l.split(",").map((v, i) => [header[i]!, v])));
    expect(rows.map((row) => row.status)).toEqual(["ok", "ok"]);
    const run = spawnSync(process.execPath, [CLI, "run", column, "--json"], { encoding: "utf8" });
    const doc = JSON.parse(run.stdout) as { summary: { temperature: { minK: number; meanK: number }; skinDepths: { diurnalM: number; orbitalM: number }; depthProfile: { meanK: number }[] } };
    // The scenario's own albedo is 0.11: the first row must be that run, number for number.
    expect(Number(rows[0]!.T_min_K)).toBe(doc.summary.temperature.minK);
    expect(Number(rows[0]!.T_mean_K)).toBe(doc.summary.temperature.meanK);
    expect(Number(rows[0]!.skin_depth_diurnal_m)).toBe(doc.summary.skinDepths.diurnalM);
    expect(Number(rows[0]!.skin_depth_orbital_m)).toBe(doc.summary.skinDepths.orbitalM);
    expect(Number(rows[0]!.T_deep_mean_K)).toBe(doc.summary.depthProfile.at(-1)!.meanK);
    expect(rows[0]!.integrator).toBe("crank-nicolson");
    expect(rows[0]!.tau_over_period).toBe("");
    // A brighter surface absorbs less: colder at the surface and at depth.
    expect(Number(rows[1]!.T_mean_K)).toBeLessThan(Number(rows[0]!.T_mean_K));
    expect(Number(rows[1]!.T_deep_mean_K)).toBeLessThan(Number(rows[0]!.T_deep_mean_K));
  });

  it("tells a user whose shell split off a log range's \"log\" to quote it", () => {
    const r = sweep(scenario, "--vary", "body.heatCapacity=1e7..1e9:3", "log", "--quiet");
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toContain('quote a log range, e.g. --vary "body.heatCapacity=1e5..1e9:9 log"');
  });

  it("records a failing case with its reason and carries on", () => {
    const out = join(dir, "fail.csv");
    sweep(scenario, "--vary", "orbit.eccentricity=0.3,1.2,0.5", "--quiet", "--out", out);
    const rows = rowsOf(out);
    expect(rows).toHaveLength(3);
    expect(rows[1]).toMatch(/^1,1.2,"?error: orbit\.eccentricity: given 1\.2; allowed: a number with 0 ≤ e < 1"?,/);
    expect(rows[2]!.split(",")[2]).toBe("ok");
  });

  it("resumes after a crash that tore the last line, ending with every case exactly once", () => {
    const whole = join(dir, "whole.csv");
    const torn = join(dir, "torn.csv");
    sweep(scenario, ...grid, "--out", whole);
    sweep(scenario, ...grid, "--out", torn);
    const text = readFileSync(torn, "utf8");
    const cut = text.indexOf("\n", text.indexOf("\n7,")) - 20; // in the middle of case 7's row
    truncateSync(torn, Buffer.byteLength(text.slice(0, cut)));
    const r = sweep(scenario, ...grid, "--out", torn);
    expect(r.status).toBe(0);
    expect(idsOf(torn)).toEqual(Array.from({ length: 16 }, (_, i) => i));
    expect(readFileSync(torn, "utf8")).toBe(readFileSync(whole, "utf8"));
  });

  it("resumes after SIGKILL at an arbitrary moment", async () => {
    const out = join(dir, "killed.jsonl");
    const args = ["--vary", "orbit.eccentricity=0:0.8:40", "--vary", "body.albedo=0:0.6:10", "--format", "jsonl", "--workers", "2", "--quiet", "--out", out];
    const child = spawn(process.execPath, [CLI, "sweep", scenario, ...args], { detached: true, stdio: "ignore" });
    // Kill the whole process group (as a scheduler would) once some rows have landed.
    for (let i = 0; i < 400; i++) {
      await new Promise((r) => setTimeout(r, 25));
      try {
        if (statSync(out).size > 20_000) break;
      } catch {
        /* not created yet */
      }
    }
    process.kill(-child.pid!, "SIGKILL");
    await new Promise((r) => setTimeout(r, 200));
    const before = readFileSync(out, "utf8").split("\n").filter((l) => l.startsWith("{")).length;
    expect(before).toBeLessThan(400);
    expect(sweep(scenario, ...args).status).toBe(0);
    const ids = readFileSync(out, "utf8").split("\n").filter((l) => l.startsWith("{")).map((l) => JSON.parse(l).case_id);
    expect(ids).toEqual(Array.from({ length: 400 }, (_, i) => i));
  }, 60_000);

  it("refuses to resume a file written by a different sweep", () => {
    const out = join(dir, "other.csv");
    sweep(scenario, ...grid, "--out", out);
    const r = sweep(scenario, "--vary", "orbit.eccentricity=0,0.5", "--quiet", "--out", out);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^calorbit: .*other\.csv: refusing to resume: it was written by a different sweep definition or shard/m);
  });

  it("runs shards that merge into the whole sweep, and reports missing cases", () => {
    const whole = join(dir, "m-whole.csv");
    sweep(scenario, ...grid, "--out", whole);
    const parts = [1, 2, 3].map((i) => join(dir, `m-part-${i}.csv`));
    parts.forEach((p, i) => expect(sweep(scenario, ...grid, "--shard", `${i + 1}/3`, "--out", p).status).toBe(0));
    expect(idsOf(parts[1]!)).toEqual([1, 4, 7, 10, 13]);
    const merged = join(dir, "m-merged.csv");
    const r = sweep("merge", ...parts, "--out", merged);
    expect(r.status).toBe(0);
    expect(rowsOf(merged)).toEqual(rowsOf(whole));
    const missing = sweep("merge", parts[0]!, parts[2]!, "--out", join(dir, "m-bad.csv"));
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/5 missing \(case ids 1, 4, 7, 10, 13\); nothing written/);
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
