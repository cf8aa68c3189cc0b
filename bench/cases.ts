/**
 * The benchmark's cases, shared by the benchmark (bench.ts) and the independent reference run
 * (reference.ts). Invented bodies around a Sun-like star; every value here is plain data.
 */
import { ASTRONOMICAL_UNIT_M as AU, SOLAR_LUMINOSITY_W as SOLAR_LUMINOSITY, SOLAR_MASS_KG as SOLAR_MASS, STEFAN_BOLTZMANN as STEFAN, type ThermalCase } from "../src/index.js";

/** One orbit, s (a Julian year: the orbit's period is given, not derived from a and M). */
export const YEAR = 3.15576e7;

/** Geometry factor of the lumped regimes (common practice: whole sphere 1/4, dayside 1/2, substellar 1). */
const GLOBAL_FACTOR = 0.25;

/** Equilibrium temperature of the orbit-mean flux of a global slab (closed form, Williams & Pollard 2002 eq. 3), K. */
export function meanFluxEquilibriumK(e: number, albedo: number, emissivity: number): number {
  const mean = (GLOBAL_FACTOR * (1 - albedo) * SOLAR_LUMINOSITY) / (4 * Math.PI * AU * AU * Math.sqrt(1 - e * e));
  return Math.sqrt(Math.sqrt(mean / (emissivity * STEFAN)));
}

/** A global slab at 1 au on an orbit of eccentricity e whose radiative time is τ/P (at its mean-flux equilibrium). */
export function slabCase(e: number, tauOverPeriod: number, albedo = 0.3, emissivity = 0.95): ThermalCase {
  const t = meanFluxEquilibriumK(e, albedo, emissivity);
  const heatCapacity = tauOverPeriod * YEAR * 4 * emissivity * STEFAN * t ** 3;
  return {
    name: "bench slab",
    star: { luminosityW: SOLAR_LUMINOSITY, massKg: SOLAR_MASS },
    orbit: { semiMajorAxisM: AU, eccentricity: e, periodSeconds: YEAR, meanAnomalyAtStartRad: 0 },
    surface: { albedo, emissivity, heatCapacityJPerM2K: heatCapacity, internalFluxWPerM2: 0 },
    regime: "global",
  };
}

/**
 * A point on the equator of a spinning rock (zero obliquity) with `solarDays` solar days per orbit
 * (spin (solarDays + 1):1, prograde), e = 0.1, a skin of C = 1e5 J m⁻² K⁻¹ (about 7 cm of regolith) and
 * a little internal heat so the nights do not fall towards 0 K.
 */
export function pointCase(solarDays: number): ThermalCase {
  const n = (2 * Math.PI) / YEAR;
  const spinRatio = solarDays + 1;
  return {
    name: `bench point ${solarDays}`,
    star: { luminosityW: SOLAR_LUMINOSITY, massKg: SOLAR_MASS },
    orbit: { semiMajorAxisM: AU, eccentricity: 0.1, periodSeconds: YEAR, meanAnomalyAtStartRad: 0 },
    surface: { albedo: 0.1, emissivity: 0.95, heatCapacityJPerM2K: 1e5, internalFluxWPerM2: 0.03 },
    regime: "point",
    location: { latitudeRad: 0, longitudeRad: 0 },
    spin: { rateRadPerSecond: spinRatio * n, ratio: { spin: spinRatio, orbit: 1 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 },
  };
}

/** A latitude band at 40° N on a tilted fast rotator (obliquity 23.5°, equinox at ν = 90°), e = 0.1, τ ≈ 0.07 P. */
export function bandCase(): ThermalCase {
  return {
    name: "bench band",
    star: { luminosityW: SOLAR_LUMINOSITY, massKg: SOLAR_MASS },
    orbit: { semiMajorAxisM: AU, eccentricity: 0.1, periodSeconds: YEAR, meanAnomalyAtStartRad: 0 },
    surface: { albedo: 0.3, emissivity: 0.95, heatCapacityJPerM2K: 1e7, internalFluxWPerM2: 0 },
    regime: "band",
    location: { latitudeRad: (40 * Math.PI) / 180, longitudeRad: 0 },
    spin: { rateRadPerSecond: (2 * Math.PI) / 86_400, obliquityRad: (23.5 * Math.PI) / 180, equinoxTrueAnomalyRad: Math.PI / 2 },
  };
}

/** Two hemispheres of a locked planet (uniform dayside), exchange coefficient 1 W m⁻² K⁻¹, e = 0.3, C = 1e8 J m⁻² K⁻¹ (τ about P, like the slab). */
export function dayNightCase(): ThermalCase {
  return {
    name: "bench daynight",
    star: { luminosityW: SOLAR_LUMINOSITY, massKg: SOLAR_MASS },
    orbit: { semiMajorAxisM: AU, eccentricity: 0.3, periodSeconds: YEAR, meanAnomalyAtStartRad: 0 },
    surface: { albedo: 0.3, emissivity: 0.95, heatCapacityJPerM2K: 1e8, internalFluxWPerM2: 0 },
    regime: "daynight",
    exchange: { recirculation: 0, coefficientWPerM2K: 1, weighting: "uniform" },
  };
}

/** The cases with a stored independent reference (reference.ts writes bench/references.json). */
export const REFERENCE_CASES: Record<string, () => ThermalCase> = {
  slab: () => slabCase(0.5, 1),
  slab100: () => slabCase(0.5, 100),
  stiff: () => slabCase(0.95, 1e-4),
  point365: () => pointCase(365),
  point1000: () => pointCase(1000),
  band: bandCase,
  daynight: dayNightCase,
};

export { AU, SOLAR_LUMINOSITY, SOLAR_MASS, STEFAN };
