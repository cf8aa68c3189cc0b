/**
 * From a thermal case to a temperature history and its summary, for every heat store: builds the
 * model, hands it to the solve its heat store calls for (a slab's ODE cycle, a column's
 * Crank–Nicolson cycle), and reduces the converged cycle to the one summary and the one series.
 * Pure computation: no I/O.
 */
import { cycleSummary, type CycleSummary } from "../analysis/summarise.js";
import { orbitColumns, type AnomalyTrig } from "../analysis/orbitSampling.js";
import { CalorbitError, describeValue, requireNumber, requireObject } from "../errors.js";
import { buildThermalModel, type ThermalModel } from "../model/build.js";
import { REGIMES, type ThermalCase } from "../model/thermalCase.js";
import { eccentricAnomaly } from "../physics/kepler.js";
import { DEFAULT_RELATIVE_TOLERANCE, DEFAULT_SAMPLES, INTEGRATORS, type IntegratorName } from "../defaults.js";
import { columnCycle, DEFAULT_COLUMN_TOLERANCE } from "./columnCycle.js";
import type { ColumnCycleExtras, ConvergedCycle, CycleRequest, SolverReport } from "./cycle.js";
import { isDark, slabCycle } from "./slabCycle.js";
import { PERIODIC_METHODS, type PeriodicMethod } from "../solve/periodicKrylov.js";
import { checkWorkload, explainStepLimit } from "./workload.js";
import { checkProgressHook, ProgressMeter, type ProgressHook, type ProgressStage } from "./progress.js";
import { refuseDarkness } from "../scenario/physical.js";

export type { ProgressHook, ProgressStage };
export { DEFAULT_RELATIVE_TOLERANCE, DEFAULT_SAMPLES, INTEGRATORS, type IntegratorName, type SolverReport, DEFAULT_COLUMN_TOLERANCE };

/**
 * The solve's share of a run's progress; the summary takes the rest. Measured on a 1:1000 spin's
 * 1000-orbit cycle (2 million statistics points): the summary and series took 5-7 s of a 16-23 s
 * run at load 10, a third; on short cycles it is a few per cent, so the line moves on quickly.
 */
const SOLVE_SHARE = 0.75;

export interface SimulateOptions {
  /**
   * Relative tolerance of the temperatures (default 1e-8 for a slab; a column's default is 1e-6,
   * its periodicity and energy closure, since its steps are second order).
   */
  relativeTolerance?: number;
  /**
   * Integrator of a slab: by default Dormand–Prince 5(4), or Radau IIA when the radiative time is a
   * small fraction of the cycle; "odex" (extrapolation, an independent code) for a cross-check.
   */
  integrator?: IntegratorName;
  /** Points in the output series (uniform in time, both ends included); default 1000, more for a fast-spinning point. */
  samples?: number;
  /** Transient mode (slab only): start at this temperature (K, every cell) and integrate `orbits` orbits; no shooting. */
  transient?: { startK: number; orbits: number };
  /**
   * Periodic solve of slab cells that exchange heat: "dense" (variational equations, ~n³ per step)
   * or "newton-krylov" (matrix-free, ~n per product); by default chosen by the number of cells. A cross-check.
   */
  periodicMethod?: PeriodicMethod;
  /**
   * Called as the solve goes with the share done (rising, 1 at the end) and the stage: after each
   * cycle of the shooting, each orbit of a seasonal spin-up, each cycle of a column. Never inside a step.
   */
  onProgress?: ProgressHook;
}

/** One cell's history (a surface, a hemisphere, a band). */
export interface StateSeries {
  name: string;
  temperatureK: Float64Array;
  equilibriumK: Float64Array;
  absorbedWPerM2: Float64Array;
}

