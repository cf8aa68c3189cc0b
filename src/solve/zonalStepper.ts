/**
 * One orbit of the zonal climate, stepped in the eccentric anomaly E with a two-stage, L-stable,
 * stiffly accurate SDIRK method of order 2 (Alexander 1977, SIAM J. Numer. Anal. 14, 1006;
 * γ = 1 − 1/√2), applied to the heat each band stores:
 *   dH_j/dE = (dt/dE) R_j(T),  R_j = (1 − α_j(T_j)) Q_j(E) + q − I(T_j) + transport_j(T),
 * with dt/dE = (1 − e cos E)/n. Each stage solves a tridiagonal nonlinear system by Newton's
 * method (diffusion couples only neighbours), so a step costs O(N). L-stability keeps the stiff
 * diffusion modes of a large D quiet at any step.
 *
 * Because the stages update H (not T), the scheme's own quadrature conserves energy exactly: over
 * a periodic orbit the weighted sums of absorbed and emitted flux agree to the periodicity defect,
 * and the transport sums to zero to rounding. That budget is what the summary reports.
 *
 * A cycle also stores what the linearised cycle needs (the stage matrices' diagonals), so the
 * derivative of the orbit map applied to a vector, (∂Φ/∂T₀) v, costs two tridiagonal solves per step
 * and no function evaluations: the matrix-free product the periodic solver's Krylov method uses.
 */
import { CalorbitError } from "../errors.js";
import type { BandAlbedo } from "../physics/climateAlbedo.js";
import type { HeatCapacityLaw } from "../physics/climateHeatCapacity.js";
import type { OutgoingLaw } from "../physics/climateOutgoing.js";
import type { BandGrid, MeridionalDiffusion } from "../physics/climateBands.js";
import type { ZonalInsolation } from "../physics/climateInsolation.js";
import { solveSymmetricTridiagonal } from "./tridiagonal.js";

const GAMMA = 1 - Math.SQRT1_2;
const TWO_PI = 2 * Math.PI;
/** Stage Newton: stop when the largest correction is below this, K (what remains is about its square). */
const STAGE_TOLERANCE_K = 1e-7;
const STAGE_MAX_ITERATIONS = 40;

/** Everything that defines the band system (SI). */
export interface ZonalSystem {
  grid: BandGrid;
  diffusion: MeridionalDiffusion;
  /** Albedo law of each band (bound to its x). */
  albedo: readonly BandAlbedo[];
  outgoing: OutgoingLaw;
  heatCapacity: HeatCapacityLaw;
  internalFluxWPerM2: number;
  insolation: ZonalInsolation;
  eccentricity: number;
  meanMotionRadPerSecond: number;
  /** E at the start of the cycle, rad. */
  startE: number;
}

/** The E grid of one orbit and everything about it that does not depend on the temperatures. */
export interface StepGrid {
  steps: number;
  stepE: number;
  /** Insolation at each step's two stages, [step * N + band], W m⁻². */
  q1: Float64Array;
  q2: Float64Array;
  /** dt/dE at the two stages, s rad⁻¹. */
  s1: Float64Array;
  s2: Float64Array;
}

export function stepGrid(system: ZonalSystem, steps: number): StepGrid {
  const n = system.grid.count;
  const stepE = TWO_PI / steps;
  const q1 = new Float64Array(steps * n);
  const q2 = new Float64Array(steps * n);
  const s1 = new Float64Array(steps);
  const s2 = new Float64Array(steps);
  const row = new Float64Array(n);
  const e = system.eccentricity;
  const dtdE = (E: number): number => (1 - e * Math.cos(E)) / system.meanMotionRadPerSecond;
  for (let k = 0; k < steps; k++) {
    const E0 = system.startE + k * stepE;
    system.insolation.at(E0 + GAMMA * stepE, row);
    q1.set(row, k * n);
    system.insolation.at(E0 + stepE, row);
    q2.set(row, k * n);
    s1[k] = dtdE(E0 + GAMMA * stepE);
    s2[k] = dtdE(E0 + stepE);
  }
  return { steps, stepE, q1, q2, s1, s2 };
}

