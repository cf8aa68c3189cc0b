/**
 * Albedo that rises with the stellar incidence angle θ (the zenith angle of the star), as for a
 * rough regolith that reflects more at grazing light:
 *   A(θ) = A₀ + a (θ/45°)³ + b (θ/90°)⁸
 * (Hayne et al. 2017, JGR Planets 122, 2371, appendix; a = 0.06, b = 0.25 for the Moon, from memory).
 * A₀ is the albedo at normal incidence (the body's Bond albedo setting); a and b are dimensionless.
 */
import { requireNumber } from "../errors.js";

/** The coefficients a and b of A(θ); both dimensionless, ≥ 0. */
export interface IncidenceAlbedo {
  /** Rise of the albedo at θ = 45° from the cubic term (dimensionless). */
  a: number;
  /** Rise of the albedo at θ = 90° from the eighth-power term (dimensionless). */
  b: number;
}

const QUARTER_PI = Math.PI / 4;
const HALF_PI = Math.PI / 2;

/**
 * Checks that A(θ) stays a physical albedo for every θ in [0°, 90°]: with a, b ≥ 0 it rises
 * monotonically, so A₀ + 8a + b ≤ 1 (its value at 90°) is the whole condition.
 */
export function checkIncidenceAlbedo(normalAlbedo: number, law: IncidenceAlbedo, path = "body.albedoIncidence"): void {
  requireNumber(`${path}.a`, law.a, (a) => a >= 0, "a ≥ 0 (dimensionless)");
  requireNumber(`${path}.b`, law.b, (b) => b >= 0, "b ≥ 0 (dimensionless)");
  requireNumber(path, normalAlbedo + 8 * law.a + law.b, (top) => top <= 1, "A₀ + 8a + b ≤ 1 (the albedo at 90° incidence)");
}

/** A(θ) for the incidence angle θ in rad, 0 ≤ θ ≤ π/2. */
export function albedoAtIncidence(normalAlbedo: number, law: IncidenceAlbedo, incidenceRad: number): number {
  const x = incidenceRad / QUARTER_PI;
  const y = incidenceRad / HALF_PI;
  const y2 = y * y;
  const y4 = y2 * y2;
  return normalAlbedo + law.a * x * x * x + law.b * y4 * y4;
}