/** The history, uniform in time; all arrays the same length. Top-level T, T_eq, absorbed are cell 0's. */
export interface Series {
  /** Time since the start of the run, s (a seasonal or transient run's output starts after its spin-up). */
  timeSeconds: Float64Array;
  meanAnomalyRad: Float64Array;
  trueAnomalyRad: Float64Array;
  distanceM: Float64Array;
  stellarFluxWPerM2: Float64Array;
  absorbedWPerM2: Float64Array;
  temperatureK: Float64Array;
  equilibriumK: Float64Array;
  states: StateSeries[];
  /** Conduction column only: temperature series at the requested depths. */
  depths?: { depthM: number; temperatureK: Float64Array }[];
}

export interface Simulation {
  case: ThermalCase;
  summary: CycleSummary;
  series: Series;
  solver: SolverReport;
  /** Conduction column only: layer temperatures over the cycle (thinned) for a depth × time map. */
  heatMap?: ColumnCycleExtras["heatMap"];
}

/** Runs one case to its periodic steady state (or through a transient) and summarises it. */
export function simulate(thermal: ThermalCase, options: SimulateOptions = {}): Simulation {
  requireObject("thermal", thermal, ["star", "orbit", "surface"], "a ThermalCase (resolveScenario(document).thermal) with star, orbit and surface");
  if (!(REGIMES as readonly unknown[]).includes(thermal.regime)) {
    throw new CalorbitError("INVALID_ARGUMENT", "unknown regime", [{ path: "thermal.regime", given: describeValue(thermal.regime), allowed: REGIMES.join(", ") }]);
  }
  requireObject("options", options, [], "an options object (or nothing)");
  if (options.integrator !== undefined && !INTEGRATORS.includes(options.integrator)) {
    throw new CalorbitError("INVALID_ARGUMENT", "unknown integrator", [
      { path: "integrator", given: String(options.integrator), allowed: INTEGRATORS.join(", ") },
    ]);
  }
  const model = buildThermalModel(thermal);
  const rtol = options.relativeTolerance ?? (model.kind === "column" ? DEFAULT_COLUMN_TOLERANCE : DEFAULT_RELATIVE_TOLERANCE);
  requireNumber("tolerance", rtol, (t) => t >= 1e-13 && t <= 1e-2, "1e-13 ≤ tolerance ≤ 1e-2");
  if (options.periodicMethod !== undefined && !PERIODIC_METHODS.includes(options.periodicMethod)) {
    throw new CalorbitError("INVALID_ARGUMENT", "unknown periodic method", [
      { path: "periodicMethod", given: String(options.periodicMethod), allowed: PERIODIC_METHODS.join(", ") },
    ]);
  }
  if (options.transient) {
    requireNumber("from", options.transient.startK, (t) => t > 0, "a temperature > 0 K");
    requireNumber("orbits", options.transient.orbits, (k) => Number.isInteger(k) && k >= 1 && k <= 100_000, "an integer from 1 to 100,000");
  }
  checkProgressHook(options.onProgress);
  const { orbit } = thermal;
  const progress = new ProgressMeter(options.onProgress);
  progress.phase(0, SOLVE_SHARE);
  const request: CycleRequest = {
    relativeTolerance: rtol,
    startE: eccentricAnomaly(orbit.meanAnomalyAtStartRad, orbit.eccentricity),
    samples(spanOrbits) {
      const perSolarDay = model.solarDaySeconds ? Math.ceil((48 * spanOrbits * orbit.periodSeconds) / model.solarDaySeconds) : 0;
      const count = options.samples ?? Math.min(200_000, Math.max(DEFAULT_SAMPLES, perSolarDay));
      requireNumber("samples", count, (k) => Number.isInteger(k) && (k === 0 || (k >= 2 && k <= 10_000_000)), "0, or an integer from 2 to 10,000,000");
      return count;
    },
    ...(options.integrator ? { integrator: options.integrator } : {}),
    ...(options.transient ? { transient: options.transient } : {}),
    ...(options.periodicMethod ? { periodicMethod: options.periodicMethod } : {}),
    progress,
  };
  checkWorkload(thermal, model, options.transient !== undefined);
  if (!options.transient) refuseDarkness(thermal, model.surface);
  let cycle: ConvergedCycle;
  try {
    switch (model.kind) {
      case "slab":
        cycle = slabCycle(thermal, model, request);
        break;
      case "column":
        cycle = columnCycle(thermal, model, request);
        break;
    }
  } catch (error) {
    throw explainStepLimit(error, thermal, model, rtol);
  }
  progress.phase(SOLVE_SHARE, 1 - SOLVE_SHARE);
  progress.report(0, "summary");
  const simulation = finish(thermal, model, cycle);
  progress.finish("summary");
  return simulation;
}

