/**
 * Where the observer is: the direction to a distant observer, the planet's position on the sky,
 * the times of transit and occultation, and how much of one disc hides the other.
 *
 * Convention (one, used everywhere in calorbit): the orbit frame has x toward periastron, y along
 * the motion at periastron and z along the orbit normal. The observer looks along the sky
 * coordinates of Winn (2010, "Transits and Occultations", in Exoplanets, ed. Seager, eqs. 2–4):
 *   X = −r cos(ω + f),  Y = −r sin(ω + f) cos i,  Z = r sin(ω + f) sin i,
 * with +Z toward the observer, ω the argument of periastron of the planet's orbit and i the
 * inclination (90° edge-on). The planet is in front of the star (transit) at conjunction
 * f = 90° − ω, and behind it (occultation, the secondary eclipse) at f = 270° − ω. The longitude
 * of the ascending node only turns the sky picture and changes no flux.
 */
import { CalorbitError } from "../errors.js";
import { eccentricFromTrue, meanAnomalyFromEccentric } from "./kepler.js";
import { meanMotion, type Orbit } from "./orbit.js";

const TWO_PI = 2 * Math.PI;

export interface Observer {
  /** Inclination i of the orbit to the sky plane, rad, 0 ≤ i ≤ π (π/2: edge-on). */
  inclinationRad: number;
  /** Argument of periastron ω of the planet's orbit, rad. */
  argumentOfPeriastronRad: number;
  /** Longitude of the ascending node, rad: orients the sky picture only. */
  longitudeOfNodeRad: number;
}

/** Unit vector toward the observer in the orbit frame: (sin i sin ω, sin i cos ω, cos i). */
export function observerDirection(observer: Observer): [number, number, number] {
  const si = Math.sin(observer.inclinationRad);
  return [si * Math.sin(observer.argumentOfPeriastronRad), si * Math.cos(observer.argumentOfPeriastronRad), Math.cos(observer.inclinationRad)];
}

/**
 * The planet on the sky at true anomaly f and distance r: its projected separation from the star
 * (m) and its offset toward the observer, Z (m; positive in front of the star).
 */
export function skyOffset(observer: Observer, trueAnomalyRad: number, distanceM: number): { separationM: number; towardObserverM: number } {
  const s = Math.sin(observer.argumentOfPeriastronRad + trueAnomalyRad);
  const c = Math.cos(observer.argumentOfPeriastronRad + trueAnomalyRad);
  const ci = Math.cos(observer.inclinationRad);
  return {
    separationM: distanceM * Math.sqrt(c * c + s * s * ci * ci),
    towardObserverM: distanceM * s * Math.sin(observer.inclinationRad),
  };
}

/** Phase angle α (rad, 0 at full phase) at true anomaly f: cos α = −sin(ω + f) sin i. */
export function phaseAngle(observer: Observer, trueAnomalyRad: number): number {
  const c = -Math.sin(observer.argumentOfPeriastronRad + trueAnomalyRad) * Math.sin(observer.inclinationRad);
  return Math.acos(Math.max(-1, Math.min(1, c)));
}

/** Seconds after t = 0 (in [0, P)) at which the orbit reaches true anomaly f. */
export function firstTimeAtTrueAnomaly(orbit: Orbit, trueAnomalyRad: number): number {
  const E = eccentricFromTrue(trueAnomalyRad, orbit.eccentricity);
  const M = meanAnomalyFromEccentric(E, orbit.eccentricity);
  let dM = (M - orbit.meanAnomalyAtStartRad) % TWO_PI;
  if (dM < 0) dM += TWO_PI;
  return dM / meanMotion(orbit);
}

/**
 * Conjunction times in the first orbit after t = 0, s: the transit (f = 90° − ω, planet in front)
 * and the occultation (f = 270° − ω, planet behind). These are conjunctions, not the mid-times of
 * closest approach: the two differ only on an eccentric orbit seen away from edge-on.
 */
export function conjunctionTimes(orbit: Orbit, observer: Observer): { transitSeconds: number; occultationSeconds: number } {
  return {
    transitSeconds: firstTimeAtTrueAnomaly(orbit, Math.PI / 2 - observer.argumentOfPeriastronRad),
    occultationSeconds: firstTimeAtTrueAnomaly(orbit, (3 * Math.PI) / 2 - observer.argumentOfPeriastronRad),
  };
}

/**
 * Fraction of a disc of radius `coveredRadius` covered by a disc of radius `coverRadius` whose
 * centre is `separation` away (same units): the overlap area of two circles over π r² of the
 * covered one (plane geometry; both discs uniform).
 */
export function coveredFraction(coverRadius: number, coveredRadius: number, separation: number): number {
  const R = coverRadius;
  const r = coveredRadius;
  const d = separation;
  if (d >= R + r) return 0;
  if (d <= Math.abs(R - r)) return R >= r ? 1 : (R * R) / (r * r);
  const a = Math.acos(Math.max(-1, Math.min(1, (d * d + r * r - R * R) / (2 * d * r))));
  const b = Math.acos(Math.max(-1, Math.min(1, (d * d + R * R - r * r) / (2 * d * R))));
  const area = r * r * a + R * R * b - 0.5 * Math.sqrt(Math.max(0, (-d + r + R) * (d + r - R) * (d - r + R) * (d + r + R)));
  return area / (Math.PI * r * r);
}

/** Validates an observer; throws INVALID_ARGUMENT naming the field. */
export function checkObserver(observer: Observer): void {
  const check = (path: string, value: number, ok: boolean, allowed: string): void => {
    if (!Number.isFinite(value) || !ok) {
      throw new CalorbitError("INVALID_ARGUMENT", `${path}: given ${value}; allowed: ${allowed}`, [{ path, given: String(value), allowed }]);
    }
  };
  check("observer.inclination", observer.inclinationRad, observer.inclinationRad >= 0 && observer.inclinationRad <= Math.PI, "an angle from 0 to 180 deg");
  check("observer.argumentOfPeriastron", observer.argumentOfPeriastronRad, true, "a finite angle");
  check("observer.longitudeOfNode", observer.longitudeOfNodeRad, true, "a finite angle");
}
