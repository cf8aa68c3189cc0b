/**
 * Geometry of the viewer's heat maps: cells placed by their values (a column's layers are thin at
 * the top and thicken with depth, so rows are drawn at their depths in metres, not one per layer
 * index) or evenly (a sweep's levels), and which cell lies under a point. Pure: no DOM.
 */

/** Cell edges around ascending centres: midpoints inside, each end mirrored about its centre. */
export function edgesFromCentres(centres: readonly number[]): number[] {
  const n = centres.length;
  if (n === 0) return [];
  if (n === 1) return [centres[0]! - 0.5, centres[0]! + 0.5];
  const edges = new Array<number>(n + 1);
  for (let i = 1; i < n; i++) edges[i] = (centres[i - 1]! + centres[i]!) / 2;
  edges[0] = 2 * centres[0]! - edges[1]!;
  edges[n] = 2 * centres[n - 1]! - edges[n - 1]!;
  return edges;
}

/**
 * The edges of layers that start at the surface (depth 0) given their centres, each centre midway
 * between its layer's edges (as the conduction column's finite volumes are): e₀ = 0, eᵢ₊₁ = 2cᵢ − eᵢ.
 */
export function layerEdges(centres: readonly number[]): number[] {
  const edges = [0];
  for (let i = 0; i < centres.length; i++) edges.push(2 * centres[i]! - edges[i]!);
  return edges;
}

/** Evenly spaced edges 0 … n (one unit per cell), for cells placed by index. */
export function indexEdges(n: number): number[] {
  return Array.from({ length: n + 1 }, (_, i) => i);
}

/** The index of the cell whose edges hold v (edges ascending), or −1 outside. */
export function cellAt(edges: readonly number[], v: number): number {
  const n = edges.length - 1;
  if (n < 1 || !(v >= edges[0]!) || !(v <= edges[n]!)) return -1;
  let lo = 0;
  let hi = n;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (edges[mid]! <= v) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** The finite range of the values, or null when there are none. */
export function valueRange(values: Iterable<number>): { lo: number; hi: number } | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? { lo, hi } : null;
}
