import { describe, expect, it } from "vitest";
import { integrateDormandPrince } from "../src/solve/dormandPrince.js";
import type { OdeSystem } from "../src/solve/system.js";

// y′ = y cos x, y(0) = 1: y = exp(sin x) (closed form, derived by separation of variables).
const growth: OdeSystem = {
  dimension: 1,
  derivative: (x, y, out) => void (out[0] = y[0]! * Math.cos(x)),
  jacobian: (x, _y, out) => void (out[0] = Math.cos(x)),
};
// Harmonic oscillator y″ = −y as a pair: (cos x, −sin x) from (1, 0).
const oscillator: OdeSystem = {
  dimension: 2,
  derivative: (_x, y, out) => {
    out[0] = y[1]!;
    out[1] = -y[0]!;
  },
  jacobian: (_x, _y, out) => out.set([0, 1, -1, 0]),
};

function run(system: OdeSystem, y0: number[], x1: number, tolerance: number, xs: Float64Array) {
  const y = Float64Array.from(y0);
  const ys = new Float64Array(xs.length * system.dimension);
  const work = integrateDormandPrince(system, 0, y, x1, {
    relativeTolerance: tolerance,
    absoluteTolerance: new Float64Array(system.dimension).fill(tolerance),
    samples: { xs, ys, components: system.dimension },
  });
  return { y, ys, work };
}

describe("Dormand–Prince 5(4)", () => {
  it("integrates a degree-4 polynomial right-hand side exactly (the quadrature conditions of order 5)", () => {
    // y′ = 5x⁴ + 3x² + 1 → y(2) = 32 + 8 + 2 = 42 (Butcher's conditions Σbᵢcᵢᵏ = 1/(k+1), k ≤ 4).
    const poly: OdeSystem = { dimension: 1, derivative: (x, _y, out) => void (out[0] = 5 * x ** 4 + 3 * x * x + 1), jacobian: (_x, _y, out) => void (out[0] = 0) };
    const { y } = run(poly, [0], 2, 1e-3, new Float64Array(0));
    expect(Math.abs(y[0]! - 42)).toBeLessThan(1e-12);
  });

  for (const tolerance of [1e-6, 1e-9, 1e-12]) {
    it(`meets tolerance ${tolerance} at the end and in its dense output, against exp(sin x)`, () => {
      const xs = Float64Array.from({ length: 997 }, (_, k) => (10 * k) / 996);
      const { y, ys } = run(growth, [1], 10, tolerance, xs);
      expect(Math.abs(y[0]! / Math.exp(Math.sin(10)) - 1)).toBeLessThan(50 * tolerance);
      let worst = 0;
      xs.forEach((x, k) => (worst = Math.max(worst, Math.abs(ys[k]! / Math.exp(Math.sin(x)) - 1))));
      expect(worst).toBeLessThan(50 * tolerance);
    });
  }

  it("keeps the work of a fifth-order pair: 1000× tighter tolerance costs about 1000^(1/5) ≈ 4× the steps", () => {
    const none = new Float64Array(0);
    const loose = run(oscillator, [1, 0], 20, 1e-6, none).work.steps;
    const tight = run(oscillator, [1, 0], 20, 1e-9, none).work.steps;
    expect(tight / loose).toBeGreaterThan(3);
    expect(tight / loose).toBeLessThan(5.5);
  });

  it("has a fourth-order continuous extension: its error between steps shrinks like the step's local error", () => {
    // On the oscillator, compare the dense output at mid-steps with cos x; with a third-order
    // (Hermite-only) interpolant the error would grow past the tolerance as steps get longer.
    for (const tolerance of [1e-5, 1e-8, 1e-11]) {
      const xs = Float64Array.from({ length: 4001 }, (_, k) => (20 * k) / 4000);
      const { ys } = run(oscillator, [1, 0], 20, tolerance, xs);
      let worst = 0;
      xs.forEach((x, k) => (worst = Math.max(worst, Math.abs(ys[2 * k]! - Math.cos(x)), Math.abs(ys[2 * k + 1]! + Math.sin(x)))));
      expect(worst).toBeLessThan(30 * tolerance);
    }
  });
});
