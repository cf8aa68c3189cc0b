/**
 * From a thermal case to a temperature history and its summary: builds the model, finds the
 * periodic steady state (or integrates a transient), samples the converged cycle and reduces it
 * to the summary numbers. Pure computation: no I/O.
 */
import { cycleSummary, type CycleSummary } from "../analysis/summarise.js";
import { timeMean } from "../analysis/cycleStatistics.js";
import { anomaliesUniformInTime, orbitColumns } from "../analysis/orbitSampling.js";
import { CalorbitError, describeValue, requireNumber, requireObject } from "../errors.js";
import { REGIMES, type ThermalCase } from "../model/thermalCase.js";
import { eccentricAnomaly } from "../physics/kepler.js";
import { chooseIntegrator, integrateCycle, INTEGRATORS, plainOdeTolerance, solvePeriodic, type IntegratorName } from "../solve/periodic.js";
import { switchPoints } from "../solve/corners.js";
import { addWork, emptyWork, type SolverWork } from "../solve/system.js";
import { buildThermalModel, type SlabModel } from "../model/build.js";
import { exchangeCarriesHeat } from "../model/exchange.js";

import { DEFAULT_RELATIVE_TOLERANCE, DEFAULT_SAMPLES } from "../defaults.js";

export { DEFAULT_RELATIVE_TOLERANCE, DEFAULT_SAMPLES, INTEGRATORS, type IntegratorName };

const TWO_PI = 2 * Math.PI;
/** Step caps of one orbit's integration: a runaway guard, raised for a point that sees many sunrises. */
const MIN_STEP_CAP = 200_000;
const STEPS_PER_SOLAR_DAY = 500;
/** A non-commensurate spin: the most orbits integrated to forget the start. */
const MAX_SEASONAL_ORBITS = 2000;

export interface SimulateOptions {
  /** Relative tolerance of the temperatures (default 1e-8). */
  relativeTolerance?: number;
  /**
   * Integrator: by default Dormand–Prince 5(4), or Radau IIA when the radiative time is a small
   * fraction of the cycle; "odex" (extrapolation, an independent code) for a cross-check.
   */
  integrator?: IntegratorName;
  /** Points in the output series (uniform in time, both ends included); default 1000, more for a fast-spinning point. */
  samples?: number;
  /** Transient mode: start at this temperature (K, every state) and integrate `orbits` orbits; no shooting. */
  transient?: { startK: number; orbits: number };
}

/** One state's history (a surface, a hemisphere). */
export interface StateSeries {
  name: string;
  temperatureK: Float64Array;
  equilibriumK: Float64Array;
  absorbedWPerM2: Float64Array;
}

/** The history, uniform in time from t = 0; all arrays the same length. Top-level T, T_eq, absorbed are state 0's. */
export interface Series {
  timeSeconds: Float64Array;
  meanAnomalyRad: Float64Array;
  trueAnomalyRad: Float64Array;
  distanceM: Float64Array;
  stellarFluxWPerM2: Float64Array;
  absorbedWPerM2: Float64Array;
  temperatureK: Float64Array;
  equilibriumK: Float64Array;
  states: StateSeries[];
}

