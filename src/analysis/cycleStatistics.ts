/**
 * Statistics of a sampled temperature history: time means, extremes between samples, time
 * inside a window. Samples are uniform in the eccentric anomaly E; time enters through the
 * explicit t(E), so every mean is a time mean and every duration is exact for the interpolant.
 * For a periodic, smooth integrand the trapezoidal rule on a uniform grid converges
 * geometrically (Trefethen & Weideman 2014, SIAM Review 56, 385), which is why the grid is in E:
 * near periastron of a very eccentric orbit E spreads out what t crams together.
 */

/** Time mean of values v_k sampled at E_k, weighted by dt/dE at each sample (trapezoidal rule). */
export function timeMean(values: Float64Array, timePerAnomaly: Float64Array): number {
  const last = values.length - 1;
  let sum = 0.5 * (values[0]! * timePerAnomaly[0]! + values[last]! * timePerAnomaly[last]!);
  let weight = 0.5 * (timePerAnomaly[0]! + timePerAnomaly[last]!);
  for (let k = 1; k < last; k++) {
    sum += values[k]! * timePerAnomaly[k]!;
    weight += timePerAnomaly[k]!;
  }
  return sum / weight;
}

/** Cubic Hermite interpolant on [xa, xb] through (ya, da) and (yb, db) at x. */
export function hermite(xa: number, xb: number, ya: number, yb: number, da: number, db: number, x: number): number {
  const h = xb - xa;
  const s = (x - xa) / h;
  const h00 = (1 + 2 * s) * (1 - s) * (1 - s);
  const h10 = s * (1 - s) * (1 - s);
  const h01 = s * s * (3 - 2 * s);
  const h11 = s * s * (s - 1);
  return h00 * ya + h10 * h * da + h01 * yb + h11 * h * db;
}

export interface Extremum {
  /** Abscissa of the extremum (E, rad). */
  x: number;
  value: number;
}

/** Secant slope of interval k of a cycle (k = −1 is the last interval, k = last is the first: the ends are one point). */
function cyclicSecant(xs: Float64Array, ys: Float64Array, k: number): number {
  const intervals = xs.length - 1;
  const i = k < 0 ? intervals - 1 : k >= intervals ? 0 : k;
  return (ys[i + 1]! - ys[i]!) / (xs[i + 1]! - xs[i]!);
}

/** Width of interval k of a cycle (the same wrap as `cyclicSecant`). */
function cyclicWidth(xs: Float64Array, k: number): number {
  const intervals = xs.length - 1;
  const i = k < 0 ? intervals - 1 : k >= intervals ? 0 : k;
  return xs[i + 1]! - xs[i]!;
}

/** Whether derivative d at sample k lies where a smooth curve through the samples puts its slope (see `usableSlopes`). */
function slopeAgrees(xs: Float64Array, ys: Float64Array, d: number, k: number): boolean {
  const before = cyclicSecant(xs, ys, k - 1);
  const after = cyclicSecant(xs, ys, k);
  const margin = before * after > 0 ? Math.min(Math.abs(before), Math.abs(after)) : 0;
  return d >= Math.min(before, after) - margin && d <= Math.max(before, after) + margin;
}

/** Slope at sample k of the parabola through it and its two neighbours (a weighted mean of the secants; second order). */
function parabolaSlope(xs: Float64Array, ys: Float64Array, k: number): number {
  const hBefore = cyclicWidth(xs, k - 1);
  const hAfter = cyclicWidth(xs, k);
  return (hAfter * cyclicSecant(xs, ys, k - 1) + hBefore * cyclicSecant(xs, ys, k)) / (hBefore + hAfter);
}

/** More samples than this (or this share of them) contradicting their derivatives, and no derivative is used. */
const CONTRADICTIONS_TOLERATED = 2;
const CONTRADICTED_SHARE = 0.01;

/**
 * The slopes the interpolation uses: the given derivatives where the samples agree with them, else
 * the slope of the parabola through each sample and its two neighbours; and the parabola's slopes
 * everywhere when the samples contradict the derivatives at more than a few places.
 *
 * The samples agree with a derivative that lies between the two neighbouring secants, a range
 * widened on each side by the smaller secant where both have the same sign. A smooth curve's own
 * derivative always lies there: between the secants where it is convex or concave (mean value
 * theorem), which it is beside a sampled extremum (secants of opposite signs); and through an
 * inflection, where the derivative is itself extreme and passes the secants by O(h²), within the
 * margin. So exact derivatives pass unchanged and the Hermite interpolant keeps its fourth order.
 *
 * Derivatives that the samples contradict are the stiff balance's (τ ≪ P): dT/dt = (F − εσT⁴)/C
 * evaluated from a T right to 1e-9 carries that error times P/τ, and the cubic through such slopes
 * swung hundreds of kelvin between samples that agree to 1 K (a "maximum" of 502 K against an
 * equilibrium range of 229–312 K, a minimum of −1665 K). Such errors are random in size: a few
 * happen to fall inside the range above (measured: −0.23 K/rad at a peak whose neighbours' secants
 * were ±0.45), so once the samples contradict many of them, none is trusted. The parabola's slopes
 * lie between the secants, so monotone samples stay monotone (inside Fritsch & Carlson's region
 * α, β ≤ 3: SIAM J. Numer. Anal. 17 (1980) 238), and its error is second order.
 */
