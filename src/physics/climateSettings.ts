/**
 * The settings of a zonal climate (SI), as a scenario's `climate` key resolves to them: the band
 * count, the meridional diffusion coefficient, the outgoing-radiation, albedo and heat-capacity
 * laws, the start (warm, cold or both) and the time resolution.
 */
import type { AlbedoSpec } from "./climateAlbedo.js";
import type { HeatCapacitySpec } from "./climateHeatCapacity.js";
import type { OutgoingSpec } from "./climateOutgoing.js";

export const CLIMATE_STARTS = ["warm", "cold", "both"] as const;
export type ClimateStart = (typeof CLIMATE_STARTS)[number];

export interface ClimateSettings {
  /** Latitude bands, equal in x = sin latitude. */
  bands: number;
  /** D in −∂/∂x[D(1 − x²)∂T/∂x], W m⁻² K⁻¹. */
  diffusionWPerM2K: number;
  outgoing: OutgoingSpec;
  albedo: AlbedoSpec;
  heatCapacity: HeatCapacitySpec;
  start: ClimateStart;
  /** Time steps per orbit (uniform in the eccentric anomaly). */
  stepsPerOrbit: number;
}

/** Defaults: 90 bands (2° near the equator), 360 steps per orbit. */
export const DEFAULT_BANDS = 90;
export const DEFAULT_STEPS_PER_ORBIT = 360;
/** Start temperatures, K: everywhere above freezing (warm) or everywhere frozen (cold). */
export const WARM_START_K = 320;
export const COLD_START_K = 220;
