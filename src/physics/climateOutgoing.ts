/**
 * Outgoing longwave radiation of a latitude band, I(T) in W m⁻², and its slope dI/dT, for the
 * zonal climate. Three laws:
 * - blackbody: I = εσT⁴ (Stefan–Boltzmann);
 * - linear: I = a + b (T − 273.15 K), North's empirical fit to satellite data (North 1975,
 *   J. Atmos. Sci. 32, 1301; North, Cahalan & Coakley 1981, Rev. Geophys. 19, 91: a = 203.3 W m⁻²,
 *   b = 2.09 W m⁻² K⁻¹);
 * - grey: I = σT⁴ / (1 + 0.75 τ_IR), a grey atmosphere in radiative equilibrium, with
 *   τ_IR = 0.79 (T/273 K)³ (Spiegel, Menou & Scharf 2008, ApJ 681, 1609, from memory) or a fixed τ.
 * The Williams & Kasting (1997) CO₂ polynomial is not offered: its coefficients could not be
 * checked against the paper here.
 */
import {
  GREY_OPTICAL_DEPTH_AT_273K,
  GREY_OPTICAL_DEPTH_REFERENCE_K,
  NORTH_OUTGOING_A_W_PER_M2,
  NORTH_OUTGOING_B_W_PER_M2K,
  STEFAN_BOLTZMANN,
  ZERO_CELSIUS_K,
} from "../constants.js";
import { requireNumber } from "../errors.js";

export const OUTGOING_LAWS = ["blackbody", "linear", "grey"] as const;

export type OutgoingSpec =
  | { law: "blackbody"; emissivity: number }
  | { law: "linear"; aWPerM2: number; bWPerM2K: number }
  /** `opticalDepth` fixed, or absent for τ_IR = 0.79 (T/273 K)³. */
  | { law: "grey"; opticalDepth?: number };

/** A compiled law: allocation-free, called in the stepping loop. */
export interface OutgoingLaw {
  readonly spec: OutgoingSpec;
  /** I(T), W m⁻². */
  flux(temperatureK: number): number;
  /** dI/dT, W m⁻² K⁻¹. */
  slope(temperatureK: number): number;
}

/** North's linear law with the published a and b. */
export const NORTH_LINEAR: OutgoingSpec = { law: "linear", aWPerM2: NORTH_OUTGOING_A_W_PER_M2, bWPerM2K: NORTH_OUTGOING_B_W_PER_M2K };

export function outgoingLaw(spec: OutgoingSpec): OutgoingLaw {
  switch (spec.law) {
    case "blackbody": {
      requireNumber("body.emissivity", spec.emissivity, (e) => e > 0 && e <= 1, "0 < ε ≤ 1");
      const k = spec.emissivity * STEFAN_BOLTZMANN;
      return { spec, flux: (t) => k * t * t * t * t, slope: (t) => 4 * k * t * t * t };
    }
    case "linear": {
      requireNumber("climate.outgoing.a", spec.aWPerM2, () => true, "a finite flux");
      requireNumber("climate.outgoing.b", spec.bWPerM2K, (b) => b > 0, "b > 0 W m⁻² K⁻¹");
      const { aWPerM2: a, bWPerM2K: b } = spec;
      return { spec, flux: (t) => a + b * (t - ZERO_CELSIUS_K), slope: () => b };
    }
    case "grey": {
      if (spec.opticalDepth !== undefined) {
        requireNumber("climate.outgoing.opticalDepth", spec.opticalDepth, (tau) => tau >= 0, "τ ≥ 0");
        const k = STEFAN_BOLTZMANN / (1 + 0.75 * spec.opticalDepth);
        return { spec, flux: (t) => k * t * t * t * t, slope: (t) => 4 * k * t * t * t };
      }
      // I = σT⁴/(1 + cT³), c = 0.75 τ₀ / T_ref³: dI/dT = σT³(4 + cT³)/(1 + cT³)².
      const c = (0.75 * GREY_OPTICAL_DEPTH_AT_273K) / GREY_OPTICAL_DEPTH_REFERENCE_K ** 3;
      return {
        spec,
        flux: (t) => {
          const t3 = t * t * t;
          return (STEFAN_BOLTZMANN * t3 * t) / (1 + c * t3);
        },
        slope: (t) => {
          const t3 = t * t * t;
          const d = 1 + c * t3;
          return (STEFAN_BOLTZMANN * t3 * (4 + c * t3)) / (d * d);
        },
      };
    }
  }
}

/** The grey law's infrared optical depth at T: the fixed one, or 0.79 (T/273 K)³. */
export function greyOpticalDepth(spec: { opticalDepth?: number }, temperatureK: number): number {
  return spec.opticalDepth ?? GREY_OPTICAL_DEPTH_AT_273K * (temperatureK / GREY_OPTICAL_DEPTH_REFERENCE_K) ** 3;
}
