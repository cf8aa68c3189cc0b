/**
 * Parquet sweep files read back with hyparquet (an independent reader; pandas/pyarrow are not on this
 * machine): every column and the key–value metadata round-trip, and a file resumes by row groups.
 */
import { mkdtempSync, readFileSync, statSync, truncateSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { brotliDecompressSync } from "node:zlib";
import { parquetMetadata, parquetReadObjects } from "hyparquet";
import { beforeAll, describe, expect, it } from "vitest";
import { runSweep } from "../dist/src/cli/sweep.js";
import { readParquetSweep } from "../dist/src/cli/sweepParquet.js";
import { parseSweepText, sweepTableFromRecords } from "../src/view/sweepData.js";
import { parseShard } from "../dist/src/sweep/design.js";
import { parseAxis } from "../dist/src/sweep/spec.js";
import { VERSION } from "../src/version.js";
import { calorbit } from "./sweepCli.js";

let dir: string;
let scenario: string;
const BASE = {
  name: "Orvane c",
  star: { luminosity: "0.7 Lsun", mass: "0.8 Msun" },
  orbit: { semiMajorAxis: "0.8 au", eccentricity: 0.25 },
  body: { albedo: 0.2, emissivity: 0.9, heatCapacity: "3e7 J/m2/K" },
  thresholds: ["250 K", "300 K"],
};
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "calorbit-parquet-"));
  scenario = join(dir, "orvane.json");
  writeFileSync(scenario, JSON.stringify(BASE));
});

/** Brotli as Parquet's BROTLI codec stores it (RFC 7932), for hyparquet. */
const compressors = { BROTLI: (input: Uint8Array) => new Uint8Array(brotliDecompressSync(input)) };
const fileBuffer = (path: string): ArrayBuffer => {
  const b = readFileSync(path);
  return b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer;
};
const readRows = async (path: string) => (await parquetReadObjects({ file: fileBuffer(path), compressors })) as Record<string, unknown>[];

/** CSV rows as records, by the header (the CSV writer's numbers are shortest round-trip decimals). */
function csvRecords(path: string): Record<string, string>[] {
  const lines = readFileSync(path, "utf8").split("\n").filter((l) => l !== "" && !l.startsWith("#"));
  const header = lines[0]!.split(",");
  return lines.slice(1).map((l) => {
    const cells: string[] = [];
    let field = "";
    let quoted = false;
    for (let i = 0; i < l.length; i++) {
      const ch = l[i]!;
      if (quoted) {
        if (ch === '"' && l[i + 1] === '"') (field += '"'), i++;
        else if (ch === '"') quoted = false;
        else field += ch;
      } else if (ch === '"') quoted = true;
      else if (ch === ",") cells.push(field), (field = "");
      else field += ch;
    }
    cells.push(field);
    return Object.fromEntries(header.map((h, i) => [h, cells[i]!]));
  });
}

// Each axis valid with the others' first levels, but the window [280 K, 260 K] is upside down: 8 cases fail.
const definitionArgs = () => [scenario, "--vary", "orbit.eccentricity=0:0.6:4", "--vary", "regime=global,dayside", "--vary", "thresholds.0=200 K,280 K", "--vary", "thresholds.1=350 K,260 K", "--quiet"];

