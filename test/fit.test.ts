/**
 * calorbit fit: the least-squares fit and the ensemble sampler against answers known outside the
 * fit code (closed forms, textbook densities, injected truths), and the data reader's refusals.
 */
import { describe, expect, it } from "vitest";
import { STEFAN_BOLTZMANN } from "../src/constants.js";
import { fitBest } from "../src/fit/bestFit.js";
import { ForwardModel, type ForwardSettings } from "../src/fit/forward.js";
import { mulberry32 } from "../src/fit/leastSquares.js";
import { parseObservations, type Observations } from "../src/fit/observations.js";
import { parseFreeParameter } from "../src/fit/parameters.js";
import { autocorrelationTime, runEnsemble } from "../src/fit/ensemble.js";
import { CalorbitError, formatProblem } from "../src/errors.js";
import { resolveScenario } from "../src/scenario/resolve.js";
import * as calorbit from "../src/index.js";

const DAY = 86400;

function gaussian(rng: () => number): number {
  return Math.sqrt(-2 * Math.log(rng() || 1e-300)) * Math.cos(2 * Math.PI * rng());
}

function observationsAt(times: Float64Array, sigma: Float64Array | null): Observations {
  const n = times.length;
  return { timeSeconds: times, value: new Float64Array(n), sigma, quantity: "temperature", columns: { time: "time_s", value: "temperature_K", sigma: sigma ? "sigma_K" : null }, timeUnit: "s", lines: new Int32Array(n) };
}

function problemOf(f: () => unknown): string {
  try {
    f();
  } catch (err) {
    if (err instanceof CalorbitError) return err.problems.map(formatProblem).join(" | ");
    throw err;
  }
  return "no error";
}

describe("observations", () => {
  it("reads CSV with the time unit from the header suffix, comments, sigma", () => {
    const o = parseObservations("# synthetic\ntime_d,temperature_K,sigma_K\n0,100,1\n0.5,90,2\n", { format: "csv", source: "d.csv" });
    expect(Array.from(o.timeSeconds)).toEqual([0, 0.5 * DAY]);
    expect(Array.from(o.value)).toEqual([100, 90]);
    expect(Array.from(o.sigma!)).toEqual([1, 2]);
  });
  it("reads JSON Lines, a bare time column with --time-unit, and degC temperatures", () => {
    const o = parseObservations('{"time": 1, "temperature_degC": 0}\n{"time": 2, "temperature_degC": -10}\n', { format: "jsonl", source: "d.jsonl", timeUnit: "h" });
    expect(Array.from(o.timeSeconds)).toEqual([3600, 7200]);
    expect(o.value[0]).toBeCloseTo(273.15, 12); // 0 °C = 273.15 K (SI definition)
    expect(o.sigma).toBeNull();
  });
  it("refuses bad data with one line naming the file, line and column", () => {
    const csv = (body: string) => () => parseObservations(`time_s,temperature_K\n${body}`, { format: "csv", source: "d.csv" });
    expect(problemOf(csv("0,100\n10,90\n5,80\n"))).toBe("d.csv: line 4 time_s: given 5; allowed: a time after the previous row's (times strictly increasing)");
    expect(problemOf(csv("0,100\n10,\n"))).toBe("d.csv: line 3 temperature_K: given missing; allowed: a finite number");
    expect(problemOf(csv("0,100\n10,NaN\n"))).toBe('d.csv: line 3 temperature_K: given "NaN"; allowed: a finite number');
    expect(problemOf(() => parseObservations("time_s,temperature_F\n0,1\n", { format: "csv", source: "d.csv" }))).toBe('d.csv: temperature_F: given unit "F"; allowed: temperature_K or temperature_degC');
    expect(problemOf(() => parseObservations("time_fortnight,temperature_K\n0,1\n", { format: "csv", source: "d.csv" }))).toMatch(/^d\.csv: time_fortnight: given unit "fortnight"; allowed: a time unit/);
    expect(problemOf(() => parseObservations("time,temperature_K\n0,1\n", { format: "csv", source: "d.csv" }))).toBe("d.csv: time: given no unit; allowed: a unit suffix such as time_s or time_d, or --time-unit");
    expect(problemOf(() => parseObservations("time_s,temperature_K,sigma_K\n0,1,0\n", { format: "csv", source: "d.csv" }))).toBe('d.csv: line 2 sigma_K: given "0"; allowed: a 1σ uncertainty > 0');
  });
  it("refuses fewer points than free parameters", () => {
    const scenario = { name: "t", star: { luminosity: "1 Lsun" }, orbit: { semiMajorAxis: "1 au", eccentricity: 0, period: "365 d" }, body: { albedo: 0.3, heatCapacity: 1e7 } };
    const parameters = ["body.albedo=0..0.9", "body.heatCapacity=1e5..1e9"].map((a) => parseFreeParameter(a, 365 * DAY));
    const obs = observationsAt(Float64Array.of(0, DAY), null);
    const forward = new ForwardModel({ scenario, parameters, output: { spec: "surface", kind: "surface", quantity: "temperature" }, relativeTolerance: 1e-6, samples: 100 }, obs);
    expect(problemOf(() => fitBest(forward, parameters))).toBe("data: given 2 points for 2 free parameters; allowed: more points than free parameters (at least 3)");
  });
});

