import { describe, expect, it } from "vitest";
import { integrateRadau } from "../src/solve/radau.js";
import type { OdeSystem } from "../src/solve/system.js";

/**
 * A stiff linear pair y′ = A y with A = P diag(−1, λ) P⁻¹, P = [[1, 1], [1, −1]]: the closed form is
 * y(x) = P diag(e^{−x}, e^{λx}) P⁻¹ y₀ (linear algebra, derived). The fast mode dies at once;
 * the slow one sets the answer.
 */
function stiffPair(lambda: number): OdeSystem {
  const a = 0.5 * (-1 + lambda);
  const b = 0.5 * (-1 - lambda);
  return {
    dimension: 2,
    derivative: (_x, y, out) => {
      out[0] = a * y[0]! + b * y[1]!;
      out[1] = b * y[0]! + a * y[1]!;
    },
    jacobian: (_x, _y, out) => out.set([a, b, b, a]),
  };
}
const stiffPairExact = (lambda: number, x: number, y0: readonly [number, number]): [number, number] => {
  const slow = 0.5 * (y0[0] + y0[1]) * Math.exp(-x);
  const fast = 0.5 * (y0[0] - y0[1]) * Math.exp(lambda * x);
  return [slow + fast, slow - fast];
};

/** Prothero & Robinson (1974, Math. Comp. 28, 145): y′ = λ(y − g) + g′ with y(0) = g(0) has y = g; here g = sin x. */
function protheroRobinson(lambda: number): OdeSystem {
  return {
    dimension: 1,
    derivative: (x, y, out) => void (out[0] = lambda * (y[0]! - Math.sin(x)) + Math.cos(x)),
    jacobian: (_x, _y, out) => void (out[0] = lambda),
  };
}

// y′ = y cos x, y(0) = 1: y = exp(sin x) (separation of variables), non-stiff.
const growth: OdeSystem = {
  dimension: 1,
  derivative: (x, y, out) => void (out[0] = y[0]! * Math.cos(x)),
  jacobian: (x, _y, out) => void (out[0] = Math.cos(x)),
};

function run(system: OdeSystem, y0: number[], x1: number, tolerance: number, xs = new Float64Array(0)) {
  const y = Float64Array.from(y0);
  const ys = new Float64Array(xs.length * system.dimension);
  const work = integrateRadau(system, 0, y, x1, {
    relativeTolerance: tolerance,
    absoluteTolerance: new Float64Array(system.dimension).fill(tolerance),
    ...(xs.length > 0 ? { samples: { xs, ys, components: system.dimension } } : {}),
  });
  return { y, ys, work };
}

describe("Radau IIA (the stiff integrator), against closed forms", () => {
  it("integrates a stiff linear pair to its closed form, in steps that do not grow with the stiffness", () => {
    const stepsAt: number[] = [];
    for (const lambda of [-1e4, -1e7]) {
      const { y, work } = run(stiffPair(lambda), [2, 0], 3, 1e-8);
      const exact = stiffPairExact(lambda, 3, [2, 0]);
      expect(Math.abs(y[0]! - exact[0])).toBeLessThan(50 * 1e-8 * (1 + Math.abs(exact[0])));
      expect(Math.abs(y[1]! - exact[1])).toBeLessThan(50 * 1e-8 * (1 + Math.abs(exact[1])));
      stepsAt.push(work.steps);
    }
    // An explicit method would need about |λ| × 3 / 3 = 1e4 and 1e7 steps here (its stability interval).
    expect(stepsAt[1]!).toBeLessThan(1.5 * stepsAt[0]!);
    expect(stepsAt[1]!).toBeLessThan(2000);
  });

  it("follows the Prothero–Robinson solution y = sin x at λ = −1e6, at the end and in its dense output", () => {
    for (const tolerance of [1e-6, 1e-9]) {
      const xs = Float64Array.from({ length: 401 }, (_, k) => (10 * k) / 400);
      const { y, ys } = run(protheroRobinson(-1e6), [0], 10, tolerance, xs);
      expect(Math.abs(y[0]! - Math.sin(10))).toBeLessThan(50 * tolerance);
      let worst = 0;
      xs.forEach((x, k) => (worst = Math.max(worst, Math.abs(ys[k]! - Math.sin(x)))));
      expect(worst).toBeLessThan(50 * tolerance);
    }
  });

  it("meets its tolerance on a smooth non-stiff problem, at the end and in its dense output", () => {
    for (const tolerance of [1e-6, 1e-9, 1e-12]) {
      const xs = Float64Array.from({ length: 997 }, (_, k) => (10 * k) / 996);
      const { y, ys } = run(growth, [1], 10, tolerance, xs);
      let worst = 0;
      xs.forEach((x, k) => (worst = Math.max(worst, Math.abs(ys[k]! / Math.exp(Math.sin(x)) - 1))));
      expect(Math.abs(y[0]! / Math.exp(Math.sin(10)) - 1)).toBeLessThan(50 * tolerance);
      expect(worst).toBeLessThan(50 * tolerance);
    }
  });

  it("shows order 5 on a non-stiff problem: the error falls as (steps)^−5 (2s − 1 for s = 3 stages; Hairer & Wanner II, §IV.5)", () => {
    // Measured on the steps the integrator chose, so it holds whatever error estimate picks them:
    // a fourth-order method would give a slope near 4, the measured one is about 6 (pre-asymptotic).
    const points: { steps: number; error: number }[] = [];
    for (const tolerance of [1e-7, 1e-9, 1e-11]) {
      const { y, work } = run(growth, [1], 10, tolerance);
      points.push({ steps: work.steps, error: Math.abs(y[0]! / Math.exp(Math.sin(10)) - 1) });
    }
    const order = Math.log(points[0]!.error / points[2]!.error) / Math.log(points[2]!.steps / points[0]!.steps);
    expect(order).toBeGreaterThan(4.5);
    expect(order).toBeLessThan(7);
  });
});
