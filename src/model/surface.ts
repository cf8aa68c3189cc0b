/**
 * The surface of a thermal case: a set of cells, each with an area weight (its share of the
 * modelled area; the weights sum to 1) and a forcing (absorbed stellar flux per unit cell area as
 * an explicit function of the eccentric anomaly E), plus what the spin makes of the forcing: the
 * cycle after which it repeats, the solar day, and whether it has corners (sunrise, sunset).
 * Regimes build their surface in `regimes.ts`; this module only says what a surface is.
 */
import { CalorbitError } from "../errors.js";
import type { Forcing } from "../physics/forcing.js";

export interface SurfaceCell {
  /** Short name used in outputs: "surface", "day", "night", later "band_+30deg", ... */
  name: string;
  /** Share of the modelled area, 0 < w ≤ 1; the weights of a surface sum to 1. */
  areaWeight: number;
  forcing: Forcing;
}

export interface Surface {
  cells: readonly SurfaceCell[];
  /** Orbits in one forcing cycle (q for a p:q spin–orbit resonance). */
  cycleOrbits: number;
  /** False when the spin is not commensurate with the orbit: no exact cycle exists. */
  commensurate: boolean;
  /** Mean solar day, s; null when synchronous; undefined for surfaces without a spin. */
  solarDaySeconds?: number | null;
  /** True when the forcing has corners (sunrise, sunset, polar night). */
  forcingHasCorners: boolean;
  /**
   * How the periodic solve meets the corners: "scan", find each sunrise and sunset (a scan, then
   * bisection) and end steps on them; "smooth", there are none inside the cycle after all (a band
   * that never sees polar day or night); absent, corners fall inside steps and the fine tolerance
   * they need is kept.
   */
  cornerSearch?: "scan" | "smooth";
}

/** A surface of one cell covering the whole modelled area. */
export function singleCell(forcing: Forcing, spin: Omit<Surface, "cells"> = { cycleOrbits: 1, commensurate: true, forcingHasCorners: false }): Surface {
  return { ...spin, cells: [{ name: "surface", areaWeight: 1, forcing }] };
}

/** Checks that the area weights are positive and sum to 1 (a regime's own bug otherwise). */
export function checkSurfaceCells(surface: Surface): void {
  let sum = 0;
  for (const cell of surface.cells) {
    if (!(cell.areaWeight > 0 && cell.areaWeight <= 1)) {
      throw new CalorbitError("INVALID_ARGUMENT", "a surface cell has an area weight outside (0, 1]", [
        { path: `surface.${cell.name}`, given: String(cell.areaWeight), allowed: "0 < w ≤ 1" },
      ]);
    }
    sum += cell.areaWeight;
  }
  if (surface.cells.length === 0 || Math.abs(sum - 1) > 1e-12) {
    throw new CalorbitError("INVALID_ARGUMENT", "the surface cells' area weights do not sum to 1", [
      { path: "surface", given: String(sum), allowed: "Σ w = 1" },
    ]);
  }
}

/** Area-weighted cycle-mean absorbed stellar flux of the whole surface, W m⁻². */
export function meanAbsorbedOf(surface: Surface): number {
  let sum = 0;
  for (const cell of surface.cells) sum += cell.areaWeight * cell.forcing.meanAbsorbedWPerM2;
  return sum;
}
