/**
 * Absorbed stellar power per unit emitting area as an explicit function of the eccentric
 * anomaly E. Every forcing is written in E so the ODE right-hand side never solves Kepler's
 * equation: r = a(1 − e cos E) is explicit, and so are the time and the true anomaly.
 */
import { absorbedFlux, GEOMETRY_FACTOR, inverseSquareAt, stellarFlux, type LumpedRegime } from "./flux.js";
import { albedoAtIncidence, checkIncidenceAlbedo, type IncidenceAlbedo } from "./albedo.js";
import {
  cosZenithFromAngles,
  dailyMeanInsolation,
  hourAngleFrom,
  rightAscensionAt,
  solarDaySeconds,
  stellarDeclination,
  type SpinGeometry,
} from "./geometry.js";
import { meanMotion, type Orbit } from "./orbit.js";

export interface Forcing {
  /** Absorbed stellar flux (W m⁻², per unit emitting area) at eccentric anomaly E (rad). */
  absorbedAt(eccentricAnomalyRad: number): number;
  /** Orbit-mean absorbed stellar flux, W m⁻², exact where a closed form exists. */
  readonly meanAbsorbedWPerM2: number;
}

/** A forcing times a constant factor (a share of the light, a dayside weighting). */
export function scaledForcing(forcing: Forcing, factor: number): Forcing {
  return { absorbedAt: (E) => factor * forcing.absorbedAt(E), meanAbsorbedWPerM2: factor * forcing.meanAbsorbedWPerM2 };
}

/** No starlight at all (a night hemisphere). */
export const NO_FORCING: Forcing = { absorbedAt: () => 0, meanAbsorbedWPerM2: 0 };

/**
 * Whole-body lumped forcing: f(1 − A) L / (4π a² (1 − e cos E)²).
 * Its orbit mean is f(1 − A) L / (4π a² √(1 − e²)) (Williams & Pollard 2002, eq. 3).
 */
export function lumpedForcing(
  regime: LumpedRegime,
  albedo: number,
  luminosityW: number,
  orbit: Orbit,
): Forcing {
  const atSemiMajorAxis = absorbedFlux(albedo, stellarFlux(luminosityW, orbit.semiMajorAxisM), GEOMETRY_FACTOR[regime]);
  const e = orbit.eccentricity;
  return {
    absorbedAt(eccentricAnomalyRad: number): number {
      return atSemiMajorAxis * inverseSquareAt(e, eccentricAnomalyRad);
    },
    meanAbsorbedWPerM2: atSemiMajorAxis / Math.sqrt(1 - e * e),
  };
}

/** Orbit-mean of an absorbed-flux function of E by the trapezoidal rule in E, weighted by dt/dE. */
export function orbitMeanByQuadrature(absorbedAt: (E: number) => number, eccentricity: number, cycleOrbits: number, points: number): number {
  let sum = 0;
  let weight = 0;
  const total = points * cycleOrbits;
  for (let k = 0; k < total; k++) {
    const E = (2 * Math.PI * k) / points;
    const w = 1 - eccentricity * Math.cos(E);
    sum += absorbedAt(E) * w;
    weight += w;
  }
  return sum / weight;
}

/**
 * A latitude band of a fast rotator: (1 − A) × the daily-mean insolation (Berger 1978) at the
 * current distance and declination. The declination follows the true anomaly, explicit in E.
 */
export function bandForcing(
  albedo: number,
  luminosityW: number,
  orbit: Orbit,
  latitudeRad: number,
  obliquityRad: number,
  equinoxTrueAnomalyRad: number,
): Forcing {
  const e = orbit.eccentricity;
  const absorbedAtA = absorbedFlux(albedo, stellarFlux(luminosityW, orbit.semiMajorAxisM));
  const trueAnomalyFactor = Math.sqrt((1 + e) / (1 - e));
  const absorbedAt = (E: number): number => {
    const nu = 2 * Math.atan(trueAnomalyFactor * Math.tan(E / 2));
    const declination = stellarDeclination(obliquityRad, nu, equinoxTrueAnomalyRad);
    return dailyMeanInsolation(absorbedAtA * inverseSquareAt(e, E), latitudeRad, declination);
  };
  return { absorbedAt, meanAbsorbedWPerM2: orbitMeanByQuadrature(absorbedAt, e, 1, 2048) };
}

