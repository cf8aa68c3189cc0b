/**
 * A small L-stable implicit integrator for stiff cases (radiative time τ ≪ the forcing period),
 * where an explicit method would be held to steps of order τ.
 *
 * Three-stage Radau IIA collocation, order 5, stiffly accurate (Hairer & Wanner, Solving Ordinary
 * Differential Equations II, 2nd ed. 1996, §IV.5, Table 5.6). The stage equations
 * Z = h (A ⊗ I) F(y + Z) are solved by simplified Newton with the Jacobian frozen at the step's
 * start, starting from the previous step's collocation polynomial extrapolated. The local error
 * comes from the embedded estimate of §IV.8 (eqs. 8.19–8.20):
 * err = (I − hγ₀J)⁻¹ (γ₀ h f(x₀, y₀) + e₁Z₁ + e₂Z₂ + e₃Z₃), γ₀ = 1/γ̂ with γ̂ the real eigenvalue of
 * A⁻¹, filtered once more through (I − hγ₀J)⁻¹ after a rejection so that it stays bounded for
 * stiff components; it is O(h⁴), so steps scale with err^(−1/4). One step costs the Newton
 * iterations (three evaluations each) plus one evaluation at its end, where step doubling cost
 * three such steps.
 *
 * Dense output is the step's collocation polynomial (through y₀ and y₀ + Zᵢ at x₀ + cᵢh: Radau's
 * own continuous extension, §IV.8). While sampling, steps are capped at a fraction of the
 * interval, and a non-stiff step (h|J| < 1) whose collocation polynomial departs from the cubic
 * Hermite interpolant of its ends by more than the tolerance is refused: that is a step across a
 * corner of the forcing (a sunrise), fine at its end but not in between.
 */
import { CalorbitError } from "../errors.js";
import { emitStart, perDimension, type DenseSamples, type IntegrateOptions, type Integrator, type OdeSystem, type SolverWork } from "./system.js";

const SQRT6 = Math.sqrt(6);
const C = [(4 - SQRT6) / 10, (4 + SQRT6) / 10, 1] as const;
const A = [
  [(88 - 7 * SQRT6) / 360, (296 - 169 * SQRT6) / 1800, (-2 + 3 * SQRT6) / 225],
  [(296 + 169 * SQRT6) / 1800, (88 + 7 * SQRT6) / 360, (-2 - 3 * SQRT6) / 225],
  [(16 - SQRT6) / 36, (16 + SQRT6) / 36, 1 / 9],
] as const;
/** γ̂, the real eigenvalue of A⁻¹ (Hairer & Wanner 1996, §IV.8); γ₀ = 1/γ̂. */
const GAMMA_HAT = 30 / (6 + Math.cbrt(81) - Math.cbrt(9));
const GAMMA0 = 1 / GAMMA_HAT;
/** The embedded estimate's weights eᵢ = γ₀ dᵢ on the stage increments (§IV.8, eq. 8.20). */
const E1 = (GAMMA0 * -(13 + 7 * SQRT6)) / 3;
const E2 = (GAMMA0 * (-13 + 7 * SQRT6)) / 3;
const E3 = (GAMMA0 * -1) / 3;
/** The error estimate is O(h⁴). */
const ESTIMATE_ORDER = 4;
const SAFETY = 0.9;
const MAX_GROWTH = 4;
const MIN_SHRINK = 0.2;
const MAX_NEWTON = 10;
/** Newton stops when the update is this fraction of the error tolerance. */
const NEWTON_FRACTION = 0.01;
/** While sampling, a step is at most this fraction of the interval (keeps the interpolant's error small). */
const SAMPLING_STEP_FRACTION = 1 / 256;
const DEFAULT_MAX_STEPS = 200_000;