describe("--format parquet", () => {
  it("round-trips every column and the key–value metadata (read back with hyparquet)", async () => {
    const csv = join(dir, "grid.csv");
    const pq = join(dir, "grid.parquet");
    expect((await calorbit(["sweep", ...definitionArgs(), "--workers", "1", "--out", csv])).status).toBe(0);
    const r = await calorbit(["sweep", ...definitionArgs(), "--workers", "1", "--format", "parquet", "--out", pq]);
    expect(r.status).toBe(0);
    expect(r.stderr).toMatch(/^calorbit: 8 of 32 cases failed/m);

    const metadata = parquetMetadata(fileBuffer(pq));
    const kv = Object.fromEntries((metadata.key_value_metadata ?? []).map((e) => [e.key, e.value]));
    expect(kv["calorbit.version"]).toBe(VERSION);
    expect(kv["calorbit.shard"]).toBe("1/1");
    const csvDefinition = JSON.parse(readFileSync(csv, "utf8").split("\n")[1]!.slice("# definition: ".length)) as Record<string, unknown>;
    expect(JSON.parse(kv["calorbit.definition"]!)).toEqual({ ...csvDefinition, format: "parquet" });
    expect(Number(metadata.num_rows)).toBe(32);

    const expected = csvRecords(csv);
    const rows = await readRows(pq);
    expect(rows).toHaveLength(32);
    const columns = Object.keys(expected[0]!);
    expect(metadata.schema.slice(1).map((e) => e.name)).toEqual(columns);
    const types = Object.fromEntries(metadata.schema.slice(1).map((e) => [e.name!, e.type]));
    expect([types.case_id, types["orbit.eccentricity"], types.regime, types["thresholds.0_K"], types.status, types.temperature_min_K, types.iterations, types.integrator]).toEqual([
      "INT64", "DOUBLE", "BYTE_ARRAY", "DOUBLE", "BYTE_ARRAY", "DOUBLE", "INT32", "BYTE_ARRAY",
    ]);
    rows.forEach((row, i) => {
      for (const name of columns) {
        const text = expected[i]![name]!;
        const value = row[name];
        if (text === "") expect(value, `${name} of case ${i}`).toBeNull();
        else if (typeof value === "bigint" || typeof value === "number") expect(Number(value), `${name} of case ${i}`).toBe(Number(text));
        else expect(value, `${name} of case ${i}`).toBe(text);
      }
    });
  });

  it("resumes by row groups: a file cut anywhere (even inside a row group or its footer) ends with every case once", async () => {
    const definition = {
      scenario: structuredClone(BASE) as Record<string, unknown>,
      design: { axes: [parseAxis("orbit.eccentricity=0:0.6:5"), parseAxis("body.albedo=0.1,0.3,0.5")] },
      relativeTolerance: 1e-8,
      format: "parquet" as const,
    };
    const run = (out: string) => runSweep({ definition, shard: parseShard("1/1"), workers: 1, quiet: true, out, rowGroupRows: 4 });
    const whole = join(dir, "whole.parquet");
    await run(whole);
    const reference = await readRows(whole);
    expect(reference.map((r) => Number(r.case_id))).toEqual(Array.from({ length: 15 }, (_, i) => i));
    expect(parquetMetadata(fileBuffer(whole)).row_groups.map((g) => Number(g.num_rows))).toEqual([4, 4, 4, 3]);

    // Every committed footer ends with "PAR1"; cut just past one, and halfway into the bytes after it.
    const bytes = readFileSync(whole);
    const footerEnds: number[] = [];
    for (let i = 4; i + 4 <= bytes.length; i++) if (bytes.subarray(i, i + 4).toString("latin1") === "PAR1") footerEnds.push(i + 4);
    expect(footerEnds.length).toBeGreaterThanOrEqual(5); // an empty file's footer, then one per row group
    for (const [k, cut] of [footerEnds[2]!, Math.floor((footerEnds[2]! + footerEnds[3]!) / 2), footerEnds.at(-1)! - 3].entries()) {
      const torn = join(dir, `torn-${k}.parquet`);
      writeFileSync(torn, bytes.subarray(0, cut));
      const result = await run(torn);
      expect(result.skipped).toBeGreaterThan(0);
      expect(result.skipped + result.written).toBe(15);
      expect(await readRows(torn)).toEqual(reference);
    }
    // A file of another definition is refused, not appended to.
    const other = join(dir, "other.parquet");
    writeFileSync(other, bytes);
    const r = await calorbit(["sweep", scenario, "--vary", "orbit.eccentricity=0,0.1", "--format", "parquet", "--quiet", "--out", other]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/refusing to resume: it was written by a different sweep definition or shard/);
    expect(statSync(other).size).toBe(bytes.length);
    truncateSync(other, 0);
  });

  it("merges Parquet shards (--shard auto, Kubernetes numbering) into the serial file's rows, and the viewer reads it as it reads the CSV", async () => {
    const args = definitionArgs();
    const serial = join(dir, "serial.parquet");
    expect((await calorbit(["sweep", ...args, "--format", "parquet", "--out", serial])).status).toBe(0);
    const parts = [0, 1, 2].map((i) => join(dir, `part-${i}.parquet`));
    for (const [i, p] of parts.entries()) {
      expect((await calorbit(["sweep", ...args, "--format", "parquet", "--shard", "auto", "--shards", "3", "--out", p], { JOB_COMPLETION_INDEX: String(i) })).status).toBe(0);
    }
    const merged = join(dir, "merged.parquet");
    const r = await calorbit(["sweep", "merge", ...parts, "--out", merged]);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain("merged 3 shard files: 32 cases, each once");
    expect(await readRows(merged)).toEqual(await readRows(serial));
    const kv = Object.fromEntries((parquetMetadata(fileBuffer(merged)).key_value_metadata ?? []).map((e) => [e.key, e.value]));
    expect(kv["calorbit.shard"]).toBe("merged from 3 of 3 shards");
    const missing = await calorbit(["sweep", "merge", parts[0]!, parts[2]!, "--out", join(dir, "bad.parquet")]);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/cases missing \(case ids 1, 4, 7, 10, 13, 16, 19, 22, 25, 28, 31\); nothing written/);

    const csv = join(dir, "grid.csv"); // written by the first test
    const { header, records } = await readParquetSweep(merged);
    expect(sweepTableFromRecords(header, records)).toEqual(parseSweepText(readFileSync(csv, "utf8")));
  });
});
