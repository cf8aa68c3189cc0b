/**
 * Which cases a sweep runs: a full grid over the axes (case id in row-major order, the last axis
 * fastest) or a Latin hypercube of N draws (McKay, Beckman & Conover 1979, Technometrics 21, 239):
 * each axis cut into N equal strata, one draw per stratum, strata paired by seeded permutations.
 * Shards take every N-th case, so a job array of N shards covers the sweep exactly once.
 */
import { CalorbitError } from "../errors.js";
import { levelAt, type Axis, type AxisValue } from "./spec.js";

export interface Design {
  axes: Axis[];
  /** Latin hypercube draws; absent for a grid. */
  random?: { count: number; seed: number };
}

export interface CaseValues {
  id: number;
  values: AxisValue[];
}

/** mulberry32: a small, well-mixed 32-bit generator; the same seed gives the same sweep everywhere. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function caseCount(design: Design): number {
  if (design.random) return design.random.count;
  return design.axes.reduce((n, a) => n * a.count, 1);
}

/** A function from case id to its values; for a hypercube, the permutations are drawn once here. */
export function caseMaker(design: Design): (id: number) => CaseValues {
  const { axes } = design;
  if (!design.random) {
    const strides = new Array<number>(axes.length);
    let stride = 1;
    for (let d = axes.length - 1; d >= 0; d--) {
      strides[d] = stride;
      stride *= axes[d]!.count;
    }
    return (id) => ({ id, values: axes.map((a, d) => levelAt(a, Math.floor(id / strides[d]!) % a.count)) });
  }
  const n = design.random.count;
  const random = seededRandom(design.random.seed);
  const strata = axes.map(() => {
    const perm = new Uint32Array(n);
    for (let i = 0; i < n; i++) perm[i] = i;
    for (let i = n - 1; i > 0; i--) {
      const j = Math.floor(random() * (i + 1));
      const t = perm[i]!;
      perm[i] = perm[j]!;
      perm[j] = t;
    }
    return perm;
  });
  const offsets = axes.map(() => Float64Array.from({ length: n }, () => random()));
  return (id) => ({
    id,
    values: axes.map((a, d) => {
      const u = (strata[d]![id]! + offsets[d]![id]!) / n; // in stratum strata[d][id]
      if (a.range) {
        const { from, to, log } = a.range;
        const v = log ? Math.exp(Math.log(from) + u * (Math.log(to) - Math.log(from))) : from + u * (to - from);
        return a.unit === "" ? v : `${v} ${a.unit}`;
      }
      return levelAt(a, Math.min(a.count - 1, Math.floor(u * a.count)));
    }),
  });
}

export interface Shard {
  index: number; // 1-based
  count: number;
}

export function parseShard(text: string): Shard {
  const m = /^(\d+)\/(\d+)$/.exec(text.trim());
  const index = m ? Number(m[1]) : NaN;
  const count = m ? Number(m[2]) : NaN;
  if (!(index >= 1 && count >= 1 && index <= count)) {
    throw new CalorbitError("USAGE", `--shard: given ${JSON.stringify(text)}; allowed: i/N with 1 ≤ i ≤ N`, [
      { path: "--shard", given: JSON.stringify(text), allowed: "i/N with 1 ≤ i ≤ N, e.g. 3/16" },
    ]);
  }
  return { index, count };
}

/** Case ids of a shard, in order: every count-th id from index − 1. */
export function* shardIds(total: number, shard: Shard): Generator<number> {
  for (let id = shard.index - 1; id < total; id += shard.count) yield id;
}

/** Number of cases in a shard. */
export function shardSize(total: number, shard: Shard): number {
  return Math.max(0, Math.ceil((total - (shard.index - 1)) / shard.count));
}
