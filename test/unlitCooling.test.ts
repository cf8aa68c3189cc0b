/**
 * The closed-form flow of a slab in the dark, C dT/dt = q − εσT⁴, against the T⁻³ cooling law
 * (q = 0) and against the odex package (an independent extrapolation integrator from npm, Hairer &
 * Wanner's ODEX) integrating the same equation in time at a tight tolerance.
 */
import odexModule from "odex";
import { describe, expect, it } from "vitest";
import { DAY_S, STEFAN_BOLTZMANN } from "../src/constants.js";
import { UnlitCooling } from "../src/physics/unlitCooling.js";

interface OdexSolver {
  relativeTolerance: number;
  absoluteTolerance: number;
  maxSteps: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): { y: number[]; outcome: number };
}
const { Solver } = odexModule as unknown as { Solver: new (n: number) => OdexSolver };

/** T after `seconds` by odex at relative tolerance 1e-13. */
function odexCooling(emissivity: number, heatCapacity: number, q: number, startK: number, seconds: number): number {
  const solver = new Solver(1);
  solver.relativeTolerance = 1e-13;
  solver.absoluteTolerance = 1e-13;
  solver.maxSteps = 100_000;
  const result = solver.solve((_t, y) => [(q - emissivity * STEFAN_BOLTZMANN * y[0]! ** 4) / heatCapacity], 0, [startK], seconds);
  expect(result.outcome).toBe(0);
  return result.y[0]!;
}

describe("a slab in the dark", () => {
  it("follows T = T₀ (1 + 3εσT₀³t/C)^(−1/3) with no internal flux (285.082 K after 1 h, 175.813 K after 1 d, 87.226 K after 10 d from 300 K; derived)", () => {
    const cooling = new UnlitCooling(STEFAN_BOLTZMANN, 1e5, 0);
    for (const [seconds, printed] of [[3600, 285.082], [DAY_S, 175.813], [10 * DAY_S, 87.226]] as const) {
      const exact = 300 * (1 + (3 * STEFAN_BOLTZMANN * 300 ** 3 * seconds) / 1e5) ** (-1 / 3);
      expect(Math.abs(cooling.after(300, seconds) / exact - 1)).toBeLessThan(1e-14);
      expect(cooling.after(300, seconds)).toBeCloseTo(printed, 3);
    }
  });

  it("matches odex to 1e-11 with an internal flux, from far above its floor to just above it", () => {
    // floors a = (q/εσ)^(1/4): 27 K, 105 K and 206 K; starts from 1.01 a to 400 K; nights of 1 h to 30 d
    for (const q of [0.03, 6.5, 95]) {
      const cooling = new UnlitCooling(0.95 * STEFAN_BOLTZMANN, 1e5, q);
      for (const start of [400, 250, 1.3 * cooling.floorK, 1.01 * cooling.floorK]) {
        if (!(start > cooling.floorK)) continue;
        for (const seconds of [3600, DAY_S / 2, 30 * DAY_S]) {
          const reference = odexCooling(0.95, 1e5, q, start, seconds);
          expect(Math.abs(cooling.after(start, seconds) / reference - 1)).toBeLessThan(1e-11);
        }
      }
    }
  });

  it("gives the same invariant from its series and from its closed form where they meet (a/T = 1/2)", () => {
    const cooling = new UnlitCooling(STEFAN_BOLTZMANN, 1e5, 100);
    const a = cooling.floorK;
    const u = 0.5;
    const closed = (Math.atanh(u) - Math.atan(u)) / a ** 3;
    expect(Math.abs(cooling.invariant(2 * a) / closed - 1)).toBeLessThan(1e-13);
    expect(Math.abs(cooling.invariant(2 * a * (1 - 1e-12)) / cooling.invariant(2 * a * (1 + 1e-12)) - 1)).toBeLessThan(1e-10);
  });

  it("gives the flow's slope ∂T/∂T₀ = f(T)/f(T₀) that a finite difference of the flow measures", () => {
    const cooling = new UnlitCooling(0.95 * STEFAN_BOLTZMANN, 1e5, 6.5);
    const start = 280;
    const seconds = DAY_S / 3;
    const h = 1e-4;
    const difference = (cooling.after(start + h, seconds) - cooling.after(start - h, seconds)) / (2 * h);
    expect(Math.abs(cooling.flowSlope(start, cooling.after(start, seconds)) / difference - 1)).toBeLessThan(1e-7);
  });

  it("refuses a start at or below the internal-flux floor (the integrator takes that case)", () => {
    const cooling = new UnlitCooling(STEFAN_BOLTZMANN, 1e5, 100);
    expect(cooling.after(cooling.floorK, 3600)).toBeNaN();
    expect(cooling.after(0.5 * cooling.floorK, 3600)).toBeNaN();
  });
});