/** What one cycle leaves behind: the end state, the record of the orbit and its linearisation. */
export interface CycleRecord {
  /** Temperatures at the step ends, [(step) * N + band], steps + 1 rows (row 0 = the start). */
  temperatureK: Float64Array;
  /** Σ over stages of b_i Δt_i (the scheme's quadrature of time), s. */
  quadratureSeconds: number;
  /** Quadrature sums (× seconds) of the area-weighted absorbed stellar flux and outgoing radiation, and of each band's temperature. */
  absorbedSum: number;
  emittedSum: number;
  internalSum: number;
  bandTemperatureSum: Float64Array;
  /** Per step: C(T_n), the stage matrices' diagonals and the stage-1 Jacobian's diagonal (linearisation). */
  capacityStart: Float64Array;
  matrix1: Float64Array;
  matrix2: Float64Array;
  jacobian1: Float64Array;
  /** Each band's min and max over step ends and stages, K. */
  minK: Float64Array;
  maxK: Float64Array;
}

export function cycleRecord(n: number, steps: number): CycleRecord {
  return {
    temperatureK: new Float64Array((steps + 1) * n),
    quadratureSeconds: 0,
    absorbedSum: 0,
    emittedSum: 0,
    internalSum: 0,
    bandTemperatureSum: new Float64Array(n),
    capacityStart: new Float64Array(steps * n),
    matrix1: new Float64Array(steps * n),
    matrix2: new Float64Array(steps * n),
    jacobian1: new Float64Array(steps * n),
    minK: new Float64Array(n),
    maxK: new Float64Array(n),
  };
}

/** Scratch of the stepping, allocated once per band count. */
interface Scratch {
  h0: Float64Array;
  rhs: Float64Array;
  t1: Float64Array;
  t2: Float64Array;
  r1: Float64Array;
  residual: Float64Array;
  diag: Float64Array;
  off: Float64Array;
  delta: Float64Array;
  thomas: Float64Array;
  transport: Float64Array;
  v: Float64Array;
  w: Float64Array;
  u: Float64Array;
}

export class ZonalStepper {
  private readonly scratch: Scratch;
  private readonly n: number;
  /** Cumulative work: stages solved and Newton iterations taken. */
  stages = 0;
  newtonIterations = 0;

  constructor(readonly system: ZonalSystem) {
    const n = system.grid.count;
    this.n = n;
    const make = (): Float64Array => new Float64Array(n);
    this.scratch = {
      h0: make(), rhs: make(), t1: make(), t2: make(), r1: make(), residual: make(), diag: make(),
      off: new Float64Array(Math.max(n - 1, 1)), delta: make(), thomas: make(), transport: make(), v: make(), w: make(), u: make(),
    };
  }

