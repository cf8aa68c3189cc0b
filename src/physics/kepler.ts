/**
 * Kepler's equation E − e sin E = M for elliptic orbits, 0 ≤ e < 1.
 *
 * Method: reduce M to [0, π] by symmetry, start from Danby's guess E₀ = M + 0.85 e
 * (Danby, Fundamentals of Celestial Mechanics, 2nd ed. 1988, §6.6), then Newton steps kept
 * inside the bracket [M, min(π, M + e)] that always holds the root (E − M = e sin E ∈ [0, e]
 * on [0, π]); a step that would leave the bracket is replaced by bisection. The loop is capped
 * and raises a typed error instead of returning an unconverged value.
 */
import { CalorbitError, requireNumber } from "../errors.js";

const TWO_PI = 2 * Math.PI;
/** Converged when a step moves E by less than this, rad (well inside the promised 1e-12). */
const STEP_TOLERANCE_RAD = 1e-15;
const MAX_ITERATIONS = 64;

/** Reduces an angle to [−π, π). */
export function wrapPi(angleRad: number): number {
  const x = angleRad - TWO_PI * Math.floor((angleRad + Math.PI) / TWO_PI);
  return x >= Math.PI ? x - TWO_PI : x;
}

/**
 * Eccentric anomaly E (rad) for mean anomaly M (rad, any real) and eccentricity e ∈ [0, 1).
 * The result is on the same revolution as M: E − e sin E = M to about 1e-15 rad.
 */
export function eccentricAnomaly(meanAnomalyRad: number, eccentricity: number): number {
  requireNumber("meanAnomaly", meanAnomalyRad, () => true, "a finite angle in rad");
  requireNumber("eccentricity", eccentricity, (e) => e >= 0 && e < 1, "0 ≤ e < 1");
  if (eccentricity === 0) return meanAnomalyRad;

  const reduced = wrapPi(meanAnomalyRad);
  const revolutionOffset = meanAnomalyRad - reduced;
  const sign = reduced < 0 ? -1 : 1;
  const m = Math.abs(reduced); // in [0, π]
  const e = eccentricity;

  let lo = m;
  let hi = Math.min(Math.PI, m + e);
  let E = Math.min(hi, m + 0.85 * e);
  for (let i = 0; i < MAX_ITERATIONS; i++) {
    const f = E - e * Math.sin(E) - m;
    if (f === 0) return revolutionOffset + sign * E;
    if (f > 0) hi = E;
    else lo = E;
    const fPrime = 1 - e * Math.cos(E);
    let next = E - f / fPrime;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    const step = Math.abs(next - E);
    E = next;
    if (step <= STEP_TOLERANCE_RAD || hi - lo <= STEP_TOLERANCE_RAD) {
      return revolutionOffset + sign * E;
    }
  }
  throw new CalorbitError(
    "KEPLER_NO_CONVERGENCE",
    `Kepler's equation did not converge for M = ${meanAnomalyRad} rad, e = ${eccentricity}`,
  );
}

/** Mean anomaly (rad) from eccentric anomaly (rad): Kepler's equation itself. */
export function meanAnomalyFromEccentric(eccentricAnomalyRad: number, eccentricity: number): number {
  return eccentricAnomalyRad - eccentricity * Math.sin(eccentricAnomalyRad);
}

/**
 * True anomaly ν (rad) from eccentric anomaly E (rad), on the same revolution as E.
 * tan(ν/2) = √((1+e)/(1−e)) tan(E/2), written with atan2 so it holds at E = ±π
 * (Murray & Dermott, Solar System Dynamics, 1999, eq. 2.46).
 */
export function trueAnomalyFromEccentric(eccentricAnomalyRad: number, eccentricity: number): number {
  const half = eccentricAnomalyRad / 2;
  const reducedHalf = wrapPi(eccentricAnomalyRad) / 2;
  const nuReduced =
    2 *
    Math.atan2(
      Math.sqrt(1 + eccentricity) * Math.sin(reducedHalf),
      Math.sqrt(1 - eccentricity) * Math.cos(reducedHalf),
    );
  return nuReduced + 2 * (half - reducedHalf);
}

/** Eccentric anomaly (rad) from true anomaly (rad), on the same revolution. */
export function eccentricFromTrue(trueAnomalyRad: number, eccentricity: number): number {
  const reducedHalf = wrapPi(trueAnomalyRad) / 2;
  const eReduced =
    2 *
    Math.atan2(
      Math.sqrt(1 - eccentricity) * Math.sin(reducedHalf),
      Math.sqrt(1 + eccentricity) * Math.cos(reducedHalf),
    );
  return eReduced + (trueAnomalyRad - 2 * reducedHalf);
}
