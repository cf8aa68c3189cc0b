/**
 * Two hemispheres exchanging heat: a dayside under the star and a nightside that share the body's
 * one areal heat capacity C (J m⁻² K⁻¹ per unit area of either hemisphere: there is no separate
 * day and night capacity), state y = [T_day, T_night] in K, independent variable E:
 *   C dT_d/dt = f_d (1 − A) S + q − εσT_d⁴ − (4 f_d − 1) H
 *   C dT_n/dt =               q − εσT_n⁴ + H
 *   H = ε_r (1 − A) S / 4 + k (T_d − T_n)
 * with the recirculation efficiency ε_r (a fraction of the absorbed power carried to the night side
 * as it arrives) or an exchange coefficient k (W m⁻² K⁻¹). At e = 0 and k = 0 the equilibrium is
 * Cowan & Agol (2011, ApJ 729, 54, eqs. 4–5): T_d⁴ = (1−A)(S/σ)(f_d − (4f_d − 1)ε_r/4),
 * T_n⁴ = (1−A)(S/σ) ε_r/4 (ε = 1 here); f_d = 2/3 is their flux-weighted dayside,
 * f_d = 1/2 the uniform one. With f_d = 1/2 the two boxes conserve energy exactly; with f_d = 2/3 the
 * dayside is the brightness an observer at full phase would see, not a closed energy budget.
 */
import { STEFAN_BOLTZMANN } from "../constants.js";
import { CalorbitError } from "../errors.js";
import type { OdeSystem } from "../solve/system.js";
import { checkSurface, type SurfaceProperties } from "./energyBalance.js";
import { absorbedFlux, equilibriumTemperatureFrom, inverseSquareAt, stellarFlux } from "./flux.js";
import { meanMotion, type Orbit } from "./orbit.js";

export const DAYSIDE_WEIGHTINGS = ["uniform", "flux"] as const;
export type DaysideWeighting = (typeof DAYSIDE_WEIGHTINGS)[number];
export const DAYSIDE_FACTOR: Readonly<Record<DaysideWeighting, number>> = { uniform: 1 / 2, flux: 2 / 3 };

export interface HeatExchange {
  /** Recirculation efficiency ε_r ∈ [0, 1] (0 when an exchange coefficient is used). */
  recirculation: number;
  /** Exchange coefficient k ≥ 0, W m⁻² K⁻¹ (0 when a recirculation efficiency is used). */
  coefficientWPerM2K: number;
  weighting: DaysideWeighting;
}

export class DayNightBalance implements OdeSystem {
  readonly dimension = 2;
  private readonly e: number;
  private readonly inverseN: number;
  private readonly emission: number;
  private readonly inverseC: number;
  private readonly q: number;
  private readonly absorbedAtA: number;
  private readonly daysideFactor: number;
  private readonly lossFactor: number;
  /** The last exchange-coefficient equilibrium found (0, 0 before the first): the next one's start. */
  private readonly lastEquilibrium = new Float64Array(2);

  constructor(
    orbit: Orbit,
    surface: SurfaceProperties,
    luminosityW: number,
    readonly exchange: HeatExchange,
  ) {
    checkSurface(surface);
    this.e = orbit.eccentricity;
    this.inverseN = 1 / meanMotion(orbit);
    this.emission = surface.emissivity * STEFAN_BOLTZMANN;
    this.inverseC = 1 / surface.heatCapacityJPerM2K;
    this.q = surface.internalFluxWPerM2;
    this.absorbedAtA = absorbedFlux(surface.albedo, stellarFlux(luminosityW, orbit.semiMajorAxisM));
    this.daysideFactor = DAYSIDE_FACTOR[exchange.weighting];
    this.lossFactor = 4 * this.daysideFactor - 1;
  }

  timePerAnomaly(E: number): number {
    return (1 - this.e * Math.cos(E)) * this.inverseN;
  }

  /** (1 − A) S at eccentric anomaly E, W m⁻². */
  absorbable(E: number): number {
    return this.absorbedAtA * inverseSquareAt(this.e, E);
  }

  /** Stellar power absorbed per unit area of each hemisphere (before any exchange), W m⁻². */
  absorbedOn(E: number, state: 0 | 1): number {
    return state === 0 ? this.daysideFactor * this.absorbable(E) : 0;
  }

  /** Heat carried from day to night, W m⁻² (of nightside area). */
  exchangeFlux(E: number, tDay: number, tNight: number): number {
    return (this.exchange.recirculation * this.absorbable(E)) / 4 + this.exchange.coefficientWPerM2K * (tDay - tNight);
  }

