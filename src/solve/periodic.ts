/**
 * Periodic steady state by shooting: find y₀ with Φ(y₀) = y₀, where Φ integrates one forcing
 * cycle. Newton's method on g(y₀) = Φ(y₀) − y₀ with the exact derivative from the variational
 * equations S' = J S (S = ∂y/∂y₀), so a body whose radiative time is 100 cycles converges in as
 * few iterations as one that forgets its start within a cycle: orbit-after-orbit relaxation
 * would need ~τ/P orbits, Newton needs a handful (Keller, Numerical Solution of Two Point
 * Boundary Value Problems, 1976, ch. 1; standard).
 *
 * One-state problems keep a bracket (g decreases through its root, because a dissipative map
 * has 0 < Φ' < 1) and bisect when a Newton step would leave it, so they cannot diverge.
 */
import { CalorbitError } from "../errors.js";
import { INTEGRATORS, type IntegratorName } from "../defaults.js";
import { integrateDormandPrince } from "./dormandPrince.js";
import { integrateOdex } from "./odexIntegrator.js";
import { integrateRadau } from "./radau.js";
import { addWork, emptyWork, type DenseSamples, type Integrator, type OdeSystem, type SolverWork } from "./system.js";

/**
 * Above this (max |∂f/∂y| × cycle length, about P/τ) the explicit pair gives way to Radau IIA.
 * Measured on lumped e = 0.3 and e = 0.7 orbits at tolerance 1e-8 (whole periodic solves): the two
 * cost the same near 700–1000; Dormand–Prince is 3–5× faster below 50, Radau 4× faster at 1e4.
 */
export const STIFFNESS_THRESHOLD = 800;
/**
 * Shares of the requested tolerance. The energy residual of a cycle is ≈ 4(τ/P)(|g| + δ)/T, with g
 * the periodicity defect and δ the integration error; with |g|, δ ≤ share·rtol·(1 − Φ') and
 * (τ/P)(1 − Φ') ≤ 1, these shares keep it near rtol/2 while the temperatures meet rtol.
 * Measured over 271 cases of the benchmark grid (e ≤ 0.9, C = 1e6–1e10 J m⁻² K⁻¹) against runs at
 * tolerance 1e-12: ODE share 0.01 gives temperatures within 8e-10 and residuals within 3e-9 at
 * rtol 1e-8 (0.001 was no more accurate and cost 40 % more evaluations; 0.1 gave 2.4e-9).
 */
export const ODE_TOLERANCE_SHARE = 0.01;
/**
 * Sunrise and sunset put corners in a point's forcing, where an embedded error estimate underrates
 * the error of a step across them. Measured on a point with 2001 solar days per orbit: share 0.01
 * left the mean temperature 2e-7 off at rtol 1e-8, 1e-3 left 1e-8, 1e-4 left 2e-9.
 */
export const CORNER_ODE_TOLERANCE_SHARE = 1e-4;
/**
 * Share when the corners are step ends (breakpoints): the state just after a sunrise still moves
 * fastest there. Measured on a 2 cm skin at a 3:2 resonance (night minimum 29 K): share 0.01 left
 * the minimum 1.2e-8 from odex at 1e-11, 1e-3 within 1e-8, at 4× fewer evaluations than share 1e-4
 * with the corners inside steps.
 */
export const ARC_ODE_TOLERANCE_SHARE = 1e-3;
/**
 * Share when the corners are step ends and the system crosses its dark arcs exactly (`exactArc`:
 * a point's nights in closed form), so only the days are stepped and the night minimum no longer
 * carries a stepped night's error. Measured on ten points (365, 1000 and 20 solar days per orbit,
 * the 3:2 resonant rock at both poles, latitudes 40°–85° at obliquities 20°–30°, a 2 cm skin)
 * against runs at share 1e-5: share 3e-3 left the mean, minimum and maximum within 8e-10 at rtol
 * 1e-8 (1e-3 within 3e-10, 1e-2 within 2.8e-9), at 17 % fewer evaluations than 1e-3.
 */
export const EXACT_NIGHT_ODE_TOLERANCE_SHARE = 3e-3;
/** Share for a plain integration (transient, seasonal): no periodicity defect to leave room for. */
const PLAIN_ODE_TOLERANCE_SHARE = 0.1;
export const CONVERGENCE_SHARE = 0.1;
/** Below this the ODE tolerance is not tightened further (double precision). */
export const FINEST_ODE_TOLERANCE = 1e-14;
export const MAX_ITERATIONS = 40;
/** Early passes need not be finer than this: they only bring y₀ near the fixed point. */
const COARSEST_ODE_TOLERANCE = 1e-6;
/** Relative error assumed for the linear-response first guess when choosing the first pass's tolerance. */
export const FIRST_GUESS_ERROR = 1e-3;

