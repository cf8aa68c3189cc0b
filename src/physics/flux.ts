/**
 * Stellar flux, absorbed power and the instantaneous radiative equilibrium.
 *
 * S(r) = L / (4π r²). A body with Bond albedo A and emissivity ε absorbs f(1 − A)S per unit of
 * emitting area, where the geometry factor f is the ratio of intercepting to emitting area:
 * 1/4 for a fast rotator sharing heat over the whole sphere, 1/2 for a locked dayside that keeps
 * its heat, 1 for a surface element facing the star (common practice; e.g. Pierrehumbert,
 * Principles of Planetary Climate, 2010, §3.3, from memory).
 */
import { STEFAN_BOLTZMANN, WIEN_DISPLACEMENT_M_K } from "../constants.js";
import { requireNumber } from "../errors.js";

/** The whole-body regimes of a lumped surface; each fixes the geometry factor f. */
export const LUMPED_REGIMES = ["global", "dayside", "substellar"] as const;
export type LumpedRegime = (typeof LUMPED_REGIMES)[number];

/** Geometry factor f: intercepting cross-section over emitting area. */
export const GEOMETRY_FACTOR: Readonly<Record<LumpedRegime, number>> = {
  global: 1 / 4,
  dayside: 1 / 2,
  substellar: 1,
};

/** Stellar flux at distance r, W m⁻² (inverse-square law). */
export function stellarFlux(luminosityW: number, distanceM: number): number {
  return luminosityW / (4 * Math.PI * distanceM * distanceM);
}

/**
 * Absorbed stellar flux f (1 − A) S, W m⁻² per unit emitting area, for Bond albedo A, geometry
 * factor f (above) and stellar flux S (common practice). Every forcing builds on this.
 */
export function absorbedFlux(albedo: number, stellarFluxWPerM2: number, geometryFactor = 1): number {
  return geometryFactor * (1 - albedo) * stellarFluxWPerM2;
}

/** The inverse-square factor (a/r)² = 1/(1 − e cos E)² at eccentric anomaly E (r = a(1 − e cos E)). */
export function inverseSquareAt(eccentricity: number, eccentricAnomalyRad: number): number {
  const w = 1 - eccentricity * Math.cos(eccentricAnomalyRad);
  return 1 / (w * w);
}

/**
 * T = (F / (εσ))^(1/4), K, from the emission coefficient εσ (W m⁻² K⁻⁴) already formed: the
 * unguarded form for loops. A negative F (a numerical undershoot) counts as zero.
 */
export function equilibriumTemperatureFrom(absorbedWPerM2: number, emissionCoefficient: number): number {
  return Math.sqrt(Math.sqrt(Math.max(absorbedWPerM2, 0) / emissionCoefficient));
}

/**
 * Radiative equilibrium temperature of a surface absorbing `absorbedWPerM2` and emitting with
 * emissivity ε: T = (F / (εσ))^(1/4), K (Stefan–Boltzmann law). Zero when nothing is absorbed.
 */
export function equilibriumTemperature(absorbedWPerM2: number, emissivity: number): number {
  requireNumber("absorbedFlux", absorbedWPerM2, (f) => f >= 0, "F ≥ 0 W m⁻²");
  requireNumber("emissivity", emissivity, (e) => e > 0 && e <= 1, "0 < ε ≤ 1");
  return equilibriumTemperatureFrom(absorbedWPerM2, emissivity * STEFAN_BOLTZMANN);
}

/** Wavelength of peak spectral radiance per unit wavelength, λ = b/T, m (Wien's law, CODATA 2018 b). */
export function wienPeakWavelengthM(temperatureK: number): number {
  requireNumber("temperature", temperatureK, (t) => t > 0, "T > 0 K");
  return WIEN_DISPLACEMENT_M_K / temperatureK;
}

/**
 * Orbit-averaged stellar flux on an ellipse, ⟨S⟩ = L / (4π a² √(1 − e²)), W m⁻²
 * (Williams & Pollard 2002, Int. J. Astrobiology 1, 61, eq. 3).
 */
export function orbitMeanStellarFlux(luminosityW: number, semiMajorAxisM: number, eccentricity: number): number {
  return stellarFlux(luminosityW, semiMajorAxisM) / Math.sqrt(1 - eccentricity * eccentricity);
}