function finish(thermal: ThermalCase, model: ThermalModel, cycle: ConvergedCycle): Simulation {
  // Only a cell that nothing heats may sit at 0 K (exactly, by construction); anywhere else T ≤ 0 is a failed solve.
  const n = model.stateNames.length;
  const dark = model.surface.cells.map((_, i) => model.kind === "slab" && isDark(model, i));
  for (let k = 0; k < cycle.statsY.length; k++) {
    const y = cycle.statsY[k]!;
    if (!(y > 0) && !(y === 0 && dark[k % n])) throw new CalorbitError("INTEGRATION_FAILED", "the temperature left the physical range (T ≤ 0 K)");
  }
  const summary = cycleSummary({
    model,
    orbit: thermal.orbit,
    statsE: cycle.statsE,
    statsY: cycle.statsY,
    statsDerivative: cycle.statsDerivative,
    ...(cycle.cornerMinima ? { cornerMinima: cycle.cornerMinima } : {}),
    mode: cycle.solver.mode,
    ...(cycle.column ? { budget: cycle.column.energy } : {}),
    ...(thermal.windowK ? { windowK: thermal.windowK } : {}),
  });
  const series = buildSeries(thermal, model, cycle.outputE, cycle.outputY, cycle.outputTrig);
  if (cycle.outputStartSeconds !== 0) for (let j = 0; j < series.timeSeconds.length; j++) series.timeSeconds[j]! += cycle.outputStartSeconds;
  if (cycle.seasonal) summary.seasonal = cycle.seasonal;
  const simulation: Simulation = { case: thermal, summary, series, solver: cycle.solver };
  if (cycle.column) {
    const c = cycle.column;
    summary.thermalInertiaSurface = c.thermalInertiaSurface;
    summary.skinDepths = c.skinDepths;
    summary.depthProfile = c.depthProfile;
    summary.deepMeanK = c.depthProfile.at(-1)!.meanK;
    series.depths = c.depths;
    simulation.heatMap = c.heatMap;
  }
  return simulation;
}

function buildSeries(thermal: ThermalCase, model: ThermalModel, outputE: Float64Array, outputY: Float64Array, trig?: AnomalyTrig): Series {
  const count = outputE.length;
  const n = model.stateNames.length;
  const { orbit } = thermal;
  const states: StateSeries[] = model.stateNames.map((name) => ({
    name,
    temperatureK: new Float64Array(count),
    equilibriumK: new Float64Array(count),
    absorbedWPerM2: new Float64Array(count),
  }));
  const series: Series = {
    ...orbitColumns(orbit, thermal.star.luminosityW, outputE, trig),
    absorbedWPerM2: states[0]!.absorbedWPerM2,
    temperatureK: states[0]!.temperatureK,
    equilibriumK: states[0]!.equilibriumK,
    states,
  };
  const eq = new Float64Array(n);
  // Each cell's forcing once per sample: its equilibrium follows from its absorbed flux when the cells do not exchange heat.
  const ofAbsorbed = model.equilibriumOfAbsorbed;
  for (let j = 0; j < count; j++) {
    const E = outputE[j]!;
    if (!ofAbsorbed) model.equilibriumAt(E, eq);
    for (let i = 0; i < n; i++) {
      const absorbed = model.absorbedAt(E, i);
      states[i]!.temperatureK[j] = outputY[j * n + i]!;
      states[i]!.equilibriumK[j] = ofAbsorbed ? ofAbsorbed(absorbed) : eq[i]!;
      states[i]!.absorbedWPerM2[j] = absorbed;
    }
  }
  return series;
}