/** "dormand-prince": explicit 5(4) pair; "radau": implicit Radau IIA; "odex": extrapolation (the odex package), on request only. */
export { INTEGRATORS, type IntegratorName };

export interface PeriodicProblem {
  system: OdeSystem;
  /** Independent variable at the start of the cycle (eccentric anomaly, rad). */
  start: number;
  /** Length of one forcing cycle in the independent variable (2π per orbit). */
  cycleLength: number;
  /** First guess of the periodic start state. */
  guess: Float64Array;
  /** Typical magnitude of each state component (sets absolute tolerances), e.g. a temperature in K. */
  scale: Float64Array;
  /** Estimated max |∂f/∂y| × cycleLength: the number of relaxation times in one cycle. */
  stiffness: number;
  /** The forcing has corners (a point's sunrise and sunset): integrate more finely, unless they are all in `breakpoints`. */
  forcingHasCorners?: boolean;
  /**
   * Every corner of the forcing inside the cycle (ascending, strictly inside it; empty when it has
   * none): each becomes a step end, so inside each arc the forcing is smooth and the corners cost
   * nothing extra (the tolerance and the choice of integrator are then those of a smooth forcing).
   */
  breakpoints?: Float64Array;
  /** Step cap of one cycle's integration (default: the integrator's own, 200,000). */
  maxStepsPerCycle?: number;
  /** Expected 1 − ∂Φ/∂y₀ (how much of a start error one cycle forgets), e.g. 1 − exp(−cycle/τ); sets the first pass's tolerance. Default 1. */
  memoryEstimate?: number;
}

export interface PeriodicOptions {
  relativeTolerance: number;
  /** Overrides the choice by stiffness (a cross-check; the default choice is the fast one). */
  integrator?: IntegratorName;
  /** Dense output of the state on the converged cycle. */
  samples?: DenseSamples;
  /** Called after each whole cycle integrated, with the count so far (progress; never inside a cycle). */
  onCycle?: (cycles: number) => void;
}

export interface PeriodicResult {
  /** The periodic start state y₀. */
  start: Float64Array;
  /** Newton iterations (each one integrates one cycle). */
  iterations: number;
  /** Cycles integrated in all (iterations plus any extra pass for dense output). */
  cyclesIntegrated: number;
  /**
   * max_i |Φ(y₀) − y₀|_i / scale_i on the last cycle integrated, or, when the last Newton
   * correction was applied without another cycle, the bound (|Δ|/scale)² on what remains.
   */
  periodicityResidual: number;
  /** Largest eigen-like contraction: the diagonal of ∂Φ/∂y₀ (1 = no memory loss); empty from the Newton–Krylov solve, which never forms ∂Φ/∂y₀. */
  monodromyDiagonal: Float64Array;
  integrator: IntegratorName;
  odeRelativeTolerance: number;
  work: SolverWork;
}

