/**
 * What every heat store's solve hands back to `simulate`: the converged cycle sampled on the
 * statistics grid (uniform in E, with dT/dE for refined extremes) and on the output grid (uniform in
 * time), and the solver report. `simulate` turns it into the one summary and the one series.
 */
import type { DepthRow } from "../analysis/summarise.js";
import type { AnomalyTrig } from "../analysis/orbitSampling.js";
import type { IntegratorName } from "../solve/periodic.js";
import type { PeriodicMethod } from "../solve/periodicKrylov.js";
import type { ProgressMeter } from "./progress.js";

export interface SolverReport {
  /** periodic: the exact cycle; seasonal: a non-commensurate spin, integrated orbit after orbit until the start is forgotten; transient: as asked. */
  mode: "periodic" | "seasonal" | "transient";
  /** The time stepper: an ODE integrator for a slab, "crank-nicolson" for a conduction column. */
  integrator: IntegratorName | "crank-nicolson";
  requestedTolerance: number;
  /** Relative tolerance given to the ODE integrator; null for a column (fixed steps). */
  odeRelativeTolerance: number | null;
  /** Iterations toward the periodic state, each integrating one cycle (slab: Newton shooting; column: accelerated cycles). */
  iterations: number;
  orbitsIntegrated: number;
  /** |T(cycle) − T(0)| / T on the converged cycle (periodic), or the last orbit-to-orbit change of the orbit-mean temperature (seasonal; null with one orbit). */
  periodicityResidual: number | null;
  steps: number;
  rejectedSteps: number;
  evaluations: number;
  /** Column only: layers and fixed steps per cycle. */
  layers?: number;
  stepsPerCycle?: number;
}

export interface CycleRequest {
  relativeTolerance: number;
  integrator?: IntegratorName;
  /** Start in the eccentric anomaly (from the orbit's mean anomaly at t = 0). */
  startE: number;
  /** Points in the output series for a span of this many orbits. */
  samples(spanOrbits: number): number;
  transient?: { startK: number; orbits: number };
  /** Periodic solve of coupled slab cells (a cross-check); default by the state's size (`choosePeriodicMethod`). */
  periodicMethod?: PeriodicMethod;
  /** Where the solve is, reported at coarse points (after a cycle, an orbit, a column); `simulate` ends it. */
  progress?: ProgressMeter;
}

/** The column's extras: depth profile, skin depths, layer temperatures over the cycle. */
export interface ColumnCycleExtras {
  thermalInertiaSurface: number;
  skinDepths: { diurnalM: number | null; orbitalM: number };
  depthProfile: DepthRow[];
  /** Temperature series at the requested depths, on the output grid. */
  depths: { depthM: number; temperatureK: Float64Array }[];
  /** Layer temperatures over the cycle, thinned to at most 240 times: temperatureK[t][layer]. */
  heatMap: { depthsM: number[]; timesSeconds: number[]; temperatureK: number[][] };
  /** The column's own energy budget over the cycle (its scheme's, including the interior flux). */
  energy: { meanAbsorbedWPerM2: number; meanEmittedWPerM2: number; residual: number };
}

export interface ConvergedCycle {
  /** Statistics grid, uniform in E over the summarised cycle, both ends included. */
  statsE: Float64Array;
  /** States at those points, component-major: statsY[k·n + i]; statsDerivative likewise, dT/dE in K rad⁻¹. */
  statsY: Float64Array;
  statsDerivative: Float64Array;
  /** Per cell, a minimum the statistics grid cannot see (a column's sunrise, between fixed steps), or null. */
  cornerMinima?: ({ E: number; K: number } | null)[];
  /** Output grid (uniform in time) and the states there. */
  outputE: Float64Array;
  outputY: Float64Array;
  /** sin E and cos E on the output grid, when the solve has them (the orbit columns then need no more). */
  outputTrig?: AnomalyTrig;
  /** Time of the first output sample since the run's start, s (seasonal and transient runs: after the spin-up). */
  outputStartSeconds: number;
  solver: SolverReport;
  column?: ColumnCycleExtras;
  /** Seasonal runs: the orbits summarised (the beat of spin and orbit) and the spread of their orbit means. */
  seasonal?: { orbits: number; orbitMeanK: { minK: number; maxK: number } };
}
