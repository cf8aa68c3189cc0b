/**
 * Restarted GMRES for A x = b with A given only as a product (matrix-free), modified Gram–Schmidt
 * Arnoldi and Givens rotations (Saad & Schultz 1986, SIAM J. Sci. Stat. Comput. 7, 856; Saad,
 * Iterative Methods for Sparse Linear Systems, 2nd ed., 2003, Algorithm 6.9). Starts from x = 0.
 */
export interface GmresResult {
  /** Products A v taken. */
  products: number;
  /** ‖b − A x‖₂ / ‖b‖₂ reached. */
  relativeResidual: number;
}

export function gmres(
  apply: (v: Float64Array, out: Float64Array) => void,
  b: Float64Array,
  x: Float64Array,
  options: { relativeTolerance: number; restart: number; maxProducts: number },
): GmresResult {
  const n = b.length;
  const m = Math.max(1, Math.min(options.restart, n));
  const basis = Array.from({ length: m + 1 }, () => new Float64Array(n));
  const h = new Float64Array((m + 1) * m); // Hessenberg, row-major (m + 1) × m
  const cs = new Float64Array(m);
  const sn = new Float64Array(m);
  const g = new Float64Array(m + 1);
  const y = new Float64Array(m);
  const work = new Float64Array(n);
  const norm = (v: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < n; i++) s += v[i]! * v[i]!;
    return Math.sqrt(s);
  };
  x.fill(0);
  const bNorm = norm(b);
  if (bNorm === 0) return { products: 0, relativeResidual: 0 };
  let products = 0;
  let relative = 1;
  while (products < options.maxProducts) {
    // r = b − A x
    const r = basis[0]!;
    if (products === 0) r.set(b);
    else {
      apply(x, work);
      products++;
      for (let i = 0; i < n; i++) r[i] = b[i]! - work[i]!;
    }
    const beta = norm(r);
    relative = beta / bNorm;
    if (relative <= options.relativeTolerance) break;
    for (let i = 0; i < n; i++) r[i] = r[i]! / beta;
    g.fill(0);
    g[0] = beta;
    let k = 0;
    for (; k < m && products < options.maxProducts; k++) {
      const w = basis[k + 1]!;
      apply(basis[k]!, w);
      products++;
      for (let i = 0; i <= k; i++) {
        const v = basis[i]!;
        let dot = 0;
        for (let c = 0; c < n; c++) dot += w[c]! * v[c]!;
        h[i * m + k] = dot;
        for (let c = 0; c < n; c++) w[c] = w[c]! - dot * v[c]!;
      }
      const wNorm = norm(w);
      h[(k + 1) * m + k] = wNorm;
      if (wNorm > 0) for (let c = 0; c < n; c++) w[c] = w[c]! / wNorm;
      for (let i = 0; i < k; i++) {
        const a = h[i * m + k]!;
        const bb = h[(i + 1) * m + k]!;
        h[i * m + k] = cs[i]! * a + sn[i]! * bb;
        h[(i + 1) * m + k] = -sn[i]! * a + cs[i]! * bb;
      }
      const a = h[k * m + k]!;
      const bb = h[(k + 1) * m + k]!;
      const d = Math.hypot(a, bb);
      cs[k] = d === 0 ? 1 : a / d;
      sn[k] = d === 0 ? 0 : bb / d;
      h[k * m + k] = d;
      h[(k + 1) * m + k] = 0;
      g[k + 1] = -sn[k]! * g[k]!;
      g[k] = cs[k]! * g[k]!;
      relative = Math.abs(g[k + 1]!) / bNorm;
      if (relative <= options.relativeTolerance || wNorm === 0) {
        k++;
        break;
      }
    }
    // Back substitution for y, then x += V y.
    for (let i = k - 1; i >= 0; i--) {
      let s = g[i]!;
      for (let c = i + 1; c < k; c++) s -= h[i * m + c]! * y[c]!;
      y[i] = h[i * m + i] === 0 ? 0 : s / h[i * m + i]!;
    }
    for (let i = 0; i < k; i++) {
      const v = basis[i]!;
      for (let c = 0; c < n; c++) x[c] = x[c]! + y[i]! * v[c]!;
    }
    if (relative <= options.relativeTolerance) break;
  }
  return { products, relativeResidual: relative };
}
