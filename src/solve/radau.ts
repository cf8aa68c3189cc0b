/**
 * A small L-stable implicit integrator for stiff cases (radiative time τ ≪ the forcing period),
 * where the explicit extrapolation of odex would be held to steps of order τ.
 *
 * Three-stage Radau IIA collocation, order 5, stiffly accurate (Hairer & Wanner, Solving Ordinary
 * Differential Equations II, 2nd ed. 1996, §IV.5, Table 5.6). The stage equations
 * Z = h (A ⊗ I) F(y + Z) are solved by simplified Newton with the Jacobian frozen at the step's
 * start. The local error comes from step doubling (one step of h against two of h/2; the
 * difference over 2⁵ − 1 estimates the error of the pair, Richardson), and the pair of half
 * steps is kept. Dense output is a quintic Hermite interpolant where h|J| < 1 and each half
 * step's collocation polynomial where the step is stiff; while sampling, steps are also capped at
 * a fraction of the interval so the interpolation error stays far below the tolerance.
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
const ORDER = 5;
const RICHARDSON = 2 ** ORDER - 1;
const SAFETY = 0.9;
const MAX_GROWTH = 4;
const MIN_SHRINK = 0.2;
const MAX_NEWTON = 10;
/** Newton stops when the update is this fraction of the error tolerance. */
const NEWTON_FRACTION = 0.01;
/** While sampling, a step is at most this fraction of the interval (keeps the interpolant's error small). */
const SAMPLING_STEP_FRACTION = 1 / 128; // a half step is then 1/256 of the interval
/** How much better the half steps' interpolants are than the full step's (2⁴, the interpolant's order). */
const DENSE_GAIN = 16;
const DEFAULT_MAX_STEPS = 200_000;

class Workspace {
  readonly z: Float64Array;
  readonly f: Float64Array;
  readonly stage: Float64Array;
  readonly jac: Float64Array;
  readonly lu: Float64Array;
  readonly pivot: Int32Array;
  readonly rhs: Float64Array;
  readonly yBig: Float64Array;
  readonly yMid: Float64Array;
  readonly fMid: Float64Array;
  readonly ySmall: Float64Array;
  readonly fEnd: Float64Array;
  /** Scratch for one stage's derivative. */
  readonly fStage: Float64Array;
  /** Converged stage increments Z of the first and second half steps (dense output). */
  readonly zFirst: Float64Array;
  readonly zSecond: Float64Array;
  /** Stage increments of the full step (the dense-output check while sampling). */
  readonly zBig: Float64Array;
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
    this.yBig = new Float64Array(n);
    this.yMid = new Float64Array(n);
    this.fMid = new Float64Array(n);
    this.ySmall = new Float64Array(n);
    this.fEnd = new Float64Array(n);
    this.fStage = new Float64Array(n);
    this.zFirst = new Float64Array(m);
    this.zSecond = new Float64Array(m);
    this.zBig = new Float64Array(m);
  }
}

const workspaceFor = perDimension((n) => new Workspace(n));

