/** The star: its luminosity and mass, the only properties the thermal model needs. */
import { GRAVITATIONAL_CONSTANT, STEFAN_BOLTZMANN } from "../constants.js";
import { requireNumber } from "../errors.js";

export interface Star {
  /** Bolometric luminosity L, W (> 0). */
  luminosityW: number;
  /** Mass M★, kg (> 0); sets the period through Kepler's third law. */
  massKg: number;
  /** Photospheric radius R★, m, when known (used only for reporting and T₀ = T★√(R★/a)). */
  radiusM?: number;
  /** Effective temperature T★, K, when known. */
  effectiveTemperatureK?: number;
}

/** Stefan–Boltzmann law for a sphere, L = 4πR²σT⁴, W. */
export function luminosityFromRadiusTemperature(radiusM: number, temperatureK: number): number {
  requireNumber("star.radius", radiusM, (r) => r > 0, "R > 0 m");
  requireNumber("star.temperature", temperatureK, (t) => t > 0, "T > 0 K");
  return 4 * Math.PI * radiusM * radiusM * STEFAN_BOLTZMANN * temperatureK ** 4;
}

/** Gravitational parameter μ = G M★, m³ s⁻² (the body's own mass neglected). */
export function massParameter(star: Star): number {
  requireNumber("star.mass", star.massKg, (m) => m > 0, "M > 0 kg");
  return GRAVITATIONAL_CONSTANT * star.massKg;
}