  /**
   * Integrates one orbit on `grid` from the temperatures `start`, filling `record` (which must be
   * sized for the grid); returns the record's last row (a view, the end state).
   */
  cycle(grid: StepGrid, start: ArrayLike<number>, record: CycleRecord): Float64Array {
    const n = this.n;
    const heatCapacity = this.system.heatCapacity;
    const s = this.scratch;
    const T = record.temperatureK;
    for (let j = 0; j < n; j++) {
      T[j] = start[j]!;
      record.minK[j] = start[j]!;
      record.maxK[j] = start[j]!;
      record.bandTemperatureSum[j] = 0;
    }
    record.quadratureSeconds = 0;
    record.absorbedSum = 0;
    record.emittedSum = 0;
    record.internalSum = 0;

    for (let step = 0; step < grid.steps; step++) {
      const row = step * n;
      const next = row + n;
      const dt1 = grid.stepE * grid.s1[step]!; // Δt-like weights at each stage (s)
      const dt2 = grid.stepE * grid.s2[step]!;
      // Stage 1: H(T1) − γ dt1 R(T1) = H(T_n).
      for (let j = 0; j < n; j++) {
        const tn = T[row + j]!;
        s.h0[j] = heatCapacity.heat(tn);
        record.capacityStart[row + j] = heatCapacity.capacity(tn);
        s.rhs[j] = s.h0[j]!;
        s.t1[j] = tn;
      }
      this.solveStage(s.t1, s.rhs, GAMMA * dt1, grid.q1, row, record.matrix1);
      // Stage-1 flux R1 and Jacobian diagonal (kept for the linearisation), and the quadrature.
      this.flux(s.t1, grid.q1, row, s.r1, record.jacobian1, (1 - GAMMA) * dt1, record);
      // Stage 2: H(T2) − γ dt2 R(T2) = H(T_n) + (1 − γ) dt1 R1.
      for (let j = 0; j < n; j++) {
        s.rhs[j] = s.h0[j]! + (1 - GAMMA) * dt1 * s.r1[j]!;
        // Linear extrapolation of the stage value to the step's end as the first guess.
        s.t2[j] = T[row + j]! + (s.t1[j]! - T[row + j]!) / GAMMA;
        if (!(s.t2[j]! > 0)) s.t2[j] = s.t1[j]!;
      }
      this.solveStage(s.t2, s.rhs, GAMMA * dt2, grid.q2, row, record.matrix2);
      this.flux(s.t2, grid.q2, row, s.residual, null, GAMMA * dt2, record);
      for (let j = 0; j < n; j++) {
        const t = s.t2[j]!;
        T[next + j] = t;
        const t1 = s.t1[j]!;
        if (t < record.minK[j]!) record.minK[j] = t;
        if (t > record.maxK[j]!) record.maxK[j] = t;
        if (t1 < record.minK[j]!) record.minK[j] = t1;
        if (t1 > record.maxK[j]!) record.maxK[j] = t1;
      }
    }
    return T.subarray(grid.steps * n, (grid.steps + 1) * n);
  }

  /**
   * R(T) at one stage into `out`, its diagonal ∂R/∂T into `jacobianOut` (when given), and the
   * stage's share `weightSeconds` of the quadrature sums.
   */
  private flux(t: Float64Array, qTable: Float64Array, row: number, out: Float64Array, jacobianOut: Float64Array | null, weightSeconds: number, record: CycleRecord): void {
    const n = this.n;
    const { diffusion, outgoing, albedo, internalFluxWPerM2: q } = this.system;
    const weights = this.system.grid.areaFraction;
    const k = diffusion.coupling;
    const transport = this.scratch.transport;
    applyTransport(k, t, transport, n);
    let absorbed = 0;
    let emitted = 0;
    for (let j = 0; j < n; j++) {
      const tj = t[j]!;
      const insolation = qTable[row + j]!;
      const band = albedo[j]!;
      const a = (1 - band.value(tj)) * insolation;
      const i = outgoing.flux(tj);
      out[j] = a + q - i + transport[j]!;
      absorbed += weights[j]! * a;
      emitted += weights[j]! * i;
      record.bandTemperatureSum[j]! += weightSeconds * tj;
      if (jacobianOut) {
        const couplingSum = (j > 0 ? k[j - 1]! : 0) + (j < n - 1 ? k[j]! : 0);
        jacobianOut[row + j] = -band.slope(tj) * insolation - outgoing.slope(tj) - couplingSum;
      }
    }
    record.absorbedSum += weightSeconds * absorbed;
    record.emittedSum += weightSeconds * emitted;
    record.internalSum += weightSeconds * q;
    record.quadratureSeconds += weightSeconds;
  }