describe("free parameters", () => {
  it("take bounds and units as sweep axes do, log scale for keys that span decades", () => {
    const c = parseFreeParameter("body.heatCapacity=0.1 MJ/m2/K..10 MJ/m2/K", DAY);
    expect(c).toMatchObject({ key: "body.heatCapacity", unit: "MJ/m2/K", low: 0.1, high: 10, log: true, kind: "arealHeatCapacity" });
    expect(parseFreeParameter("body.albedo", DAY)).toMatchObject({ low: 0, high: 1, log: false });
    expect(parseFreeParameter("body.heatCapacity=1e5..1e7 lin", DAY).log).toBe(false);
    expect(parseFreeParameter("timeOffset", 2 * DAY)).toMatchObject({ low: -DAY, high: DAY, unit: "s" });
    expect(problemOf(() => parseFreeParameter("body.internalFlux", DAY))).toMatch(/^--free: given "body.internalFlux"; allowed: bounds for body.internalFlux/);
    expect(problemOf(() => parseFreeParameter("body.albedo=0.5..0.1", DAY))).toBe('--free: given "body.albedo=0.5..0.1"; allowed: LOW < HIGH');
  });
});

/**
 * Injection and recovery (coverage, common practice): series made by calorbit itself at known
 * values plus seeded Gaussian noise (σ = 1 K) are fitted back with the heat capacity, the albedo and
 * the time offset free. Over 50 seeds the truth must fall inside ±1σ about 68 % and inside ±2σ about
 * 95 % of the time. With 100 draws (two parameters × 50 seeds) the binomial standard deviation is
 * 4.7 points at 68 % and 2.2 at 95 %; the bands below are about ±3 of them.
 * The forward model is kept cheap (a lumped slab, tolerance 1e-5, 200 samples per cycle, 25 points).
 */
describe("injection and recovery", () => {
  it("covers the truth at the 1σ and 2σ rates over 50 seeds", () => {
    const scenario = { name: "Injection test (invented)", star: { luminosity: "0.8 Lsun" }, orbit: { semiMajorAxis: "0.15 au", eccentricity: 0.3, period: "20 d" }, body: { albedo: 0.3, emissivity: 0.95, heatCapacity: "1 MJ/m2/K" } };
    const parameters = ["body.heatCapacity=0.2 MJ/m2/K..20 MJ/m2/K", "body.albedo=0..0.6", "timeOffset=-3 d..3 d"].map((a) => parseFreeParameter(a, 20 * DAY));
    const n = 25;
    const sigma = new Float64Array(n).fill(1);
    const times = Float64Array.from({ length: n }, (_, i) => i * 0.8 * DAY);
    const settings: ForwardSettings = { scenario, parameters, output: { spec: "surface", kind: "surface", quantity: "temperature" }, relativeTolerance: 1e-5, samples: 200 };
    const truth = [2, 0.2, 0.5];
    const clean = new ForwardModel(settings, observationsAt(times, sigma)).predict(truth);
    let within1 = 0;
    let within2 = 0;
    let draws = 0;
    for (let seed = 1; seed <= 50; seed++) {
      const rng = mulberry32(seed);
      const obs = { ...observationsAt(times, sigma), value: Float64Array.from(clean, (v) => v + gaussian(rng)) };
      const fit = fitBest(new ForwardModel(settings, obs), parameters, { starts: 1 });
      for (const j of [0, 1]) {
        const e = fit.estimates[j]!;
        const z = Math.abs(e.value - truth[j]!) / e.sigma!;
        draws++;
        if (z <= 1) within1++;
        if (z <= 2) within2++;
      }
    }
    expect(within1 / draws).toBeGreaterThan(0.54);
    expect(within1 / draws).toBeLessThan(0.82);
    expect(within2 / draws).toBeGreaterThan(0.88);
  });
});

