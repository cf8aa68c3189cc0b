/**
 * The sweep file formats compared (for bench.ts): the same 100,000-case lumped sweep (the one in
 * sweepRun.ts) written as CSV and as Parquet, each timed from start to closed file, with the file sizes.
 * Prints {cases, csvSeconds, parquetSeconds, csvBytes, parquetBytes, timeRatio, sizeRatio}; the issue's
 * targets are timeRatio <= 1.2 and sizeRatio <= 1/3. Run: node dist/bench/sweepFormats.js [cases] [workers]
 */
import { mkdtempSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runSweep } from "../src/cli/sweep.js";
import type { SweepFormat } from "../src/sweep/runCase.js";
import { parseAxis } from "../src/sweep/spec.js";

const cases = Number(process.argv[2] ?? 100_000);
const workers = Number(process.argv[3] ?? 2);
const albedoLevels = cases / 10_000;
const scenario = {
  name: "benchmark world",
  star: { luminosity: "1 Lsun", mass: "1 Msun" },
  orbit: { semiMajorAxis: "1 au", eccentricity: 0.1 },
  body: { albedo: 0.3, emissivity: 0.95, heatCapacity: 1e8 },
  thresholds: ["273.15 K", "373.15 K"],
};
const axes = [parseAxis("orbit.eccentricity=0:0.9:100"), parseAxis("body.heatCapacity=1e6..1e10:100 log")];
if (albedoLevels > 1) axes.push(parseAxis(`body.albedo=0:0.6:${albedoLevels}`));
const dir = mkdtempSync(join(tmpdir(), "calorbit-bench-formats-"));

async function timed(format: SweepFormat): Promise<{ seconds: number; bytes: number }> {
  const out = join(dir, `sweep.${format}`);
  // A fresh file each round: an existing complete file would be resumed, and time nothing.
  rmSync(out, { force: true });
  const started = performance.now();
  await runSweep({ definition: { scenario, design: { axes }, relativeTolerance: 1e-8, format }, shard: { index: 1, count: 1 }, out, workers, quiet: true });
  return { seconds: (performance.now() - started) / 1000, bytes: statSync(out).size };
}

// Alternate the two, twice each, and keep each one's fastest: the machine's speed drifts.
const csv: { seconds: number; bytes: number }[] = [];
const parquet: { seconds: number; bytes: number }[] = [];
for (let round = 0; round < 2; round++) {
  csv.push(await timed("csv"));
  parquet.push(await timed("parquet"));
}
rmSync(dir, { recursive: true, force: true });
const best = (runs: { seconds: number }[]) => Math.min(...runs.map((r) => r.seconds));
console.log(
  JSON.stringify({
    cases,
    workers,
    csvSeconds: best(csv),
    parquetSeconds: best(parquet),
    csvBytes: csv[0]!.bytes,
    parquetBytes: parquet[0]!.bytes,
    timeRatio: best(parquet) / best(csv),
    sizeRatio: parquet[0]!.bytes / csv[0]!.bytes,
  }),
);
