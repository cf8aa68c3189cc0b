// Makes the fit demo's SYNTHETIC "measured" series, scenarios/tessaly-night.csv: the night-time
// cooling of a surface point of Tessaly d (an invented body, scenarios/tessaly-night.yaml) computed by
// calorbit itself with known "true" values, sampled on an observer's clock that starts at an
// arbitrary time, plus seeded Gaussian noise. Run after `npm run build`:
//   node scripts/make-fit-demo.mjs
// The true values are written into the file's header, so the README's worked example can be checked.
import { readFileSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { parseScenarioText } from "../dist/src/scenario/text.js";
import { resolveScenario } from "../dist/src/scenario/resolve.js";
import { simulate } from "../dist/src/run/simulate.js";
import { ForwardModel } from "../dist/src/fit/forward.js";
import { parseFreeParameter } from "../dist/src/fit/parameters.js";
import { mulberry32 } from "../dist/src/fit/leastSquares.js";

const here = (p) => fileURLToPath(new URL(p, import.meta.url));
const scenarioFile = here("../scenarios/tessaly-night.yaml");
const outFile = here("../scenarios/tessaly-night.csv");
const scenario = parseScenarioText(readFileSync(scenarioFile, "utf8"), "yaml", scenarioFile);

const TRUE = { heatCapacityMJ: 0.035, albedo: 0.14 };
const POINTS = 72;
const SIGMA_K = 1.5;
const SEED = 20260;
const HOUR = 3600;

// Where the night is on the model's clock: the first sample after sunset at the true values.
const truthDoc = structuredClone(scenario);
truthDoc.body.heatCapacity = `${TRUE.heatCapacityMJ} MJ/m2/K`;
truthDoc.body.albedo = TRUE.albedo;
const sim = simulate(resolveScenario(truthDoc).thermal, { samples: 4000 });
const s = sim.series;
let sunset = -1;
for (let j = 1; j < s.timeSeconds.length; j++) if (s.absorbedWPerM2[j - 1] > 0 && s.absorbedWPerM2[j] === 0) sunset = s.timeSeconds[j];
let sunrise = -1;
for (let j = 1; j < s.timeSeconds.length; j++) if (s.absorbedWPerM2[j - 1] === 0 && s.absorbedWPerM2[j] > 0 && s.timeSeconds[j] > sunset) sunrise = s.timeSeconds[j];
if (sunrise < 0) sunrise = s.timeSeconds.at(-1) + s.timeSeconds.findIndex((_, j) => s.absorbedWPerM2[j] > 0) * (s.timeSeconds[1] - s.timeSeconds[0]);
// The observer's clock starts 6 h before sunset (they do not know the model's clock: the fit's timeOffset finds it).
const offsetSeconds = sunset - 6 * HOUR;
const spanSeconds = sunrise - 12 * HOUR - offsetSeconds;
const cycle = 1e9; // bounds wide enough not to matter here
const parameters = ["body.heatCapacity=0.001 MJ/m2/K..1 MJ/m2/K", "body.albedo=0..0.9", "timeOffset=0..1000 d"].map((a) => parseFreeParameter(a, cycle));
const times = Float64Array.from({ length: POINTS }, (_, i) => (i * spanSeconds) / (POINTS - 1));
const observations = { timeSeconds: times, value: new Float64Array(POINTS), sigma: null, quantity: "temperature", columns: { time: "time_h", value: "temperature_K", sigma: null }, timeUnit: "h", lines: new Int32Array(POINTS) };
const forward = new ForwardModel({ scenario, parameters, output: { spec: "surface", kind: "surface", quantity: "temperature" }, relativeTolerance: 1e-9, samples: 20000 }, observations);
const clean = forward.predict([TRUE.heatCapacityMJ, TRUE.albedo, offsetSeconds / 86400]);

const rng = mulberry32(SEED);
const gauss = () => Math.sqrt(-2 * Math.log(rng() || 1e-300)) * Math.cos(2 * Math.PI * rng());
const lines = [
  "# SYNTHETIC DATA: not a measurement. Made by scripts/make-fit-demo.mjs from calorbit's own model of",
  "# Tessaly d, an invented airless body (scenarios/tessaly-night.yaml), with seeded Gaussian noise.",
  `# True values: body.heatCapacity = ${TRUE.heatCapacityMJ} MJ/m2/K, body.albedo = ${TRUE.albedo}, timeOffset = ${(offsetSeconds / HOUR).toFixed(4)} h`,
  `# (the model's time of this file's time 0); noise sigma = ${SIGMA_K} K, seed ${SEED}.`,
  "time_h,temperature_K,sigma_K",
];
for (let i = 0; i < POINTS; i++) lines.push(`${(times[i] / HOUR).toFixed(3)},${(clean[i] + SIGMA_K * gauss()).toFixed(2)},${SIGMA_K}`);
writeFileSync(outFile, lines.join("\n") + "\n");
console.log(`wrote ${outFile}: ${POINTS} points over ${(spanSeconds / HOUR).toFixed(1)} h; true timeOffset ${(offsetSeconds / HOUR).toFixed(3)} h`);