/**
 * A model with a closed-form least-squares answer: on a circular orbit under the global regime the
 * temperature is constant, T(q) = ((F + q)/(εσ))^¼ with F = L(1 − A)/(16π a²), so T⁴ is linear in the
 * internal flux q. The weighted least-squares T is the weighted mean ȳ = Σ wᵢyᵢ / Σ wᵢ (wᵢ = 1/σᵢ²),
 * hence q̂ = εσ ȳ⁴ − F, and its variance from the normal equations is (dq/dT)² / Σ wᵢ = (4εσȳ³)² / Σ wᵢ.
 */
describe("closed-form linear case", () => {
  it("reproduces the normal-equation solution and its variance for the internal heat flux", () => {
    const scenario = { name: "Linear test (invented)", star: { luminosity: "1 Lsun" }, orbit: { semiMajorAxis: "3 au", eccentricity: 0, period: "100 d" }, body: { albedo: 0.3, emissivity: 0.9, heatCapacity: "1 kJ/m2/K" } };
    const parameters = [parseFreeParameter("body.internalFlux=0..200", 100 * DAY)];
    const thermal = resolveScenario(structuredClone(scenario)).thermal;
    const absorbed = (thermal.star.luminosityW * (1 - 0.3)) / (16 * Math.PI * thermal.orbit.semiMajorAxisM ** 2);
    const epsSigma = 0.9 * STEFAN_BOLTZMANN;
    const qTrue = 40;
    const tTrue = ((absorbed + qTrue) / epsSigma) ** 0.25;
    const n = 12;
    const rng = mulberry32(7);
    const sigma = Float64Array.from({ length: n }, (_, i) => 0.5 + 0.25 * i);
    const times = Float64Array.from({ length: n }, (_, i) => i * 7 * DAY);
    const obs = { ...observationsAt(times, sigma), value: Float64Array.from(sigma, (s) => tTrue + s * gaussian(rng)) };
    let sw = 0;
    let swy = 0;
    for (let i = 0; i < n; i++) {
      sw += 1 / sigma[i]! ** 2;
      swy += obs.value[i]! / sigma[i]! ** 2;
    }
    const yBar = swy / sw;
    const qHat = epsSigma * yBar ** 4 - absorbed;
    const qSigma = (4 * epsSigma * yBar ** 3) / Math.sqrt(sw);
    const fit = fitBest(new ForwardModel({ scenario, parameters, output: { spec: "surface", kind: "surface", quantity: "temperature" }, relativeTolerance: 1e-10, samples: 64 }, obs), parameters);
    expect(fit.values[0]).toBeCloseTo(qHat, 4);
    expect(fit.estimates[0]!.sigma! / qSigma).toBeCloseTo(1, 4);
    // χ² at the optimum: Σ wᵢ (yᵢ − ȳ)².
    let chi2 = 0;
    for (let i = 0; i < n; i++) chi2 += (obs.value[i]! - yBar) ** 2 / sigma[i]! ** 2;
    expect(fit.chiSquare / chi2).toBeCloseTo(1, 6);
    expect(fit.degreesOfFreedom).toBe(n - 1);
  });
});

/** Sample moments of a chain after the burn-in. */
function moments(chain: Float64Array[][], dim: number): { mean: number[]; variance: number[]; covariance01: number } {
  const mean = new Array<number>(dim).fill(0);
  let count = 0;
  for (const step of chain) for (const x of step) {
    for (let d = 0; d < dim; d++) mean[d]! += x[d]!;
    count++;
  }
  for (let d = 0; d < dim; d++) mean[d]! /= count;
  const variance = new Array<number>(dim).fill(0);
  let covariance01 = 0;
  for (const step of chain) for (const x of step) {
    for (let d = 0; d < dim; d++) variance[d]! += (x[d]! - mean[d]!) ** 2 / count;
    covariance01 += ((x[0]! - mean[0]!) * (x[1]! - mean[1]!)) / count;
  }
  return { mean, variance, covariance01 };
}

