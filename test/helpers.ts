/** Shared builders for engine tests: real-world check values live in the tests themselves. */
import { ASTRONOMICAL_UNIT_M, SOLAR_LUMINOSITY_W, SOLAR_MASS_KG } from "../src/constants.js";
import type { ThermalCase } from "../src/model/thermalCase.js";
import type { ColumnProperties } from "../src/physics/column.js";
import type { SurfaceProperties } from "../src/physics/energyBalance.js";

/** A case around a star with the IAU 2015 nominal solar luminosity and mass. */
export function nominalCase(overrides: {
  e?: number;
  aAu?: number;
  periodSeconds?: number;
  albedo?: number;
  emissivity?: number;
  heatCapacity?: number;
  internalFlux?: number;
  regime?: ThermalCase["regime"];
  meanAnomalyAtStartRad?: number;
  windowK?: readonly [number, number];
}): ThermalCase & { surface: SurfaceProperties } {
  return {
    name: "test case",
    star: { luminosityW: SOLAR_LUMINOSITY_W, massKg: SOLAR_MASS_KG },
    orbit: {
      semiMajorAxisM: (overrides.aAu ?? 1) * ASTRONOMICAL_UNIT_M,
      eccentricity: overrides.e ?? 0,
      periodSeconds: overrides.periodSeconds ?? 3.15576e7,
      meanAnomalyAtStartRad: overrides.meanAnomalyAtStartRad ?? 0,
    },
    surface: {
      albedo: overrides.albedo ?? 0,
      emissivity: overrides.emissivity ?? 1,
      heatCapacityJPerM2K: overrides.heatCapacity ?? 1e8,
      internalFluxWPerM2: overrides.internalFlux ?? 0,
    },
    regime: overrides.regime ?? "global",
    ...(overrides.windowK ? { windowK: overrides.windowK } : {}),
  };
}

/** A conduction column of one material: k (W m⁻¹ K⁻¹), ρ (kg m⁻³) and c (J kg⁻¹ K⁻¹) at every depth, no radiative conduction. */
export const homogeneous = (k: number, rho: number, c: number): ColumnProperties => ({
  densitySurface: rho,
  densityDeep: rho,
  conductivitySurface: k,
  conductivityDeep: k,
  eFoldingDepthM: Infinity,
  specificHeatPolynomial: [c],
  radiativeChi: 0,
});
