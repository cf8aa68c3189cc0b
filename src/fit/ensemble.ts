/**
 * The affine-invariant ensemble sampler with the stretch move (Goodman & Weare 2010, Comm. App.
 * Math. Comp. Sci. 5, 65), in the parallel form of Foreman-Mackey et al. (2013, PASP 125, 306,
 * Algorithm 3): the walkers are split into two halves; each walker of one half proposes
 * Y = X_j + Z (X_k − X_j) with X_j from the other half and Z drawn from g(z) ∝ 1/√z on [1/a, a]
 * (a = 2), accepted with probability min(1, Z^(d−1) p(Y)/p(X_k)). The proposals of one half are
 * independent, so a batch of them can be evaluated in parallel (the caller's `logProbability`).
 *
 * Reproducible and resumable: the random numbers of step s come from a generator seeded by
 * (seed, s) alone, so a run resumed at step s from the saved walkers continues exactly as an
 * uninterrupted one would.
 */
import { mulberry32 } from "./leastSquares.js";

/** Evaluates ln p at each point (−Infinity outside the support); may be asynchronous (worker threads). */
export type LogProbabilityBatch = (points: Float64Array[]) => number[] | Promise<number[]>;

export interface EnsembleState {
  /** Walker positions, walkers × dimension. */
  positions: Float64Array[];
  logProbability: number[];
}

export interface EnsembleOptions {
  steps: number;
  seed: number;
  /** Stretch scale a (default 2, Goodman & Weare's choice). */
  stretch?: number;
  /** The first step to run (a resumed run: the steps already saved). */
  firstStep?: number;
  /** Called after each step with the walkers (a copy is not made: copy what you keep). */
  onStep?: (step: number, state: EnsembleState, accepted: number) => void | Promise<void>;
}

/** A generator for step `step` of a run seeded with `seed` (independent of every other step). */
export function stepGenerator(seed: number, step: number): () => number {
  // Mix the two 32-bit numbers (an integer hash, splitmix-style constants) into one seed.
  let h = (seed ^ 0x9e3779b9) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b) >>> 0;
  h = (h ^ Math.imul(step + 1, 0xc2b2ae35)) >>> 0;
  h = Math.imul(h ^ (h >>> 13), 0x27d4eb2f) >>> 0;
  return mulberry32(h ^ (h >>> 16));
}

/** Runs the sampler from `state` (modified in place); returns the acceptance fraction of the steps run. */
export async function runEnsemble(state: EnsembleState, logProbability: LogProbabilityBatch, options: EnsembleOptions): Promise<number> {
  const walkers = state.positions.length;
  if (walkers < 4 || walkers % 2 !== 0) throw new RangeError("the ensemble needs an even number of walkers, at least 4");
  const dim = state.positions[0]!.length;
  const a = options.stretch ?? 2;
  const half = walkers / 2;
  let acceptedTotal = 0;
  let proposedTotal = 0;
  const proposals: Float64Array[] = Array.from({ length: half }, () => new Float64Array(dim));
  const zs = new Float64Array(half);
  for (let step = options.firstStep ?? 0; step < options.steps; step++) {
    const rng = stepGenerator(options.seed, step);
    let accepted = 0;
    for (let part = 0; part < 2; part++) {
      const self = part * half;
      const other = (1 - part) * half;
      for (let k = 0; k < half; k++) {
        const z = ((a - 1) * rng() + 1) ** 2 / a;
        const j = other + Math.min(half - 1, Math.floor(rng() * half));
        const xk = state.positions[self + k]!;
        const xj = state.positions[j]!;
        const y = proposals[k]!;
        for (let d = 0; d < dim; d++) y[d] = xj[d]! + z * (xk[d]! - xj[d]!);
        zs[k] = z;
      }
      const lp = await logProbability(proposals);
      for (let k = 0; k < half; k++) {
        const current = state.logProbability[self + k]!;
        const lnRatio = (dim - 1) * Math.log(zs[k]!) + lp[k]! - current;
        const u = rng();
        if (lp[k]! > -Infinity && Math.log(u) < lnRatio) {
          state.positions[self + k]!.set(proposals[k]!);
          state.logProbability[self + k] = lp[k]!;
          accepted++;
        }
      }
    }
    acceptedTotal += accepted;
    proposedTotal += walkers;
    if (options.onStep) await options.onStep(step, state, accepted);
  }
  return proposedTotal > 0 ? acceptedTotal / proposedTotal : 0;
}

/**
 * Integrated autocorrelation time of a chain stored as chain[step][walker] for one parameter: the
 * autocorrelation function averaged over walkers, summed with Sokal's automatic window (the
 * smallest M with M ≥ c τ(M), c = 5), as described by Foreman-Mackey et al. (2013) and Sokal (1997).
 */
export function autocorrelationTime(chain: readonly Float64Array[], c = 5): number {
  const steps = chain.length;
  if (steps < 4) return NaN;
  const walkers = chain[0]!.length;
  const centred: Float64Array[] = [];
  const variance: number[] = [];
  for (let w = 0; w < walkers; w++) {
    const x = new Float64Array(steps);
    let mean = 0;
    for (let s = 0; s < steps; s++) mean += chain[s]![w]!;
    mean /= steps;
    let c0 = 0;
    for (let s = 0; s < steps; s++) {
      x[s] = chain[s]![w]! - mean;
      c0 += x[s]! * x[s]!;
    }
    if (c0 > 0) {
      centred.push(x);
      variance.push(c0);
    }
  }
  if (centred.length === 0) return NaN;
  // Lag by lag (each averaged over walkers), stopping at Sokal's window: O(steps × window × walkers).
  let tau = 1;
  for (let m = 1; m < steps; m++) {
    let rho = 0;
    for (let w = 0; w < centred.length; w++) {
      const x = centred[w]!;
      let acc = 0;
      for (let s = 0; s + m < steps; s++) acc += x[s]! * x[s + m]!;
      rho += acc / variance[w]!;
    }
    tau += (2 * rho) / centred.length;
    if (m >= c * tau) return tau;
  }
  return tau;
}

/** The q-quantile (0..1) of values, linear between order statistics. */
export function quantile(sorted: Float64Array, q: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const pos = q * (n - 1);
  const i = Math.floor(pos);
  const f = pos - i;
  return i + 1 < n ? sorted[i]! * (1 - f) + sorted[i + 1]! * f : sorted[n - 1]!;
}
