/**
 * The explicit integrator for non-stiff cycles: the Dormand–Prince 5(4) pair with its continuous
 * extension of order 4 (Dormand & Prince, J. Comput. Appl. Math. 6, 1980; tableau, error
 * estimate and dense-output coefficients as in Hairer, Nørsett & Wanner, Solving Ordinary
 * Differential Equations I, 2nd ed. 1993, §II.5 and §II.6, Table 5.2).
 *
 * Written for the shooting loop's hot path: one workspace per dimension, reused, and nothing
 * allocated per step or per sample, so a sweep of millions of cycles creates no garbage here.
 * Its dense output costs a polynomial per sample and no extra evaluations, which lets every
 * Newton pass be sampled (see periodic.ts).
 */
import { CalorbitError } from "../errors.js";
import { emitStart, perDimension, type DenseSamples, type IntegrateOptions, type Integrator, type OdeSystem, type SolverWork } from "./system.js";

// Nodes and stage weights (Hairer, Nørsett & Wanner 1993, Table 5.2).
const C2 = 1 / 5;
const C3 = 3 / 10;
const C4 = 4 / 5;
const C5 = 8 / 9;
const A21 = 1 / 5;
const A31 = 3 / 40;
const A32 = 9 / 40;
const A41 = 44 / 45;
const A42 = -56 / 15;
const A43 = 32 / 9;
const A51 = 19372 / 6561;
const A52 = -25360 / 2187;
const A53 = 64448 / 6561;
const A54 = -212 / 729;
const A61 = 9017 / 3168;
const A62 = -355 / 33;
const A63 = 46732 / 5247;
const A64 = 49 / 176;
const A65 = -5103 / 18656;
// Fifth-order weights (also the seventh stage's row: first same as last).
const B1 = 35 / 384;
const B3 = 500 / 1113;
const B4 = 125 / 192;
const B5 = -2187 / 6784;
const B6 = 11 / 84;
// Fifth- minus fourth-order weights: the local error estimate.
const E1 = 35 / 384 - 5179 / 57600;
const E3 = 500 / 1113 - 7571 / 16695;
const E4 = 125 / 192 - 393 / 640;
const E5 = -2187 / 6784 + 92097 / 339200;
const E6 = 11 / 84 - 187 / 2100;
const E7 = -1 / 40;
// Continuous extension (Hairer, Nørsett & Wanner 1993, §II.6, the DOPRI5 dense output).
const D1 = -12715105075 / 11282082432;
const D3 = 87487479700 / 32700410799;
const D4 = -10690763975 / 1880347072;
const D5 = 701980252875 / 199316789632;
const D6 = -1453857185 / 822651844;
const D7 = 69997945 / 29380423;

// Step-size control: a PI controller on the order-5 error estimate (ibid., §IV.2 "PI control").
const SAFETY = 0.9;
const EXPONENT = 0.7 / 5;
const MEMORY_EXPONENT = 0.4 / 5;
const MAX_GROWTH = 10;
const MIN_SHRINK = 0.2;
const DEFAULT_MAX_STEPS = 200_000;

class Workspace {
  readonly k1: Float64Array;
  readonly k2: Float64Array;
  readonly k3: Float64Array;
  readonly k4: Float64Array;
  readonly k5: Float64Array;
  readonly k6: Float64Array;
  readonly k7: Float64Array;
  readonly stage: Float64Array;
  readonly next: Float64Array;
  /** Dense-output coefficients of the last accepted step, 5 × n. */
  readonly dense: Float64Array;
  constructor(readonly n: number) {
    this.k1 = new Float64Array(n);
    this.k2 = new Float64Array(n);
    this.k3 = new Float64Array(n);
    this.k4 = new Float64Array(n);
    this.k5 = new Float64Array(n);
    this.k6 = new Float64Array(n);
    this.k7 = new Float64Array(n);
    this.stage = new Float64Array(n);
    this.next = new Float64Array(n);
    this.dense = new Float64Array(5 * n);
  }
}