class Workspace {
  readonly z: Float64Array;
  readonly f: Float64Array;
  readonly stage: Float64Array;
  readonly jac: Float64Array;
  readonly lu: Float64Array;
  readonly pivot: Int32Array;
  readonly rhs: Float64Array;
  /** LU of I − hγ₀J (the error estimate's filter). */
  readonly luError: Float64Array;
  readonly pivotError: Int32Array;
  readonly yNew: Float64Array;
  readonly fNew: Float64Array;
  readonly err: Float64Array;
  readonly errStage: Float64Array;
  /** e₁Z₁ + e₂Z₂ + e₃Z₃ of the current step. */
  readonly ez: Float64Array;
  /** Scratch for one stage's derivative. */
  readonly fStage: Float64Array;
  /** Stage increments of the last accepted step (its collocation polynomial predicts the next step's stages). */
  readonly zPrevious: Float64Array;
  readonly yPrevious: Float64Array;
  evaluations = 0;
  constructor(readonly n: number) {
    const m = 3 * n;
    this.z = new Float64Array(m);
    this.f = new Float64Array(m);
    this.stage = new Float64Array(n);
    this.jac = new Float64Array(n * n);
    this.lu = new Float64Array(m * m);
    this.pivot = new Int32Array(m);
    this.rhs = new Float64Array(m);
    this.luError = new Float64Array(n * n);
    this.pivotError = new Int32Array(n);
    this.yNew = new Float64Array(n);
    this.fNew = new Float64Array(n);
    this.err = new Float64Array(n);
    this.errStage = new Float64Array(n);
    this.ez = new Float64Array(n);
    this.fStage = new Float64Array(n);
    this.zPrevious = new Float64Array(m);
    this.yPrevious = new Float64Array(n);
  }
}

const workspaceFor = perDimension((n) => new Workspace(n));

/** LU with partial pivoting of the m×m matrix in `lu`, in place. Returns false when singular. */
function luInPlace(lu: Float64Array, pivot: Int32Array, m: number): boolean {
  for (let col = 0; col < m; col++) {
    let best = col;
    for (let r = col + 1; r < m; r++) if (Math.abs(lu[r * m + col]!) > Math.abs(lu[best * m + col]!)) best = r;
    pivot[col] = best;
    if (lu[best * m + col] === 0) return false;
    if (best !== col) {
      for (let c = 0; c < m; c++) {
        const t = lu[col * m + c]!;
        lu[col * m + c] = lu[best * m + c]!;
        lu[best * m + c] = t;
      }
    }
    const d = lu[col * m + col]!;
    for (let r = col + 1; r < m; r++) {
      const factor = (lu[r * m + col]! /= d);
      if (factor !== 0) for (let c = col + 1; c < m; c++) lu[r * m + c]! -= factor * lu[col * m + c]!;
    }
  }
  return true;
}

/** Solves (LU) x = b in place. */
function luSolve(lu: Float64Array, pivot: Int32Array, m: number, b: Float64Array): void {
  for (let i = 0; i < m; i++) {
    const p = pivot[i]!;
    if (p !== i) {
      const t = b[i]!;
      b[i] = b[p]!;
      b[p] = t;
    }
  }
  for (let i = 0; i < m; i++) for (let c = 0; c < i; c++) b[i]! -= lu[i * m + c]! * b[c]!;
  for (let i = m - 1; i >= 0; i--) {
    for (let c = i + 1; c < m; c++) b[i]! -= lu[i * m + c]! * b[c]!;
    b[i]! /= lu[i * m + i]!;
  }
}

/** Factorises I − h (A ⊗ J) (the stage system) and I − hγ₀J (the error filter). Returns false when singular. */
function factorise(w: Workspace, h: number): boolean {
  const { n, jac, lu, luError } = w;
  const m = 3 * n;
  for (let bi = 0; bi < 3; bi++) {
    for (let bj = 0; bj < 3; bj++) {
      const a = A[bi]![bj]! * h;
      for (let r = 0; r < n; r++) {
        for (let c = 0; c < n; c++) lu[(bi * n + r) * m + bj * n + c] = (bi === bj && r === c ? 1 : 0) - a * jac[r * n + c]!;
      }
    }
  }
  for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) luError[r * n + c] = (r === c ? 1 : 0) - h * GAMMA0 * jac[r * n + c]!;
  return luInPlace(lu, w.pivot, m) && luInPlace(luError, w.pivotError, n);
}

