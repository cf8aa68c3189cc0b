/**
 * From a thermal case to a temperature history and its summary: builds the forcing and the
 * energy balance, finds the periodic steady state (or integrates a transient), samples the
 * converged cycle and reduces it to the summary numbers. Pure computation: no I/O.
 */
import { cycleSummary, type CycleSummary } from "./analysis/summarise.js";
import { STEFAN_BOLTZMANN } from "./constants.js";
import { CalorbitError, requireNumber } from "./errors.js";
import { equilibriumTemperature, stellarFlux } from "./physics/flux.js";
import { lumpedForcing, type Forcing } from "./physics/forcing.js";
import { LumpedBalance, radiativeTimeSeconds } from "./physics/energyBalance.js";
import { eccentricAnomaly, trueAnomalyFromEccentric } from "./physics/kepler.js";
import { checkOrbit, distanceFromEccentric, meanMotion, timeAtEccentric } from "./physics/orbit.js";
import type { ThermalCase } from "./model.js";
import { chooseIntegrator, integrateCycle, solvePeriodic, type IntegratorName } from "./solve/periodic.js";
import { addWork, emptyWork, type SolverWork } from "./solve/system.js";

const TWO_PI = 2 * Math.PI;
/**
 * Statistics grid, points per orbit in E (see analysis/cycleStatistics.ts for why E). The
 * periastron peak of the integrand has a width in E of about √(2(1 − e)), so the grid grows as
 * that width shrinks: 512 points up to e = 0.9, 8192 at e = 0.999.
 */
function statisticsPointsPerOrbit(eccentricity: number): number {
  const width = Math.sqrt(2 * (1 - eccentricity));
  const points = Math.ceil((512 * Math.sqrt(0.2)) / width / 64) * 64;
  return Math.min(8192, Math.max(512, points));
}
export const DEFAULT_RELATIVE_TOLERANCE = 1e-8;
export const DEFAULT_SAMPLES = 1000;

export interface SimulateOptions {
  /** Relative tolerance of the temperatures (default 1e-8). */
  relativeTolerance?: number;
  /** Points in the output series (uniform in time, both ends included; default 1000; 0 for none). */
  samples?: number;
  /** Transient mode: start at this temperature (K) and integrate `orbits` orbits; no shooting. */
  transient?: { startK: number; orbits: number };
}

/** The history, uniform in time from t = 0; all arrays the same length. */
export interface Series {
  timeSeconds: Float64Array;
  meanAnomalyRad: Float64Array;
  trueAnomalyRad: Float64Array;
  distanceM: Float64Array;
  stellarFluxWPerM2: Float64Array;
  absorbedWPerM2: Float64Array;
  temperatureK: Float64Array;
  equilibriumK: Float64Array;
}

export interface SolverReport {
  mode: "periodic" | "transient";
  integrator: IntegratorName;
  requestedTolerance: number;
  odeRelativeTolerance: number;
  /** Shooting iterations (periodic mode) — each integrates one cycle. */
  iterations: number;
  orbitsIntegrated: number;
  /** |T(P) − T(0)| / T on the converged cycle (periodic mode). */
  periodicityResidual: number | null;
  steps: number;
  rejectedSteps: number;
  evaluations: number;
}

export interface Simulation {
  case: ThermalCase;
  summary: CycleSummary;
  series: Series;
  solver: SolverReport;
}

/** What the engine needs to integrate and summarise one case. */
interface Prepared {
  balance: LumpedBalance;
  forcing: Forcing;
  equilibriumAt: (E: number) => number;
  meanEquilibriumOfMeanFluxK: number;
  stiffnessPerOrbit: number;
}

function prepare(thermal: ThermalCase): Prepared {
  checkOrbit(thermal.orbit);
  requireNumber("star.luminosity", thermal.star.luminosityW, (l) => l > 0, "L > 0 W");
  const forcing = lumpedForcing(thermal.regime, thermal.surface.albedo, thermal.star.luminosityW, thermal.orbit);
  const balance = new LumpedBalance(thermal.orbit, thermal.surface, forcing);
  const q = thermal.surface.internalFluxWPerM2;
  const eps = thermal.surface.emissivity;
  equilibriumTemperature(forcing.meanAbsorbedWPerM2 + q, eps); // validates ε once; the fast form below is unchecked
  const emission = eps * STEFAN_BOLTZMANN;
  const equilibriumAt = (E: number): number => Math.sqrt(Math.sqrt((forcing.absorbedAt(E) + q) / emission));
  const meanEquilibriumOfMeanFluxK = equilibriumTemperature(forcing.meanAbsorbedWPerM2 + q, eps);
  // Relaxation rate in E is (dt/dE)/τ(T_eq(E)); its maximum over the orbit times 2π measures stiffness.
  let stiffness = 0;
  const y = new Float64Array(1);
  const jac = new Float64Array(1);
  for (let k = 0; k < 64; k++) {
    const E = (TWO_PI * k) / 64;
    y[0] = equilibriumAt(E);
    balance.jacobian(E, y, jac);
    stiffness = Math.max(stiffness, Math.abs(jac[0]!) * TWO_PI);
  }
  return { balance, forcing, equilibriumAt, meanEquilibriumOfMeanFluxK, stiffnessPerOrbit: stiffness };
}

