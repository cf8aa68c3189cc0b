/**
 * From a thermal case to the model the solver integrates: the ODE system in the eccentric anomaly,
 * the absorbed flux and instantaneous equilibrium of each state, the forcing cycle (one orbit, or
 * q orbits for a p:q spin–orbit resonance), the stiffness and the resolution the statistics need.
 */
import { STEFAN_BOLTZMANN } from "../constants.js";
import { requireNumber } from "../errors.js";
import type { ThermalCase } from "./thermalCase.js";
import { DAYSIDE_FACTOR, DayNightBalance } from "../physics/dayNight.js";
import { LumpedBalance, radiativeTimeSeconds } from "../physics/energyBalance.js";
import type { LumpedRegime } from "../physics/flux.js";
import { bandForcing, lumpedForcing, orbitMeanByQuadrature, pointForcing, type Forcing } from "../physics/forcing.js";
import { solarDaySeconds } from "../physics/geometry.js";
import { checkOrbit, meanMotion } from "../physics/orbit.js";
import type { OdeSystem } from "../solve/system.js";

const TWO_PI = 2 * Math.PI;

export interface ThermalModel {
  system: OdeSystem;
  /** Names of the state components: ["surface"], or ["day", "night"]. */
  stateNames: readonly string[];
  /** Orbits in one forcing cycle. */
  cycleOrbits: number;
  /** False when the spin is not commensurate with the orbit: no exact cycle exists. */
  commensurate: boolean;
  /** dt/dE, s rad⁻¹. */
  timePerAnomaly(E: number): number;
  /** Stellar power absorbed by state i at E, W m⁻² (before exchange; no internal heat). */
  absorbedAt(E: number, state: number): number;
  /** Instantaneous equilibrium of every state at E, K, into `out`. */
  equilibriumAt(E: number, out: Float64Array): void;
  /** εσ, W m⁻² K⁻⁴. */
  emissionCoefficient: number;
  internalFluxWPerM2: number;
  /** Cycle-mean stellar absorbed flux of the whole model (all states together), W m⁻². */
  meanAbsorbedWPerM2: number;
  /** Equilibrium of the cycle-mean absorbed flux of state 0, K (a temperature scale). */
  meanFluxEquilibriumK: number;
  /** τ = C/(4εσT³) at that temperature, s. */
  radiativeTimeSeconds: number;
  /** max |∂f/∂y| over the cycle × the cycle length in E: about the cycle over τ. */
  stiffness: number;
  /** Statistics grid resolution. */
  statsPointsPerOrbit: number;
  /** True when the absorbed flux has corners (sunrise, sunset, polar night): means then split intervals there. */
  forcingHasCorners: boolean;
  /** Mean solar day, s; null when synchronous; undefined for regimes without a spin. */
  solarDaySeconds?: number | null;
}

/**
 * Statistics grid, points per orbit in E. The periastron peak of the integrand has a width in E of
 * about √(2(1 − e)), so the grid grows as that width shrinks (256 points up to e = 0.6, 512 at
 * e = 0.9, 8192 at e = 0.999); a spinning point needs at least 96 points per solar day on top:
 * its temperature has a corner in the second derivative at sunrise and sunset, where the
 * trapezoidal rule drops to third order (measured on points with 0.7–1.8-day solar days: the
 * energy residual is 9e-8 with 48 points per day, 4e-9–8e-9 with 96).
 */
const STATISTICS_POINTS_PER_SOLAR_DAY = 96;

function statisticsPointsPerOrbit(eccentricity: number, solarDaysPerOrbit: number, corners: boolean): number {
  const width = Math.sqrt(2 * (1 - eccentricity));
  const forPeriastron = Math.min(8192, Math.max(256, Math.ceil((512 * Math.sqrt(0.2)) / width / 64) * 64));
  // Sunrise and sunset put corners in the integrands, where the rules lose their order: more points.
  const forCorners = corners ? 2048 : 0;
  return Math.min(1 << 20, Math.max(forPeriastron, forCorners, Math.ceil(STATISTICS_POINTS_PER_SOLAR_DAY * solarDaysPerOrbit)));
}

/** Greatest common divisor of two non-negative integers. */
export function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}

/** Cycle of a spin: q orbits for a p:q resonance (or a period within 1e-9 of one, q ≤ 16); else not commensurate. */
function spinCycle(spinRate: number, n: number, ratio?: { spin: number; orbit: number }): { orbits: number; commensurate: boolean } {
  if (ratio) return { orbits: ratio.orbit / gcd(ratio.spin, ratio.orbit), commensurate: true };
  const r = spinRate / n;
  for (let q = 1; q <= 16; q++) {
    const p = Math.round(r * q);
    if (p > 0 && Math.abs(r * q - p) <= 1e-9 * r * q) return { orbits: q / gcd(p, q), commensurate: true };
  }
  return { orbits: 1, commensurate: false };
}

