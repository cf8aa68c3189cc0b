import { describe, expect, it } from "vitest";
import { ASTRONOMICAL_UNIT_M, SOLAR_EFFECTIVE_TEMPERATURE_K, SOLAR_LUMINOSITY_W, SOLAR_RADIUS_M } from "../src/constants.js";
import { equilibriumTemperature, GEOMETRY_FACTOR, orbitMeanStellarFlux, stellarFlux, wienPeakWavelengthM } from "../src/physics/flux.js";
import { layerHeatCapacity, MATERIALS } from "../src/physics/materials.js";
import { luminosityFromRadiusTemperature } from "../src/physics/star.js";
import { simulate } from "../src/run/simulate.js";
import { nominalCase } from "./helpers.js";

describe("stellar flux and equilibrium temperature", () => {
  it("gives L/(4π au²) = 1361.17 W m⁻² for the IAU 2015 B3 nominal luminosity (IAU 2015 B3 note)", () => {
    expect(stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M)).toBeCloseTo(1361.17, 2);
  });

  it("puts a fast rotator at 1 au from the nominal star, A = 0, at 278.33 K (derived from IAU 2015 B3; ≈ 279 K is common practice)", () => {
    const s = stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M);
    expect(equilibriumTemperature(GEOMETRY_FACTOR.global * s, 1)).toBeCloseTo(278.33, 2);
  });

  it("keeps the regimes in the ratios 2^(1/4) and 4^(1/4) (common practice)", () => {
    const s = stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M) * 0.7;
    const global = equilibriumTemperature(GEOMETRY_FACTOR.global * s, 0.9);
    const dayside = equilibriumTemperature(GEOMETRY_FACTOR.dayside * s, 0.9);
    const substellar = equilibriumTemperature(GEOMETRY_FACTOR.substellar * s, 0.9);
    expect(dayside / global).toBeCloseTo(2 ** 0.25, 12);
    expect(substellar / global).toBeCloseTo(4 ** 0.25, 12);
  });

  it("recovers the nominal luminosity from R☉ and T☉ to 0.1% (IAU 2015 B3 values are mutually consistent to that level)", () => {
    const l = luminosityFromRadiusTemperature(SOLAR_RADIUS_M, SOLAR_EFFECTIVE_TEMPERATURE_K);
    expect(Math.abs(l / SOLAR_LUMINOSITY_W - 1)).toBeLessThan(1e-3);
  });

  it("places Wien peaks at 502.04 nm (5772 K), 11.364 µm (255 K), 28.978 µm (100 K) (CODATA 2018 b, derived)", () => {
    expect(wienPeakWavelengthM(5772) * 1e9).toBeCloseTo(502.04, 2);
    expect(wienPeakWavelengthM(255) * 1e6).toBeCloseTo(11.364, 3);
    expect(wienPeakWavelengthM(100) * 1e6).toBeCloseTo(28.978, 3);
  });

  it("rejects a zero emissivity and a negative flux", () => {
    expect(() => equilibriumTemperature(100, 0)).toThrowError(/emissivity/);
    expect(() => equilibriumTemperature(-1, 1)).toThrowError(/absorbedFlux/);
  });
});

describe("orbit averages computed by the engine's quadrature", () => {
  // Williams & Pollard 2002, Int. J. Astrobiology 1, 61: <S> = L/(4πa²√(1−e²)).
  const factors: Array<[number, number]> = [[0.1, 1.005038], [0.3, 1.048285], [0.5, 1.154701], [0.9, 2.294157]];
  for (const [e, factor] of factors) {
    it(`orbit-mean absorbed flux at e = ${e} is ${factor} × the circular value to 1e-6 (Williams & Pollard 2002)`, () => {
      const sim = simulate(nominalCase({ e, heatCapacity: 1e8 }), { samples: 0 });
      const circular = GEOMETRY_FACTOR.global * stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M);
      expect(Math.abs(sim.summary.meanAbsorbedWPerM2! / circular / factor - 1)).toBeLessThan(1e-6);
      expect(orbitMeanStellarFlux(1, 1, e) / stellarFlux(1, 1)).toBeCloseTo(factor, 6);
    });
  }

  // Méndez & Rivera-Valentín 2017, ApJL 837, L1: time-mean T_eq / circular T_eq = (1/2π)∫√(1 − e cos E) dE
  // (values derived by quadrature of that integral; the e → 1 limit 2√2/π is stated in their abstract).
  const ratios: Array<[number, number]> = [[0.1, 0.999374], [0.3, 0.994251], [0.5, 0.983343], [0.9, 0.932819]];
  for (const [e, ratio] of ratios) {
    it(`time-mean equilibrium at e = ${e} is ${ratio} × the circular value to 1e-6 (Méndez & Rivera-Valentín 2017)`, () => {
      const sim = simulate(nominalCase({ e }), { samples: 0 });
      const circular = equilibriumTemperature(GEOMETRY_FACTOR.global * stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M), 1);
      expect(Math.abs(sim.summary.equilibrium.meanK / circular / ratio - 1)).toBeLessThan(1e-6);
    });
  }
});

describe("materials", () => {
  it("gives a 50 m water layer ρ c h = 2.108e8 J m⁻² K⁻¹ (Mellon et al. 2008, Table 18.1 values)", () => {
    expect(layerHeatCapacity(MATERIALS.water, 50)).toBeCloseTo(999.8 * 4217 * 50, 0);
    expect(MATERIALS.aluminium.densityKgPerM3).toBe(2700); // CRC Handbook
    expect(MATERIALS.aluminium.specificHeatJPerKgK).toBe(897); // CRC Handbook
  });
  it("rejects a layer of zero thickness", () => {
    expect(() => layerHeatCapacity(MATERIALS.rock, 0)).toThrowError(/thickness/);
  });
});