async function sample(logP: (x: Float64Array) => number, start: number[], walkers: number, steps: number, burn: number, seed: number): Promise<Float64Array[][]> {
  const rng = mulberry32(seed);
  const positions = Array.from({ length: walkers }, () => Float64Array.from(start, (v) => v + 0.1 * gaussian(rng)));
  const state = { positions, logProbability: positions.map(logP) };
  const chain: Float64Array[][] = [];
  await runEnsemble(state, (pts) => pts.map(logP), {
    steps,
    seed,
    onStep: (step, s) => {
      if (step >= burn) chain.push(s.positions.map((x) => Float64Array.from(x)));
    },
  });
  return chain;
}

describe("ensemble sampler (Goodman & Weare 2010 stretch move)", () => {
  it("reproduces the means, variances and covariance of a correlated 2-D Gaussian", async () => {
    // N(μ, Σ) with μ = (1, −2), σ = (1, 3), ρ = 0.8: ln p = −½ (x−μ)ᵀ Σ⁻¹ (x−μ) (textbook bivariate normal).
    const [m0, m1, s0, s1, rho] = [1, -2, 1, 3, 0.8];
    const logP = (x: Float64Array) => {
      const u = (x[0]! - m0) / s0;
      const v = (x[1]! - m1) / s1;
      return -(u * u - 2 * rho * u * v + v * v) / (2 * (1 - rho * rho));
    };
    const chain = await sample(logP, [0, 0], 32, 3000, 500, 11);
    const m = moments(chain, 2);
    expect(Math.abs(m.mean[0]! - m0)).toBeLessThan(0.1 * s0);
    expect(Math.abs(m.mean[1]! - m1)).toBeLessThan(0.1 * s1);
    expect(m.variance[0]! / s0 ** 2).toBeGreaterThan(0.88);
    expect(m.variance[0]! / s0 ** 2).toBeLessThan(1.12);
    expect(m.variance[1]! / s1 ** 2).toBeGreaterThan(0.88);
    expect(m.variance[1]! / s1 ** 2).toBeLessThan(1.12);
    expect(m.covariance01 / (rho * s0 * s1)).toBeGreaterThan(0.85);
    expect(m.covariance01 / (rho * s0 * s1)).toBeLessThan(1.15);
    // Reproducible: the same seed gives the same chain.
    const again = await sample(logP, [0, 0], 32, 600, 500, 11);
    expect(Array.from(again.at(-1)![3]!)).toEqual(Array.from(chain[99]![3]!));
  });

  it("reproduces the known moments of the Rosenbrock density Goodman & Weare use", async () => {
    // π(x₁, x₂) ∝ exp(−(100 (x₂ − x₁²)² + (1 − x₁)²)/20) (Goodman & Weare 2010, eq. 9): x₁ ~ N(1, 10),
    // x₂ | x₁ ~ N(x₁², 0.1), so E x₁ = 1, Var x₁ = 10, E x₂ = 11, Var x₂ = Var(x₁²) + 0.1 = 2·10² + 4·1·10 + 0.1 = 240.1.
    const logP = (x: Float64Array) => -(100 * (x[1]! - x[0]! ** 2) ** 2 + (1 - x[0]!) ** 2) / 20;
    const chain = await sample(logP, [1, 1], 64, 12000, 2000, 5);
    const m = moments(chain, 2);
    expect(Math.abs(m.mean[0]! - 1)).toBeLessThan(0.35);
    expect(m.variance[0]! / 10).toBeGreaterThan(0.85);
    expect(m.variance[0]! / 10).toBeLessThan(1.15);
    expect(Math.abs(m.mean[1]! - 11) / 11).toBeLessThan(0.12);
    expect(m.variance[1]! / 240.1).toBeGreaterThan(0.7);
    expect(m.variance[1]! / 240.1).toBeLessThan(1.3);
  });

  it("measures the integrated autocorrelation time of an AR(1) process", () => {
    // x_t = φ x_{t−1} + noise has ρ(k) = φ^k, so τ = (1 + φ)/(1 − φ) (textbook; Sokal 1997): 19 for φ = 0.9.
    const phi = 0.9;
    const rng = mulberry32(3);
    const walkers = 16;
    const steps = 20000;
    const chain: Float64Array[] = [];
    const x = new Float64Array(walkers);
    for (let s = 0; s < steps; s++) {
      for (let w = 0; w < walkers; w++) x[w] = phi * x[w]! + gaussian(rng);
      chain.push(Float64Array.from(x));
    }
    expect(autocorrelationTime(chain) / 19).toBeGreaterThan(0.9);
    expect(autocorrelationTime(chain) / 19).toBeLessThan(1.1);
  });
});