export function usableSlopes(xs: Float64Array, ys: Float64Array, ds: Float64Array): Float64Array {
  const count = xs.length;
  const slopes = new Float64Array(count);
  let contradicted = 0;
  for (let k = 0; k < count; k++) {
    const d = ds[k]!;
    if (slopeAgrees(xs, ys, d, k)) {
      slopes[k] = d;
    } else {
      slopes[k] = parabolaSlope(xs, ys, k);
      contradicted++;
    }
  }
  if (contradicted > Math.max(CONTRADICTIONS_TOLERATED, CONTRADICTED_SHARE * count)) {
    for (let k = 0; k < count; k++) slopes[k] = parabolaSlope(xs, ys, k);
  }
  return slopes;
}

/**
 * Maximum (sign = 1) or minimum (sign = −1) of a sampled function with known derivatives,
 * refined between samples with the cubic Hermite interpolant (error O(h⁴)). Every interval where
 * the slope turns is refined, not only those beside the best sample: a history with many
 * near-equal peaks (a point's days) can have its best sample on another peak than its extremum
 * (measured on a point with 365 solar days per orbit: the best sample's peak left the maximum
 * 1.3e-5 low against an independent reference).
 *
 * The refined value never leaves the bracket the samples give: it is at least the best sample and
 * at most the peak of the two neighbouring secants extended toward each other (over a curve that is
 * concave near its maximum, those lines lie above it, so the true maximum is below their meeting
 * point; where the samples are not concave there, no refinement beyond the best sample is taken).
 * The slopes are those of `usableSlopes`. The samples are a cycle: the last repeats the first.
 */
export function hermiteExtremum(xs: Float64Array, ys: Float64Array, ds: Float64Array, sign: 1 | -1): Extremum {
  let best = 0;
  for (let k = 1; k < ys.length; k++) if (sign * ys[k]! > sign * ys[best]!) best = k;
  let result: Extremum = { x: xs[best]!, value: ys[best]! };
  // On a cycle the last sample repeats the first: a peak at either end may lie past the other end.
  const last = ys.length - 1;
  const firstNearBest = best === 0 || best === last ? 0 : best - 1;
  const wrapNearBest = best === 0 || best === last ? last - 1 : best;
  const slopes = usableSlopes(xs, ys, ds);
  for (let k = 0; k < last; k++) {
    const turns = sign * slopes[k]! > 0 && sign * slopes[k + 1]! <= 0;
    if (turns || k === firstNearBest || k === wrapNearBest) {
      const refined = refineInterval(xs, ys, slopes[k]!, slopes[k + 1]!, k, sign);
      if (refined !== null && sign * refined.value > sign * result.value) result = refined;
    }
  }
  return result;
}

/**
 * The highest value (in sign × y) the samples allow on interval k: the meeting point of the
 * secants of the intervals before and after it, extended into it, and never below its end samples.
 */
function bracketCap(xs: Float64Array, ys: Float64Array, k: number, sign: 1 | -1): number {
  const xa = xs[k]!;
  const xb = xs[k + 1]!;
  const ya = sign * ys[k]!;
  const yb = sign * ys[k + 1]!;
  const rising = sign * cyclicSecant(xs, ys, k - 1);
  const falling = sign * cyclicSecant(xs, ys, k + 1);
  const lower = (x: number) => Math.min(ya + rising * (x - xa), yb + falling * (x - xb));
  let cap = Math.max(lower(xa), lower(xb));
  if (rising !== falling) {
    const meet = (yb - ya + rising * xa - falling * xb) / (rising - falling);
    if (meet > xa && meet < xb) cap = Math.max(cap, lower(meet));
  }
  return Math.max(cap, ya, yb);
}

