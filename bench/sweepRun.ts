/**
 * One benchmark sweep in its own process (spawned by bench.ts): runs a lumped sweep of the given
 * size with the given workers into a temporary file, then reads the file back and checks it:
 * rows and statuses counted, every row's equilibrium range against its closed form and every
 * row's temperatures inside it. Prints {cases, workers, seconds, cpuSeconds, maxRssMiB, rows, statuses,
 * worstEquilibriumError, outsideEquilibrium}; time and memory are taken before the file is read.
 */
import { createReadStream, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createInterface } from "node:readline";
import { runSweep } from "../src/cli/sweep.js";
import { parseAxis } from "../src/sweep/spec.js";
import { ASTRONOMICAL_UNIT_M, SOLAR_LUMINOSITY_W, STEFAN_BOLTZMANN } from "../src/constants.js";

const [casesText, workersText] = process.argv.slice(2);
const cases = Number(casesText);
const workers = Number(workersText);
const albedoLevels = cases / 10_000;
const EMISSIVITY = 0.95;
const scenario = {
  name: "benchmark world",
  star: { luminosity: "1 Lsun", mass: "1 Msun" },
  orbit: { semiMajorAxis: "1 au", eccentricity: 0.1 },
  body: { albedo: 0.3, emissivity: EMISSIVITY, heatCapacity: 1e8 },
  thresholds: ["273.15 K", "373.15 K"],
};
const axes = [parseAxis("orbit.eccentricity=0:0.9:100"), parseAxis("body.heatCapacity=1e6..1e10:100 log")];
if (albedoLevels > 1) axes.push(parseAxis(`body.albedo=0:0.6:${albedoLevels}`));
const dir = mkdtempSync(join(tmpdir(), "calorbit-bench-"));
const out = join(dir, "sweep.csv");
const started = performance.now();
const cpuBefore = process.cpuUsage();
await runSweep({
  definition: { scenario, design: { axes }, relativeTolerance: 1e-8, format: "csv" },
  shard: { index: 1, count: 1 },
  out,
  workers,
  quiet: true,
});
const seconds = (performance.now() - started) / 1000;
// CPU of every thread (main, workers, the compiler's): what the sweep costs whatever else loads the machine.
const cpuUsed = process.cpuUsage(cpuBefore);
const cpuSeconds = (cpuUsed.user + cpuUsed.system) / 1e6;
const maxRssMiB = process.resourceUsage().maxRSS / 1024;

/** Equilibrium temperature of a global slab at distance a(1 ∓ e) (closed form, common practice), K. */
function equilibriumAt(distanceFactor: number, albedo: number): number {
  const r = ASTRONOMICAL_UNIT_M * distanceFactor;
  return Math.sqrt(Math.sqrt((0.25 * (1 - albedo) * SOLAR_LUMINOSITY_W) / (4 * Math.PI * r * r) / (EMISSIVITY * STEFAN_BOLTZMANN)));
}

let header: string[] | null = null;
let rows = 0;
const statuses: Record<string, number> = {};
let worstEquilibriumError = 0;
let outsideEquilibrium = 0;
const column = (pattern: RegExp): number => {
  const index = header!.findIndex((name) => pattern.test(name));
  if (index < 0) throw new Error(`sweep output: no column matching ${pattern} in ${header!.join(",")}`);
  return index;
};
let at = { e: 0, albedo: -1, status: 0, tMin: 0, tMax: 0, eqMin: 0, eqMax: 0 };
for await (const line of createInterface({ input: createReadStream(out, "utf8"), crlfDelay: Infinity })) {
  if (line === "" || line.startsWith("#")) continue;
  const fields = line.split(",");
  if (!header) {
    header = fields;
    at = {
      e: column(/^orbit\.eccentricity/),
      albedo: header.findIndex((name) => /^body\.albedo/.test(name)),
      status: column(/^status$/),
      tMin: column(/^(T|temperature)_min_K$/),
      tMax: column(/^(T|temperature)_max_K$/),
      eqMin: column(/^(Teq|equilibrium)_min_K$/),
      eqMax: column(/^(Teq|equilibrium)_max_K$/),
    };
    continue;
  }
  rows++;
  const status = fields[at.status]!;
  statuses[status] = (statuses[status] ?? 0) + 1;
  if (status !== "ok") continue;
  const e = Number(fields[at.e]);
  const albedo = at.albedo >= 0 ? Number(fields[at.albedo]) : 0.3;
  const eqMin = equilibriumAt(1 + e, albedo);
  const eqMax = equilibriumAt(1 - e, albedo);
  worstEquilibriumError = Math.max(
    worstEquilibriumError,
    Math.abs(Number(fields[at.eqMin]) / eqMin - 1),
    Math.abs(Number(fields[at.eqMax]) / eqMax - 1),
  );
  // A periodic temperature lies strictly inside the equilibrium range (1e-9 for the row's rounding).
  if (Number(fields[at.tMin]) < eqMin * (1 - 1e-9) || Number(fields[at.tMax]) > eqMax * (1 + 1e-9)) outsideEquilibrium++;
}
rmSync(dir, { recursive: true, force: true });
console.log(JSON.stringify({ cases, workers, seconds, cpuSeconds, maxRssMiB, rows, statuses, worstEquilibriumError, outsideEquilibrium }));