const workspaceFor = perDimension((n) => new Workspace(n));

/** RMS of v / (atol + rtol |y|) over the components. */
function weightedNorm(v: Float64Array, y: ArrayLike<number>, atol: Float64Array, rtol: number, n: number): number {
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const r = v[i]! / (atol[i]! + rtol * Math.abs(y[i]!));
    sum += r * r;
  }
  return Math.sqrt(sum / n);
}

/**
 * First step size from the size of y, y′ and an estimate of y″ (Hairer, Nørsett & Wanner 1993,
 * §II.4, "Starting step size"); costs one evaluation.
 */
function initialStep(system: OdeSystem, w: Workspace, x: number, y: Float64Array, span: number, atol: Float64Array, rtol: number): number {
  const n = w.n;
  const d0 = weightedNorm(y, y, atol, rtol, n);
  const d1 = weightedNorm(w.k1, y, atol, rtol, n);
  let h0 = d0 < 1e-5 || d1 < 1e-5 ? 1e-6 : (0.01 * d0) / d1;
  h0 = Math.min(h0, span);
  for (let i = 0; i < n; i++) w.stage[i] = y[i]! + h0 * w.k1[i]!;
  system.derivative(x + h0, w.stage, w.k2);
  for (let i = 0; i < n; i++) w.next[i] = (w.k2[i]! - w.k1[i]!) / h0;
  const d2 = weightedNorm(w.next, y, atol, rtol, n);
  const largest = Math.max(d1, d2);
  const h1 = largest <= 1e-15 ? Math.max(1e-6, h0 * 1e-3) : (0.01 / largest) ** (1 / 5);
  return Math.min(100 * h0, h1, span);
}

