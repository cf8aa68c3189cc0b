/**
 * A thermal case: everything the engine needs, validated and in SI units. The scenario module
 * builds it from a file; a script can build it directly. Nothing here knows about files.
 */
import type { SurfaceProperties } from "./physics/energyBalance.js";
import type { LumpedRegime } from "./physics/flux.js";
import type { Orbit } from "./physics/orbit.js";
import type { Star } from "./physics/star.js";

export type Regime = LumpedRegime;

export interface ThermalCase {
  name: string;
  star: Star;
  orbit: Orbit;
  surface: SurfaceProperties;
  regime: Regime;
  /** Optional temperature window [low, high], K, for the time-in-range statistic. */
  windowK?: readonly [number, number];
}
