/**
 * Lateral heat exchange between the cells of a surface. A tagged union like the heat store:
 * - none: every cell on its own (one cell, or independent points);
 * - dayNight: the two-hemisphere exchange of `src/physics/dayNight.ts` (a recirculation
 *   efficiency, or an exchange coefficient k (T_day − T_night));
 * - conductance: links between pairs of cells carrying G (T_b − T_a) (`src/physics/conductance.ts`):
 *   discretised diffusion between bands or grid cells, any number of cells;
 * later kinds (diffusion between latitude bands, advection along longitude) add a member here,
 * their operator in their own physics module, and a case in `exchangeOperator` below.
 *
 * A new kind supplies, for each cell i, the exchange flux X_i (W m⁻² of that cell's area) in the
 * cell's balance C dT_i/dt = F_i + q − εσT_i⁴ + X_i and its Jacobian (sparse: name the coupled
 * cells), and must conserve energy: Σ w_i X_i = 0 over the area weights w_i (the day/night `flux`
 * weighting is the one documented exception: its dayside is a brightness, not a budget, and
 * `exchangeIsBudget` says so). The compiler flags every `switch (exchange.kind)` to extend.
 */
import type { ConductanceLink } from "../physics/conductance.js";
import type { DaysideWeighting } from "../physics/dayNight.js";

export interface NoExchange {
  kind: "none";
}

export interface DayNightExchange {
  kind: "dayNight";
  /** Recirculation efficiency ε_r ∈ [0, 1] (0 when an exchange coefficient is used). */
  recirculation: number;
  /** Exchange coefficient k ≥ 0, W m⁻² K⁻¹ (0 when a recirculation efficiency is used). */
  coefficientWPerM2K: number;
  weighting: DaysideWeighting;
}

export interface ConductanceExchangeSpec {
  kind: "conductance";
  /** Linked cell pairs, each with its conductance per unit of the whole surface's area. */
  links: readonly ConductanceLink[];
}

export type Exchange = NoExchange | DayNightExchange | ConductanceExchangeSpec;
export type ExchangeKind = Exchange["kind"];

/** True when the exchange can carry heat into a cell the star never lights (the night side). */
export function exchangeCarriesHeat(exchange: Exchange): boolean {
  switch (exchange.kind) {
    case "none":
      return false;
    case "dayNight":
      return exchange.recirculation > 0 || exchange.coefficientWPerM2K > 0;
    case "conductance":
      return exchange.links.some((link) => link.conductanceWPerM2K > 0);
  }
}

/** True when the cells' area-weighted absorbed flux is the body's energy input (see the header). */
export function exchangeIsBudget(exchange: Exchange): boolean {
  switch (exchange.kind) {
    case "none":
      return true;
    case "dayNight":
      return exchange.weighting === "uniform";
    case "conductance":
      return true;
  }
}

/**
 * What a new exchange kind supplies to the slab-cells system (`slabCells.ts`): its flux into each
 * cell and its Jacobian. Allocation-free: both run inside the ODE right-hand side.
 */
export interface ExchangeOperator {
  /** Adds X_i (W m⁻² of cell i) to out[i] for every cell, at eccentric anomaly E and temperatures T. */
  addFlux(E: number, temperatureK: ArrayLike<number>, out: Float64Array): void;
  /** Adds ∂X_i/∂T_j to jacobian[i·n + j] (row-major, n cells). */
  addJacobian(E: number, temperatureK: ArrayLike<number>, jacobian: Float64Array): void;
  /**
   * Optional: adds (∂X/∂T) v to out, without forming the n × n Jacobian. A matrix-free periodic
   * solve of many cells uses it (cost of a pass over the sparse couplings instead of n²).
   */
  addJacobianProduct?(E: number, temperatureK: ArrayLike<number>, v: ArrayLike<number>, out: Float64Array): void;
}
