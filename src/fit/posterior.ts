/**
 * The posterior of the free parameters: a Gaussian likelihood with the data's σ (or the σ the best
 * fit estimated from the residual scatter when the file gives none), and a flat prior inside the
 * bounds: flat in the value, or flat in its logarithm (∝ 1/v) for a log-scale parameter. The
 * chain file format (CSV, one row per walker per step) and the summary of a chain live here too.
 */
import { VERSION } from "../version.js";
import type { ForwardModel } from "./forward.js";
import { autocorrelationTime, quantile, stepGenerator, type EnsembleState } from "./ensemble.js";
import { parameterColumn, type FreeParameter } from "./parameters.js";

/** ln posterior (up to a constant) at parameter values; −Infinity outside the bounds or where the model fails. */
export function logPosterior(forward: ForwardModel, parameters: readonly FreeParameter[], sigma: Float64Array): (values: Float64Array) => number {
  const obs = forward.observations;
  const model = new Float64Array(obs.value.length);
  return (values) => {
    let lnPrior = 0;
    for (let j = 0; j < parameters.length; j++) {
      const p = parameters[j]!;
      const v = values[j]!;
      if (!(v >= p.low && v <= p.high)) return -Infinity;
      if (p.log) lnPrior -= Math.log(v);
    }
    try {
      forward.predict(values, model);
    } catch {
      return -Infinity;
    }
    let chi2 = 0;
    for (let i = 0; i < model.length; i++) {
      const r = (obs.value[i]! - model[i]!) / sigma[i]!;
      chi2 += r * r;
    }
    return Number.isFinite(chi2) ? lnPrior - 0.5 * chi2 : -Infinity;
  };
}

/**
 * Starting walkers: a small Gaussian ball around the best fit (1 % of each σ, or 10⁻⁴ of the range
 * when σ is unknown), kept inside the bounds (common practice: Foreman-Mackey et al. 2013, §5).
 */
export function initialWalkers(best: readonly number[], sigma: readonly (number | null)[], parameters: readonly FreeParameter[], walkers: number, seed: number): Float64Array[] {
  const rng = stepGenerator(seed, -2);
  const gauss = () => {
    const u = rng() || 1e-300;
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
  };
  return Array.from({ length: walkers }, () =>
    Float64Array.from(parameters, (p, j) => {
      const width = sigma[j] !== null && sigma[j]! > 0 ? 0.01 * sigma[j]! : 1e-4 * (p.high - p.low);
      const v = best[j]! + width * gauss();
      return Math.min(p.high - 1e-9 * (p.high - p.low), Math.max(p.low + 1e-9 * (p.high - p.low), v));
    }),
  );
}

export const CHAIN_MAGIC = "# calorbit fit chain";

export function chainHeader(parameters: readonly FreeParameter[], definition: string): string {
  return [`${CHAIN_MAGIC} (calorbit ${VERSION})`, `# definition: ${definition}`, ["step", "walker", ...parameters.map(parameterColumn), "log_posterior"].join(",")].join("\n") + "\n";
}

/** One step's rows. Numbers printed with full round-trip precision so that a resumed run continues exactly. */
export function chainRows(step: number, state: EnsembleState): string {
  let out = "";
  state.positions.forEach((x, w) => {
    out += `${step},${w},${Array.from(x, String).join(",")},${String(state.logProbability[w])}\n`;
  });
  return out;
}

export interface SavedChain {
  /** Steps whose every walker row is present, in order: positions[step][walker] and ln p. */
  steps: { positions: Float64Array[]; logProbability: number[] }[];
  /** Bytes of the file up to the last complete step (a torn tail is cut there before appending). */
  completeLength: number;
}

/**
 * Reads a chain file written by `chainHeader` + `chainRows`; null when it is not one or its
 * definition differs (the caller refuses to mix runs).
 */
export function parseChain(text: string, definition: string, walkers: number, dimension: number): SavedChain | "different" | null {
  if (!text.startsWith(CHAIN_MAGIC)) return null;
  const lines = text.split("\n");
  if (lines[1] !== `# definition: ${definition}`) return "different";
  const steps: SavedChain["steps"] = [];
  let offset = lines[0]!.length + 1 + lines[1]!.length + 1 + lines[2]!.length + 1;
  let completeLength = offset;
  let current: { positions: Float64Array[]; logProbability: number[] } = { positions: [], logProbability: [] };
  for (let i = 3; i < lines.length; i++) {
    const line = lines[i]!;
    const complete = i < lines.length - 1; // the last piece has no newline after it: torn or empty
    offset += line.length + 1;
    if (!complete) break;
    const f = line.split(",");
    if (f.length !== dimension + 3) break;
    const step = Number(f[0]);
    const walker = Number(f[1]);
    if (step !== steps.length || walker !== current.positions.length) break;
    const x = Float64Array.from(f.slice(2, 2 + dimension), Number);
    const lp = Number(f[2 + dimension]);
    if (x.some((v) => !Number.isFinite(v)) || Number.isNaN(lp)) break;
    current.positions.push(x);
    current.logProbability.push(lp);
    if (current.positions.length === walkers) {
      steps.push(current);
      current = { positions: [], logProbability: [] };
      completeLength = offset;
    }
  }
  return { steps, completeLength };
}

export interface PosteriorEstimate {
  median: number;
  p16: number;
  p84: number;
  /** Integrated autocorrelation time, steps. */
  autocorrelationSteps: number;
}

export interface PosteriorSummary {
  estimates: PosteriorEstimate[];
  steps: number;
  burnIn: number;
  walkers: number;
  acceptance: number;
  warnings: string[];
}

/** Medians and 16/84 percentiles over the steps after the burn-in, autocorrelation times and their warning. */
export function summarisePosterior(steps: SavedChain["steps"], parameters: readonly FreeParameter[], burnIn: number): PosteriorSummary {
  const kept = steps.slice(burnIn);
  const walkers = steps[0]?.positions.length ?? 0;
  // Acceptance from the chain itself (a walker whose ln p changed moved), so a resumed run counts every step.
  let moved = 0;
  for (let s = 1; s < steps.length; s++) {
    for (let w = 0; w < walkers; w++) if (steps[s]!.logProbability[w] !== steps[s - 1]!.logProbability[w]) moved++;
  }
  const acceptance = steps.length > 1 ? moved / ((steps.length - 1) * walkers) : NaN;
  const warnings: string[] = [];
  const estimates = parameters.map((p, j) => {
    const perStep = kept.map((s) => Float64Array.from(s.positions, (x) => x[j]!));
    const flat = new Float64Array(kept.length * walkers);
    perStep.forEach((row, s) => flat.set(row, s * walkers));
    flat.sort();
    const tau = autocorrelationTime(perStep);
    // Foreman-Mackey et al. (2013) and emcee: trust τ only when the chain is longer than ~50 τ.
    if (!(kept.length >= 50 * tau)) {
      warnings.push(`${p.key}: the chain after burn-in (${kept.length} steps) is shorter than 50 autocorrelation times (τ ≈ ${Number.isFinite(tau) ? tau.toFixed(1) : "?"} steps): run more steps before trusting the percentiles`);
    }
    return { median: quantile(flat, 0.5), p16: quantile(flat, 0.16), p84: quantile(flat, 0.84), autocorrelationSteps: tau };
  });
  if (acceptance < 0.1) warnings.push(`the acceptance fraction is ${acceptance.toFixed(3)} (below 0.1): the walkers barely move; check the bounds and the model`);
  return { estimates, steps: steps.length, burnIn, walkers, acceptance, warnings };
}