  /**
   * Newton's method for H(T) − h R(T) = rhs, from the guess in `t` (updated in place); stores the
   * final iteration matrix's diagonal (C − h ∂R/∂T) in `matrixOut` at `row`.
   */
  private solveStage(t: Float64Array, rhs: Float64Array, h: number, qTable: Float64Array, row: number, matrixOut: Float64Array): void {
    const n = this.n;
    const s = this.scratch;
    const { diffusion, heatCapacity, outgoing, albedo, internalFluxWPerM2: q } = this.system;
    const k = diffusion.coupling;
    for (let j = 0; j < n - 1; j++) s.off[j] = -h * k[j]!;
    this.stages++;
    for (let iteration = 1; iteration <= STAGE_MAX_ITERATIONS; iteration++) {
      applyTransport(k, t, s.transport, n);
      for (let j = 0; j < n; j++) {
        const tj = t[j]!;
        const insolation = qTable[row + j]!;
        const band = albedo[j]!;
        const r = (1 - band.value(tj)) * insolation + q - outgoing.flux(tj) + s.transport[j]!;
        s.residual[j] = heatCapacity.heat(tj) - h * r - rhs[j]!;
        const couplingSum = (j > 0 ? k[j - 1]! : 0) + (j < n - 1 ? k[j]! : 0);
        const dr = -band.slope(tj) * insolation - outgoing.slope(tj) - couplingSum;
        s.diag[j] = heatCapacity.capacity(tj) - h * dr;
      }
      solveSymmetricTridiagonal(s.diag, s.off, s.residual, s.delta, s.thomas);
      let largest = 0;
      for (let j = 0; j < n; j++) {
        let d = s.delta[j]!;
        // Never step below half the current temperature (a far guess on a stiff radiator).
        if (t[j]! - d < 0.5 * t[j]!) d = 0.5 * t[j]!;
        t[j] = t[j]! - d;
        largest = Math.max(largest, Math.abs(d));
      }
      this.newtonIterations++;
      // Newton converges quadratically: after a correction below the tolerance what remains is its square.
      if (largest <= STAGE_TOLERANCE_K) {
        for (let j = 0; j < n; j++) matrixOut[row + j] = s.diag[j]!;
        return;
      }
      if (!Number.isFinite(largest)) break;
    }
    throw new CalorbitError(
      "INTEGRATION_FAILED",
      `a zonal step did not converge (Newton on the band temperatures, ${STAGE_MAX_ITERATIONS} iterations): take more steps per orbit (climate.stepsPerOrbit) or a larger heat capacity`,
    );
  }

  /**
   * The linearised orbit map applied to `v`: (∂Φ/∂T₀) v into `out`, along the cycle stored in
   * `record` on `grid`. Uses only stored diagonals: two tridiagonal solves per step.
   */
  linearCycle(grid: StepGrid, record: CycleRecord, v: ArrayLike<number>, out: Float64Array): void {
    const n = this.n;
    const s = this.scratch;
    const k = this.system.diffusion.coupling;
    const x = s.v;
    for (let j = 0; j < n; j++) x[j] = v[j]!;
    for (let step = 0; step < grid.steps; step++) {
      const row = step * n;
      const dt1 = grid.stepE * grid.s1[step]!;
      const dt2 = grid.stepE * grid.s2[step]!;
      // dH_n = C(T_n) v;  M1 dT1 = dH_n
      for (let j = 0; j < n; j++) s.w[j] = record.capacityStart[row + j]! * x[j]!;
      for (let j = 0; j < n - 1; j++) s.off[j] = -GAMMA * dt1 * k[j]!;
      solveSymmetricTridiagonal(record.matrix1, s.off, s.w, s.u, s.thomas, row);
      // J1 dT1 (tridiagonal: stored diagonal, couplings off the diagonal)
      for (let j = 0; j < n; j++) {
        let jv = record.jacobian1[row + j]! * s.u[j]!;
        if (j > 0) jv += k[j - 1]! * s.u[j - 1]!;
        if (j < n - 1) jv += k[j]! * s.u[j + 1]!;
        s.w[j] = s.w[j]! + (1 - GAMMA) * dt1 * jv;
      }
      for (let j = 0; j < n - 1; j++) s.off[j] = -GAMMA * dt2 * k[j]!;
      solveSymmetricTridiagonal(record.matrix2, s.off, s.w, x, s.thomas, row);
    }
    for (let j = 0; j < n; j++) out[j] = x[j]!;
  }
}

/** Transport into each band for temperatures t (see climateBands.applyDiffusion; inlined for the hot loop). */
function applyTransport(k: Float64Array, t: ArrayLike<number>, out: Float64Array, n: number): void {
  for (let j = 0; j < n; j++) out[j] = 0;
  for (let j = 0; j < n - 1; j++) {
    const flow = k[j]! * (t[j + 1]! - t[j]!);
    out[j]! += flow;
    out[j + 1]! -= flow;
  }
}
