/**
 * The zonal benchmark sweep in its own process (spawned by bench/climate.ts): 1,000 cases of the
 * Earth-like 90-band climate over eccentricity (0–0.6, 40 levels) × obliquity (0–90°, 25 levels),
 * 2 workers; prints {cases, workers, seconds, failed}.
 */
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runSweep } from "../src/cli/sweep.js";
import { parseAxis } from "../src/sweep/spec.js";

const scenario = {
  name: "zonal benchmark world",
  star: { luminosity: "1 Lsun", mass: "1 Msun" },
  orbit: { semiMajorAxis: "1 au", eccentricity: 0.0167 },
  body: { albedo: 0.3, emissivity: 1 },
  spin: { obliquity: "23.44 deg" },
  regime: "zonal",
  climate: { bands: 90, diffusion: "0.5394 W/m2/K", outgoing: { law: "grey" }, albedo: { law: "smooth" }, heatCapacity: { oceanFraction: 0.7 }, start: "warm" },
};
const axes = [parseAxis("orbit.eccentricity=0:0.6:40"), parseAxis("spin.obliquity=0:1.5707963:25")];
const dir = mkdtempSync(join(tmpdir(), "calorbit-climate-bench-"));
const out = join(dir, "sweep.csv");
const started = performance.now();
await runSweep({ definition: { scenario, design: { axes }, relativeTolerance: 1e-8, format: "csv" }, shard: { index: 1, count: 1 }, out, workers: 2, quiet: true });
const seconds = (performance.now() - started) / 1000;
const rows = readFileSync(out, "utf8").split("\n").filter((l) => l !== "" && !l.startsWith("#")).slice(1);
const failed = rows.filter((l) => l.includes(",error")).length;
rmSync(dir, { recursive: true, force: true });
console.log(JSON.stringify({ cases: rows.length, workers: 2, seconds, failed }));
