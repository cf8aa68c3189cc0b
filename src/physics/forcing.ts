/**
 * Absorbed stellar power per unit emitting area as an explicit function of the eccentric
 * anomaly E. Every forcing is written in E so the ODE right-hand side never solves Kepler's
 * equation: r = a(1 − e cos E) is explicit, and so are the time and the true anomaly.
 */
import { GEOMETRY_FACTOR, stellarFlux, type LumpedRegime } from "./flux.js";
import type { Orbit } from "./orbit.js";

export interface Forcing {
  /** Absorbed stellar flux (W m⁻², per unit emitting area) at eccentric anomaly E (rad). */
  absorbedAt(eccentricAnomalyRad: number): number;
  /** Orbit-mean absorbed stellar flux, W m⁻², exact where a closed form exists. */
  readonly meanAbsorbedWPerM2: number;
}

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
  const atSemiMajorAxis = GEOMETRY_FACTOR[regime] * (1 - albedo) * stellarFlux(luminosityW, orbit.semiMajorAxisM);
  const e = orbit.eccentricity;
  return {
    absorbedAt(eccentricAnomalyRad: number): number {
      const w = 1 - e * Math.cos(eccentricAnomalyRad);
      return atSemiMajorAxis / (w * w);
    },
    meanAbsorbedWPerM2: atSemiMajorAxis / Math.sqrt(1 - e * e),
  };
}