/** LU (partial pivoting) of I − h (A ⊗ J) in w.lu. Returns false when singular. */
function factorise(w: Workspace, h: number): boolean {
  const { n, jac, lu, pivot } = w;
  const m = 3 * n;
  for (let bi = 0; bi < 3; bi++) {
    for (let bj = 0; bj < 3; bj++) {
      const a = A[bi]![bj]! * h;
      for (let r = 0; r < n; r++) {
        for (let c = 0; c < n; c++) lu[(bi * n + r) * m + bj * n + c] = (bi === bj && r === c ? 1 : 0) - a * jac[r * n + c]!;
      }
    }
  }
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

function backSolve(w: Workspace, b: Float64Array): void {
  const { lu, pivot } = w;
  const m = 3 * w.n;
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

/**
 * One Radau IIA step of size h from (x, y) into `out`; f at the end into `fOut`.
 * Returns false when Newton fails to converge (the caller shrinks h).
 */
function radauStep(
  system: OdeSystem,
  w: Workspace,
  x: number,
  y: ArrayLike<number>,
  h: number,
  scale: Float64Array,
  out: Float64Array,
  fOut: Float64Array,
  zOut?: Float64Array,
): boolean {
  const { n, z, f, stage, rhs } = w;
  system.jacobian(x, y, w.jac);
  if (!factorise(w, h)) return false;
  z.fill(0);
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
    backSolve(w, rhs);
    let update = 0;
    for (let k = 0; k < 3 * n; k++) {
      z[k]! += rhs[k]!;
      if (!Number.isFinite(z[k]!)) return false;
      update = Math.max(update, Math.abs(rhs[k]!) / scale[k % n]!);
    }
    if (update <= NEWTON_FRACTION) {
      for (let i = 0; i < n; i++) out[i] = y[i]! + z[2 * n + i]!; // stiffly accurate: y₁ = y₀ + Z₃
      if (zOut) zOut.set(z);
      system.derivative(x + h, out, fOut);
      w.evaluations++;
      return true;
    }
  }
  return false;
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
  const maxStep = samples ? SAMPLING_STEP_FRACTION * span : span / 8;
  const scale = new Float64Array(n);
  const fStart = new Float64Array(n);
  let nextSample = 0;

  let x = x0;
  let h = Math.min(maxStep, span * 1e-3);
  let steps = 0;
  let rejected = 0;
  system.derivative(x, y, fStart);
  w.evaluations++;
  if (samples) nextSample = emitStart(samples, x0, y);

  while (x < x1) {
    if (steps >= maxSteps) throw new CalorbitError("INTEGRATION_FAILED", `the implicit solver exceeded ${maxSteps} steps`);
    const last = x + h >= x1;
    if (last) h = x1 - x;
    for (let i = 0; i < n; i++) scale[i] = atol[i]! + rtol * Math.abs(y[i]!);
    const half = 0.5 * h;
    const ok =
      radauStep(system, w, x, y, h, scale, w.yBig, w.fEnd, samples ? w.zBig : undefined) &&
      radauStep(system, w, x, y, half, scale, w.yMid, w.fMid, w.zFirst) &&
      radauStep(system, w, x + half, w.yMid, half, scale, w.ySmall, w.fEnd, w.zSecond);
    if (!ok) {
      h *= 0.5;
      rejected++;
      continue;
    }
    let errSq = 0;
    for (let i = 0; i < n; i++) {
      const sc = atol[i]! + rtol * Math.max(Math.abs(y[i]!), Math.abs(w.ySmall[i]!));
      const e = (w.ySmall[i]! - w.yBig[i]!) / RICHARDSON / sc;
      errSq += e * e;
    }
    const err = Math.sqrt(errSq / n);
    const factor = err === 0 ? MAX_GROWTH : Math.min(MAX_GROWTH, Math.max(MIN_SHRINK, SAFETY * err ** (-1 / (ORDER + 1))));
    if (!(err <= 1)) {
      h *= Math.min(factor, 0.5);
      rejected++;
      continue;
    }
    const xEnd = last ? x1 : x + h;
    // While sampling, the interpolant must be as good as the step's end: the full step's
    // collocation polynomial at its midpoint, against the two half steps' value there, estimates
    // the O(h⁴) interpolation error of the full step; the half steps' own interpolants are about
    // 2⁴ times better. A step across a corner of the forcing (a sunrise) is refused here even when
    // its end value is fine.
    if (samples) {
      let denseSq = 0;
      for (let i = 0; i < n; i++) {
        const sc = atol[i]! + rtol * Math.max(Math.abs(y[i]!), Math.abs(w.yMid[i]!));
        const e = (collocationAt(0.5, y[i]!, w.zBig, n, i) - w.yMid[i]!) / (DENSE_GAIN * sc);
        denseSq += e * e;
      }
      const denseErr = Math.sqrt(denseSq / n);
      if (!(denseErr <= 1)) {
        h *= Math.max(MIN_SHRINK, Math.min(0.5, SAFETY * denseErr ** -0.25));
        rejected++;
        continue;
      }
    }
    if (samples) {
      // Where h|J| is small, f carries the state's error harmlessly and the O(h⁶) Hermite form is
      // best; where it is large (the stiff regime), only the values-based collocation form is safe.
      let stiffness = 0;
      for (let i = 0; i < n * n; i++) stiffness = Math.max(stiffness, Math.abs(w.jac[i]!));
      if (h * stiffness < 1) {
        nextSample = emitHermite(samples, nextSample, x, xEnd, y, fStart, w.yMid, w.fMid, w.ySmall, w.fEnd);
      } else {
        nextSample = emitCollocation(samples, nextSample, x, x + half, y, w.zFirst, n);
        nextSample = emitCollocation(samples, nextSample, x + half, xEnd, w.yMid, w.zSecond, n);
      }
    }
    for (let i = 0; i < n; i++) {
      y[i] = w.ySmall[i]!;
      fStart[i] = w.fEnd[i]!;
    }
    x = xEnd;
    steps++;
    h = Math.min(maxStep, h * factor);
  }
  return { steps, rejected, evaluations: w.evaluations };
};

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

/**
 * Writes, at every pending sample in (xa, xb], the quintic Hermite interpolant through the
 * values and derivatives at both ends and at the midpoint (the pair of half steps supplies all
 * three), in Newton form on the nodes 0, 0, ½, ½, 1, 1; its error is O(h⁶).
 */
function emitHermite(
  samples: DenseSamples,
  from: number,
  xa: number,
  xb: number,
  ya: ArrayLike<number>,
  fa: ArrayLike<number>,
  ym: ArrayLike<number>,
  fm: ArrayLike<number>,
  yb: ArrayLike<number>,
  fb: ArrayLike<number>,
): number {
  const { xs, ys, components } = samples;
  const h = xb - xa;
  const slack = Math.abs(xb) * 1e-12;
  let k = from;
  while (k < xs.length && xs[k]! <= xb + slack) {
    const base = k * components;
    const u = (xs[k]! - xa) / h;
    const uh = u - 0.5;
    for (let i = 0; i < components; i++) {
      const d0 = h * fa[i]!;
      const dm = h * fm[i]!;
      const d1 = h * fb[i]!;
      const q0m = 2 * (ym[i]! - ya[i]!);
      const qm1 = 2 * (yb[i]! - ym[i]!);
      const c2 = 2 * (q0m - d0);
      const c0mm = 2 * (dm - q0m);
      const cmm1 = 2 * (qm1 - dm);
      const cm11 = 2 * (d1 - qm1);
      const c3 = 2 * (c0mm - c2);
      const t0mm1 = cmm1 - c0mm;
      const tmm11 = 2 * (cm11 - cmm1);
      const c4 = t0mm1 - c3;
      const c5 = tmm11 - t0mm1 - c4;
      ys[base + i] = ya[i]! + u * (d0 + u * (c2 + uh * (c3 + uh * (c4 + c5 * (u - 1)))));
    }
    k++;
  }
  return k;
}
