/**
 * Bond albedo of a latitude band as a function of its temperature (ice–albedo feedback) and of
 * x = sin latitude (a fixed latitude profile), for the zonal climate. Three laws:
 * - constant: α(x) = α₀ + α₂ P₂(x) (no ice);
 * - step: the ice-free α(x) above the ice temperature, the ice albedo below it, as in North 1975
 *   (J. Atmos. Sci. 32, 1301: ice where T < −10 °C). A band straddles the edge, so the step is
 *   a linear ramp `rampK` wide centred on the ice temperature: the band there is partly iced, and
 *   the band system keeps a fixed point (a bare step has none when the edge falls between bands);
 * - smooth: α = 0.525 − 0.245 tanh((T − 268 K)/5 K) (Spiegel, Menou & Scharf 2008, ApJ 681, 1609,
 *   from memory), independent of x.
 * P₂(x) = (3x² − 1)/2 (Legendre), as in North's annual-mean profiles.
 */
import { NORTH_ICE_ALBEDO, NORTH_ICE_EDGE_K, SMOOTH_ICE_ALBEDO } from "../constants.js";
import { requireNumber } from "../errors.js";

export const ALBEDO_LAWS = ["constant", "step", "smooth"] as const;

export type AlbedoSpec =
  | { law: "constant"; value: number; p2?: number }
  | { law: "step"; warm: number; warmP2?: number; ice: number; iceK: number; rampK: number }
  | { law: "smooth" };

/** Width of the step law's ramp when not given, K: narrow against a band's seasonal swing. */
export const DEFAULT_STEP_RAMP_K = 1;

/** A law bound to one band (its x): allocation-free in the stepping loop. */
export interface BandAlbedo {
  /** α(T). */
  value(temperatureK: number): number;
  /** dα/dT, K⁻¹. */
  slope(temperatureK: number): number;
  /** Share of the band under ice, 0 … 1 (0 for a law without ice). */
  iceFraction(temperatureK: number): number;
}

export interface AlbedoLaw {
  readonly spec: AlbedoSpec;
  /** The temperature at the ice edge, K (where the ice fraction is one half); null without ice. */
  readonly iceEdgeK: number | null;
  forBand(x: number): BandAlbedo;
}

/** Legendre P₂(x) = (3x² − 1)/2. */
export function legendreP2(x: number): number {
  return 0.5 * (3 * x * x - 1);
}

/** North's step law with his ice-free profile and ice co-albedo (North, Cahalan & Coakley 1981): co-albedo 0.697 − 0.0779 P₂ ice-free, 0.38 over ice, at −10 °C. */
export function northStepAlbedo(rampK = DEFAULT_STEP_RAMP_K): AlbedoSpec {
  return { law: "step", warm: 1 - 0.697, warmP2: 0.0779, ice: NORTH_ICE_ALBEDO, iceK: NORTH_ICE_EDGE_K, rampK };
}

function checkAlbedo(path: string, a: number): void {
  requireNumber(path, a, (v) => v >= 0 && v <= 1, "0 ≤ α ≤ 1");
}

export function albedoLaw(spec: AlbedoSpec): AlbedoLaw {
  switch (spec.law) {
    case "constant": {
      const p2 = spec.p2 ?? 0;
      for (const x of [0, 1]) checkAlbedo("climate.albedo.value", spec.value + p2 * legendreP2(x));
      return {
        spec,
        iceEdgeK: null,
        forBand(x) {
          const a = spec.value + p2 * legendreP2(x);
          return { value: () => a, slope: () => 0, iceFraction: () => 0 };
        },
      };
    }
    case "step": {
      const p2 = spec.warmP2 ?? 0;
      for (const x of [0, 1]) checkAlbedo("climate.albedo.warm", spec.warm + p2 * legendreP2(x));
      checkAlbedo("climate.albedo.ice", spec.ice);
      requireNumber("climate.albedo.iceTemperature", spec.iceK, (t) => t > 0, "T > 0 K");
      requireNumber("climate.albedo.ramp", spec.rampK, (w) => w > 0 && w <= 20, "0 < ramp ≤ 20 K");
      const low = spec.iceK - spec.rampK / 2;
      const high = spec.iceK + spec.rampK / 2;
      const iceFraction = (t: number): number => (t <= low ? 1 : t >= high ? 0 : (high - t) / spec.rampK);
      return {
        spec,
        iceEdgeK: spec.iceK,
        forBand(x) {
          const warm = spec.warm + p2 * legendreP2(x);
          const jump = spec.ice - warm;
          const rampSlope = -jump / spec.rampK;
          return {
            value: (t) => warm + jump * iceFraction(t),
            slope: (t) => (t > low && t < high ? rampSlope : 0),
            iceFraction,
          };
        },
      };
    }
    case "smooth": {
      const { midpoint, halfRange, centreK, widthK } = SMOOTH_ICE_ALBEDO;
      // Ice share: 0 at the warm plateau (midpoint − halfRange), 1 at the icy one. The stepping asks
      // for the value and the slope at the same T in turn: each band computes tanh once for both.
      const bandLaw = (): BandAlbedo => {
        let lastT = NaN;
        let lastTanh = 0;
        const tanhAt = (t: number): number => {
          if (t !== lastT) {
            lastT = t;
            lastTanh = Math.tanh((t - centreK) / widthK);
          }
          return lastTanh;
        };
        return {
          value: (t) => midpoint - halfRange * tanhAt(t),
          slope: (t) => {
            const th = tanhAt(t);
            return (-halfRange / widthK) * (1 - th * th);
          },
          iceFraction: (t) => 0.5 * (1 - tanhAt(t)),
        };
      };
      return { spec, iceEdgeK: centreK, forBand: bandLaw };
    }
  }
}