/** The extremum of the Hermite cubic on [xs[k], xs[k+1]] strictly inside it (within the samples' bracket), or null. */
function refineInterval(xs: Float64Array, ys: Float64Array, da: number, db: number, k: number, sign: 1 | -1): Extremum | null {
  const xa = xs[k]!;
  const xb = xs[k + 1]!;
  const h = xb - xa;
  // d/ds of the Hermite cubic is a quadratic a s² + b s + c; its roots in (0, 1) are candidates.
  const ya = ys[k]!;
  const yb = ys[k + 1]!;
  const ma = h * da;
  const mb = h * db;
  const a = 6 * ya + 3 * ma - 6 * yb + 3 * mb;
  const b = -6 * ya - 4 * ma + 6 * yb - 2 * mb;
  const c = ma;
  let found: Extremum | null = null;
  const consider = (s: number): void => {
    if (!(s > 0 && s < 1)) return;
    const x = xa + s * h;
    const v = hermite(xa, xb, ya, yb, da, db, x);
    if (found === null || sign * v > sign * found.value) found = { x, value: v };
  };
  if (Math.abs(a) < 1e-300) {
    if (b !== 0) consider(-c / b);
  } else {
    const disc = b * b - 4 * a * c;
    if (disc >= 0) {
      const q = -0.5 * (b + Math.sign(b || 1) * Math.sqrt(disc));
      consider(q / a);
      if (q !== 0) consider(c / q);
    }
  }
  const refined = found as Extremum | null;
  if (refined === null) return null;
  const cap = bracketCap(xs, ys, k, sign);
  return sign * refined.value > cap ? { x: refined.x, value: sign * cap } : refined;
}

/**
 * Maximum (sign = 1) or minimum (sign = −1) of an explicit function f sampled at xs: the best
 * sample, refined by golden-section search on its two neighbouring intervals.
 */
export function refinedExtremum(xs: Float64Array, ys: Float64Array, f: (x: number) => number, sign: 1 | -1): Extremum {
  let best = 0;
  for (let k = 1; k < ys.length; k++) if (sign * ys[k]! > sign * ys[best]!) best = k;
  const last = ys.length - 1;
  if (best === 0 || best === last) {
    // On a cycle the ends are one point: search the first and the last interval.
    const a = golden(xs[0]!, xs[1]!, f, sign);
    const b = golden(xs[last - 1]!, xs[last]!, f, sign);
    const winner = sign * a.value >= sign * b.value ? a : b;
    return sign * winner.value > sign * ys[best]! ? winner : { x: xs[best]!, value: ys[best]! };
  }
  const inner = golden(xs[best - 1]!, xs[best + 1]!, f, sign);
  return sign * inner.value > sign * ys[best]! ? inner : { x: xs[best]!, value: ys[best]! };
}

/** Golden-section search for the extremum of f on [lo, hi]. */
function golden(lo: number, hi: number, f: (x: number) => number, sign: 1 | -1): Extremum {
  const ratio = (Math.sqrt(5) - 1) / 2;
  let x1 = hi - ratio * (hi - lo);
  let x2 = lo + ratio * (hi - lo);
  let f1 = sign * f(x1);
  let f2 = sign * f(x2);
  for (let i = 0; i < 80 && hi - lo > 1e-13 * Math.max(1, Math.abs(hi)); i++) {
    if (f1 > f2) {
      hi = x2;
      x2 = x1;
      f2 = f1;
      x1 = hi - ratio * (hi - lo);
      f1 = sign * f(x1);
    } else {
      lo = x1;
      x1 = x2;
      f1 = f2;
      x2 = lo + ratio * (hi - lo);
      f2 = sign * f(x2);
    }
  }
  const x = 0.5 * (lo + hi);
  return { x, value: f(x) };
}

/**
 * Time spent with low ≤ y ≤ high, s, for a Hermite-interpolated sampled history (the slopes
 * of `usableSlopes`, as for the extremes); `timeAt` converts the abscissa to time. Crossings are located by bisection on the interpolant.
 */
export function timeInWindow(
  xs: Float64Array,
  ys: Float64Array,
  ds: Float64Array,
  low: number,
  high: number,
  timeAt: (x: number) => number,
): number {
  let total = 0;
  // Intervals wholly inside are joined into runs, so time is looked up only where a run ends.
  let runStart = NaN;
  const slopes = usableSlopes(xs, ys, ds);
  for (let k = 0; k + 1 < xs.length; k++) {
    const xa = xs[k]!;
    const xb = xs[k + 1]!;
    const da = slopes[k]!;
    const db = slopes[k + 1]!;
    // The cubic stays within (4/27) h (|y′ₐ| + |y′ᵦ|) of its end values' range (|h₁₀|, |h₁₁| ≤ 4/27
    // on [0, 1]): an interval whose whole range is inside or outside the window has no crossing.
    const slack = (4 / 27) * (xb - xa) * (Math.abs(da) + Math.abs(db));
    const lowest = Math.min(ys[k]!, ys[k + 1]!) - slack;
    const highest = Math.max(ys[k]!, ys[k + 1]!) + slack;
    if (lowest >= low && highest <= high) {
      if (Number.isNaN(runStart)) runStart = xa;
      continue;
    }
    if (!Number.isNaN(runStart)) {
      total += timeAt(xa) - timeAt(runStart);
      runStart = NaN;
    }
    if (highest < low || lowest > high) continue;
    total += timeInsideInterval(xa, xb, ys[k]!, ys[k + 1]!, da, db, low, high, timeAt);
  }
  if (!Number.isNaN(runStart)) total += timeAt(xs[xs.length - 1]!) - timeAt(runStart);
  return total;
}

