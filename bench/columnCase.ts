/**
 * The benchmark's conduction column: a bundled-style 60-layer regolith column on a slow rotator
 * (solar day 30 d, 12 solar days per orbit), shared by bench.ts and columnReference.ts.
 */
import { ASTRONOMICAL_UNIT_M } from "../src/constants.js";
import type { ColumnSpec, ThermalCase } from "../src/model/thermalCase.js";
import { DEFAULT_GRID } from "../src/physics/column.js";
import { slabCase } from "./cases.js";

const SYNODIC_SECONDS = 30 * 86_400;

export function columnCase(): ThermalCase {
  return {
    ...slabCase(0.05, 1),
    name: "bench column",
    regime: "point",
    orbit: { semiMajorAxisM: ASTRONOMICAL_UNIT_M, eccentricity: 0.05, periodSeconds: 12 * SYNODIC_SECONDS, meanAnomalyAtStartRad: 0 },
    location: { latitudeRad: 0, longitudeRad: 0 },
    spin: { rateRadPerSecond: (13 * 2 * Math.PI) / (12 * SYNODIC_SECONDS), ratio: { spin: 13, orbit: 1 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 },
  };
}

/** `stepsFactor` multiplies the default time steps per solar day (the reference run uses 4). */
export function columnSpec(stepsFactor = 1): ColumnSpec {
  return {
    properties: {
      densitySurface: 1100,
      densityDeep: 1800,
      conductivitySurface: 7.4e-4,
      conductivityDeep: 3.4e-3,
      eFoldingDepthM: 0.07,
      specificHeatPolynomial: [-3.6125, 2.7431, 2.3616e-3, -1.234e-5, 8.9093e-9],
      radiativeChi: 2.7,
    },
    // Growth chosen so that the grid has 60 layers down to 4 orbital skin depths.
    grid: { ...DEFAULT_GRID, growth: 1.057, stepsPerShortestPeriod: DEFAULT_GRID.stepsPerShortestPeriod * stepsFactor },
    outputDepthsM: [],
    interiorFluxWPerM2: 0.018,
  };
}