/** Adds the variational equations S' = J S to a system: state [y (n), S (n×n, row-major)]. */
class WithSensitivity implements OdeSystem {
  readonly dimension: number;
  private readonly jac: Float64Array;
  constructor(private readonly base: OdeSystem) {
    const n = base.dimension;
    this.dimension = n + n * n;
    this.jac = new Float64Array(n * n);
  }
  derivative(x: number, y: ArrayLike<number>, out: Float64Array): void {
    const n = this.base.dimension;
    if (this.base.derivativeAndJacobian) {
      this.base.derivativeAndJacobian(x, y, out, this.jac);
    } else {
      this.base.derivative(x, y, out);
      this.base.jacobian(x, y, this.jac);
    }
    if (n === 1) {
      out[1] = this.jac[0]! * y[1]!;
      return;
    }
    for (let r = 0; r < n; r++) {
      for (let c = 0; c < n; c++) {
        let s = 0;
        for (let k = 0; k < n; k++) s += this.jac[r * n + k]! * y[n + k * n + c]!;
        out[n + r * n + c] = s;
      }
    }
  }
  /**
   * A one-state system's exact arc (./system.ts), with the sensitivity carried by the flow's slope
   * ∂y(x)/∂y(x0) (the base's `exactArcSlope`): S(x) = S(x0) · slope.
   */
  exactArc(x0: number, x1: number, y: Float64Array, samples?: DenseSamples): boolean {
    const base = this.base;
    if (base.dimension !== 1 || !base.exactArc || !base.exactArcSlope) return false;
    const start = y[0]!;
    const sensitivity = y[1]!;
    if (!base.exactArc(x0, x1, y, samples)) return false;
    if (samples && samples.components > 1) {
      const { ys, components } = samples;
      for (let k = 0; k < samples.xs.length; k++) ys[k * components + 1] = sensitivity * base.exactArcSlope(start, ys[k * components]!);
    }
    y[1] = sensitivity * base.exactArcSlope(start, y[0]!);
    return true;
  }
  /** Block-diagonal approximation (J on every block, the ∂(JS)/∂y terms dropped): Radau uses it only in its simplified Newton iteration, so the solution it converges to is unchanged. */
  jacobian(x: number, y: ArrayLike<number>, out: Float64Array): void {
    const n = this.base.dimension;
    const m = this.dimension;
    out.fill(0);
    this.base.jacobian(x, y, this.jac);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) out[r * m + c] = this.jac[r * n + c]!;
    for (let block = 0; block < n; block++) {
      // Sensitivity column `block` occupies entries n + k*n + block for k = 0..n−1.
      for (let r = 0; r < n; r++) {
        for (let c = 0; c < n; c++) out[(n + r * n + block) * m + (n + c * n + block)] = this.jac[r * n + c]!;
      }
    }
  }
}

/** The ODE tolerance of a plain (non-shooting) integration meant to meet `rtol` in the temperatures. */
export function plainOdeTolerance(rtol: number, forcingHasCorners: boolean): number {
  return Math.max(FINEST_ODE_TOLERANCE, rtol * (forcingHasCorners ? CORNER_ODE_TOLERANCE_SHARE : PLAIN_ODE_TOLERANCE_SHARE));
}

/**
 * Where a point's forcing has corners (sunrise, sunset) the explicit pair stays in charge far
 * longer: its embedded estimate rejects a step across a corner, while Radau's step doubling can
 * miss one. Measured on the 3:2 resonant demo (stiffness 3e4) at tolerance 1e-8: Dormand–Prince
 * 6e-8 K from an odex reference at 1e-12, Radau 5e-5 K after sunrise, at 5× fewer evaluations.
 */
export const CORNER_STIFFNESS_THRESHOLD = 1e5;

export function chooseIntegrator(stiffness: number, forcingHasCorners = false): IntegratorName {
  return stiffness > (forcingHasCorners ? CORNER_STIFFNESS_THRESHOLD : STIFFNESS_THRESHOLD) ? "radau" : "dormand-prince";
}

function integratorFor(name: IntegratorName): Integrator {
  return name === "radau" ? integrateRadau : name === "odex" ? integrateOdex : integrateDormandPrince;
}

/** Solves n×n M x = b (Gaussian elimination with partial pivoting; n is 1 or 2 in practice). */
function solveSmall(n: number, m: Float64Array, b: Float64Array): Float64Array {
  const a = Float64Array.from(m);
  const x = Float64Array.from(b);
  for (let col = 0; col < n; col++) {
    let best = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r * n + col]!) > Math.abs(a[best * n + col]!)) best = r;
    if (a[best * n + col] === 0) throw new CalorbitError("PERIODIC_NO_CONVERGENCE", "singular shooting Jacobian");
    for (let c = 0; c < n; c++) [a[col * n + c], a[best * n + c]] = [a[best * n + c]!, a[col * n + c]!];
    [x[col], x[best]] = [x[best]!, x[col]!];
    for (let r = col + 1; r < n; r++) {
      const f = a[r * n + col]! / a[col * n + col]!;
      for (let c = col; c < n; c++) a[r * n + c]! -= f * a[col * n + c]!;
      x[r]! -= f * x[col]!;
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    for (let c = r + 1; c < n; c++) x[r]! -= a[r * n + c]! * x[c]!;
    x[r]! /= a[r * n + r]!;
  }
  return x;
}

/**
 * Integrates one cycle from `start`, with or without sensitivities, returning the end state.
 * Exported for the transient mode, which integrates cycles without shooting.
 */
