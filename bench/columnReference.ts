/**
 * The stored reference of the benchmark's conduction column: calorbit's column solver on the same
 * 60-layer grid with 8× the default time steps per solar day, at tolerance 1e-7. (Until the scheme
 * took k(T) at the step's midpoint it was first order in k, and the 4× reference it stored then sat
 * 2.3e-4 from the converged deepest-layer mean, which runs at 1×, 2×, 4× and 8× the steps showed.) Not
 * independent of calorbit's column code: it pins the answer of the default run to its converged
 * value, so a faster column that loses accuracy fails the benchmark.
 *
 * `npm run build && node dist/bench/columnReference.js` adds it to bench/references.json.
 */
import { simulate } from "../src/run/simulate.js";
import { execSync } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { columnCase, columnSpec } from "./columnCase.js";

const STEPS_FACTOR = 8;
const started = Date.now();
const result = simulate({ ...columnCase(), column: columnSpec(STEPS_FACTOR) }, { relativeTolerance: 1e-7, samples: 0 });
const path = fileURLToPath(new URL("../../bench/references.json", import.meta.url));
const document = JSON.parse(readFileSync(path, "utf8"));
const deepest = result.summary.depthProfile!.at(-1)!;
document.column = {
  provenance: {
    generator: "bench/columnReference.ts (npm run build && node dist/bench/columnReference.js)",
    method: `calorbit's column solver, same grid, ${STEPS_FACTOR}x the default steps per solar day (${result.solver.stepsPerCycle} per cycle), tolerance 1e-7`,
    commit: execSync("git rev-parse --short HEAD", { encoding: "utf8" }).trim(),
    generatedAt: new Date().toISOString(),
    seconds: (Date.now() - started) / 1000,
  },
  layers: result.solver.layers,
  meanK: result.summary.temperature.meanK,
  minK: result.summary.temperature.minK,
  maxK: result.summary.temperature.maxK,
  deepestMeanK: deepest.meanK,
};
writeFileSync(path, JSON.stringify(document, null, 2) + "\n");
console.error(JSON.stringify(document.column));