/**
 * An observed case, as a self-consistency check (both series come from calorbit): the lunar equator's
 * night-time cooling computed with the regolith profile of Hayne et al. (2017, JGR Planets 122, 2371;
 * the same parameters as test/column.test.ts, from memory: ρ 1100 → 1800 kg m⁻³, k_c 7.4e-4 → 3.4e-3
 * W m⁻¹ K⁻¹ on H = 0.07 m, χ = 2.7, their c(T), A = 0.12, ε = 0.95, 0.018 W m⁻²), fitted with a
 * homogeneous regolith (their surface density and c(T), no radiative term) for its thermal inertia
 * at 273 K. Hayne et al. summarise the layered regolith by a thermal inertia of about 55 J m⁻² K⁻¹ s⁻½
 * at 273 K (from memory); the single-layer fit must land near it. The solar day is the synodic month
 * (a 2:1 spin on a one-month orbit at 1 au), on a coarse grid to keep the ~20 column runs cheap.
 */
describe("lunar night-time cooling (self-consistency)", () => {
  it("fits a homogeneous regolith's thermal inertia near Hayne et al.'s 55 J m⁻² K⁻¹ s⁻½ at 273 K", () => {
    const cT = [-3.6125, 2.7431, 2.3616e-3, -1.234e-5, 8.9093e-9];
    const c273 = cT.reduce((sum, a, i) => sum + a * 273 ** i, 0);
    const grid = { stepsPerDay: 192, topLayerFraction: 0.1, growth: 1.3 };
    const layered = {
      name: "Lunar equator (test)",
      star: { luminosity: "1 Lsun" },
      orbit: { semiMajorAxis: "1 au", eccentricity: 0, period: "29.530589 d" },
      body: {
        albedo: 0.12,
        emissivity: 0.95,
        internalFlux: 0.018,
        column: { profile: { surfaceDensity: 1100, deepDensity: 1800, surfaceConductivity: 7.4e-4, deepConductivity: 3.4e-3, eFoldingDepth: "0.07 m" }, radiativeConductivity: 2.7, specificHeatPolynomial: cT, grid },
      },
      regime: "point",
      spin: { orbitRatio: "2:1" },
      surface: { latitude: 0, longitude: 0 },
    };
    // The "observed" night: every 50th sample of the layered run where the point is dark.
    const truthSettings: ForwardSettings = { scenario: layered, parameters: [], output: { spec: "surface", kind: "surface", quantity: "temperature" }, relativeTolerance: 1e-5, samples: 2000 };
    const month = 29.530589 * DAY;
    const all = Float64Array.from({ length: 60 }, (_, i) => (i * month) / 60);
    const full = new ForwardModel(truthSettings, observationsAt(all, null)).predict([]);
    // Night at longitude 0 with the star overhead at t = 0: local times 6 pm to 6 am, i.e. t ∈ (P/4, 3P/4).
    const night = Array.from(all.keys()).filter((i) => all[i]! > 0.27 * month && all[i]! < 0.73 * month);
    const times = Float64Array.from(night, (i) => all[i]!);
    const obs = { ...observationsAt(times, new Float64Array(night.length).fill(1)), value: Float64Array.from(night, (i) => full[i]!) };
    expect(Math.min(...obs.value)).toBeGreaterThan(85); // pre-dawn ≈ 95 K (test/column.test.ts)
    const homogeneous = { ...layered, body: { ...layered.body, column: { thermalInertia: 50, density: 1100, specificHeat: c273, specificHeatPolynomial: cT, grid } } };
    const parameters = [parseFreeParameter("body.column.thermalInertia=10..500", DAY)];
    const fit = fitBest(new ForwardModel({ scenario: homogeneous, parameters, output: { spec: "surface", kind: "surface", quantity: "temperature" }, relativeTolerance: 1e-4, samples: 300 }, obs), parameters, { starts: 1 });
    expect(fit.converged).toBe(true);
    expect(Math.abs(fit.values[0]! - 55) / 55).toBeLessThan(0.15);
  });
});

/**
 * A phase curve against a published relation, through the library entry point. A tidally locked
 * planet on a circular orbit re-radiating what it absorbs where it absorbs it (no transport) emits
 * I ∝ cos z from each point, so its bolometric flux ratio is (2/3)(1 − A)(R_p/a)² Φ(α) with the
 * Lambert phase function Φ(α) = [sin α + (π − α) cos α]/π (Russell 1916, ApJ 43, 173; the 2/3 dayside
 * of Cowan & Agol 2011, ApJ 729, 54, with ε = 0). Data from that formula (not from calorbit) with a
 * 1 % σ are fitted for the Bond albedo; the grid's error must fall at second order in the cell size.
 */