export function integrateCycle(
  system: OdeSystem,
  integrator: IntegratorName,
  from: number,
  to: number,
  y: Float64Array,
  relativeTolerance: number,
  scale: Float64Array,
  samples?: DenseSamples,
  maxSteps?: number,
  breakpoints?: Float64Array,
): SolverWork {
  const n = system.dimension;
  const atol = new Float64Array(n);
  for (let i = 0; i < n; i++) atol[i] = relativeTolerance * (scale[i] ?? 1);
  const integrate = integratorFor(integrator);
  if (!breakpoints || breakpoints.length === 0) {
    return integrate(system, from, y, to, {
      relativeTolerance,
      absoluteTolerance: atol,
      ...(samples ? { samples } : {}),
      ...(maxSteps !== undefined ? { maxSteps } : {}),
    });
  }
  // Arc by arc between the breakpoints; each arc fills the samples in (its start, its end] (the
  // first arc also its start), through views of the sample arrays.
  const work = emptyWork();
  let arcStart = from;
  let nextSample = 0;
  const sampleCount = samples ? samples.xs.length : 0;
  for (let b = 0; b <= breakpoints.length; b++) {
    const arcEnd = b < breakpoints.length ? breakpoints[b]! : to;
    if (!(arcEnd > arcStart) || arcEnd > to) continue;
    let arcSamples: DenseSamples | undefined;
    if (samples) {
      let last = nextSample;
      while (last < sampleCount && samples.xs[last]! <= arcEnd) last++;
      if (b === breakpoints.length) last = sampleCount;
      if (last > nextSample) {
        const c = samples.components;
        arcSamples = { xs: samples.xs.subarray(nextSample, last), ys: samples.ys.subarray(nextSample * c, last * c), components: c };
      }
      nextSample = last;
    }
    if (system.exactArc && system.exactArc(arcStart, arcEnd, y, arcSamples)) {
      // a closed-form arc: one exact step, no right-hand-side evaluations
      work.steps++;
      arcStart = arcEnd;
      continue;
    }
    const remaining = maxSteps === undefined ? undefined : Math.max(1, maxSteps - work.steps - work.rejected);
    addWork(
      work,
      integrate(system, arcStart, y, arcEnd, {
        relativeTolerance,
        absoluteTolerance: atol,
        cycleSpan: to - from,
        ...(arcSamples ? { samples: arcSamples } : {}),
        ...(remaining !== undefined ? { maxSteps: remaining } : {}),
      }),
    );
    arcStart = arcEnd;
  }
  return work;
}

/**
 * The tolerance of a pass that only has to bring y₀ close enough for the next Newton step:
 * integration error δ moves the computed fixed point by about δ/(1 − Φ'), so it is held to a
 * hundredth of the error expected after the step, times the memory factor 1 − Φ'.
 */
export function coarsePassTolerance(expectedError: number, memory: number, finalTolerance: number): number {
  return Math.max(finalTolerance, Math.min(COARSEST_ODE_TOLERANCE, 0.01 * expectedError * memory));
}

/** The sampled trajectory moved from start y₀ to y₀ + Δ: y(x) + S(x) Δ, with S sampled beside y. */
function correctedSamples(internal: DenseSamples, target: DenseSamples, n: number, correction: Float64Array | null): void {
  const m = internal.components;
  const count = target.xs.length;
  for (let k = 0; k < count; k++) {
    for (let i = 0; i < n; i++) {
      let value = internal.ys[k * m + i]!;
      if (correction) for (let c = 0; c < n; c++) value += internal.ys[k * m + n + i * n + c]! * correction[c]!;
      target.ys[k * target.components + i] = value;
    }
  }
}

/**
 * The start's error after a Newton step of (scaled) size Δ: about Δ² in general. A one-state map
 * that contracts strongly (Φ' = ∂Φ/∂y₀ ≪ 1: a surface that forgets its start within the cycle)
 * leaves far less. By the mean value theorem the new start is off by
 * |Φ'(y₀) − Φ'(ξ)|·|y₀ − y*|/(1 − Φ'(y₀)) for some ξ between y₀ and the fixed point y*. For a
 * radiating slab ln Φ' = −∫4εσT³/C dt along the cycle, and a start moved by no more than the scale
 * (Δ ≤ 1) changes only the part of that integral before the start is forgotten, so |Φ'(ξ)| ≤ √Φ'(y₀)
 * (half the exponent) is a wide margin. Measured on points with 365 and 1000 solar days per orbit
 * (Φ' below 1e-300, first step 0.6 and 0.4): the second coarse pass this saves changed no summary
 * temperature by 1e-12.
 */