/**
 * One point on a spinning body: (1 − A) S cos z by day, nothing by night. The hour angle comes
 * from the spin angle Ω (t − t_p) with t − t_p = (E − e sin E)/n, so it too is explicit in E.
 * The geometry is ./geometry.ts's (declination, right ascension, hour angle, cos z), fed the sines
 * and cosines this loop already has. With `incidenceAlbedo` the albedo is A(z) of ./albedo.ts.
 */
export function pointForcing(
  albedo: number,
  luminosityW: number,
  orbit: Orbit,
  latitudeRad: number,
  longitudeRad: number,
  spin: SpinGeometry,
  cycleOrbits: number,
  incidenceAlbedo?: IncidenceAlbedo,
): Forcing {
  const e = orbit.eccentricity;
  const n = meanMotion(orbit);
  const fluxAtA = stellarFlux(luminosityW, orbit.semiMajorAxisM);
  const absorbedAtA = absorbedFlux(albedo, fluxAtA);
  const sinTheta = Math.sin(spin.obliquityRad);
  const cosTheta = Math.cos(spin.obliquityRad);
  const nuEq = spin.equinoxTrueAnomalyRad;
  const sinNuEq = Math.sin(nuEq);
  const cosNuEq = Math.cos(nuEq);
  const sinLat = Math.sin(latitudeRad);
  const cosLat = Math.cos(latitudeRad);
  const rootOneMinusE2 = Math.sqrt(1 - e * e);
  // The point's angle A = λ + α★(0) + φ(E), φ = Ω (t − t_p) = (Ω/n)(E − e sin E): see hourAngleFrom.
  const angleAtPeriastron = hourAngleFrom(longitudeRad, rightAscensionAt(cosTheta, -sinNuEq, cosNuEq), 0, 0);
  const spinPerAnomaly = spin.rateRadPerSecond / n;
  // One sine–cosine pair of E and one of A per evaluation: cos ν = (cos E − e)/(1 − e cos E) and
  // sin ν = √(1 − e²) sin E/(1 − e cos E) (Kepler's orbit, common practice), l = ν − ν_eq by the sum rules.
  // (a/r)² = 1/(1 − e cos E)² of the last cosZenithAt (the same cos E; inverseSquareAt's formula).
  let inverseSquare = 1;
  const cosZenithAt = (E: number): number => {
    const sinE = Math.sin(E);
    const cosE = Math.cos(E);
    const w = 1 - e * cosE;
    inverseSquare = 1 / (w * w);
    const cosNu = (cosE - e) / w;
    const sinNu = (rootOneMinusE2 * sinE) / w;
    const sinL = sinNu * cosNuEq - cosNu * sinNuEq;
    const cosL = cosNu * cosNuEq + sinNu * sinNuEq;
    const a = angleAtPeriastron + spinPerAnomaly * (E - e * sinE);
    return cosZenithFromAngles(sinLat, cosLat, sinTheta, cosTheta, sinL, cosL, Math.sin(a), Math.cos(a));
  };
  let absorbedAt: (E: number) => number;
  if (incidenceAlbedo === undefined) {
    absorbedAt = (E) => {
      const mu = cosZenithAt(E);
      return mu > 0 ? absorbedAtA * inverseSquare * mu : 0;
    };
  } else {
    checkIncidenceAlbedo(albedo, incidenceAlbedo);
    absorbedAt = (E) => {
      const mu = cosZenithAt(E);
      return mu > 0 ? absorbedFlux(albedoAtIncidence(albedo, incidenceAlbedo, Math.acos(Math.min(1, mu))), fluxAtA * inverseSquare) * mu : 0;
    };
  }
  const solarDay = solarDaySeconds(spin.rateRadPerSecond, n, spin.obliquityRad);
  const daysPerOrbit = solarDay === null ? 0 : orbit.periodSeconds / solarDay;
  const points = Math.min(1 << 20, Math.max(4096, Math.ceil(64 * daysPerOrbit * cycleOrbits)));
  return { absorbedAt, meanAbsorbedWPerM2: orbitMeanByQuadrature(absorbedAt, e, cycleOrbits, Math.ceil(points / cycleOrbits)) };
}
