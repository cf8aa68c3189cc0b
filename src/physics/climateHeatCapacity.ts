/**
 * Areal heat capacity of a latitude band, C(T) in J m⁻² K⁻¹, and the heat it stores, H(T) = ∫C dT
 * in J m⁻² (from 273 K), for the zonal climate. H is what the stepping conserves, so a band whose
 * heat capacity changes as its water freezes still keeps an exact energy budget.
 * - slab: one constant C (calorbit's body.heatCapacity or layer);
 * - surface: land and ocean shares, C = f_l C_l + (1 − f_l)[(1 − f_i) C_o + f_i C_i(T)], with open
 *   water freezing below 273 K as f_i = 1 − exp((T − 273 K)/10 K) and ice's heat capacity 9.2 C_l
 *   between 263 and 273 K (the latent heat of freezing spread over 10 K) and 2 C_l below 263 K
 *   (Spiegel, Menou & Scharf 2008, ApJ 681, 1609; C_l = 5.25e6 J m⁻² K⁻¹, C_o = 40 C_l; from memory).
 */
import {
  SPIEGEL_COLD_ICE_K,
  SPIEGEL_FREEZING_K,
  SPIEGEL_ICE_FRACTION_SCALE_K,
  SPIEGEL_ICE_OVER_LAND,
  SPIEGEL_LAND_HEAT_CAPACITY_J_PER_M2K,
  SPIEGEL_OCEAN_OVER_LAND,
} from "../constants.js";
import { requireNumber } from "../errors.js";

export type HeatCapacitySpec =
  | { kind: "slab"; heatCapacityJPerM2K: number }
  | {
      kind: "surface";
      /** Share of each band covered by ocean, 0 … 1. */
      oceanFraction: number;
      landHeatCapacityJPerM2K: number;
      oceanHeatCapacityJPerM2K: number;
      /** Open water freezes below 273 K with ice's heat capacity (Spiegel et al. 2008); false: the ocean keeps C_o. */
      freezing: boolean;
    };

/** Spiegel et al. (2008)'s surface: land C_l, ocean 40 C_l, freezing on (from memory). */
export function spiegelSurface(oceanFraction: number): HeatCapacitySpec {
  return {
    kind: "surface",
    oceanFraction,
    landHeatCapacityJPerM2K: SPIEGEL_LAND_HEAT_CAPACITY_J_PER_M2K,
    oceanHeatCapacityJPerM2K: SPIEGEL_OCEAN_OVER_LAND * SPIEGEL_LAND_HEAT_CAPACITY_J_PER_M2K,
    freezing: true,
  };
}

/** A compiled heat store: allocation-free. */
export interface HeatCapacityLaw {
  readonly spec: HeatCapacitySpec;
  /** C(T), J m⁻² K⁻¹ (> 0). */
  capacity(temperatureK: number): number;
  /** H(T) = ∫ from 273 K to T of C dT', J m⁻². */
  heat(temperatureK: number): number;
}

export function heatCapacityLaw(spec: HeatCapacitySpec): HeatCapacityLaw {
  if (spec.kind === "slab") {
    requireNumber("body.heatCapacity", spec.heatCapacityJPerM2K, (c) => c > 0, "C > 0 J m⁻² K⁻¹");
    const c = spec.heatCapacityJPerM2K;
    return { spec, capacity: () => c, heat: (t) => c * (t - SPIEGEL_FREEZING_K) };
  }
  requireNumber("climate.surface.oceanFraction", spec.oceanFraction, (f) => f >= 0 && f <= 1, "0 ≤ ocean fraction ≤ 1");
  requireNumber("climate.surface.landHeatCapacity", spec.landHeatCapacityJPerM2K, (c) => c > 0, "C > 0 J m⁻² K⁻¹");
  requireNumber("climate.surface.oceanHeatCapacity", spec.oceanHeatCapacityJPerM2K, (c) => c > 0, "C > 0 J m⁻² K⁻¹");
  const land = (1 - spec.oceanFraction) * spec.landHeatCapacityJPerM2K;
  const ocean = spec.oceanFraction;
  const co = spec.oceanHeatCapacityJPerM2K;
  const t0 = SPIEGEL_FREEZING_K;
  const s = SPIEGEL_ICE_FRACTION_SCALE_K;
  const warmIce = SPIEGEL_ICE_OVER_LAND.nearFreezing * spec.landHeatCapacityJPerM2K;
  const coldIce = SPIEGEL_ICE_OVER_LAND.cold * spec.landHeatCapacityJPerM2K;
  const tCold = SPIEGEL_COLD_ICE_K;
  const uCold = Math.exp((tCold - t0) / s);
  // ∫ from 273 K to 263 K of (1 − e^u) dT, u = (T − 273 K)/10 K.
  const warmIceSpan = tCold - t0 - s * (uCold - 1);
  if (!spec.freezing) {
    const c = land + ocean * co;
    return { spec, capacity: () => c, heat: (t) => c * (t - t0) };
  }
  return {
    spec,
    capacity(t) {
      if (t >= t0) return land + ocean * co;
      const open = Math.exp((t - t0) / s); // 1 − f_i
      return land + ocean * (open * co + (1 - open) * (t >= tCold ? warmIce : coldIce));
    },
    heat(t) {
      if (t >= t0) return (land + ocean * co) * (t - t0);
      const open = Math.exp((t - t0) / s);
      const water = s * (open - 1) * co;
      const ice = t >= tCold ? warmIce * (t - t0 - s * (open - 1)) : warmIce * warmIceSpan + coldIce * (t - tCold - s * (open - uCold));
      return land * (t - t0) + ocean * (water + ice);
    },
  };
}