  derivative(x: number, y: ArrayLike<number>, out: Float64Array): void {
    const td = y[0]!;
    const tn = y[1]!;
    const s = this.absorbable(x);
    const h = (this.exchange.recirculation * s) / 4 + this.exchange.coefficientWPerM2K * (td - tn);
    const g = this.timePerAnomaly(x) * this.inverseC;
    out[0] = g * (this.daysideFactor * s + this.q - this.emission * td * td * td * td - this.lossFactor * h);
    out[1] = g * (this.q - this.emission * tn * tn * tn * tn + h);
  }

  jacobian(x: number, y: ArrayLike<number>, out: Float64Array): void {
    const td = y[0]!;
    const tn = y[1]!;
    const g = this.timePerAnomaly(x) * this.inverseC;
    const k = this.exchange.coefficientWPerM2K;
    out[0] = g * (-4 * this.emission * td * td * td - this.lossFactor * k);
    out[1] = g * (this.lossFactor * k);
    out[2] = g * k;
    out[3] = g * (-4 * this.emission * tn * tn * tn - k);
  }

  /**
   * Instantaneous equilibrium of both hemispheres under the flux at E, K: closed form when k = 0,
   * Newton's method on the two balance equations otherwise.
   */
  equilibrium(E: number, out: Float64Array): void {
    const s = this.absorbable(E);
    const forced = (this.exchange.recirculation * s) / 4;
    const dayInput = this.daysideFactor * s + this.q - this.lossFactor * forced;
    const nightInput = this.q + forced;
    const k = this.exchange.coefficientWPerM2K;
    if (k > 0) {
      // Successive calls come at nearby E (grids, extremum searches): start from the last answer.
      exchangeEquilibrium(dayInput, nightInput, this.emission, this.lossFactor, k, out, EXCHANGE_EQUILIBRIUM_MAX_ITERATIONS, this.lastEquilibrium);
      this.lastEquilibrium[0] = out[0]!;
      this.lastEquilibrium[1] = out[1]!;
    } else {
      out[0] = equilibriumTemperatureFrom(dayInput, this.emission);
      out[1] = equilibriumTemperatureFrom(nightInput, this.emission);
    }
  }
}

/** Newton iterations allowed for the exchange-coefficient equilibrium (it takes 4–8 from the mixed start). */
export const EXCHANGE_EQUILIBRIUM_MAX_ITERATIONS = 60;

/**
 * The two balance equations with an exchange coefficient k (W m⁻² K⁻¹), solved for [T_day, T_night]
 * into `out` by Newton's method from the fully mixed state:
 *   P_d − εσT_d⁴ − L k (T_d − T_n) = 0,   P_n − εσT_n⁴ + k (T_d − T_n) = 0
 * with P_d, P_n the day and night inputs (W m⁻²), εσ the emission coefficient and L = 4 f_d − 1.
 * `start` (a nearby equilibrium, both temperatures > 0) replaces the mixed start: two or three
 * steps instead of four to eight. Throws EQUILIBRIUM_NO_CONVERGENCE, naming the balance and the
 * last step, if the cap is reached.
 */
export function exchangeEquilibrium(
  dayInput: number,
  nightInput: number,
  emission: number,
  lossFactor: number,
  k: number,
  out: Float64Array,
  maxIterations = EXCHANGE_EQUILIBRIUM_MAX_ITERATIONS,
  start?: ArrayLike<number>,
): void {
  const warm = start !== undefined && start[0]! > 0 && start[1]! > 0;
  const shared = warm ? 0 : equilibriumTemperatureFrom((dayInput + lossFactor * nightInput) / (1 + lossFactor), emission);
  let td = warm ? start[0]! : shared;
  let tn = warm ? start[1]! : shared;
  let dd = NaN;
  let dn = NaN;
  for (let i = 0; i < maxIterations; i++) {
    const td3 = td * td * td;
    const tn3 = tn * tn * tn;
    const r0 = dayInput - emission * td3 * td - lossFactor * k * (td - tn);
    const r1 = nightInput - emission * tn3 * tn + k * (td - tn);
    const a = -4 * emission * td3 - lossFactor * k;
    const b = lossFactor * k;
    const c = k;
    const d = -4 * emission * tn3 - k;
    const det = a * d - b * c;
    dd = (-r0 * d + r1 * b) / det;
    dn = (-r1 * a + r0 * c) / det;
    td = Math.max(td + dd, 0.5 * td);
    tn = Math.max(tn + dn, 0.5 * tn);
    if (Math.abs(dd) <= 1e-13 * td && Math.abs(dn) <= 1e-13 * tn) {
      out[0] = td;
      out[1] = tn;
      return;
    }
  }
  throw new CalorbitError(
    "EQUILIBRIUM_NO_CONVERGENCE",
    `the day/night equilibrium with an exchange coefficient did not converge in ${maxIterations} Newton steps (last steps ${dd.toExponential(2)} K day, ${dn.toExponential(2)} K night)`,
  );
}