/**
 * Solves the stage equations of one step of size h from (x, y), starting from the stage
 * increments already in w.z. On success w.z holds Z, w.yNew = y + Z₃ (stiffly accurate).
 * Returns false when Newton fails to converge (the caller shrinks h).
 */
function solveStages(system: OdeSystem, w: Workspace, x: number, y: ArrayLike<number>, h: number, scale: Float64Array): boolean {
  const { n, z, f, stage, rhs } = w;
  for (let iter = 0; iter < MAX_NEWTON; iter++) {
    for (let s = 0; s < 3; s++) {
      for (let i = 0; i < n; i++) stage[i] = y[i]! + z[s * n + i]!;
      system.derivative(x + C[s]! * h, stage, w.fStage);
      w.evaluations++;
      for (let i = 0; i < n; i++) f[s * n + i] = w.fStage[i]!;
    }
    for (let s = 0; s < 3; s++) {
      for (let i = 0; i < n; i++) {
        rhs[s * n + i] = -z[s * n + i]! + h * (A[s]![0]! * f[i]! + A[s]![1]! * f[n + i]! + A[s]![2]! * f[2 * n + i]!);
      }
    }
    luSolve(w.lu, w.pivot, 3 * n, rhs);
    let update = 0;
    for (let k = 0; k < 3 * n; k++) {
      z[k]! += rhs[k]!;
      if (!Number.isFinite(z[k]!)) return false;
      update = Math.max(update, Math.abs(rhs[k]!) / scale[k % n]!);
    }
    if (update <= NEWTON_FRACTION) {
      for (let i = 0; i < n; i++) w.yNew[i] = y[i]! + z[2 * n + i]!;
      return true;
    }
  }
  return false;
}

/**
 * The embedded error estimate's weighted RMS norm (Hairer & Wanner 1996, §IV.8): err =
 * (I − hγ₀J)⁻¹ (γ₀ h f₀ + Σ eᵢZᵢ); when that is above 1 on a first or rejected step, once more
 * with f evaluated at y₀ + err in place of f₀, which keeps it bounded for stiff components.
 */
function errorNorm(
  system: OdeSystem,
  w: Workspace,
  x: number,
  y: ArrayLike<number>,
  f0: ArrayLike<number>,
  h: number,
  atol: Float64Array,
  rtol: number,
  refine: boolean,
): number {
  const { n, z, err, ez } = w;
  for (let i = 0; i < n; i++) {
    ez[i] = E1 * z[i]! + E2 * z[n + i]! + E3 * z[2 * n + i]!;
    err[i] = GAMMA0 * h * f0[i]! + ez[i]!;
  }
  luSolve(w.luError, w.pivotError, n, err);
  let norm = weightedNorm(w, y, atol, rtol);
  if (norm >= 1 && refine) {
    for (let i = 0; i < n; i++) w.errStage[i] = y[i]! + err[i]!;
    system.derivative(x, w.errStage, w.fStage);
    w.evaluations++;
    for (let i = 0; i < n; i++) err[i] = GAMMA0 * h * w.fStage[i]! + ez[i]!;
    luSolve(w.luError, w.pivotError, n, err);
    norm = weightedNorm(w, y, atol, rtol);
  }
  return norm;
}

function weightedNorm(w: Workspace, y: ArrayLike<number>, atol: Float64Array, rtol: number): number {
  const { n, err, yNew } = w;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const e = err[i]! / (atol[i]! + rtol * Math.max(Math.abs(y[i]!), Math.abs(yNew[i]!)));
    sum += e * e;
  }
  return Math.sqrt(sum / n);
}