export const integrateDormandPrince: Integrator = (
  system: OdeSystem,
  x0: number,
  y: Float64Array,
  x1: number,
  options: IntegrateOptions,
): SolverWork => {
  const n = system.dimension;
  const w = workspaceFor(n);
  const { k1, k2, k3, k4, k5, k6, k7, stage, next, dense } = w;
  const rtol = options.relativeTolerance;
  const atol = options.absoluteTolerance;
  const maxSteps = options.maxSteps ?? DEFAULT_MAX_STEPS;
  const samples = options.samples;
  const span = x1 - x0;
  let nextSample = samples ? emitStart(samples, x0, y) : 0;

  system.derivative(x0, y, k1);
  let evaluations = 1;
  let h = initialStep(system, w, x0, y, span, atol, rtol);
  evaluations++;
  let x = x0;
  let steps = 0;
  let rejected = 0;
  let previousError = 1e-4;
  let afterRejection = false;

  while (x < x1) {
    if (steps + rejected >= maxSteps) {
      throw new CalorbitError("INTEGRATION_FAILED", `the explicit solver exceeded ${maxSteps} steps without reaching the end of the cycle`);
    }
    const last = x + h >= x1 - 1e-14 * Math.abs(x1);
    if (last) h = x1 - x;
    for (let i = 0; i < n; i++) stage[i] = y[i]! + h * A21 * k1[i]!;
    system.derivative(x + C2 * h, stage, k2);
    for (let i = 0; i < n; i++) stage[i] = y[i]! + h * (A31 * k1[i]! + A32 * k2[i]!);
    system.derivative(x + C3 * h, stage, k3);
    for (let i = 0; i < n; i++) stage[i] = y[i]! + h * (A41 * k1[i]! + A42 * k2[i]! + A43 * k3[i]!);
    system.derivative(x + C4 * h, stage, k4);
    for (let i = 0; i < n; i++) stage[i] = y[i]! + h * (A51 * k1[i]! + A52 * k2[i]! + A53 * k3[i]! + A54 * k4[i]!);
    system.derivative(x + C5 * h, stage, k5);
    for (let i = 0; i < n; i++) stage[i] = y[i]! + h * (A61 * k1[i]! + A62 * k2[i]! + A63 * k3[i]! + A64 * k4[i]! + A65 * k5[i]!);
    const xEnd = last ? x1 : x + h;
    system.derivative(xEnd, stage, k6);
    for (let i = 0; i < n; i++) next[i] = y[i]! + h * (B1 * k1[i]! + B3 * k3[i]! + B4 * k4[i]! + B5 * k5[i]! + B6 * k6[i]!);
    system.derivative(xEnd, next, k7);
    evaluations += 6;

    let errSq = 0;
    for (let i = 0; i < n; i++) {
      const e = h * (E1 * k1[i]! + E3 * k3[i]! + E4 * k4[i]! + E5 * k5[i]! + E6 * k6[i]! + E7 * k7[i]!);
      const sc = atol[i]! + rtol * Math.max(Math.abs(y[i]!), Math.abs(next[i]!));
      errSq += (e / sc) * (e / sc);
    }
    const err = Math.sqrt(errSq / n);

    if (!(err <= 1)) {
      if (!Number.isFinite(err) && !(h > 1e-12 * Math.abs(span))) {
        throw new CalorbitError("INTEGRATION_FAILED", "the ODE solution became non-finite");
      }
      const shrink = Number.isFinite(err) ? Math.max(MIN_SHRINK, SAFETY * err ** -EXPONENT) : MIN_SHRINK;
      h *= Math.min(1, shrink);
      rejected++;
      afterRejection = true;
      continue;
    }

    if (samples && nextSample < samples.xs.length) {
      for (let i = 0; i < n; i++) {
        const change = next[i]! - y[i]!;
        const slope = h * k1[i]! - change;
        dense[i] = y[i]!;
        dense[n + i] = change;
        dense[2 * n + i] = slope;
        dense[3 * n + i] = change - h * k7[i]! - slope;
        dense[4 * n + i] = h * (D1 * k1[i]! + D3 * k3[i]! + D4 * k4[i]! + D5 * k5[i]! + D6 * k6[i]! + D7 * k7[i]!);
      }
      nextSample = emitDense(samples, nextSample, x, xEnd, h, dense, n, last);
    }
    for (let i = 0; i < n; i++) {
      y[i] = next[i]!;
      k1[i] = k7[i]!;
    }
    x = xEnd;
    steps++;
    const safeErr = Math.max(err, 1e-10);
    let factor = SAFETY * safeErr ** -EXPONENT * previousError ** MEMORY_EXPONENT;
    factor = Math.min(afterRejection ? 1 : MAX_GROWTH, Math.max(MIN_SHRINK, factor));
    previousError = safeErr;
    afterRejection = false;
    h *= factor;
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(y[i]!)) throw new CalorbitError("INTEGRATION_FAILED", "the ODE solution became non-finite");
  }
  return { steps, rejected, evaluations };
};

/**
 * Writes the continuous extension of one step at every pending sample in (xa, xb]; on the last
 * step, samples a rounding hair past the end are included too. With θ = (x − xa)/h:
 *   y(θ) = r₁ + θ (r₂ + (1 − θ) (r₃ + θ (r₄ + (1 − θ) r₅))).
 */
function emitDense(samples: DenseSamples, from: number, xa: number, xb: number, h: number, dense: Float64Array, n: number, last: boolean): number {
  const { xs, ys, components } = samples;
  const limit = last ? xb + Math.abs(xb) * 1e-12 + 1e-300 : xb;
  let k = from;
  while (k < xs.length && xs[k]! <= limit) {
    const theta = Math.min(1, (xs[k]! - xa) / h);
    const rest = 1 - theta;
    const base = k * components;
    for (let i = 0; i < components; i++) {
      ys[base + i] =
        dense[i]! + theta * (dense[n + i]! + rest * (dense[2 * n + i]! + theta * (dense[3 * n + i]! + rest * dense[4 * n + i]!)));
    }
    k++;
  }
  return k;
}