/**
 * Time inside [low, high] on one interval whose Hermite cubic may cross a threshold: the interval
 * is split at every crossing, found by bisection; four probes catch a cubic that leaves and
 * re-enters the window between samples. (A function of its own, with no closure over the caller's
 * loop, so the loop allocates nothing per interval.)
 */
function timeInsideInterval(
  xa: number,
  xb: number,
  ya: number,
  yb: number,
  da: number,
  db: number,
  low: number,
  high: number,
  timeAt: (x: number) => number,
): number {
  let total = 0;
  let segmentStart = xa;
  let previousX = xa;
  let previousInside = ya >= low && ya <= high;
  const probes = 4;
  for (let p = 1; p <= probes; p++) {
    const x = xa + ((xb - xa) * p) / probes;
    const v = p === probes ? yb : hermite(xa, xb, ya, yb, da, db, x);
    const now = v >= low && v <= high;
    if (now !== previousInside) {
      let lo = previousX;
      let hi = x;
      for (let i = 0; i < 60; i++) {
        const mid = 0.5 * (lo + hi);
        const vm = hermite(xa, xb, ya, yb, da, db, mid);
        if ((vm >= low && vm <= high) === previousInside) lo = mid;
        else hi = mid;
      }
      const crossing = 0.5 * (lo + hi);
      if (previousInside) total += timeAt(crossing) - timeAt(segmentStart);
      segmentStart = crossing;
      previousInside = now;
    }
    previousX = x;
  }
  if (previousInside) total += timeAt(xb) - timeAt(segmentStart);
  return total;
}

/**
 * Time mean of an explicit function f(E) over the grid, Simpson's rule on every interval, each
 * interval first split where f switches between zero and positive (sunrise and sunset of a
 * point: f has a corner there, which would cost the plain rule its order). `dtdE` is dt/dE.
 * `atGrid` may hold f and dt/dE at the grid points already (they are then not evaluated again).
 */
export function explicitTimeMean(
  xs: Float64Array,
  f: (x: number) => number,
  dtdE: (x: number) => number,
  atGrid?: { values: Float64Array; timePerAnomaly: Float64Array },
): number {
  let sum = 0;
  let weight = 0;
  // Simpson on [a, b] with the end values already known.
  const piece = (a: number, b: number, fa: number, wa: number, fb: number, wb: number): void => {
    const m = 0.5 * (a + b);
    const wm = dtdE(m);
    const h = (b - a) / 6;
    sum += h * (fa * wa + 4 * f(m) * wm + fb * wb);
    weight += h * (wa + 4 * wm + wb);
  };
  let fa = atGrid ? atGrid.values[0]! : f(xs[0]!);
  let wa = atGrid ? atGrid.timePerAnomaly[0]! : dtdE(xs[0]!);
  for (let k = 0; k + 1 < xs.length; k++) {
    const a = xs[k]!;
    const b = xs[k + 1]!;
    const fb = atGrid ? atGrid.values[k + 1]! : f(b);
    const wb = atGrid ? atGrid.timePerAnomaly[k + 1]! : dtdE(b);
    if (fa > 0 !== fb > 0) {
      let lo = a;
      let hi = b;
      for (let i = 0; i < 60; i++) {
        const mid = 0.5 * (lo + hi);
        if (f(mid) > 0 === fa > 0) lo = mid;
        else hi = mid;
      }
      piece(a, lo, fa, wa, f(lo), dtdE(lo));
      piece(hi, b, f(hi), dtdE(hi), fb, wb);
    } else {
      piece(a, b, fa, wa, fb, wb);
    }
    fa = fb;
    wa = wb;
  }
  return sum / weight;
}

/** x modulo m in [0, m) (also for negative x). */
export function positiveModulo(x: number, m: number): number {
  const r = x - m * Math.floor(x / m);
  return r >= m ? r - m : r;
}
