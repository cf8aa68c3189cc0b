/**
 * Where an explicit forcing switches between zero and positive (a point's sunrise and sunset, a
 * band's polar night): found once per run so that the integrators can end steps exactly there,
 * where the forcing has a corner, and treat it as smooth in between.
 */

/**
 * The abscissae in (from, to), ascending, where f changes between ≤ 0 and > 0: f is scanned at
 * `points` equal steps and each change is bisected to 1e-10 (relative to |x| beyond 1). A pair of
 * changes closer together than one scan step can be missed (a sliver of day at a polar
 * terminator); the integrators' error control still covers such a corner, at their usual cost.
 */
export function switchPoints(f: (x: number) => number, from: number, to: number, points: number): Float64Array {
  const found: number[] = [];
  const step = (to - from) / points;
  let xa = from;
  let positiveA = f(from) > 0;
  for (let k = 1; k <= points; k++) {
    const xb = k === points ? to : from + k * step;
    const positiveB = f(xb) > 0;
    if (positiveA !== positiveB) {
      let lo = xa;
      let hi = xb;
      // Bisection to 1e-10 rad (a few milliseconds of a day): a step that ends that close to a
      // corner carries an error of order its square.
      for (let i = 0; i < 80 && hi - lo > 1e-10 * Math.max(1, Math.abs(lo)); i++) {
        const mid = 0.5 * (lo + hi);
        if (f(mid) > 0 === positiveA) lo = mid;
        else hi = mid;
      }
      const x = 0.5 * (lo + hi);
      if (x > from && x < to) found.push(x);
    }
    xa = xb;
    positiveA = positiveB;
  }
  return Float64Array.from(found);
}
