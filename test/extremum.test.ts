import { describe, expect, it } from "vitest";
import { hermiteExtremum } from "../src/analysis/cycleStatistics.js";

describe("hermiteExtremum", () => {
  it("finds the highest of many near-equal peaks even when the best sample sits on another peak", () => {
    // f(x) = cos x + δx on [0, 20π]: peaks where sin x = δ (calculus; closed form), each δ·2π higher
    // than the one before, 1.3e-4 apart, while a grid of step 0.1 misses a peak by up to h²/8 = 1.2e-3.
    const delta = 2e-5;
    const h = 0.1;
    const count = Math.floor((20 * Math.PI) / h) + 1;
    const xs = Float64Array.from({ length: count }, (_, k) => k * h);
    const ys = xs.map((x) => Math.cos(x) + delta * x);
    const ds = xs.map((x) => -Math.sin(x) + delta);
    const lastPeak = 9;
    const exactX = 2 * Math.PI * lastPeak + Math.asin(delta);
    const exactValue = Math.cos(Math.asin(delta)) + delta * exactX;
    let bestSample = 0;
    for (let k = 1; k < count; k++) if (ys[k]! > ys[bestSample]!) bestSample = k;
    // The premise: the best sample is not on the last peak.
    expect(Math.abs(xs[bestSample]! - exactX)).toBeGreaterThan(1);
    const found = hermiteExtremum(xs, ys, ds, 1);
    expect(Math.abs(found.x - exactX)).toBeLessThan(1e-3);
    expect(Math.abs(found.value - exactValue)).toBeLessThan(1e-6); // cubic Hermite error h⁴/384 ≈ 3e-7
  });

  it("finds a minimum the same way (sign −1)", () => {
    const delta = 2e-5;
    const h = 0.1;
    const count = Math.floor((20 * Math.PI) / h) + 1;
    const xs = Float64Array.from({ length: count }, (_, k) => k * h);
    const ys = xs.map((x) => -Math.cos(x) - delta * x);
    const ds = xs.map((x) => Math.sin(x) - delta);
    const exactX = 2 * Math.PI * 9 + Math.asin(delta);
    const found = hermiteExtremum(xs, ys, ds, -1);
    expect(Math.abs(found.x - exactX)).toBeLessThan(1e-3);
    expect(Math.abs(found.value + Math.cos(Math.asin(delta)) + delta * exactX)).toBeLessThan(1e-6);
  });
});