/** Runs one case to its periodic steady state (or through a transient) and summarises it. */
export function simulate(thermal: ThermalCase, options: SimulateOptions = {}): Simulation {
  const rtol = options.relativeTolerance ?? DEFAULT_RELATIVE_TOLERANCE;
  requireNumber("tolerance", rtol, (t) => t >= 1e-13 && t <= 1e-2, "1e-13 ≤ tolerance ≤ 1e-2");
  const sampleCount = options.samples ?? DEFAULT_SAMPLES;
  requireNumber("samples", sampleCount, (n) => Number.isInteger(n) && (n === 0 || (n >= 2 && n <= 10_000_000)), "0, or an integer from 2 to 10,000,000");
  const { orbit } = thermal;
  const prepared = prepare(thermal);
  const { balance } = prepared;
  const orbits = options.transient ? options.transient.orbits : 1;
  if (options.transient) {
    requireNumber("from", options.transient.startK, (t) => t > 0, "a temperature > 0 K");
    requireNumber("orbits", orbits, (n) => Number.isInteger(n) && n >= 1 && n <= 100_000, "an integer from 1 to 100,000");
  }

  const startE = eccentricAnomaly(orbit.meanAnomalyAtStartRad, orbit.eccentricity);
  const periodSeconds = orbit.periodSeconds;
  const spanSeconds = orbits * periodSeconds;

  // Output grid, uniform in time; Kepler is solved here, once per sample, never inside the ODE.
  const outputE = new Float64Array(sampleCount);
  for (let j = 0; j < sampleCount; j++) {
    const t = sampleCount === 1 ? 0 : (spanSeconds * j) / (sampleCount - 1);
    outputE[j] = eccentricAnomaly(orbit.meanAnomalyAtStartRad + meanMotion(orbit) * t, orbit.eccentricity);
    if (j === sampleCount - 1) outputE[j] = startE + TWO_PI * orbits; // exact end despite rounding
  }
  // Statistics grid, uniform in E over the last orbit integrated (the converged cycle).
  const pointsPerOrbit = statisticsPointsPerOrbit(orbit.eccentricity);
  const statsCount = pointsPerOrbit + 1;
  const lastOrbitStart = startE + TWO_PI * (orbits - 1);
  const statsE = new Float64Array(statsCount);
  for (let k = 0; k < statsCount; k++) statsE[k] = lastOrbitStart + (TWO_PI * k) / pointsPerOrbit;

  const scale = Float64Array.of(prepared.meanEquilibriumOfMeanFluxK);
  const work: SolverWork = emptyWork();
  let solver: SolverReport;
  const statsT = new Float64Array(statsCount);
  const outputT = new Float64Array(sampleCount);

  if (!options.transient) {
    const tau = radiativeTimeSeconds(thermal.surface.heatCapacityJPerM2K, thermal.surface.emissivity, prepared.meanEquilibriumOfMeanFluxK);
    const guess = linearResponseGuess(prepared.equilibriumAt, orbit.eccentricity, orbit.meanAnomalyAtStartRad, tau / periodSeconds, prepared.meanEquilibriumOfMeanFluxK);
    const merged = mergeGrids(outputE, statsE);
    const result = solvePeriodic(
      {
        system: balance,
        start: startE,
        cycleLength: TWO_PI,
        guess: Float64Array.of(guess),
        scale,
        stiffness: prepared.stiffnessPerOrbit,
      },
      { relativeTolerance: rtol, samples: { xs: merged.xs, ys: merged.ys, components: 1 } },
    );
    merged.scatter(outputT, statsT);
    addWork(work, result.work);
    solver = {
      mode: "periodic",
      integrator: result.integrator,
      requestedTolerance: rtol,
      odeRelativeTolerance: result.odeRelativeTolerance,
      iterations: result.iterations,
      orbitsIntegrated: result.cyclesIntegrated,
      periodicityResidual: result.periodicityResidual,
      steps: work.steps,
      rejectedSteps: work.rejected,
      evaluations: work.evaluations,
    };
  } else {
    const integrator = chooseIntegrator(prepared.stiffnessPerOrbit);
    const y = Float64Array.of(options.transient.startK);
    const merged = mergeGrids(outputE, statsE);
    addWork(
      work,
      integrateCycle(balance, integrator, startE, startE + TWO_PI * orbits, y, rtol * 0.1, scale, {
        xs: merged.xs,
        ys: merged.ys,
        components: 1,
      }),
    );
    merged.scatter(outputT, statsT);
    solver = {
      mode: "transient",
      integrator,
      requestedTolerance: rtol,
      odeRelativeTolerance: rtol * 0.1,
      iterations: 0,
      orbitsIntegrated: orbits,
      periodicityResidual: null,
      steps: work.steps,
      rejectedSteps: work.rejected,
      evaluations: work.evaluations,
    };
  }
  for (let k = 0; k < statsCount; k++) {
    if (!(statsT[k]! > 0)) throw new CalorbitError("INTEGRATION_FAILED", "the temperature left the physical range (T ≤ 0 K)");
  }

  const summary = cycleSummary({
    thermal,
    balance,
    forcing: prepared.forcing,
    equilibriumAt: prepared.equilibriumAt,
    statsE,
    statsT,
    meanEquilibriumOfMeanFluxK: prepared.meanEquilibriumOfMeanFluxK,
  });
  const series = buildSeries(thermal, prepared, outputE, outputT);
  return { case: thermal, summary, series, solver };
}

