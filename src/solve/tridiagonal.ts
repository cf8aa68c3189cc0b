/**
 * Symmetric tridiagonal solve by the Thomas algorithm (forward elimination, back substitution;
 * common practice, e.g. Press et al., Numerical Recipes, §2.4). O(n), allocation-free given scratch.
 */
import { CalorbitError } from "../errors.js";

/**
 * Solves M x = b (n = x.length) for M with diagonal diag[diagOffset … diagOffset + n − 1] and
 * off-diagonal `off` (n − 1 values, the same above and below the diagonal). `x` may alias `b`;
 * `scratch` holds n values.
 */
export function solveSymmetricTridiagonal(
  diag: ArrayLike<number>,
  off: ArrayLike<number>,
  b: ArrayLike<number>,
  x: Float64Array,
  scratch: Float64Array,
  diagOffset = 0,
): void {
  const n = x.length;
  let pivot = diag[diagOffset]!;
  if (!(Math.abs(pivot) > 0) || !Number.isFinite(pivot)) throw singular();
  x[0] = b[0]! / pivot;
  for (let i = 1; i < n; i++) {
    const o = off[i - 1]!;
    scratch[i] = o / pivot;
    pivot = diag[diagOffset + i]! - o * scratch[i]!;
    if (!(Math.abs(pivot) > 0) || !Number.isFinite(pivot)) throw singular();
    x[i] = (b[i]! - o * x[i - 1]!) / pivot;
  }
  for (let i = n - 2; i >= 0; i--) x[i] = x[i]! - scratch[i + 1]! * x[i + 1]!;
}

function singular(): CalorbitError {
  return new CalorbitError("INTEGRATION_FAILED", "a band system's step matrix is singular (a zero pivot in the tridiagonal solve)");
}
