/**
 * Words for summary statistics that are easy to mislabel, shared by the viewer (and open to the text
 * report): a lag in the most readable unit with its fraction of the orbit, why there is no lag, and
 * time in a window as a share of the cycle actually summarised (several orbits for a resonance).
 */
import { duration, fixed, sig } from "./format.js";

/** A fraction written so that it never reads as zero when it is not: 0.163, or 0.034 % below 0.01. */
export function fractionWords(fraction: number): string {
  if (fraction === 0) return "0";
  return fraction >= 0.01 ? fixed(fraction, 3) : `${sig(100 * fraction, 2)} %`;
}

export interface LagInput {
  lagSeconds: number | null;
  periodSeconds: number;
  temperature: { swingK: number; maxK: number };
}

/**
 * The lag of the maximum after periastron: "46.6 d (0.163 of the orbit)", "2.3 h (0.034 % of the
 * orbit)"; when there is none, why: a circular orbit has no periastron, a constant temperature no maximum.
 */
export function lagWords(s: LagInput, eccentricity: number, resolutionSeconds?: number): string {
  if (s.lagSeconds === null) return eccentricity === 0 ? "none (circular orbit)" : "none (no swing)";
  // A conduction column's extremes sit on its time steps: a lag shorter than one step is not resolved.
  if (resolutionSeconds !== undefined && s.lagSeconds < resolutionSeconds) return `under one time step (${duration(resolutionSeconds)}): not resolved`;
  return `${duration(s.lagSeconds)} (${fractionWords(s.lagSeconds / s.periodSeconds)} of the orbit)`;
}

/** The time step of a conduction column's solve, s (its extremes are resolved to it); undefined for a slab. */
export function columnStepSeconds(s: { cycleSeconds: number }, solver: { stepsPerCycle?: number }): number | undefined {
  return solver.stepsPerCycle ? s.cycleSeconds / solver.stepsPerCycle : undefined;
}

/** "of the orbit", or "of the cycle (2 orbits)" when the summarised cycle spans several orbits. */
export function cycleWords(periodSeconds: number, cycleSeconds: number): string {
  return cycleSeconds > periodSeconds * 1.000001 ? `of the cycle (${sig(cycleSeconds / periodSeconds, 3)} orbits)` : "of the orbit";
}

export interface WindowInput {
  periodSeconds: number;
  cycleSeconds: number;
  timeInRange?: { lowK: number; highK: number; fraction: number; seconds: number };
}

/** Time in the temperature window: "98.27 % of the orbit (280 d)", or null without a window. */
export function windowWords(s: WindowInput): string | null {
  const w = s.timeInRange;
  if (!w) return null;
  return `${fixed(100 * w.fraction, 2)} % ${cycleWords(s.periodSeconds, s.cycleSeconds)} (${duration(w.seconds)})`;
}
