/**
 * The heat store under each surface cell: what holds the heat between the absorbed sunlight and
 * the emitted infrared. A tagged union, so every place that treats the two differently is a
 * `switch (store.kind)` the compiler checks:
 * - a slab: one temperature per cell and an areal heat capacity C (J m⁻² K⁻¹);
 * - a conduction column: layers under the surface, solved by `src/solve/columnSolver.ts`.
 */
import { CalorbitError } from "../errors.js";
import type { ColumnProperties, GridControls } from "../physics/column.js";

export interface ColumnSpec {
  properties: ColumnProperties;
  grid: GridControls;
  /** Depths at which to report temperature series, m. */
  outputDepthsM: readonly number[];
  /** Heat flux into the bottom, W m⁻². */
  interiorFluxWPerM2: number;
}

export interface SlabStore {
  kind: "slab";
  /** Areal heat capacity C, J m⁻² K⁻¹ (> 0). */
  heatCapacityJPerM2K: number;
}

export interface ColumnStore {
  kind: "column";
  column: ColumnSpec;
}

export type HeatStore = SlabStore | ColumnStore;
export const HEAT_STORE_KINDS = ["slab", "column"] as const satisfies readonly HeatStore["kind"][];
export type HeatStoreKind = (typeof HEAT_STORE_KINDS)[number];

/** The fields of a thermal case that name its heat store (see `ThermalCase`). */
export interface HeatStoreFields {
  heatStore?: HeatStore;
  surface: { heatCapacityJPerM2K?: number };
  column?: ColumnSpec;
}

/**
 * The heat store of a case: `heatStore` when given, else the shorthand fields (`column`, or the
 * slab's `surface.heatCapacityJPerM2K`). The only place that reads those shorthands.
 */
export function heatStoreOf(thermal: HeatStoreFields): HeatStore {
  if (thermal.heatStore) return thermal.heatStore;
  if (thermal.column) return { kind: "column", column: thermal.column };
  const c = thermal.surface.heatCapacityJPerM2K;
  if (c === undefined) {
    throw new CalorbitError("INVALID_ARGUMENT", "the body has no heat store", [
      { path: "body.heatCapacity", given: "missing", allowed: "an areal heat capacity (body.heatCapacity or body.layer), or body.column" },
    ]);
  }
  return { kind: "slab", heatCapacityJPerM2K: c };
}

/** The areal heat capacity of a slab case, J m⁻² K⁻¹; a CalorbitError for a column case. */
export function slabHeatCapacity(thermal: HeatStoreFields): number {
  const store = heatStoreOf(thermal);
  if (store.kind === "slab") return store.heatCapacityJPerM2K;
  throw new CalorbitError("INVALID_ARGUMENT", "this case has a conduction column, not a slab", [
    { path: "body.column", given: "a conduction column", allowed: "a slab (body.heatCapacity or body.layer) here" },
  ]);
}
