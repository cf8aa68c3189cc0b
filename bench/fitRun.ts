/**
 * The fit benchmarks, for bench/bench.ts to call (`await fitBenchmarks({ quick })` prints its lines and
 * returns them; `node dist/bench/fitRun.js [--quick]` runs them alone):
 *  - a two-parameter fit (heat capacity, albedo) of a lumped slab to 500 points (target < 2 s);
 *  - the posterior of that fit, 32 walkers × 2,000 steps on 2 worker threads, through the CLI as a
 *    user runs it (the time includes the best fit before it; target < 60 s on 2 cores).
 * The data are made by calorbit itself (an invented slab on an eccentric orbit) with seeded noise.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { fitBest } from "../src/fit/bestFit.js";
import { ForwardModel, type ForwardSettings } from "../src/fit/forward.js";
import { mulberry32 } from "../src/fit/leastSquares.js";
import type { Observations } from "../src/fit/observations.js";
import { parseFreeParameter } from "../src/fit/parameters.js";

const DAY = 86400;
const SCENARIO = {
  name: "Fit bench slab (invented)",
  star: { luminosity: "0.8 Lsun" },
  orbit: { semiMajorAxis: "0.15 au", eccentricity: 0.3, period: "20 d" },
  body: { albedo: 0.3, emissivity: 0.95, heatCapacity: "1 MJ/m2/K" },
  regime: "global",
};
const FREE = ["body.heatCapacity=0.2 MJ/m2/K..20 MJ/m2/K", "body.albedo=0..0.6"];
const POINTS = 500;

function syntheticData(): { observations: Observations; csv: string } {
  const parameters = FREE.map((a) => parseFreeParameter(a, 20 * DAY));
  const times = Float64Array.from({ length: POINTS }, (_, i) => (i * 20 * DAY) / POINTS);
  const sigma = new Float64Array(POINTS).fill(1);
  const base: Observations = { timeSeconds: times, value: new Float64Array(POINTS), sigma, quantity: "temperature", columns: { time: "time_s", value: "temperature_K", sigma: "sigma_K" }, timeUnit: "s", lines: new Int32Array(POINTS) };
  const settings: ForwardSettings = { scenario: SCENARIO, parameters, output: { spec: "surface", kind: "surface", quantity: "temperature" }, relativeTolerance: 1e-7, samples: 2000 };
  const clean = new ForwardModel(settings, base).predict([2, 0.2]);
  const rng = mulberry32(42);
  const value = Float64Array.from(clean, (v) => v + Math.sqrt(-2 * Math.log(rng() || 1e-300)) * Math.cos(2 * Math.PI * rng()));
  const csv = ["time_s,temperature_K,sigma_K", ...Array.from(times, (t, i) => `${t},${value[i]},1`)].join("\n") + "\n";
  return { observations: { ...base, value }, csv };
}

/** `quick`: the posterior runs 500 steps against a quarter of the target (15 s). */
export async function fitBenchmarks(options: { quick?: boolean } = {}): Promise<string[]> {
  const steps = options.quick ? 500 : 2000;
  const targetSeconds = options.quick ? 15 : 60;
  const lines: string[] = [];
  const { observations, csv } = syntheticData();
  const parameters = FREE.map((a) => parseFreeParameter(a, 20 * DAY));
  const settings: ForwardSettings = { scenario: SCENARIO, parameters, output: { spec: "surface", kind: "surface", quantity: "temperature" }, relativeTolerance: 1e-7, samples: 2000 };
  const t0 = performance.now();
  const fit = fitBest(new ForwardModel(settings, observations), parameters, { starts: 4 });
  const fitSeconds = (performance.now() - t0) / 1000;
  const ok = (v: number, target: number) => (v < target ? "met" : "MISSED");
  lines.push(`fit: ${fitSeconds.toFixed(2)} s (target < 2 s: ${ok(fitSeconds, 2)}; two-parameter slab fit to ${POINTS} points, ${fit.evaluations} model runs, 4 starts)`);

  const dir = mkdtempSync(join(tmpdir(), "calorbit-fit-bench-"));
  try {
    writeFileSync(join(dir, "slab.json"), JSON.stringify(SCENARIO));
    writeFileSync(join(dir, "data.csv"), csv);
    const cli = fileURLToPath(new URL("../src/cli/main.js", import.meta.url));
    const args = [cli, "fit", join(dir, "slab.json"), "--data", join(dir, "data.csv"), ...FREE.flatMap((f) => ["--free", f]), "--posterior", String(steps), "--walkers", "32", "--workers", "2", "--chain", join(dir, "chain.csv"), "--json", "--quiet"];
    const t1 = performance.now();
    const run = spawnSync(process.execPath, args, { encoding: "utf8" });
    const seconds = (performance.now() - t1) / 1000;
    if (run.status !== 0) throw new Error(`fit posterior bench failed: ${run.stderr}`);
    lines.push(`fit posterior: ${seconds.toFixed(1)} s (target < ${targetSeconds} s: ${ok(seconds, targetSeconds)}; 32 walkers x ${steps} steps of a slab on 2 workers, best fit and Node start-up included)`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  for (const l of lines) console.log(l);
  return lines;
}

// Run directly: node dist/bench/fitRun.js
if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) void fitBenchmarks({ quick: process.argv.includes("--quick") });