export const integrateRadau: Integrator = (
  system: OdeSystem,
  x0: number,
  y: Float64Array,
  x1: number,
  options: IntegrateOptions,
): SolverWork => {
  const n = system.dimension;
  const w = workspaceFor(n);
  w.evaluations = 0;
  const rtol = options.relativeTolerance;
  const atol = options.absoluteTolerance;
  const maxSteps = options.maxSteps ?? DEFAULT_MAX_STEPS;
  const samples = options.samples;
  const span = x1 - x0;
  const capSpan = options.cycleSpan ?? span;
  const maxStep = samples ? SAMPLING_STEP_FRACTION * capSpan : capSpan / 8;
  const scale = new Float64Array(n);
  const fStart = new Float64Array(n);
  let nextSample = 0;

  let x = x0;
  let h = Math.min(maxStep, capSpan * 1e-3, span);
  let steps = 0;
  let rejected = 0;
  let lastRejected = false;
  let previousH = 0; // 0: no previous step to predict the stages from
  system.derivative(x, y, fStart);
  w.evaluations++;
  if (samples) nextSample = emitStart(samples, x0, y);
  let jacobianAt = NaN;

  while (x < x1) {
    if (steps >= maxSteps) throw new CalorbitError("INTEGRATION_FAILED", `the implicit solver exceeded ${maxSteps} steps`);
    const last = x + h >= x1;
    if (last) h = x1 - x;
    if (jacobianAt !== x) {
      // A rejected step retries from the same (x, y): its Jacobian still holds.
      system.jacobian(x, y, w.jac);
      jacobianAt = x;
    }
    for (let i = 0; i < n; i++) scale[i] = atol[i]! + rtol * Math.abs(y[i]!);
    if (!factorise(w, h)) {
      h *= 0.5;
      rejected++;
      lastRejected = true;
      continue;
    }
    // Starting stages: the previous step's collocation polynomial, extrapolated (zero on the first step).
    if (previousH > 0) {
      for (let s = 0; s < 3; s++) {
        const u = 1 + (C[s]! * h) / previousH;
        for (let i = 0; i < n; i++) w.z[s * n + i] = collocationAt(u, w.yPrevious[i]!, w.zPrevious, n, i) - y[i]!;
      }
    } else {
      w.z.fill(0);
    }
    if (!solveStages(system, w, x, y, h, scale)) {
      h *= 0.5;
      rejected++;
      lastRejected = true;
      continue;
    }
    const err = errorNorm(system, w, x, y, fStart, h, atol, rtol, steps === 0 || lastRejected);
    const factor = err === 0 ? MAX_GROWTH : Math.min(MAX_GROWTH, Math.max(MIN_SHRINK, SAFETY * err ** (-1 / ESTIMATE_ORDER)));
    if (!(err <= 1)) {
      h *= Math.min(factor, 0.5);
      rejected++;
      lastRejected = true;
      continue;
    }
    const xEnd = last ? x1 : x + h;
    system.derivative(xEnd, w.yNew, w.fNew);
    w.evaluations++;
    if (samples) {
      // A non-stiff step across a corner of the forcing (a sunrise) can be fine at its end and
      // not in between: its collocation polynomial then departs from the cubic Hermite
      // interpolant of its ends (both O(h⁴) where the solution is smooth) at the midpoint.
      let stiffness = 0;
      for (let i = 0; i < n * n; i++) stiffness = Math.max(stiffness, Math.abs(w.jac[i]!));
      if (h * stiffness < 1) {
        let denseSq = 0;
        for (let i = 0; i < n; i++) {
          const sc = atol[i]! + rtol * Math.max(Math.abs(y[i]!), Math.abs(w.yNew[i]!));
          const e = (collocationAt(0.5, y[i]!, w.z, n, i) - hermite3Mid(y[i]!, fStart[i]!, w.yNew[i]!, w.fNew[i]!, h)) / sc;
          denseSq += e * e;
        }
        const denseErr = Math.sqrt(denseSq / n);
        if (!(denseErr <= 1)) {
          h *= Math.max(MIN_SHRINK, Math.min(0.5, SAFETY * denseErr ** (-1 / ESTIMATE_ORDER)));
          rejected++;
          lastRejected = true;
          continue;
        }
      }
      nextSample = emitCollocation(samples, nextSample, x, xEnd, y, w.z, n);
    }
    for (let i = 0; i < n; i++) {
      w.yPrevious[i] = y[i]!;
      y[i] = w.yNew[i]!;
      fStart[i] = w.fNew[i]!;
    }
    w.zPrevious.set(w.z);
    previousH = h;
    x = xEnd;
    steps++;
    // After a rejection the step may not grow at once (Hairer & Wanner 1996, §IV.8, the usual safeguard).
    h = Math.min(maxStep, h * (lastRejected ? Math.min(1, factor) : factor));
    lastRejected = false;
  }
  return { steps, rejected, evaluations: w.evaluations };
};

