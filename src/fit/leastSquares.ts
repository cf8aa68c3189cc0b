/**
 * Bounded nonlinear least squares: Levenberg–Marquardt (Marquardt's diagonal scaling, Nocedal &
 * Wright 2006, §10.3; Press et al., Numerical Recipes 3rd ed. §15.5) with the step projected onto
 * the bounds, from several starts.
 *
 * Why not the ml-levenberg-marquardt package (checked: 5.1.0)? Its iteration applies every step,
 * even one that raises χ² (it only remembers the best point seen), it has no stopping rule except
 * an absolute χ² target (so it always runs to its iteration cap: each iteration is p + 1 full
 * simulations here), and it has no covariance. A fit whose every model evaluation is a periodic
 * solve needs steps that are rejected and retried with more damping, a relative stopping rule,
 * and the Jacobian at the optimum for the covariance; that is the ~150 lines below.
 *
 * The problem is written in internal coordinates z (ln v for log-scale parameters), residuals
 * weighted by 1/σ: χ² = Σ rᵢ².
 */

export interface LeastSquaresProblem {
  /** Lower and upper bounds of each internal coordinate. */
  lower: Float64Array;
  upper: Float64Array;
  /** Number of residuals. */
  points: number;
  /** Writes the weighted residuals (yᵢ − mᵢ(z))/σᵢ; returns false when the model cannot be evaluated there. */
  residuals(z: Float64Array, out: Float64Array): boolean;
}

export interface LeastSquaresOptions {
  maxIterations?: number;
  /** Stop when an accepted step lowers χ² by less than this fraction (default 1e-9) and moves z by < 1e-6 of the range. */
  relativeChiSquareTolerance?: number;
}

export interface LeastSquaresResult {
  z: Float64Array;
  chiSquare: number;
  /** Weighted residuals at z. */
  residuals: Float64Array;
  iterations: number;
  evaluations: number;
  converged: boolean;
  /** Coordinates that ended on a bound (their uncertainty from the Jacobian is not meaningful). */
  atBound: boolean[];
}

/** Cholesky factorisation of a symmetric positive-definite p×p matrix (row-major, in place: lower triangle); false if not positive definite. */
function cholesky(a: Float64Array, p: number): boolean {
  for (let j = 0; j < p; j++) {
    let d = a[j * p + j]!;
    for (let k = 0; k < j; k++) d -= a[j * p + k]! ** 2;
    if (!(d > 0)) return false;
    const l = Math.sqrt(d);
    a[j * p + j] = l;
    for (let i = j + 1; i < p; i++) {
      let s = a[i * p + j]!;
      for (let k = 0; k < j; k++) s -= a[i * p + k]! * a[j * p + k]!;
      a[i * p + j] = s / l;
    }
  }
  return true;
}

/** Solves L Lᵀ x = b with the factor from `cholesky`. */
function choleskySolve(l: Float64Array, p: number, b: Float64Array, x: Float64Array): void {
  for (let i = 0; i < p; i++) {
    let s = b[i]!;
    for (let k = 0; k < i; k++) s -= l[i * p + k]! * x[k]!;
    x[i] = s / l[i * p + i]!;
  }
  for (let i = p - 1; i >= 0; i--) {
    let s = x[i]!;
    for (let k = i + 1; k < p; k++) s -= l[k * p + i]! * x[k]!;
    x[i] = s / l[i * p + i]!;
  }
}

/** The inverse of a symmetric positive-definite matrix, or null when it is singular. */
export function inverseSpd(a: Float64Array, p: number): Float64Array | null {
  const l = Float64Array.from(a);
  if (!cholesky(l, p)) return null;
  const inv = new Float64Array(p * p);
  const e = new Float64Array(p);
  const x = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    e.fill(0);
    e[j] = 1;
    choleskySolve(l, p, e, x);
    for (let i = 0; i < p; i++) inv[i * p + j] = x[i]!;
  }
  return inv;
}

function chiSquareOf(r: Float64Array): number {
  let s = 0;
  for (let i = 0; i < r.length; i++) s += r[i]! * r[i]!;
  return s;
}

/**
 * The Jacobian of the weighted model values, ∂(mᵢ/σᵢ)/∂zⱼ = −∂rᵢ/∂zⱼ (row-major, points × p), by
 * central differences (one-sided at a bound), step `relativeStep` × the coordinate's range.
 * Returns the number of evaluations, or −1 when an evaluation failed.
 */
export function jacobian(problem: LeastSquaresProblem, z: Float64Array, relativeStep: number, out: Float64Array): number {
  const p = z.length;
  const m = problem.points;
  const zp = Float64Array.from(z);
  const rPlus = new Float64Array(m);
  const rMinus = new Float64Array(m);
  let evaluations = 0;
  for (let j = 0; j < p; j++) {
    const h = relativeStep * (problem.upper[j]! - problem.lower[j]!);
    const up = Math.min(z[j]! + h, problem.upper[j]!);
    const down = Math.max(z[j]! - h, problem.lower[j]!);
    zp[j] = up;
    if (!problem.residuals(zp, rPlus)) return -1;
    zp[j] = down;
    if (!problem.residuals(zp, rMinus)) return -1;
    zp[j] = z[j]!;
    evaluations += 2;
    const span = up - down;
    for (let i = 0; i < m; i++) out[i * p + j] = -(rPlus[i]! - rMinus[i]!) / span;
  }
  return evaluations;
}

