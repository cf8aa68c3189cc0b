import { mkdtempSync, readFileSync, truncateSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { VERSION } from "../src/version.js";
import { calorbit } from "./sweepCli.js";

let dir: string;
let scenario: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "calorbit-sweep-formats-"));
  scenario = join(dir, "base.yaml");
  writeFileSync(
    scenario,
    `name: format base
star: { luminosity: 0.8 Lsun, mass: 0.9 Msun }
orbit: { semiMajorAxis: 0.9 au, eccentricity: 0.2 }
body: { albedo: 0.3, emissivity: 0.95, heatCapacity: 1e7 J/m2/K }
`,
  );
});

const grid = ["--vary", "orbit.eccentricity=0,0.3,0.6", "--vary", "regime=global,dayside", "--vary", "body.albedo=0.1,0.4", "--quiet"];
const sweep = (...args: string[]) => calorbit(["sweep", ...args]);
const lines = (path: string) => readFileSync(path, "utf8").split("\n").slice(0, -1);

describe("--format jsonl", () => {
  it("writes JSON Lines: every line one JSON value (RFC 8259 via JSON.parse, line by line), the first the definition under a marker", async () => {
    const out = join(dir, "a.jsonl");
    expect((await sweep(scenario, ...grid, "--format", "jsonl", "--out", out)).status).toBe(0);
    expect(readFileSync(out, "utf8").endsWith("\n")).toBe(true);
    const records = lines(out).map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(records).toHaveLength(13);
    const meta = records[0]!.calorbitSweep as { version: string; definition: { axes: { path: string }[]; format: string }; shard: string };
    expect(Object.keys(records[0]!)).toEqual(["calorbitSweep"]);
    expect(meta.version).toBe(VERSION);
    expect(meta.definition.axes.map((a) => a.path)).toEqual(["orbit.eccentricity", "regime", "body.albedo"]);
    expect(meta.definition.format).toBe("jsonl");
    expect(meta.shard).toBe("1/1");
    const rows = records.slice(1);
    expect(rows.map((r) => r.case_id)).toEqual(Array.from({ length: 12 }, (_, i) => i));
    expect(rows[7]).toMatchObject({ case_id: 7, "orbit.eccentricity": 0.3, regime: "dayside", "body.albedo": 0.4, status: "ok", integrator: expect.any(String) });
    for (const r of rows) expect(typeof r.temperature_mean_K).toBe("number");
  });

  it("resumes a torn JSON Lines file and merges JSON Lines shards into the serial run's lines", async () => {
    const whole = join(dir, "whole.jsonl");
    await sweep(scenario, ...grid, "--format", "jsonl", "--out", whole);
    const torn = join(dir, "torn.jsonl");
    await sweep(scenario, ...grid, "--format", "jsonl", "--out", torn);
    const text = readFileSync(torn, "utf8");
    truncateSync(torn, Buffer.byteLength(text.slice(0, text.indexOf('{"case_id":6,') + 30)));
    expect((await sweep(scenario, ...grid, "--format", "jsonl", "--out", torn)).status).toBe(0);
    expect(readFileSync(torn, "utf8")).toBe(readFileSync(whole, "utf8"));

    const parts = [1, 2].map((i) => join(dir, `part-${i}.jsonl`));
    for (const [i, p] of parts.entries()) await sweep(scenario, ...grid, "--format", "jsonl", "--shard", `${i + 1}/2`, "--out", p);
    const merged = join(dir, "merged.jsonl");
    expect((await sweep("merge", ...parts, "--out", merged)).status).toBe(0);
    const m = lines(merged);
    expect(m.slice(1)).toEqual(lines(whole).slice(1));
    expect((JSON.parse(m[0]!) as { calorbitSweep: { shard: string } }).calorbitSweep.shard).toBe("merged from 2 of 2 shards");
  });
});
