/**
 * A thermal case: everything the engine needs, validated and in SI units. The scenario module
 * builds it from a file; a script can build it directly. Nothing here knows about files.
 */
import type { HeatExchange } from "../physics/dayNight.js";
import type { SurfaceProperties } from "../physics/energyBalance.js";
import type { Orbit } from "../physics/orbit.js";
import type { ClimateSettings } from "../physics/climateSettings.js";
import type { Observer } from "../physics/observer.js";
import type { Passband } from "../physics/planck.js";
import type { Star } from "../physics/star.js";
import type { ColumnSpec, HeatStore } from "./heatStore.js";
import type { Regime } from "./regimes.js";

export { REGIMES, type Regime } from "./regimes.js";
export type { ColumnSpec, HeatStore } from "./heatStore.js";

/**
 * The optical and internal-heat properties of the surface. `heatCapacityJPerM2K` is the shorthand
 * for a slab heat store (`heatStore: { kind: "slab", ... }`); a column case has none.
 */
export type SurfaceOptics = Omit<SurfaceProperties, "heatCapacityJPerM2K"> & { heatCapacityJPerM2K?: number };

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
  surface: SurfaceOptics;
  regime: Regime;
  /**
   * What stores the heat under every cell (see `heatStore.ts`). Optional: without it the store is
   * `column` when given, else a slab of `surface.heatCapacityJPerM2K`; read it through `heatStoreOf`.
   */
  heatStore?: HeatStore;
  /** Optional temperature window [low, high], K, for the time-in-range statistic. */
  windowK?: readonly [number, number];
  /** Spin (band: obliquity and axis; point: all of it). Default: synchronous, no obliquity. */
  spin?: SpinSpec;
  /** Where on the surface (band: latitude; point: latitude and longitude). Default 0, 0. */
  location?: SurfaceLocation;
  /** Day/night heat exchange (daynight regime). Default: no exchange, uniform dayside. */
  exchange?: HeatExchange;
  /** Shorthand for `heatStore: { kind: "column", column }`: a conduction column under the surface. */
  column?: ColumnSpec;
  /**
   * The zonal climate's settings (latitude bands, transport, radiation, ice): present exactly for a
   * scenario with regime zonal, whose solver (src/run/zonal.ts) reads them; `regime` then holds global.
   */
  climate?: ClimateSettings;
  /** The map regime's grid (defaults 36 × 18, no wind). */
  map?: MapSpec;
  /** A distant observer, for the map regime's phase curve. */
  observer?: ObserverSpec;
  /** The body's radius, m (the map's flux ratio needs it). */
  bodyRadiusM?: number;
}

/** The map regime's grid: equal-angle cells, and a solid-body wind relative to the ground. */
export interface MapSpec {
  longitudes: number;
  latitudes: number;
  /** Wind angular speed relative to the ground, rad s⁻¹ (eastward positive). */
  windRadPerSecond: number;
}

/** What a telescope sees: the orbit's orientation and the passband (a file is read by the CLI into a table). */
export interface ObserverSpec extends Observer {
  passband: Passband | { kind: "file"; path: string };
}