function newtonError(n: number, plainNewton: boolean, stepSize: number, monodromy: Float64Array): number {
  const quadratic = stepSize * stepSize;
  if (n !== 1 || !plainNewton || !(stepSize <= 1)) return quadratic;
  const slope = Math.abs(monodromy[0]!);
  if (!(slope < 1)) return quadratic;
  return Math.min(quadratic, (stepSize * (slope + Math.sqrt(slope))) / (1 - slope));
}

export function solvePeriodic(problem: PeriodicProblem, options: PeriodicOptions): PeriodicResult {
  const base = problem.system;
  const n = base.dimension;
  const augmented = new WithSensitivity(base);
  const m = augmented.dimension;
  // Corners placed on step ends cost nothing: the forcing is then treated as smooth.
  const corners = problem.forcingHasCorners === true && problem.breakpoints === undefined;
  const integrator = options.integrator ?? chooseIntegrator(problem.stiffness, problem.forcingHasCorners);
  const rtol = options.relativeTolerance;
  const scale = new Float64Array(m);
  for (let i = 0; i < m; i++) scale[i] = i < n ? problem.scale[i]! : 1;
  const userSamples = options.samples;
  // Samples of the whole augmented state, so the last Newton correction can move them exactly.
  const samples: DenseSamples | undefined = userSamples
    ? { xs: userSamples.xs, ys: new Float64Array(userSamples.xs.length * m), components: m }
    : undefined;
  // Dense output of the explicit pair is a polynomial per sample; Radau's caps its steps, so it
  // samples only once a pass is likely to be the last.
  const cheapSampling = integrator !== "radau";

  const y0 = Float64Array.from(problem.guess);
  const y = new Float64Array(m);
  const g = new Float64Array(n);
  const jacobianOfG = new Float64Array(n * n);
  const work = emptyWork();
  const monodromy = new Float64Array(n).fill(1);
  const arcShare = base.exactArc ? EXACT_NIGHT_ODE_TOLERANCE_SHARE : ARC_ODE_TOLERANCE_SHARE;
  const share = corners ? CORNER_ODE_TOLERANCE_SHARE : problem.breakpoints && problem.breakpoints.length > 0 ? arcShare : ODE_TOLERANCE_SHARE;
  const finalToleranceFor = (memory: number): number => Math.max(FINEST_ODE_TOLERANCE, share * rtol * memory);
  // 1 − Φ', the smallest over the states: estimated, then measured on every pass.
  let memory = Math.min(1, Math.max(problem.memoryEstimate ?? 1, 1e-6));
  let passTolerance = coarsePassTolerance(FIRST_GUESS_ERROR, memory, finalToleranceFor(memory));
  let previousPassTolerance = NaN;
  let bracketLow = -Infinity; // n = 1: largest y₀ known with g > 0
  let bracketHigh = Infinity; // n = 1: smallest y₀ known with g < 0
  let cycles = 0;
  let lastResidual = Infinity;
  let previousStepSize = Infinity;
  let previousSampledResidual = Infinity;

  const finish = (iteration: number, residual: number, correction: Float64Array | null): PeriodicResult => {
    if (userSamples && samples) correctedSamples(samples, userSamples, n, correction);
    if (correction) for (let i = 0; i < n; i++) y0[i] = y0[i]! + correction[i]!;
    return {
      start: y0,
      iterations: iteration,
      cyclesIntegrated: cycles,
      periodicityResidual: residual,
      monodromyDiagonal: monodromy,
      integrator,
      odeRelativeTolerance: passTolerance,
      work,
    };
  };

  for (let iteration = 1; iteration <= MAX_ITERATIONS; iteration++) {
    y.fill(0);
    for (let i = 0; i < n; i++) {
      y[i] = y0[i]!;
      y[n + i * n + i] = 1;
    }
    const finalPass = passTolerance <= finalToleranceFor(memory) * 1.000001;
    const sampleThisPass = samples !== undefined && finalPass && (cheapSampling || previousStepSize <= Math.sqrt(rtol));
    if (passTolerance !== previousPassTolerance || sampleThisPass) {
      // Another tolerance, or dense output, changes the step sequence and so g by a hair: a
      // bracket found before may no longer hold the root of this pass's map.
      bracketLow = -Infinity;
      bracketHigh = Infinity;
    }
    previousPassTolerance = passTolerance;
    const from = problem.start;
    const to = problem.start + problem.cycleLength;
    addWork(
      work,
      integrateCycle(augmented, integrator, from, to, y, passTolerance, scale, sampleThisPass ? samples : undefined, problem.maxStepsPerCycle, problem.breakpoints),
    );
    cycles++;
    options.onCycle?.(cycles);
    let residual = 0;
    let minContraction = 1;
    for (let i = 0; i < n; i++) {
      g[i] = y[i]! - y0[i]!;
      for (let c = 0; c < n; c++) jacobianOfG[i * n + c] = y[n + i * n + c]! - (i === c ? 1 : 0);
      monodromy[i] = y[n + i * n + i]!;
      minContraction = Math.min(minContraction, Math.max(1 - monodromy[i]!, 0));
      residual = Math.max(residual, Math.abs(g[i]!) / problem.scale[i]!);
    }
    lastResidual = residual;
    memory = Math.min(1, Math.max(minContraction, 1e-300));
    // The start state's error is g/(1 − Φ'): |g| ≤ share·rtol·scale·(1 − Φ') makes y₀ meet rtol.
    const target = CONVERGENCE_SHARE * rtol * memory;
    const finalTolerance = finalToleranceFor(memory);
    // A slow-memory body needs a tighter ODE tolerance to resolve g at all: only a pass at the
    // tolerance its measured memory asks for can be the last.
    const toleranceFineEnough = passTolerance <= 2 * finalTolerance || residual === 0;
    // Stagnation: two sampled passes that fail to halve a residual already within 10× the target
    // mean g has reached the integrator's noise floor; take the start and report what was reached.
    const stagnated = sampleThisPass && residual > previousSampledResidual * 0.5 && residual <= 10 * target;
    if (sampleThisPass) previousSampledResidual = residual;
    if ((residual <= target || stagnated) && toleranceFineEnough && (sampleThisPass || !userSamples)) {
      return finish(iteration, residual, null);
    }

    const step = residual === 0 ? new Float64Array(n) : solveSmall(n, jacobianOfG, g);
    let stepSize = 0;
    for (let i = 0; i < n; i++) stepSize = Math.max(stepSize, Math.abs(step[i]!) / problem.scale[i]!);
    // Near the fixed point the map is linear to O(Δ²): when that remainder is far below the
    // target, the Newton-corrected start and trajectory (y + S Δ, S sampled with y) are accepted
    // without another cycle.
    if (toleranceFineEnough && (sampleThisPass || !userSamples) && stepSize * stepSize <= 0.1 * target) {
      for (let i = 0; i < n; i++) step[i] = -step[i]!;
      return finish(iteration, stepSize * stepSize, step);
    }

    stepSize = 0;
    let plainNewton = true; // no bracket or floor changed the step
    for (let i = 0; i < n; i++) {
      let next = y0[i]! - step[i]!;
      const newton = next;
      if (n === 1 && g[0] !== 0) {
        if (g[0]! > 0) bracketLow = Math.max(bracketLow, y0[0]!);
        else bracketHigh = Math.min(bracketHigh, y0[0]!);
        if (!(next > bracketLow && next < bracketHigh)) {
          next =
            Number.isFinite(bracketLow) && Number.isFinite(bracketHigh)
              ? 0.5 * (bracketLow + bracketHigh)
              : g[0]! > 0
                ? y0[0]! * 2
                : y0[0]! * 0.5;
        }
      }
      // Temperatures stay positive: never step below a tenth of the current value.
      next = Math.max(next, 0.1 * y0[i]!);
      if (next !== newton) plainNewton = false;
      stepSize = Math.max(stepSize, Math.abs(next - y0[i]!) / problem.scale[i]!);
      y0[i] = next;
    }
    previousStepSize = stepSize;
    // Newton converges quadratically: after a step Δ the start is off by about Δ² (plus this
    // pass's integration error over 1 − Φ'). If the next step is expected to be small enough to
    // accept, integrate it at the final tolerance; otherwise only as finely as it needs.
    const expectedError = newtonError(n, plainNewton, stepSize, monodromy) + passTolerance / memory;
    passTolerance =
      expectedError * expectedError <= 0.1 * target ? finalTolerance : coarsePassTolerance(expectedError, memory, finalTolerance);
  }
  throw new CalorbitError(
    "PERIODIC_NO_CONVERGENCE",
    `no periodic steady state after ${MAX_ITERATIONS} cycles (last relative residual ${lastResidual.toExponential(2)})`,
  );
}
