/**
 * One benchmark sweep in its own process (spawned by bench.ts): runs a lumped sweep of the given
 * size with the given workers into a temporary file and prints {cases, seconds, maxRssMiB}.
 */
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runSweep } from "../src/cli/sweep.js";
import { parseAxis } from "../src/sweep/spec.js";

const [casesText, workersText] = process.argv.slice(2);
const cases = Number(casesText);
const workers = Number(workersText);
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
const dir = mkdtempSync(join(tmpdir(), "calorbit-bench-"));
const started = performance.now();
await runSweep({
  definition: { scenario, design: { axes }, relativeTolerance: 1e-8, format: "csv" },
  shard: { index: 1, count: 1 },
  out: join(dir, "sweep.csv"),
  workers,
  quiet: true,
});
const seconds = (performance.now() - started) / 1000;
rmSync(dir, { recursive: true, force: true });
console.log(JSON.stringify({ cases, workers, seconds, maxRssMiB: process.resourceUsage().maxRSS / 1024 }));
