/**
 * A Keplerian (two-body) elliptic orbit: period, distance and anomalies through time.
 * Time t is measured from the start of the simulation; the orbit's phase at t = 0 is a mean anomaly.
 */
import { requireNumber } from "../errors.js";
import { eccentricAnomaly, trueAnomalyFromEccentric } from "./kepler.js";

const TWO_PI = 2 * Math.PI;

export interface Orbit {
  /** Semi-major axis a, m (> 0). */
  semiMajorAxisM: number;
  /** Eccentricity e, 0 ≤ e < 1. */
  eccentricity: number;
  /** Orbital (anomalistic) period P, s (> 0). */
  periodSeconds: number;
  /** Mean anomaly at t = 0, rad; 0 starts the run at periastron. */
  meanAnomalyAtStartRad: number;
}

/**
 * Kepler's third law P = 2π √(a³ / μ), with μ = G(M★ + m) in m³ s⁻² (> 0).
 * (Murray & Dermott, Solar System Dynamics, 1999, eq. 2.22.)
 */
export function keplerPeriodSeconds(semiMajorAxisM: number, massParameter: number): number {
  requireNumber("semiMajorAxis", semiMajorAxisM, (a) => a > 0, "a > 0 m");
  requireNumber("massParameter", massParameter, (mu) => mu > 0, "GM > 0 m³ s⁻²");
  return TWO_PI * Math.sqrt((semiMajorAxisM * semiMajorAxisM * semiMajorAxisM) / massParameter);
}

/** Validates an orbit's elements; throws INVALID_ARGUMENT naming the first bad one. */
export function checkOrbit(orbit: Orbit): void {
  requireNumber("orbit.semiMajorAxis", orbit.semiMajorAxisM, (a) => a > 0, "a > 0 m");
  requireNumber("orbit.eccentricity", orbit.eccentricity, (e) => e >= 0 && e < 1, "0 ≤ e < 1");
  requireNumber("orbit.period", orbit.periodSeconds, (p) => p > 0, "P > 0 s");
  requireNumber("orbit.meanAnomalyAtStart", orbit.meanAnomalyAtStartRad, () => true, "a finite angle");
}

/** Mean motion n = 2π/P, rad s⁻¹. */
export function meanMotion(orbit: Orbit): number {
  return TWO_PI / orbit.periodSeconds;
}

/** Mean anomaly (rad, not wrapped) at time t (s). */
export function meanAnomalyAt(orbit: Orbit, timeSeconds: number): number {
  return orbit.meanAnomalyAtStartRad + meanMotion(orbit) * timeSeconds;
}

/** Eccentric anomaly (rad, on the revolution of the mean anomaly) at time t (s). */
export function eccentricAnomalyAt(orbit: Orbit, timeSeconds: number): number {
  return eccentricAnomaly(meanAnomalyAt(orbit, timeSeconds), orbit.eccentricity);
}

/** Time (s) at which the orbit reaches eccentric anomaly E (rad), E on the same scale as eccentricAnomalyAt. */
export function timeAtEccentric(orbit: Orbit, eccentricAnomalyRad: number): number {
  const m = eccentricAnomalyRad - orbit.eccentricity * Math.sin(eccentricAnomalyRad);
  return (m - orbit.meanAnomalyAtStartRad) / meanMotion(orbit);
}

/** Star–body distance r = a(1 − e cos E), m. */
export function distanceFromEccentric(orbit: Orbit, eccentricAnomalyRad: number): number {
  return orbit.semiMajorAxisM * (1 - orbit.eccentricity * Math.cos(eccentricAnomalyRad));
}

/** Star–body distance at time t, m. Solves Kepler's equation: keep it out of inner loops. */
export function distanceAt(orbit: Orbit, timeSeconds: number): number {
  return distanceFromEccentric(orbit, eccentricAnomalyAt(orbit, timeSeconds));
}

/** True anomaly (rad, same revolution as the mean anomaly) at time t (s). */
export function trueAnomalyAt(orbit: Orbit, timeSeconds: number): number {
  return trueAnomalyFromEccentric(eccentricAnomalyAt(orbit, timeSeconds), orbit.eccentricity);
}

/** Periastron distance a(1 − e), m. */
export function periastronM(orbit: Orbit): number {
  return orbit.semiMajorAxisM * (1 - orbit.eccentricity);
}

/** Apastron distance a(1 + e), m. */
export function apastronM(orbit: Orbit): number {
  return orbit.semiMajorAxisM * (1 + orbit.eccentricity);
}

/** Time (s) of the first periastron passage at or after t = 0, in [0, P). */
export function firstPeriastronSeconds(orbit: Orbit): number {
  const m0 = orbit.meanAnomalyAtStartRad - TWO_PI * Math.floor(orbit.meanAnomalyAtStartRad / TWO_PI);
  const remaining = m0 === 0 ? 0 : TWO_PI - m0;
  return remaining / meanMotion(orbit);
}