/** The cubic Hermite interpolant through (0, ya, fa) and (h, yb, fb) at h/2. */
function hermite3Mid(ya: number, fa: number, yb: number, fb: number, h: number): number {
  return 0.5 * (ya + yb) + (h / 8) * (fa - fb);
}

/** Lagrange basis weights of the collocation nodes 0, c₁, c₂, 1 (barycentric form). */
const NODES = [0, C[0], C[1], 1] as const;
const BARYCENTRIC = NODES.map((ni, i) => 1 / NODES.reduce((p, nj, j) => (j === i ? p : p * (ni - nj)), 1));

/** Component i of a step's collocation polynomial (through y₀ at 0 and y₀ + Zⱼ at cⱼ) at u ∈ (0, 1), u not a node. */
function collocationAt(u: number, y0: number, z: Float64Array, n: number, i: number): number {
  let num = BARYCENTRIC[0]! / u * y0;
  let den = BARYCENTRIC[0]! / u;
  for (let j = 1; j < 4; j++) {
    const wj = BARYCENTRIC[j]! / (u - NODES[j]!);
    num += wj * (y0 + z[(j - 1) * n + i]!);
    den += wj;
  }
  return num / den;
}

/**
 * Writes the collocation polynomial of one step (through y₀ at 0 and y₀ + Zᵢ at cᵢ) at every
 * pending sample in (xa, xb]: Radau's own continuous extension (Hairer & Wanner 1996, §IV.8).
 * It uses values only: an interpolant built on f would multiply the state's tiny error by h/τ,
 * which is huge exactly when this integrator is chosen.
 */
function emitCollocation(
  samples: DenseSamples,
  from: number,
  xa: number,
  xb: number,
  ya: ArrayLike<number>,
  z: Float64Array,
  n: number,
): number {
  const { xs, ys, components } = samples;
  const h = xb - xa;
  const slack = Math.abs(xb) * 1e-12;
  let k = from;
  while (k < xs.length && xs[k]! <= xb + slack) {
    const base = k * components;
    const u = (xs[k]! - xa) / h;
    // Barycentric Lagrange interpolation on the four nodes (exact at a node).
    let exact = -1;
    for (let j = 0; j < 4; j++) if (u === NODES[j]) exact = j;
    for (let i = 0; i < components; i++) {
      const value = (j: number) => (j === 0 ? ya[i]! : ya[i]! + z[(j - 1) * n + i]!);
      if (exact >= 0) {
        ys[base + i] = value(exact);
        continue;
      }
      let num = 0;
      let den = 0;
      for (let j = 0; j < 4; j++) {
        const wj = BARYCENTRIC[j]! / (u - NODES[j]!);
        num += wj * value(j);
        den += wj;
      }
      ys[base + i] = num / den;
    }
    k++;
  }
  return k;
}