export function buildThermalModel(thermal: ThermalCase): ThermalModel {
  checkOrbit(thermal.orbit);
  requireNumber("star.luminosity", thermal.star.luminosityW, (l) => l > 0, "L > 0 W");
  const { orbit, surface, star } = thermal;
  const q = surface.internalFluxWPerM2;
  const emission = surface.emissivity * STEFAN_BOLTZMANN;
  const n = meanMotion(orbit);
  const e = orbit.eccentricity;
  // ε is validated by the balances' constructors (checkSurface) before teqOf is first used.
  const teqOf = (absorbed: number): number => Math.sqrt(Math.sqrt((absorbed + q) / emission));

  if (thermal.regime === "daynight") {
    const exchange = thermal.exchange ?? { recirculation: 0, coefficientWPerM2K: 0, weighting: "uniform" as const };
    requireNumber("body.recirculation", exchange.recirculation, (r) => r >= 0 && r <= 1, "0 ≤ ε ≤ 1");
    requireNumber("body.exchangeCoefficient", exchange.coefficientWPerM2K, (k) => k >= 0, "k ≥ 0 W m⁻² K⁻¹");
    const balance = new DayNightBalance(orbit, surface, star.luminosityW, exchange);
    const meanAbsorbable = orbitMeanByQuadrature((E) => balance.absorbable(E), e, 1, 1024);
    const dayMean = meanAbsorbable * DAYSIDE_FACTOR[exchange.weighting];
    const scaleK = teqOf(dayMean);
    const tau = radiativeTimeSeconds(surface.heatCapacityJPerM2K, surface.emissivity, scaleK);
    return {
      system: balance,
      stateNames: ["day", "night"],
      cycleOrbits: 1,
      commensurate: true,
      timePerAnomaly: (E) => balance.timePerAnomaly(E),
      absorbedAt: (E, i) => balance.absorbedOn(E, i as 0 | 1),
      equilibriumAt: (E, out) => balance.equilibrium(E, out),
      emissionCoefficient: emission,
      internalFluxWPerM2: q,
      meanAbsorbedWPerM2: dayMean,
      meanFluxEquilibriumK: scaleK,
      radiativeTimeSeconds: tau,
      stiffness: stiffnessOf(balance, 1, (E, y) => balance.equilibrium(E, y)),
      statsPointsPerOrbit: statisticsPointsPerOrbit(e, 0, false),
      forcingHasCorners: false,
    };
  }

  let forcing: Forcing;
  let cycleOrbits = 1;
  let commensurate = true;
  let solarDay: number | null | undefined;
  let solarDaysPerOrbit = 0;
  const location = thermal.location ?? { latitudeRad: 0, longitudeRad: 0 };
  const spin = thermal.spin ?? { rateRadPerSecond: n, ratio: { spin: 1, orbit: 1 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 };
  if (thermal.regime === "band") {
    forcing = bandForcing(surface.albedo, star.luminosityW, orbit, location.latitudeRad, spin.obliquityRad, spin.equinoxTrueAnomalyRad);
  } else if (thermal.regime === "point") {
    requireNumber("spin.period", spin.rateRadPerSecond, (w) => w > 0, "a spin period > 0 s");
    const cycle = spinCycle(spin.rateRadPerSecond, n, spin.ratio);
    cycleOrbits = cycle.orbits;
    commensurate = cycle.commensurate;
    solarDay = solarDaySeconds(spin.rateRadPerSecond, n);
    solarDaysPerOrbit = solarDay === null ? 0 : orbit.periodSeconds / solarDay;
    forcing = pointForcing(surface.albedo, star.luminosityW, orbit, location.latitudeRad, location.longitudeRad, spin, cycleOrbits);
  } else {
    forcing = lumpedForcing(thermal.regime as LumpedRegime, surface.albedo, star.luminosityW, orbit);
  }
  const balance = new LumpedBalance(orbit, surface, forcing);
  const scaleK = teqOf(forcing.meanAbsorbedWPerM2);
  const corners = thermal.regime === "band" || thermal.regime === "point";
  const model: ThermalModel = {
    system: balance,
    stateNames: ["surface"],
    cycleOrbits,
    commensurate,
    timePerAnomaly: (E) => balance.timePerAnomaly(E),
    absorbedAt: (E) => forcing.absorbedAt(E),
    equilibriumAt: (E, out) => {
      out[0] = teqOf(forcing.absorbedAt(E));
    },
    emissionCoefficient: emission,
    internalFluxWPerM2: q,
    meanAbsorbedWPerM2: forcing.meanAbsorbedWPerM2,
    meanFluxEquilibriumK: scaleK,
    radiativeTimeSeconds: radiativeTimeSeconds(surface.heatCapacityJPerM2K, surface.emissivity, scaleK),
    stiffness: 0,
    statsPointsPerOrbit: statisticsPointsPerOrbit(e, solarDaysPerOrbit, corners),
    forcingHasCorners: corners,
  };
  if (solarDay !== undefined) model.solarDaySeconds = solarDay;
  model.stiffness = stiffnessOf(balance, cycleOrbits, model.equilibriumAt);
  return model;
}

/** max |∂f/∂y| × cycle length, probing the system at its instantaneous equilibrium around the cycle. */
function stiffnessOf(system: OdeSystem, cycleOrbits: number, equilibriumAt: (E: number, out: Float64Array) => void): number {
  const d = system.dimension;
  const y = new Float64Array(d);
  const jac = new Float64Array(d * d);
  let worst = 0;
  const probes = 64 * cycleOrbits;
  for (let k = 0; k < probes; k++) {
    const E = (TWO_PI * cycleOrbits * k) / probes;
    equilibriumAt(E, y);
    for (let i = 0; i < d; i++) if (!(y[i]! > 0)) y[i] = 1; // a dark nightside: probe at 1 K instead of 0
    system.jacobian(E, y, jac);
    let rowMax = 0;
    for (let i = 0; i < d * d; i++) rowMax = Math.max(rowMax, Math.abs(jac[i]!));
    worst = Math.max(worst, rowMax);
  }
  return worst * TWO_PI * cycleOrbits;
}