describe("phase-curve fit (map regime, flux ratio)", () => {
  function lambertFit(longitudes: number, latitudes: number): { albedo: number; sigma: number; reducedChiSquare: number } {
    const scenario = {
      name: "Lambert sphere (test, invented)",
      star: { radius: "1 Rsun", temperature: "5772 K", mass: "1 Msun" },
      orbit: { semiMajorAxis: "0.05 au", eccentricity: 0 },
      body: { albedo: 0.1, emissivity: 1, heatCapacity: "1e7 J/m2/K", radius: "1 Rjup" },
      regime: "map",
      spin: { orbitRatio: "1:1" },
      map: { longitudes, latitudes },
      observer: { inclination: "90 deg", argumentOfPeriastron: "90 deg", passband: "bolometric" },
    };
    const { thermal } = calorbit.resolveScenario(structuredClone(scenario));
    const period = thermal.orbit.periodSeconds;
    const ratio = thermal.bodyRadiusM! / thermal.orbit.semiMajorAxisM;
    const albedo = 0.3;
    const peak = (2 / 3) * (1 - albedo) * ratio ** 2;
    // Transit at t = 0 (true anomaly 90° − ω = 0), so the phase angle is α = arccos(−cos 2πt/P);
    // the points within 0.2 rad of the occultation (where the star hides the planet) are left out.
    const times = Float64Array.from({ length: 40 }, (_, i) => ((i + 0.5) * period) / 40).filter((t) => Math.abs((2 * Math.PI * t) / period - Math.PI) > 0.2);
    const value = Float64Array.from(times, (t) => {
      const alpha = Math.acos(-Math.cos((2 * Math.PI * t) / period));
      return (peak * (Math.sin(alpha) + (Math.PI - alpha) * Math.cos(alpha))) / Math.PI;
    });
    const n = times.length;
    const obs: calorbit.Observations = { timeSeconds: times, value, sigma: new Float64Array(n).fill(0.01 * peak), quantity: "fluxRatio", columns: { time: "time_s", value: "flux_ratio", sigma: "sigma" }, timeUnit: "s", lines: new Int32Array(n) };
    const parameters = [calorbit.parseFreeParameter("body.albedo=0..0.9", period)];
    const output = calorbit.parseModelOutput(calorbit.defaultModelOutput("fluxRatio"), () => null);
    const fit = calorbit.fitBest(new calorbit.ForwardModel({ scenario, parameters, output, relativeTolerance: 1e-6, samples: 100 }, obs), parameters, { starts: 1 });
    return { albedo: fit.values[0]!, sigma: fit.estimates[0]!.sigma!, reducedChiSquare: fit.reducedChiSquare };
  }

  it("recovers the Bond albedo of a Lambert-sphere phase curve, the grid's error falling at second order", () => {
    const coarse = lambertFit(12, 6);
    const fine = lambertFit(24, 12);
    expect(Math.abs(fine.albedo - 0.3)).toBeLessThan(fine.sigma);
    expect(fine.reducedChiSquare).toBeLessThan(1);
    const ratio = Math.abs(coarse.albedo - 0.3) / Math.abs(fine.albedo - 0.3);
    expect(ratio).toBeGreaterThan(3);
    expect(ratio).toBeLessThan(6);
  });
});

/**
 * The zonal climate against North's analytic solution (North 1975, J. Atmos. Sci. 32, 1301): with
 * outgoing radiation A + B·T(°C), a constant albedo and diffusion D in x = sin latitude, each Legendre
 * mode of the absorbed flux responds as T_n = F_n / (n(n+1)D + B). On a circular orbit with no
 * obliquity the daily-mean insolation is S cos φ / π at every season (common practice), i.e.
 * (S/π)√(1 − x²), whose Legendre coefficients are computed here by quadrature. The climate is then
 * steady; A, B, D are North, Cahalan & Coakley's (1981, Rev. Geophys. 19, 91) values. Data from that
 * formula (not from calorbit), σ = 0.1 K, are fitted for D (one band) and for B (the global mean).
 */