/**
 * First guess of the periodic start temperature from linear response: T_eq(M) expanded in
 * harmonics of the mean anomaly, each passed through the first-order filter 1/(1 + i k ωτ)
 * (standard), the mean moved from ⟨T_eq⟩ toward the mean-flux equilibrium as memory grows.
 * Newton then has only the nonlinearity to remove: typically two or three cycles.
 */
function linearResponseGuess(
  equilibriumAt: (E: number) => number,
  eccentricity: number,
  startMeanAnomalyRad: number,
  tauOverPeriod: number,
  meanFluxEquilibriumK: number,
): number {
  const points = 64;
  const harmonics = 3;
  const a = new Float64Array(harmonics + 1);
  const b = new Float64Array(harmonics + 1);
  for (let j = 0; j < points; j++) {
    const E = (TWO_PI * j) / points;
    const M = E - eccentricity * Math.sin(E);
    const weight = (1 - eccentricity * Math.cos(E)) / points; // dM/dE over 2π, trapezoidal in E
    const teq = equilibriumAt(E);
    for (let k = 0; k <= harmonics; k++) {
      a[k]! += teq * Math.cos(k * M) * weight;
      b[k]! += teq * Math.sin(k * M) * weight;
    }
  }
  const omegaTau = TWO_PI * tauOverPeriod;
  const memory = (omegaTau * omegaTau) / (1 + omegaTau * omegaTau);
  let t = memory * meanFluxEquilibriumK + (1 - memory) * a[0]!;
  for (let k = 1; k <= harmonics; k++) {
    // Re[(a − i b) e^{ikM₀} / (1 + i k ωτ)] × 2
    const x = k * omegaTau;
    const c = Math.cos(k * startMeanAnomalyRad);
    const s = Math.sin(k * startMeanAnomalyRad);
    const re = a[k]! * c + b[k]! * s;
    const im = a[k]! * s - b[k]! * c;
    t += (2 * (re + x * im)) / (1 + x * x);
  }
  return t;
}

/** Joins two ascending grids into one for a single dense pass, and splits the results back. */
function mergeGrids(a: Float64Array, b: Float64Array) {
  const xs = new Float64Array(a.length + b.length);
  const origin = new Int32Array(a.length + b.length); // ≥ 0: index into a; < 0: −(index into b) − 1
  let i = 0;
  let j = 0;
  for (let k = 0; k < xs.length; k++) {
    if (j >= b.length || (i < a.length && a[i]! <= b[j]!)) {
      xs[k] = a[i]!;
      origin[k] = i++;
    } else {
      xs[k] = b[j]!;
      origin[k] = -(j++) - 1;
    }
  }
  const ys = new Float64Array(xs.length);
  return {
    xs,
    ys,
    scatter(intoA: Float64Array, intoB: Float64Array): void {
      for (let k = 0; k < xs.length; k++) {
        const o = origin[k]!;
        if (o >= 0) intoA[o] = ys[k]!;
        else intoB[-o - 1] = ys[k]!;
      }
    },
  };
}

function buildSeries(thermal: ThermalCase, prepared: Prepared, outputE: Float64Array, outputT: Float64Array): Series {
  const n = outputE.length;
  const { orbit } = thermal;
  const series: Series = {
    timeSeconds: new Float64Array(n),
    meanAnomalyRad: new Float64Array(n),
    trueAnomalyRad: new Float64Array(n),
    distanceM: new Float64Array(n),
    stellarFluxWPerM2: new Float64Array(n),
    absorbedWPerM2: new Float64Array(n),
    temperatureK: outputT,
    equilibriumK: new Float64Array(n),
  };
  const startE = outputE[0] ?? 0;
  const t0 = timeAtEccentric(orbit, startE);
  for (let j = 0; j < n; j++) {
    const E = outputE[j]!;
    const r = distanceFromEccentric(orbit, E);
    series.timeSeconds[j] = timeAtEccentric(orbit, E) - t0;
    series.meanAnomalyRad[j] = E - orbit.eccentricity * Math.sin(E);
    series.trueAnomalyRad[j] = trueAnomalyFromEccentric(E, orbit.eccentricity);
    series.distanceM[j] = r;
    series.stellarFluxWPerM2[j] = stellarFlux(thermal.star.luminosityW, r);
    series.absorbedWPerM2[j] = prepared.forcing.absorbedAt(E);
    series.equilibriumK[j] = prepared.equilibriumAt(E);
  }
  return series;
}
