/**
 * The zonal climate's speed figures, for `npm run bench` (call `climateBenchLines()`; bench/bench.ts
 * belongs to the speed work): a 90-band Earth-like case with ice–albedo feedback, a grey greenhouse
 * and a freezing ocean to its periodic state from a warm start (target < 0.5 s on one core), and a
 * 1,000-case sweep of it over eccentricity × obliquity with 2 workers (target < 5 min).
 * Run on its own: `node dist/bench/climate.js`.
 */
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { ASTRONOMICAL_UNIT_M, SOLAR_LUMINOSITY_W } from "../src/constants.js";
import { spiegelSurface } from "../src/physics/climateHeatCapacity.js";
import { simulateZonal, type ZonalCase } from "../src/run/zonal.js";

const YEAR_S = 3.15576e7;

export const CLIMATE_BENCH_CASE: ZonalCase = {
  luminosityW: SOLAR_LUMINOSITY_W,
  orbit: { semiMajorAxisM: ASTRONOMICAL_UNIT_M, eccentricity: 0.0167, periodSeconds: YEAR_S, meanAnomalyAtStartRad: 0 },
  obliquityRad: (23.44 * Math.PI) / 180,
  equinoxTrueAnomalyRad: 0,
  internalFluxWPerM2: 0,
  climate: {
    bands: 90,
    diffusionWPerM2K: 0.5394,
    outgoing: { law: "grey" },
    albedo: { law: "smooth" },
    heatCapacity: spiegelSurface(0.7),
    start: "warm",
    stepsPerOrbit: 360,
  },
};

/** CPU milliseconds of `run` (user + system of this process), the fastest of `repeats` after one warm-up. */
function fastestCpuMs(run: () => void, repeats: number): number {
  run();
  let best = Infinity;
  for (let i = 0; i < repeats; i++) {
    const before = process.cpuUsage();
    run();
    const used = process.cpuUsage(before);
    best = Math.min(best, (used.user + used.system) / 1000);
  }
  return best;
}

export function climateBenchLines(): string[] {
  const lines: string[] = [];
  let ice = 0;
  const ms = fastestCpuMs(() => {
    ice = simulateZonal(CLIMATE_BENCH_CASE).climates[0]!.summary.iceEdge?.meanDeg ?? 90;
  }, 5);
  lines.push(`zonal climate: ${ms.toFixed(0)} ms CPU to the periodic state (90 bands, smooth ice, grey, freezing ocean, warm start; ice edge ${ice.toFixed(1)} deg; target < 500 ms)`);
  const bothMs = fastestCpuMs(() => void simulateZonal({ ...CLIMATE_BENCH_CASE, climate: { ...CLIMATE_BENCH_CASE.climate, start: "both" } }), 3);
  lines.push(`zonal climate, warm and cold starts: ${bothMs.toFixed(0)} ms CPU`);
  const script = fileURLToPath(new URL("./climateSweep.js", import.meta.url));
  const sweep = spawnSync(process.execPath, [script], { encoding: "utf8" });
  if (sweep.status === 0) {
    const r = JSON.parse(sweep.stdout.trim().split("\n").at(-1)!) as { cases: number; workers: number; seconds: number; failed: number };
    lines.push(`zonal sweep: ${r.cases} cases over eccentricity x obliquity in ${r.seconds.toFixed(1)} s with ${r.workers} workers (${r.failed} failed; target < 300 s)`);
  } else {
    lines.push(`zonal sweep: failed (${sweep.stderr.trim().split("\n").at(-1) ?? "no message"})`);
  }
  return lines;
}

if (process.argv[1] === fileURLToPath(import.meta.url)) for (const line of climateBenchLines()) console.log(line);
