/**
 * The posterior's pair plot as numbers: each parameter's range and histogram, and the 2-D counts of
 * each pair, binned on the same edges. The SVG figure and the viewer draw from this one binning.
 */

export interface PairDensity {
  bins: number;
  /** [low, high] of each parameter's bins (the samples' range, padded by 5 %). */
  ranges: [number, number][];
  /** histograms[j][b]: samples of parameter j in bin b. */
  histograms: number[][];
  /** pairs[row][col] for col < row: counts[by · bins + bx], x = parameter col, y = parameter row. */
  pairs: number[][][];
}

function paddedRange(values: readonly number[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (Number.isFinite(v)) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
  }
  if (!(hi > lo)) {
    const c = Number.isFinite(lo) ? lo : 0;
    const half = Math.abs(c) * 1e-6 || 1;
    return [c - half, c + half];
  }
  const pad = 0.05 * (hi - lo);
  return [lo - pad, hi + pad];
}

/** Bins columns of samples (columns[j][i]: parameter j of sample i) into histograms and pairwise counts. */
export function pairDensity(columns: readonly (readonly number[])[], bins = 24): PairDensity {
  const ranges = columns.map(paddedRange);
  const binOf = (v: number, [lo, hi]: [number, number]) => Math.min(bins - 1, Math.max(0, Math.floor(((v - lo) / (hi - lo)) * bins)));
  const histograms = columns.map((c, j) => {
    const counts = new Array<number>(bins).fill(0);
    for (const v of c) counts[binOf(v, ranges[j]!)]!++;
    return counts;
  });
  const pairs = columns.map((ys, row) =>
    columns.slice(0, row).map((xs, col) => {
      const counts = new Array<number>(bins * bins).fill(0);
      for (let i = 0; i < xs.length; i++) counts[binOf(ys[i]!, ranges[row]!) * bins + binOf(xs[i]!, ranges[col]!)]!++;
      return counts;
    }),
  );
  return { bins, ranges, histograms, pairs };
}

/** Parameter columns of the chain's walker positions (every walker of every step given). */
export function chainColumns(steps: readonly { positions: readonly ArrayLike<number>[] }[], dimension: number): number[][] {
  const columns = Array.from({ length: dimension }, () => [] as number[]);
  for (const s of steps) for (const x of s.positions) for (let j = 0; j < dimension; j++) columns[j]!.push(x[j]!);
  return columns;
}
