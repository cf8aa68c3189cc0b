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
