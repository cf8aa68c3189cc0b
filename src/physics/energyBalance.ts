/**
 * Lumped energy balance of a surface layer with areal heat capacity C:
 *   C dT/dt = F(t) + q − εσT⁴
 * with F the absorbed stellar flux, q an internal heat flux and ε the emissivity (common practice;
 * e.g. Pierrehumbert, Principles of Planetary Climate, 2010, ch. 7, from memory).
 * Written in the eccentric anomaly E, where dt/dE = (1 − e cos E)/n (Kepler's equation
 * differentiated), so the distance is explicit and no Kepler solve enters the right-hand side.
 */
import { STEFAN_BOLTZMANN } from "../constants.js";
import { requireNumber } from "../errors.js";
import type { DenseSamples, OdeSystem } from "../solve/system.js";
import { checkIncidenceAlbedo, type IncidenceAlbedo } from "./albedo.js";
import type { Forcing } from "./forcing.js";
import { meanMotion, type Orbit } from "./orbit.js";
import { UnlitCooling } from "./unlitCooling.js";

/** Points at which an arc's forcing is probed for darkness before its closed-form flow is used. */
const DARK_PROBES = 32;

export interface SurfaceProperties {
  /** Bond albedo A, 0 ≤ A ≤ 1 (enters through the forcing); with `albedoIncidence`, the albedo A₀ at normal incidence. */
  albedo: number;
  /**
   * Optional rise of the albedo with the stellar incidence angle θ, A(θ) = A₀ + a (θ/45°)³ + b (θ/90°)⁸
   * (a, b dimensionless; see ./albedo.ts). Only a surface point has one incidence angle: the point
   * and substellar (θ = 0) regimes take it.
   */
  albedoIncidence?: IncidenceAlbedo;
  /** Thermal emissivity ε, 0 < ε ≤ 1. */
  emissivity: number;
  /** Areal heat capacity C, J m⁻² K⁻¹ (> 0). */
  heatCapacityJPerM2K: number;
  /** Internal (geothermal, tidal) heat flux q, W m⁻² (≥ 0). */
  internalFluxWPerM2: number;
}

export function checkSurface(s: SurfaceProperties): void {
  requireNumber("body.albedo", s.albedo, (a) => a >= 0 && a <= 1, "0 ≤ A ≤ 1");
  if (s.albedoIncidence) checkIncidenceAlbedo(s.albedo, s.albedoIncidence);
  requireNumber("body.emissivity", s.emissivity, (e) => e > 0 && e <= 1, "0 < ε ≤ 1");
  requireNumber("body.heatCapacity", s.heatCapacityJPerM2K, (c) => c > 0, "C > 0 J m⁻² K⁻¹");
  requireNumber("body.internalFlux", s.internalFluxWPerM2, (q) => q >= 0, "q ≥ 0 W m⁻²");
}

/** Radiative relaxation time τ = C / (4εσT³) at temperature T, s: the e-folding time of small departures. */
export function radiativeTimeSeconds(heatCapacityJPerM2K: number, emissivity: number, temperatureK: number): number {
  return heatCapacityJPerM2K / (4 * emissivity * STEFAN_BOLTZMANN * temperatureK ** 3);
}

/** One lumped surface; state y = [T] in K, independent variable E in rad. */
export class LumpedBalance implements OdeSystem {
  readonly dimension = 1;
  private readonly eccentricity: number;
  private readonly inverseMeanMotion: number;
  private readonly emissionCoefficient: number;
  private readonly inverseHeatCapacity: number;
  private readonly internalFlux: number;
  private readonly unlit: UnlitCooling;

  constructor(
    readonly orbit: Orbit,
    readonly surface: SurfaceProperties,
    readonly forcing: Forcing,
  ) {
    checkSurface(surface);
    this.eccentricity = orbit.eccentricity;
    this.inverseMeanMotion = 1 / meanMotion(orbit);
    this.emissionCoefficient = surface.emissivity * STEFAN_BOLTZMANN;
    this.inverseHeatCapacity = 1 / surface.heatCapacityJPerM2K;
    this.internalFlux = surface.internalFluxWPerM2;
    this.unlit = new UnlitCooling(this.emissionCoefficient, surface.heatCapacityJPerM2K, surface.internalFluxWPerM2);
  }

  /** Time from periastron passage at eccentric anomaly E, s (Kepler's equation, explicit in E). */
  private timeAt(eccentricAnomalyRad: number): number {
    return (eccentricAnomalyRad - this.eccentricity * Math.sin(eccentricAnomalyRad)) * this.inverseMeanMotion;
  }

  /**
   * Across an arc with no starlight (a night between a sunset and a sunrise that the caller found)
   * the temperature is ./unlitCooling.ts's closed form of the time elapsed: no steps. The forcing
   * is probed at 32 points inside the arc; any light there and the arc is left to the integrator.
   */
  exactArc(x0: number, x1: number, y: Float64Array, samples?: DenseSamples): boolean {
    const start = y[0]!;
    if (!(start > this.unlit.floorK * 1.001) || !(x1 > x0)) return false;
    for (let j = 0; j < DARK_PROBES; j++) {
      if (this.forcing.absorbedAt(x0 + ((j + 0.5) / DARK_PROBES) * (x1 - x0)) !== 0) return false;
    }
    const t0 = this.timeAt(x0);
    const g0 = this.unlit.invariant(start);
    const rate = this.unlit.invariantRate;
    if (samples) {
      const { xs, ys, components } = samples;
      for (let k = 0; k < xs.length; k++) {
        const x = Math.min(xs[k]!, x1); // the last arc's samples may lie a rounding hair past its end
        ys[k * components] = x <= x0 ? start : this.unlit.temperatureAt(g0 + rate * (this.timeAt(x) - t0), start);
      }
    }
    y[0] = this.unlit.temperatureAt(g0 + rate * (this.timeAt(x1) - t0), start);
    return true;
  }

  /** ∂T(x)/∂T(x0) across an arc that `exactArc` took, from the temperatures at its ends. */
  exactArcSlope(startK: number, endK: number): number {
    return this.unlit.flowSlope(startK, endK);
  }

  /** dt/dE = (1 − e cos E)/n, s rad⁻¹. */
  timePerAnomaly(eccentricAnomalyRad: number): number {
    return (1 - this.eccentricity * Math.cos(eccentricAnomalyRad)) * this.inverseMeanMotion;
  }

  derivative(x: number, y: ArrayLike<number>, out: Float64Array): void {
    const t = y[0]!;
    const t2 = t * t;
    const net = this.forcing.absorbedAt(x) + this.internalFlux - this.emissionCoefficient * t2 * t2;
    out[0] = this.timePerAnomaly(x) * net * this.inverseHeatCapacity;
  }

  jacobian(x: number, y: ArrayLike<number>, out: Float64Array): void {
    const t = y[0]!;
    out[0] = -this.timePerAnomaly(x) * 4 * this.emissionCoefficient * t * t * t * this.inverseHeatCapacity;
  }

  derivativeAndJacobian(x: number, y: ArrayLike<number>, out: Float64Array, jacobianOut: Float64Array): void {
    const t = y[0]!;
    const t3 = t * t * t;
    const perHeatCapacity = this.timePerAnomaly(x) * this.inverseHeatCapacity;
    out[0] = perHeatCapacity * (this.forcing.absorbedAt(x) + this.internalFlux - this.emissionCoefficient * t3 * t);
    jacobianOut[0] = -perHeatCapacity * 4 * this.emissionCoefficient * t3;
  }
}