/** One Levenberg–Marquardt descent from `start` (internal coordinates, clamped into the bounds). */
export function levenbergMarquardt(problem: LeastSquaresProblem, start: ArrayLike<number>, options: LeastSquaresOptions = {}): LeastSquaresResult | null {
  const p = start.length;
  const m = problem.points;
  const maxIterations = options.maxIterations ?? 100;
  const tol = options.relativeChiSquareTolerance ?? 1e-9;
  const z = Float64Array.from(start, (v, j) => Math.min(problem.upper[j]!, Math.max(problem.lower[j]!, v)));
  const r = new Float64Array(m);
  const rTrial = new Float64Array(m);
  const jac = new Float64Array(m * p);
  const a = new Float64Array(p * p);
  const damped = new Float64Array(p * p);
  const g = new Float64Array(p);
  const step = new Float64Array(p);
  const trial = new Float64Array(p);
  let evaluations = 1;
  if (!problem.residuals(z, r)) return null;
  let chi2 = chiSquareOf(r);
  let lambda = 1e-3;
  let converged = false;
  let iterations = 0;
  for (; iterations < maxIterations && !converged; iterations++) {
    const used = jacobian(problem, z, 1e-6, jac);
    if (used < 0) return null;
    evaluations += used;
    // Normal equations: (JᵀJ + λ diag JᵀJ) δ = Jᵀ r (J of the model values, r = data − model).
    a.fill(0);
    g.fill(0);
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < p; j++) {
        const jij = jac[i * p + j]!;
        g[j]! += jij * r[i]!;
        for (let k = 0; k <= j; k++) a[j * p + k]! += jij * jac[i * p + k]!;
      }
    }
    for (let j = 0; j < p; j++) for (let k = 0; k < j; k++) a[k * p + j] = a[j * p + k]!;
    let accepted = false;
    for (let attempt = 0; attempt < 30 && !accepted; attempt++) {
      damped.set(a);
      for (let j = 0; j < p; j++) damped[j * p + j] = a[j * p + j]! * (1 + lambda) + 1e-30;
      if (!cholesky(damped, p)) {
        lambda *= 10;
        continue;
      }
      choleskySolve(damped, p, g, step);
      let moved = 0;
      for (let j = 0; j < p; j++) {
        trial[j] = Math.min(problem.upper[j]!, Math.max(problem.lower[j]!, z[j]! + step[j]!));
        moved = Math.max(moved, Math.abs(trial[j]! - z[j]!) / (problem.upper[j]! - problem.lower[j]!));
      }
      evaluations++;
      const ok = problem.residuals(trial, rTrial);
      const chi2Trial = ok ? chiSquareOf(rTrial) : Infinity;
      if (chi2Trial <= chi2) {
        accepted = true;
        const decrease = (chi2 - chi2Trial) / Math.max(chi2, 1e-300);
        z.set(trial);
        r.set(rTrial);
        chi2 = chi2Trial;
        lambda = Math.max(lambda / 5, 1e-12);
        if (decrease < tol && moved < 1e-6) converged = true;
      } else {
        lambda *= 4;
        // No downhill step even with heavy damping: at a minimum to the model's precision.
        if (lambda > 1e12 || moved < 1e-12) {
          converged = true;
          break;
        }
      }
    }
    if (!accepted && !converged) break;
  }
  const atBound = Array.from(z, (v, j) => v <= problem.lower[j]! || v >= problem.upper[j]!);
  return { z, chiSquare: chi2, residuals: r, iterations, evaluations, converged, atBound };
}

/** Runs LM from every start and keeps the lowest χ²; null when no start could be evaluated. */
export function multiStart(problem: LeastSquaresProblem, starts: readonly ArrayLike<number>[], options: LeastSquaresOptions = {}): { best: LeastSquaresResult; runs: (LeastSquaresResult | null)[] } | null {
  const runs = starts.map((s) => levenbergMarquardt(problem, s, options));
  let best: LeastSquaresResult | null = null;
  for (const r of runs) if (r && (best === null || r.chiSquare < best.chiSquare)) best = r;
  return best ? { best, runs } : null;
}

/**
 * Covariance of the internal coordinates from the Jacobian at the optimum, (JᵀJ)⁻¹ (weighted
 * residuals with absolute σ), null when JᵀJ is singular (a parameter the data do not constrain).
 */
export function covarianceFromJacobian(jac: Float64Array, points: number, p: number): Float64Array | null {
  const a = new Float64Array(p * p);
  for (let i = 0; i < points; i++) {
    for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) a[j * p + k]! += jac[i * p + j]! * jac[i * p + k]!;
  }
  return inverseSpd(a, p);
}

/** A seeded 32-bit generator (mulberry32): uniform in [0, 1). */
export function mulberry32(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
