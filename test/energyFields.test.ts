/**
 * Energy fields are budgets or null: a flux-weighted dayside is a brightness (its two boxes do not
 * add up to what the body absorbs), and a transient's last orbit stores heat; neither may print an
 * energy residual or a whole-body absorbed flux as if it were one.
 */
import { describe, expect, it } from "vitest";
import { SOLAR_LUMINOSITY_W } from "../src/constants.js";
import { stellarFlux } from "../src/physics/flux.js";
import { simulate } from "../src/run/simulate.js";
import { nominalCase } from "./helpers.js";

describe("energy fields", () => {
  const s0 = stellarFlux(SOLAR_LUMINOSITY_W, 1.495978707e11); // 1361 W m⁻² at 1 au (IAU 2015 B3 nominal)
  const dayNight = (weighting: "uniform" | "flux") =>
    simulate({ ...nominalCase({ heatCapacity: 1e7 }), regime: "daynight", exchange: { recirculation: 0.3, coefficientWPerM2K: 0, weighting } }, { samples: 0 });

  it("a uniform dayside is a budget: the body absorbs S/4 (common practice) and the residual closes", () => {
    const s = dayNight("uniform").summary;
    expect(Math.abs(s.meanAbsorbedWPerM2! / (s0 / 4) - 1)).toBeLessThan(1e-9);
    expect(Math.abs(s.energyBalanceResidual!)).toBeLessThan(1e-8);
    expect(s.notes).toBeUndefined();
  });

  it("a flux-weighted dayside (f = 2/3, Cowan & Agol 2011) is not: no whole-body absorbed flux or residual, and a note says why", () => {
    const s = dayNight("flux").summary;
    // The two boxes would claim (1/2)(2/3) S = S/3 where the body absorbs S/4.
    expect(Math.abs(s.day!.meanAbsorbedWPerM2 / ((2 / 3) * s0) - 1)).toBeLessThan(1e-9);
    expect(s.meanAbsorbedWPerM2).toBeNull();
    expect(s.meanEmittedWPerM2).toBeNull();
    expect(s.energyBalanceResidual).toBeNull();
    expect(s.notes?.energyBalanceResidual).toMatch(/brightness/);
    expect(JSON.parse(JSON.stringify(s)).energyBalanceResidual).toBeNull();
  });

  it("a transient has no balance residual and no damping ratio, with notes saying why", () => {
    const s = simulate(nominalCase({ e: 0.2, heatCapacity: 1e8 }), { samples: 0, transient: { startK: 150, orbits: 1 } }).summary;
    expect(s.energyBalanceResidual).toBeNull();
    expect(s.dampingRatio).toBeNull();
    expect(s.notes?.energyBalanceResidual).toMatch(/storage/);
    expect(s.notes?.dampingRatio).toMatch(/drift/);
  });
});