export interface SolverReport {
  /** periodic: shooting on the exact cycle; seasonal: a non-commensurate spin, integrated orbit after orbit until the start is forgotten; transient: as asked. */
  mode: "periodic" | "seasonal" | "transient";
  integrator: IntegratorName;
  requestedTolerance: number;
  odeRelativeTolerance: number;
  /** Shooting iterations (periodic mode) — each integrates one cycle. */
  iterations: number;
  orbitsIntegrated: number;
  /** |T(cycle) − T(0)| / T on the converged cycle (periodic), or the last orbit-to-orbit change of the orbit-mean temperature (seasonal; null with one orbit). */
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

/** Runs one case to its periodic steady state (or through a transient) and summarises it. */
export function simulate(thermal: ThermalCase, options: SimulateOptions = {}): Simulation {
  requireObject("thermal", thermal, ["star", "orbit", "surface"], "a ThermalCase (resolveScenario(document).thermal) with star, orbit and surface");
  if (!(REGIMES as readonly unknown[]).includes(thermal.regime)) {
    throw new CalorbitError("INVALID_ARGUMENT", "unknown regime", [{ path: "thermal.regime", given: describeValue(thermal.regime), allowed: REGIMES.join(", ") }]);
  }
  requireObject("options", options, [], "an options object (or nothing)");
  const rtol = options.relativeTolerance ?? DEFAULT_RELATIVE_TOLERANCE;
  requireNumber("tolerance", rtol, (t) => t >= 1e-13 && t <= 1e-2, "1e-13 ≤ tolerance ≤ 1e-2");
  if (options.integrator !== undefined && !INTEGRATORS.includes(options.integrator)) {
    throw new CalorbitError("INVALID_ARGUMENT", "unknown integrator", [
      { path: "integrator", given: String(options.integrator), allowed: INTEGRATORS.join(", ") },
    ]);
  }
  const model = buildThermalModel(thermal);
  if (model.kind !== "slab") {
    throw new CalorbitError("INVALID_ARGUMENT", "this case has a conduction column (body.column), and only calorbit run and calorbit sweep solve a column; compare and the viewer's live controls take a slab (body.heatCapacity or body.layer)", [
      { path: "body.column", given: "a conduction column", allowed: "calorbit run or sweep (the column solver); compare and the viewer's live controls take lumped surfaces" },
    ]);
  }
  const { orbit } = thermal;
  const n = model.system.dimension;
  if (options.transient) {
    requireNumber("from", options.transient.startK, (t) => t > 0, "a temperature > 0 K");
    requireNumber("orbits", options.transient.orbits, (k) => Number.isInteger(k) && k >= 1 && k <= 100_000, "an integer from 1 to 100,000");
  }
  const mode: SolverReport["mode"] = options.transient ? "transient" : model.commensurate ? "periodic" : "seasonal";
  checkHeated(model, mode);

  const startE = eccentricAnomaly(orbit.meanAnomalyAtStartRad, orbit.eccentricity);
  const spanOrbits = mode === "transient" ? options.transient!.orbits : mode === "periodic" ? model.cycleOrbits : 1;
  const summaryOrbits = mode === "periodic" ? model.cycleOrbits : 1;
  const defaultSamples = Math.min(200_000, Math.max(DEFAULT_SAMPLES, model.solarDaySeconds ? Math.ceil((48 * spanOrbits * orbit.periodSeconds) / model.solarDaySeconds) : 0));
  const sampleCount = options.samples ?? defaultSamples;
  requireNumber("samples", sampleCount, (k) => Number.isInteger(k) && (k === 0 || (k >= 2 && k <= 10_000_000)), "0, or an integer from 2 to 10,000,000");

  const scale = new Float64Array(n).fill(model.meanFluxEquilibriumK);
  // A fast-spinning point sees thousands of sunrises per orbit, each needing its own steps.
  const solarDaysPerOrbit = model.solarDaySeconds ? orbit.periodSeconds / model.solarDaySeconds : 0;
  const maxStepsPerOrbit = Math.max(MIN_STEP_CAP, STEPS_PER_SOLAR_DAY * solarDaysPerOrbit);
  const work: SolverWork = emptyWork();
  let solver: SolverReport;
  let runStartE = startE; // where the sampled span starts (seasonal mode: the last orbit)
  let sampledOrbits = spanOrbits;
  let y0: Float64Array;

  if (mode === "periodic") {
    y0 = guessStart(model, thermal);
    const grids = makeGrids(orbit, startE, spanOrbits, summaryOrbits, sampleCount, model.statsPointsPerOrbit, n);
    const result = solvePeriodic(
      {
        system: model.system,
        start: startE,
        cycleLength: TWO_PI * model.cycleOrbits,
        guess: y0,
        scale,
        stiffness: model.stiffness,
        maxStepsPerCycle: maxStepsPerOrbit * model.cycleOrbits,
        forcingHasCorners: model.forcingHasCorners,
        ...breakpointsOf(thermal, model, startE),
        memoryEstimate: -Math.expm1((-model.cycleOrbits * orbit.periodSeconds) / model.radiativeTimeSeconds),
      },
      { relativeTolerance: rtol, samples: grids.dense, ...(options.integrator ? { integrator: options.integrator } : {}) },
    );
    addWork(work, result.work);
    solver = report("periodic", result.integrator, rtol, result.odeRelativeTolerance, result.iterations, result.cyclesIntegrated * model.cycleOrbits, result.periodicityResidual, work);
    return finish(thermal, model, grids, solver);
  }

  const integrator = options.integrator ?? chooseIntegrator(model.stiffness / model.cycleOrbits, model.forcingHasCorners);
  const odeTol = plainOdeTolerance(rtol, model.forcingHasCorners);
  const y = mode === "transient" ? new Float64Array(n).fill(options.transient!.startK) : guessStart(model, thermal);
  let orbitsIntegrated = 0;
  let change: number | null = null;
  if (mode === "seasonal") {
    // No exact cycle: the time of day at a given orbital phase drifts from orbit to orbit, so the
    // state never repeats. Integrate until the start has been forgotten: memory decays as
    // exp(−t/τ), τ taken 8× the mean-temperature value to cover cold nights (τ ∝ T⁻³).
    const memoryOrbits = (8 * model.radiativeTimeSeconds * Math.log(1 / rtol)) / orbit.periodSeconds;
    const spinUpOrbits = Math.ceil(Math.min(MAX_SEASONAL_ORBITS, Math.max(1, memoryOrbits)));
    const probe = makeGrids(orbit, startE, 1, 1, 0, model.statsPointsPerOrbit, n);
    let previousMean = NaN;
    while (orbitsIntegrated < spinUpOrbits) {
      const from = startE + TWO_PI * orbitsIntegrated;
      const shifted = Float64Array.from(probe.statsE, (E) => E + TWO_PI * orbitsIntegrated);
      const ys = new Float64Array(shifted.length * n);
      addWork(work, integrateCycle(model.system, integrator, from, from + TWO_PI, y, odeTol, scale, { xs: shifted, ys, components: n }, maxStepsPerOrbit));
      orbitsIntegrated++;
      const t0 = Float64Array.from({ length: shifted.length }, (_, k) => ys[k * n]!);
      const dtdE = Float64Array.from(shifted, (E) => model.timePerAnomaly(E));
      const mean = timeMean(t0, dtdE);
      change = Math.abs(mean - previousMean) / mean;
      previousMean = mean;
    }
    runStartE = startE + TWO_PI * orbitsIntegrated;
    sampledOrbits = 1;
  }
  const grids = makeGrids(orbit, runStartE, sampledOrbits, summaryOrbits, sampleCount, model.statsPointsPerOrbit, n);
  addWork(
    work,
    integrateCycle(model.system, integrator, runStartE, runStartE + TWO_PI * sampledOrbits, y, odeTol, scale, grids.dense, maxStepsPerOrbit * sampledOrbits),
  );
  orbitsIntegrated += sampledOrbits;
  solver = report(mode, integrator, rtol, odeTol, 0, orbitsIntegrated, change, work);
  return finish(thermal, model, grids, solver);
}

/**
 * The corners of the forcing, for the periodic solve to end steps on: a point's sunrises and
 * sunsets (a scan at a quarter of the statistics grid, then bisection), and none at all for a band
 * that never sees a polar day or night (|latitude| + obliquity < 90°), whose daily mean is smooth.
 * Other cases keep the fine tolerance that corners inside steps need.
 */
function breakpointsOf(thermal: ThermalCase, model: SlabModel, startE: number): { breakpoints?: Float64Array } {
  if (!model.forcingHasCorners) return {};
  if (thermal.regime === "point") {
    const end = startE + TWO_PI * model.cycleOrbits;
    const scan = Math.ceil((model.statsPointsPerOrbit * model.cycleOrbits) / 4);
    return { breakpoints: switchPoints((E) => model.absorbedAt(E, 0), startE, end, scan) };
  }
  if (thermal.regime === "band") {
    const obliquity = thermal.spin?.obliquityRad ?? 0;
    const tilt = Math.min(obliquity, Math.PI - obliquity);
    if (Math.abs(thermal.location?.latitudeRad ?? 0) + tilt < 0.5 * Math.PI - 1e-6) return { breakpoints: new Float64Array(0) };
  }
  return {};
}

function report(
  mode: SolverReport["mode"],
  integrator: IntegratorName,
  rtol: number,
  odeTol: number,
  iterations: number,
  orbits: number,
  residual: number | null,
  work: SolverWork,
): SolverReport {
  return {
    mode,
    integrator,
    requestedTolerance: rtol,
    odeRelativeTolerance: odeTol,
    iterations,
    orbitsIntegrated: orbits,
    periodicityResidual: residual,
    steps: work.steps,
    rejectedSteps: work.rejected,
    evaluations: work.evaluations,
  };
}

/** A cell with no heat source over the whole cycle cools toward 0 K: there is no periodic state to find. */
function checkHeated(model: SlabModel, mode: SolverReport["mode"]): void {
  if (mode === "transient" || model.internalFluxWPerM2 > 0 || exchangeCarriesHeat(model.exchange)) return;
  for (const cell of model.surface.cells) {
    if (cell.forcing.meanAbsorbedWPerM2 > 0) continue;
    if (model.surface.cells.length > 1) {
      throw new CalorbitError("INVALID_ARGUMENT", `the ${cell.name} side has no heat source: give body.recirculation or body.exchangeCoefficient a value above 0 to carry heat from the day side, or body.internalFlux one above 0`, [
        { path: "body", given: "no recirculation, exchange coefficient or internal flux", allowed: "body.recirculation > 0, body.exchangeCoefficient > 0 or body.internalFlux > 0" },
      ]);
    }
    throw new CalorbitError("INVALID_ARGUMENT", "the surface never sees the star", [
      { path: "surface", given: "a point or band in permanent night", allowed: "a place that is lit during the cycle, or body.internalFlux > 0" },
    ]);
  }
}

/**
 * First guess of the periodic start state from linear response: each state's T_eq expanded in
 * harmonics of the mean anomaly, each passed through the first-order filter 1/(1 + i k ωτ)
 * (standard), the mean moved from ⟨T_eq⟩ toward the mean-flux equilibrium as memory grows.
 * Newton then has only the nonlinearity to remove: typically two or three cycles.
 */
function guessStart(model: SlabModel, thermal: ThermalCase): Float64Array {
  const n = model.system.dimension;
  const e = thermal.orbit.eccentricity;
  const points = 64;
  const harmonics = 3;
  const a = new Float64Array((harmonics + 1) * n);
  const b = new Float64Array((harmonics + 1) * n);
  const fourth = new Float64Array(n); // ⟨T_eq⁴⟩: a slab with long memory sits near its fourth root
  const eq = new Float64Array(n);
  for (let j = 0; j < points; j++) {
    const E = (TWO_PI * j) / points;
    const M = E - e * Math.sin(E);
    const weight = (1 - e * Math.cos(E)) / points; // dM/dE over 2π, trapezoidal in E
    model.equilibriumAt(E, eq);
    const c1 = Math.cos(M);
    const s1 = Math.sin(M);
    let ck = 1; // cos kM and sin kM by the angle-addition recurrence
    let sk = 0;
    for (let k = 0; k <= harmonics; k++) {
      for (let i = 0; i < n; i++) {
        a[k * n + i]! += eq[i]! * ck * weight;
        b[k * n + i]! += eq[i]! * sk * weight;
      }
      const next = ck * c1 - sk * s1;
      sk = sk * c1 + ck * s1;
      ck = next;
    }
    for (let i = 0; i < n; i++) fourth[i]! += eq[i]! ** 4 * weight;
  }
  const omegaTau = (TWO_PI * model.radiativeTimeSeconds) / thermal.orbit.periodSeconds;
  const memory = (omegaTau * omegaTau) / (1 + omegaTau * omegaTau);
  const m0 = thermal.orbit.meanAnomalyAtStartRad;
  const guess = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let t = memory * Math.sqrt(Math.sqrt(fourth[i]!)) + (1 - memory) * a[i]!;
    for (let k = 1; k <= harmonics; k++) {
      // 2 Re[(a − i b) e^{ikM₀} / (1 + i k ωτ)]
      const x = k * omegaTau;
      const c = Math.cos(k * m0);
      const s = Math.sin(k * m0);
      const re = a[k * n + i]! * c + b[k * n + i]! * s;
      const im = a[k * n + i]! * s - b[k * n + i]! * c;
      t += (2 * (re + x * im)) / (1 + x * x);
    }
    guess[i] = Math.max(t, 0.3 * model.meanFluxEquilibriumK);
  }
  return guess;
}

