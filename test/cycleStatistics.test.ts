import { describe, expect, it } from "vitest";
import { explicitTimeMean, hermiteExtremum, positiveModulo, refinedExtremum, timeInWindow, timeMean } from "../src/analysis/cycleStatistics.js";

const grid = (count: number, from = 0, span = 2 * Math.PI) => Float64Array.from({ length: count + 1 }, (_, k) => from + (span * k) / count);

describe("cycle statistics against closed forms", () => {
  it("time-averages over an orbit from samples uniform in E: ⟨r⟩ = a(1 + e²/2), ⟨(a/r)²⟩ = 1/√(1 − e²)", () => {
    // dt/dE ∝ 1 − e cos E (Kepler's equation differentiated). ⟨r⟩_t = a(1 + e²/2) is the standard
    // time-mean distance (common practice); ⟨(a/r)²⟩_t is Williams & Pollard 2002, eq. 3.
    for (const e of [0.1, 0.5, 0.9]) {
      const xs = grid(512);
      const w = Float64Array.from(xs, (E) => 1 - e * Math.cos(E));
      const r = Float64Array.from(xs, (E) => 1 - e * Math.cos(E));
      const flux = Float64Array.from(xs, (E) => 1 / (1 - e * Math.cos(E)) ** 2);
      expect(Math.abs(timeMean(r, w) / (1 + (e * e) / 2) - 1)).toBeLessThan(1e-12);
      expect(Math.abs(timeMean(flux, w) * Math.sqrt(1 - e * e) - 1)).toBeLessThan(1e-9);
    }
  });

  it("refines a maximum between samples to the Hermite interpolant's fourth order, also across the cycle's ends", () => {
    // y = cos(E − c) on 32 intervals: max 1 at E = c, min −1 at c + π.
    for (const c of [0.3, 2 * Math.PI - 0.05, 0.02]) {
      const xs = grid(32);
      const ys = Float64Array.from(xs, (E) => Math.cos(E - c));
      const ds = Float64Array.from(xs, (E) => -Math.sin(E - c));
      const max = hermiteExtremum(xs, ys, ds, 1);
      const min = hermiteExtremum(xs, ys, ds, -1);
      expect(Math.abs(max.value - 1)).toBeLessThan(1e-5); // samples alone are off by up to 1 − cos(π/32) = 4.8e-3
      expect(Math.abs(min.value + 1)).toBeLessThan(1e-5);
      expect(Math.abs(positiveModulo(max.x - c + Math.PI, 2 * Math.PI) - Math.PI)).toBeLessThan(5e-3);
    }
    // Halving the spacing (the peak at the same place within its interval) shrinks the error about 16× (fourth order).
    const err = (count: number) => {
      const xs = grid(count);
      const c = (3.37 * 2 * Math.PI) / count;
      return Math.abs(1 - hermiteExtremum(xs, Float64Array.from(xs, (E) => Math.cos(E - c)), Float64Array.from(xs, (E) => -Math.sin(E - c)), 1).value);
    };
    const ratio = err(32) / err(64);
    expect(ratio).toBeGreaterThan(10);
    expect(ratio).toBeLessThan(40);
  });

  it("keeps refined extremes and window times inside what the samples allow when the derivatives are wrong (a stiff balance's)", () => {
    // y = cos(E − c): max 1 at E = c, min −1 at c + π, and cos E ≥ 0.5 for 2π/3 of the cycle (closed
    // forms). The samples are exact; the derivatives carry an error of ±1e6, as dT/dt = (F − εσT⁴)/C
    // does when τ ≪ P. The cubic through those slopes went to ±1e4 between samples.
    const count = 200;
    const c = 0.123;
    const xs = grid(count);
    const ys = Float64Array.from(xs, (E) => Math.cos(E - c));
    const ds = Float64Array.from(xs, (E, k) => -Math.sin(E - c) + (k % 3 === 0 ? 1e6 : k % 3 === 1 ? -7e5 : 3e5));
    ds[count] = ds[0]!; // a cycle: the last sample is the first
    const h = (2 * Math.PI) / count;
    const max = hermiteExtremum(xs, ys, ds, 1);
    const min = hermiteExtremum(xs, ys, ds, -1);
    // Never beyond the true extreme by more than the three-point slopes' O(h³) error, never short of the best sample.
    expect(max.value).toBeLessThanOrEqual(1 + h ** 3);
    expect(max.value).toBeGreaterThanOrEqual(Math.max(...ys));
    expect(min.value).toBeGreaterThanOrEqual(-1 - h ** 3);
    expect(min.value).toBeLessThanOrEqual(Math.min(...ys));
    expect(Math.abs(max.x - c)).toBeLessThan(h);
    const window = timeInWindow(xs, ys, ds, 0.5, 2, (E) => E);
    expect(Math.abs(window - (2 * Math.PI) / 3)).toBeLessThan(1e-4);
  });

  it("does not overshoot a corner: a triangle wave's refined peak stays at or below the corner", () => {
    // y = 1 − |E − c| near c (a corner, as a surface tracking a forcing with a sunrise does), exact
    // one-sided derivatives ±1. Its maximum is 1 at E = c and its minimum 1 − π at c + π (closed form).
    const count = 64;
    const h = (2 * Math.PI) / count;
    for (const offset of [0.05, 0.2, 0.5, 0.8]) {
      const c = (10 + offset) * h;
      const distance = (E: number) => Math.abs(positiveModulo(E - c + Math.PI, 2 * Math.PI) - Math.PI);
      const xs = grid(count);
      const ys = Float64Array.from(xs, (E) => 1 - distance(E));
      const ds = Float64Array.from(xs, (E) => (positiveModulo(E - c, 2 * Math.PI) < Math.PI ? -1 : 1));
      const max = hermiteExtremum(xs, ys, ds, 1);
      expect(max.value).toBeLessThanOrEqual(1 + 1e-12);
      expect(max.value).toBeGreaterThanOrEqual(Math.max(...ys));
      const min = hermiteExtremum(xs, ys, ds, -1);
      expect(min.value).toBeGreaterThanOrEqual(1 - Math.PI - 1e-12);
    }
  });

  it("finds the extremum of an explicit function between samples (golden section)", () => {
    const f = (E: number) => 2 - (E - 1.2345) ** 2;
    const xs = grid(16);
    const best = refinedExtremum(xs, Float64Array.from(xs, f), f, 1);
    expect(Math.abs(best.x - 1.2345)).toBeLessThan(1e-7);
    expect(Math.abs(best.value - 2)).toBeLessThan(1e-13);
  });

  it("times a window by Kepler's equation: r ≤ a for (π − 2e)/(2π) of the orbit", () => {
    // r ≤ a ⟺ cos E ≥ 0 ⟺ E ∈ [−π/2, π/2], and t = (E − e sin E)/n, so the time inside is (π − 2e)/n (Kepler's equation).
    const e = 0.6;
    const n = 2e-7;
    const xs = grid(40, -Math.PI);
    const ys = Float64Array.from(xs, (E) => Math.cos(E));
    const ds = Float64Array.from(xs, (E) => -Math.sin(E));
    const seconds = timeInWindow(xs, ys, ds, 0, 2, (E) => (E - e * Math.sin(E)) / n);
    expect(Math.abs(seconds / ((Math.PI - 2 * e) / n) - 1)).toBeLessThan(1e-6);
    // A window the curve enters and leaves twice: 0.5 ≤ cos E ≤ 0.9 (uniform time).
    const twice = timeInWindow(xs, ys, ds, 0.5, 0.9, (E) => E);
    expect(Math.abs(twice - 2 * (Math.acos(0.5) - Math.acos(0.9)))).toBeLessThan(1e-4);
  });

  it("means a function with sunrise and sunset corners without losing order: ⟨max(0, cos E)⟩ = 1/π", () => {
    // Simpson on intervals split at the corners: the plain trapezoidal rule on 63 points is off by ~1e-4 here.
    const xs = grid(63, 0.1);
    const mean = explicitTimeMean(xs, (E) => Math.max(0, Math.cos(E)), () => 1);
    expect(Math.abs(mean * Math.PI - 1)).toBeLessThan(1e-6);
  });

  it("wraps angles into [0, m), negatives included", () => {
    expect(positiveModulo(-0.5, 2)).toBe(1.5);
    expect(positiveModulo(7, 2)).toBe(1);
    expect(positiveModulo(-4, 2)).toBe(0);
    expect(positiveModulo(-1e-18, 2 * Math.PI)).toBeLessThan(2 * Math.PI);
  });
});
