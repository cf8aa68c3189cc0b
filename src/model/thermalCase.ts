/**
 * A thermal case: everything the engine needs, validated and in SI units. The scenario module
 * builds it from a file; a script can build it directly. Nothing here knows about files.
 */
import type { ColumnProperties, GridControls } from "../physics/column.js";
import type { HeatExchange } from "../physics/dayNight.js";
import type { SurfaceProperties } from "../physics/energyBalance.js";
import { LUMPED_REGIMES } from "../physics/flux.js";
import type { Orbit } from "../physics/orbit.js";
import type { Star } from "../physics/star.js";

/** Every regime calorbit integrates. */
export const REGIMES = [...LUMPED_REGIMES, "daynight", "band", "point"] as const;
export type Regime = (typeof REGIMES)[number];

export interface SpinSpec {
  /** Sidereal rotation rate Ω, rad s⁻¹ (> 0). */
  rateRadPerSecond: number;
  /** Spin:orbit ratio p:q in lowest terms when the spin was given as a resonance. */
  ratio?: { spin: number; orbit: number };
  /** Obliquity θ, rad, 0 ≤ θ ≤ π. */
  obliquityRad: number;
  /** True anomaly at the northern spring equinox, rad. */
  equinoxTrueAnomalyRad: number;
}

export interface SurfaceLocation {
  /** Latitude φ, rad, −π/2 ≤ φ ≤ π/2. */
  latitudeRad: number;
  /** Longitude λ, rad, east of the meridian under the star at periastron. */
  longitudeRad: number;
}

export interface ThermalCase {
  name: string;
  star: Star;
  orbit: Orbit;
  surface: SurfaceProperties;
  regime: Regime;
  /** Optional temperature window [low, high], K, for the time-in-range statistic. */
  windowK?: readonly [number, number];
  /** Spin (band: obliquity and axis; point: all of it). Default: synchronous, no obliquity. */
  spin?: SpinSpec;
  /** Where on the surface (band: latitude; point: latitude and longitude). Default 0, 0. */
  location?: SurfaceLocation;
  /** Day/night heat exchange (daynight regime). Default: no exchange, uniform dayside. */
  exchange?: HeatExchange;
  /** A conduction column under the surface, in place of the lumped heat capacity. */
  column?: ColumnSpec;
}

export interface ColumnSpec {
  properties: ColumnProperties;
  grid: GridControls;
  /** Depths at which to report temperature series, m. */
  outputDepthsM: readonly number[];
  /** Heat flux into the bottom, W m⁻². */
  interiorFluxWPerM2: number;
}