interface Grids {
  outputE: Float64Array;
  statsE: Float64Array;
  dense: { xs: Float64Array; ys: Float64Array; components: number };
  /** Splits the dense output back into the two grids. */
  scatter(): { outputY: Float64Array; statsY: Float64Array };
}

/**
 * The output grid (uniform in time over the span; Kepler solved once per sample, never inside the
 * ODE) and the statistics grid (uniform in E over the last `summaryOrbits` orbits), merged into one
 * ascending grid so that a single dense pass fills both.
 */
function makeGrids(
  orbit: ThermalCase["orbit"],
  startE: number,
  spanOrbits: number,
  summaryOrbits: number,
  sampleCount: number,
  statsPointsPerOrbit: number,
  n: number,
): Grids {
  const outputE = anomaliesUniformInTime(orbit, startE, spanOrbits, sampleCount);
  const statsCount = statsPointsPerOrbit * summaryOrbits + 1;
  const statsStart = startE + TWO_PI * (spanOrbits - summaryOrbits);
  const statsE = new Float64Array(statsCount);
  for (let k = 0; k < statsCount; k++) statsE[k] = statsStart + (TWO_PI * k) / statsPointsPerOrbit;

  const total = sampleCount + statsCount;
  const xs = new Float64Array(total);
  const origin = new Int32Array(total); // ≥ 0: output index; < 0: −(stats index) − 1
  let i = 0;
  let j = 0;
  for (let k = 0; k < total; k++) {
    if (j >= statsCount || (i < sampleCount && outputE[i]! <= statsE[j]!)) {
      xs[k] = outputE[i]!;
      origin[k] = i++;
    } else {
      xs[k] = statsE[j]!;
      origin[k] = -(j++) - 1;
    }
  }
  const dense = { xs, ys: new Float64Array(total * n), components: n };
  return {
    outputE,
    statsE,
    dense,
    scatter() {
      const outputY = new Float64Array(sampleCount * n);
      const statsY = new Float64Array(statsCount * n);
      for (let k = 0; k < total; k++) {
        const o = origin[k]!;
        const target = o >= 0 ? outputY : statsY;
        const index = o >= 0 ? o : -o - 1;
        for (let c = 0; c < n; c++) target[index * n + c] = dense.ys[k * n + c]!;
      }
      return { outputY, statsY };
    },
  };
}