describe("zonal climate fit (North's linear model)", () => {
  const OLR_A = 203.3;
  const OLR_B = 2.09;
  const D = 0.649;
  const ALBEDO = 0.3;
  const BANDS = 30;
  const scenario = {
    name: "North test (invented)",
    star: { luminosity: "1 Lsun", mass: "1 Msun" },
    orbit: { semiMajorAxis: "1 au", eccentricity: 0 },
    body: { albedo: ALBEDO, emissivity: 1, heatCapacity: "1e7 J/m2/K" },
    regime: "zonal",
    spin: { obliquity: 0 },
    climate: { bands: BANDS, diffusion: 1, outgoing: { law: "linear", a: OLR_A, b: 3 }, start: "warm", stepsPerOrbit: 48 },
  };
  const { thermal } = calorbit.resolveScenario(structuredClone(scenario));
  const S = thermal.star.luminosityW / (4 * Math.PI * thermal.orbit.semiMajorAxisM ** 2);
  const legendre = (n: number, x: number): number => {
    let p0 = 1;
    let p1 = x;
    if (n === 0) return 1;
    for (let k = 2; k <= n; k++) [p0, p1] = [p1, ((2 * k - 1) * x * p1 - (k - 1) * p0) / k];
    return p1;
  };
  // F_n = (2n + 1)/2 ∫ (1 − A)(S/π)√(1 − x²) P_n(x) dx (midpoint rule, 4000 points; odd modes vanish), minus A for n = 0.
  const MODES = 40;
  const forcing: number[] = [];
  for (let n = 0; n <= MODES; n += 2) {
    let sum = 0;
    for (let i = 0; i < 4000; i++) {
      const x = -1 + (2 * i + 1) / 4000;
      sum += ((1 - ALBEDO) * S * Math.sqrt(1 - x * x) * legendre(n, x) * 2) / (Math.PI * 4000);
    }
    forcing[n] = ((2 * n + 1) / 2) * sum - (n === 0 ? OLR_A : 0);
  }
  /** North's profile averaged over the band containing `latitudeDeg` (the model's bands are equal in x), K. */
  const bandMeanK = (latitudeDeg: number): number => {
    const j = Math.floor(((Math.sin((latitudeDeg * Math.PI) / 180) + 1) / 2) * BANDS);
    const x0 = -1 + (2 * j) / BANDS;
    let sum = 0;
    for (let i = 0; i < 200; i++) {
      const x = x0 + ((i + 0.5) * 2) / BANDS / 200;
      for (let n = 0; n <= MODES; n += 2) sum += (forcing[n]! / (n * (n + 1) * D + OLR_B)) * legendre(n, x);
    }
    return sum / 200 + 273.15;
  };
  const fit = (free: string, output: string, valueK: number) => {
    const n = 6;
    const times = Float64Array.from({ length: n }, (_, i) => (i * thermal.orbit.periodSeconds) / n);
    const obs = { ...observationsAt(times, new Float64Array(n).fill(0.1)), value: new Float64Array(n).fill(valueK) };
    const parameters = [calorbit.parseFreeParameter(free, thermal.orbit.periodSeconds)];
    const out = calorbit.parseModelOutput(output, () => null, (text) => (Number(text) * Math.PI) / 180);
    const doc = { ...scenario, climate: { ...scenario.climate, ...(free.startsWith("climate.outgoing.b") ? { diffusion: D } : { outgoing: { law: "linear", a: OLR_A, b: OLR_B } }) } };
    return calorbit.fitBest(new calorbit.ForwardModel({ scenario: doc, parameters, output: out, relativeTolerance: 1e-6, samples: 50 }, obs), parameters, { starts: 1 });
  };

  it("recovers the diffusion from one band's temperature and B from the global mean, within 1σ of 0.1 K data", () => {
    const band = fit("climate.diffusion=0.1..10", "latitude=60", bandMeanK(60));
    expect(Math.abs(band.values[0]! - D)).toBeLessThan(band.estimates[0]!.sigma!);
    const globalMeanK = forcing[0]! / OLR_B + 273.15; // the n = 0 mode
    const global = fit("climate.outgoing.b=1..4", "surface", globalMeanK);
    expect(Math.abs(global.values[0]! - OLR_B)).toBeLessThan(global.estimates[0]!.sigma!);
  });

  // The seasons of the global mean, which no diffusion touches: C dT/dt = (1 − A)S(t)/4 − A − B·T(°C) on an
  // eccentric orbit without obliquity (the daily-mean insolation averages to S/4 over the sphere). Each harmonic k
  // of the forcing responds as F_k / (B + ikωC), the seasonal form of the mode response (North, Cahalan & Coakley
  // 1981; the linear response of a first-order system, common practice). S(t) ∝ (a/r)² is sampled here through a
  // Kepler solve of the test's own (Newton's method on M = E − e sin E).
  it("recovers the heat capacity from the seasonal cycle of the global mean, placed in time as the model places it", () => {
    const e = 0.2;
    const heatCapacity = 1e7;
    const seasonal = { ...scenario, orbit: { semiMajorAxis: "1 au", eccentricity: e }, body: { ...scenario.body, heatCapacity: "3e6 J/m2/K" }, climate: { ...scenario.climate, bands: 4, diffusion: D, outgoing: { law: "linear", a: OLR_A, b: OLR_B }, stepsPerOrbit: 192 } };
    const period = calorbit.resolveScenario(structuredClone(seasonal)).thermal.orbit.periodSeconds;
    const omega = (2 * Math.PI) / period;
    const M = 2048;
    const absorbed = Float64Array.from({ length: M }, (_, i) => {
      const meanAnomaly = (2 * Math.PI * i) / M; // the scenario starts at periastron (mean anomaly 0 at t = 0)
      let E = meanAnomaly;
      for (let k = 0; k < 50; k++) E -= (E - e * Math.sin(E) - meanAnomaly) / (1 - e * Math.cos(E));
      return ((1 - ALBEDO) * S) / 4 / (1 - e * Math.cos(E)) ** 2;
    });
    const HARMONICS = 20;
    const re: number[] = [];
    const im: number[] = [];
    for (let k = 0; k <= HARMONICS; k++) {
      let c = 0;
      let s = 0;
      for (let i = 0; i < M; i++) {
        c += (absorbed[i]! * Math.cos((2 * Math.PI * k * i) / M)) / M;
        s += (absorbed[i]! * Math.sin((2 * Math.PI * k * i) / M)) / M;
      }
      re.push(c);
      im.push(s);
    }
    const globalMeanK = (t: number): number => {
      let T = (re[0]! - OLR_A) / OLR_B;
      for (let k = 1; k <= HARMONICS; k++) {
        // forcing 2(c cos kωt + s sin kωt) = 2 Re[(c − is) e^{ikωt}], divided by B + ikωC
        const dr = OLR_B;
        const di = k * omega * heatCapacity;
        const den = dr * dr + di * di;
        const ar = (re[k]! * dr - im[k]! * di) / den;
        const ai = (-im[k]! * dr - re[k]! * di) / den;
        T += 2 * (ar * Math.cos(k * omega * t) - ai * Math.sin(k * omega * t));
      }
      return T + 273.15;
    };
    const n = 12;
    const times = Float64Array.from({ length: n }, (_, i) => ((i + 0.25) * period) / n);
    const obs = { ...observationsAt(times, new Float64Array(n).fill(0.1)), value: Float64Array.from(times, globalMeanK) };
    const parameters = [calorbit.parseFreeParameter("body.heatCapacity=1e6..1e8", period)];
    const out = calorbit.parseModelOutput("surface", () => null);
    const fitted = calorbit.fitBest(new calorbit.ForwardModel({ scenario: seasonal, parameters, output: out, relativeTolerance: 1e-6, samples: 200 }, obs), parameters, { starts: 1 });
    expect(Math.max(...obs.value) - Math.min(...obs.value)).toBeGreaterThan(5); // a real seasonal cycle to fit
    expect(Math.abs(fitted.values[0]! - heatCapacity)).toBeLessThan(fitted.estimates[0]!.sigma!);
    expect(fitted.reducedChiSquare).toBeLessThan(1);
  });

  it("refuses a zonal fit from two starts (two climates) before fitting", () => {
    const parameters = [calorbit.parseFreeParameter("climate.diffusion=0.1..10", 1)];
    const both = { ...scenario, climate: { ...scenario.climate, start: "both" } };
    const output = calorbit.parseModelOutput("surface", () => null);
    const thermalBoth = calorbit.resolveScenario(structuredClone(both)).thermal;
    expect(problemOf(() => calorbit.checkModelOutput(output, thermalBoth))).toBe("climate.start: given both; allowed: warm or cold: the fit follows the climate reached from that start (two starts can reach two climates)");
    expect(parameters[0]!.log).toBe(true);
  });
});
