/**
 * A spin not commensurate with the orbit has no exact cycle: the summary must describe the long
 * run, not one arbitrary orbit, and the series must carry its real elapsed time.
 */
import { describe, expect, it } from "vitest";
import { STEFAN_BOLTZMANN } from "../src/constants.js";
import type { ThermalCase } from "../src/model/thermalCase.js";
import { stellarFlux } from "../src/physics/flux.js";
import { meanMotion } from "../src/physics/orbit.js";
import { simulate } from "../src/run/simulate.js";
import { beatOrbits } from "../src/run/slabCycle.js";
import { nominalCase } from "./helpers.js";

const e = 0.3;
const base = nominalCase({ e, heatCapacity: 2e5 });
const n = meanMotion(base.orbit);
/** An equatorial point spinning 3.3001 times per orbit (no p:q with q ≤ 16 within 1e-9): 2.3001 solar days per orbit. */
const point: ThermalCase = {
  ...base,
  regime: "point",
  location: { latitudeRad: 0, longitudeRad: 0 },
  spin: { rateRadPerSecond: 3.3001 * n, obliquityRad: 0, equinoxTrueAnomalyRad: 0 },
};

describe("a spin not commensurate with the orbit", () => {
  it("finds the beat of spin and orbit: 10 orbits hold 23.001 solar days", () => {
    expect(beatOrbits(2.3001, 2048)).toBe(10);
    expect(beatOrbits(0.5, 2048)).toBe(2);
  });

  const sim = simulate(point, { samples: 200 });
  const s = sim.summary;

  it("summarises the beat, whose mean absorbed flux is the long-run mean (1 − A) S(a) / (π √(1 − e²))", () => {
    // Over many orbits the hour angle at a given distance is uniformly spread, so the mean of
    // max(cos h, 0) is 1/π, and the time mean of S(r) is S(a)/√(1 − e²) (Williams & Pollard 2002, eq. 3).
    const longRun = stellarFlux(point.star.luminosityW, point.orbit.semiMajorAxisM) / (Math.PI * Math.sqrt(1 - e * e));
    expect(sim.solver.mode).toBe("seasonal");
    expect(s.seasonal!.orbits).toBe(10);
    expect(s.cycleSeconds / point.orbit.periodSeconds).toBeCloseTo(10, 9);
    expect(Math.abs(s.meanAbsorbedWPerM2! / longRun - 1)).toBeLessThan(5e-4);
    // The summarised orbits are far apart from one another: one orbit alone would not represent the run.
    expect((s.seasonal!.orbitMeanK.maxK - s.seasonal!.orbitMeanK.minK) / s.temperature.meanK).toBeGreaterThan(0.1);
    // Over the beat the budget nearly closes (storage left over from a partial day only).
    expect(Math.abs(s.energyBalanceResidual!)).toBeLessThan(1e-5);
    // And the mean temperature sits inside the spread of the orbit means.
    expect(s.temperature.meanK).toBeGreaterThan(s.seasonal!.orbitMeanK.minK);
    expect(s.temperature.meanK).toBeLessThan(s.seasonal!.orbitMeanK.maxK);
    expect(s.temperature.meanK ** 4 * STEFAN_BOLTZMANN).toBeLessThan(longRun);
  });

  it("gives the series its real elapsed time: it starts after the spin-up orbits", () => {
    const spinUp = sim.solver.orbitsIntegrated - s.seasonal!.orbits;
    expect(spinUp).toBeGreaterThanOrEqual(1);
    expect(sim.series.timeSeconds[0]! / point.orbit.periodSeconds).toBeCloseTo(spinUp, 9);
    expect((sim.series.timeSeconds.at(-1)! - sim.series.timeSeconds[0]!) / point.orbit.periodSeconds).toBeCloseTo(10, 9);
  });
});