function finish(thermal: ThermalCase, model: SlabModel, grids: Grids, solver: SolverReport): Simulation {
  const { outputY, statsY } = grids.scatter();
  for (let k = 0; k < statsY.length; k++) {
    if (!(statsY[k]! > 0)) throw new CalorbitError("INTEGRATION_FAILED", "the temperature left the physical range (T ≤ 0 K)");
  }
  const summary = cycleSummary({
    model,
    orbit: thermal.orbit,
    statsE: grids.statsE,
    statsY,
    ...(thermal.windowK ? { windowK: thermal.windowK } : {}),
  });
  return { case: thermal, summary, series: buildSeries(thermal, model, grids.outputE, outputY), solver };
}

function buildSeries(thermal: ThermalCase, model: SlabModel, outputE: Float64Array, outputY: Float64Array): Series {
  const count = outputE.length;
  const n = model.system.dimension;
  const { orbit } = thermal;
  const states: StateSeries[] = model.stateNames.map((name) => ({
    name,
    temperatureK: new Float64Array(count),
    equilibriumK: new Float64Array(count),
    absorbedWPerM2: new Float64Array(count),
  }));
  const series: Series = {
    ...orbitColumns(orbit, thermal.star.luminosityW, outputE),
    absorbedWPerM2: states[0]!.absorbedWPerM2,
    temperatureK: states[0]!.temperatureK,
    equilibriumK: states[0]!.equilibriumK,
    states,
  };
  const eq = new Float64Array(n);
  for (let j = 0; j < count; j++) {
    const E = outputE[j]!;
    model.equilibriumAt(E, eq);
    for (let i = 0; i < n; i++) {
      states[i]!.temperatureK[j] = outputY[j * n + i]!;
      states[i]!.equilibriumK[j] = eq[i]!;
      states[i]!.absorbedWPerM2[j] = model.absorbedAt(E, i);
    }
  }
  return series;
}
