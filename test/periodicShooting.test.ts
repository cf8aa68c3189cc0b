/**
 * The shooting loop's pass schedule on a surface that forgets its start within the cycle: a
 * point with 20 solar days per orbit under a thin skin (radiative time about a quarter of a day).
 */
import { describe, expect, it } from "vitest";
import { ASTRONOMICAL_UNIT_M, SOLAR_LUMINOSITY_W, STEFAN_BOLTZMANN } from "../src/constants.js";
import { LumpedBalance } from "../src/physics/energyBalance.js";
import { pointForcing } from "../src/physics/forcing.js";
import type { Orbit } from "../src/physics/orbit.js";
import { switchPoints } from "../src/solve/corners.js";
import { integrateCycle, solvePeriodic } from "../src/solve/periodic.js";
import type { OdeSystem } from "../src/solve/system.js";

const YEAR = 3.15576e7;
const orbit: Orbit = { semiMajorAxisM: ASTRONOMICAL_UNIT_M, eccentricity: 0.1, periodSeconds: YEAR, meanAnomalyAtStartRad: 0 };
const n = (2 * Math.PI) / YEAR;
const spin = { rateRadPerSecond: 21 * n, obliquityRad: 0, equinoxTrueAnomalyRad: 0 };
const forcing = pointForcing(0.1, SOLAR_LUMINOSITY_W, orbit, 0, 0, spin, 1);
const balance = new LumpedBalance(orbit, { albedo: 0.1, emissivity: 0.95, heatCapacityJPerM2K: 1e5, internalFluxWPerM2: 0.03 }, forcing);
const breakpoints = switchPoints((E) => forcing.absorbedAt(E), 0, 2 * Math.PI, 4096);

describe("periodic shooting on a map that contracts strongly", () => {
  it("takes one coarse pass and one final pass from a start 60 % off, and lands where many plain cycles from another start do", () => {
    // Fixed point of the one-orbit map Φ, found independently: Φ applied three times from 150 K at a
    // tight tolerance (each orbit forgets its start by a factor far below 1e-100: τ ≈ 0.3 d against 365 d).
    const plain = Float64Array.of(150);
    for (let k = 0; k < 3; k++) integrateCycle(balance, "dormand-prince", 0, 2 * Math.PI, plain, 1e-12, Float64Array.of(280), undefined, 1e6, breakpoints);
    const problem = { system: balance, start: 0, cycleLength: 2 * Math.PI, guess: Float64Array.of(plain[0]! * 1.6), scale: Float64Array.of(280), stiffness: 1e4, forcingHasCorners: true, breakpoints, maxStepsPerCycle: 1e6 };
    const samples = { xs: Float64Array.of(0, 1, 2, 3), ys: new Float64Array(4), components: 1 };
    for (const result of [solvePeriodic(problem, { relativeTolerance: 1e-8 }), solvePeriodic(problem, { relativeTolerance: 1e-8, samples })]) {
      expect(result.monodromyDiagonal[0]!).toBeLessThan(1e-100);
      // Newton from 60 % off lands within the first pass's integration error (1e-6): a second coarse
      // pass would have nothing to remove (and, repeating the first's steps exactly, would find a
      // residual of exactly 0 at the coarse tolerance), so the next pass is the final one.
      expect(result.iterations).toBe(2);
      expect(result.odeRelativeTolerance).toBeLessThan(1e-10);
      expect(Math.abs(result.start[0]! / plain[0]! - 1)).toBeLessThan(1e-9);
    }
    expect(Math.abs(samples.ys[0]! / plain[0]! - 1)).toBeLessThan(1e-9);
  });

  it("crosses each night in closed form and lands on the state integrated step by step through the nights, at fewer evaluations", () => {
    // The same balance without its exact arcs: Dormand–Prince through every night as well.
    const stepped: OdeSystem = {
      dimension: 1,
      derivative: (x, y, out) => balance.derivative(x, y, out),
      jacobian: (x, y, out) => balance.jacobian(x, y, out),
      derivativeAndJacobian: (x, y, out, j) => balance.derivativeAndJacobian(x, y, out, j),
    };
    const xs = Float64Array.from({ length: 400 }, (_, k) => (2 * Math.PI * k) / 400);
    const run = (system: OdeSystem) => {
      const samples = { xs, ys: new Float64Array(xs.length), components: 1 };
      const result = solvePeriodic(
        { system, start: 0, cycleLength: 2 * Math.PI, guess: Float64Array.of(300), scale: Float64Array.of(280), stiffness: 1e4, forcingHasCorners: true, breakpoints, maxStepsPerCycle: 1e6 },
        { relativeTolerance: 1e-8, samples },
      );
      return { result, samples };
    };
    const exact = run(balance);
    const reference = run(stepped);
    let nights = 0;
    for (let k = 0; k < xs.length; k++) {
      if (forcing.absorbedAt(xs[k]!) === 0) nights++;
      expect(Math.abs(exact.samples.ys[k]! / reference.samples.ys[k]! - 1)).toBeLessThan(1e-9);
    }
    expect(nights).toBeGreaterThan(150); // the samples do cover the nights
    expect(Math.abs(exact.result.start[0]! / reference.result.start[0]! - 1)).toBeLessThan(1e-9);
    // Here the long nights sit near their floor and cost the stepper little (86 % of the evaluations
    // remain); with 365 solar days per orbit the nights were 36 % of the steps.
    expect(exact.result.work.evaluations).toBeLessThan(0.9 * reference.result.work.evaluations);
  });

  it("leaves an arc with any starlight to the integrator, touching nothing, and crosses a dark one with the T⁻³ law when q = 0", () => {
    const day = Array.from(breakpoints).findIndex((_, i) => i + 1 < breakpoints.length && forcing.absorbedAt(0.5 * (breakpoints[i]! + breakpoints[i + 1]!)) > 0);
    const [x0, x1] = [breakpoints[day]!, breakpoints[day + 1]!];
    const y = Float64Array.of(250);
    expect(balance.exactArc(x0, x1, y)).toBe(false);
    expect(y[0]).toBe(250);
    // A night without internal heat: T(t) = T₀ (1 + 3εσT₀³t/C)^(−1/3) (derived), t from Kepler's equation.
    const cold = new LumpedBalance(orbit, { albedo: 0.1, emissivity: 0.95, heatCapacityJPerM2K: 1e5, internalFluxWPerM2: 0 }, forcing);
    const [n0, n1] = [breakpoints[day + 1]!, breakpoints[day + 2]!];
    const seconds = (n1 - 0.1 * Math.sin(n1) - (n0 - 0.1 * Math.sin(n0))) / n;
    const z = Float64Array.of(250);
    expect(cold.exactArc(n0, n1, z)).toBe(true);
    expect(Math.abs(z[0]! / (250 * (1 + (3 * 0.95 * STEFAN_BOLTZMANN * 250 ** 3 * seconds) / 1e5) ** (-1 / 3)) - 1)).toBeLessThan(1e-13);
  });
});
