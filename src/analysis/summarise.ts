/**
 * The summary of one converged cycle: temperature and equilibrium extremes and time means, the
 * lag of the maximum after periastron, the damping ratio, the radiative time, time in a window,
 * and the energy budget with its residual.
 */
import { STEFAN_BOLTZMANN } from "../constants.js";
import type { LumpedBalance } from "../physics/energyBalance.js";
import { radiativeTimeSeconds } from "../physics/energyBalance.js";
import { wienPeakWavelengthM } from "../physics/flux.js";
import type { Forcing } from "../physics/forcing.js";
import { firstPeriastronSeconds, timeAtEccentric } from "../physics/orbit.js";
import type { ThermalCase } from "../model.js";
import { hermiteExtremum, refinedExtremum, timeInWindow, timeMean } from "./cycleStatistics.js";

export interface TemperatureStats {
  minK: number;
  maxK: number;
  /** Time mean over the cycle. */
  meanK: number;
  /** max − min. */
  swingK: number;
}

export interface CycleSummary {
  periodSeconds: number;
  temperature: TemperatureStats;
  equilibrium: TemperatureStats;
  /** Time from the start of the run to the temperature maximum / minimum (last cycle), s. */
  timeOfMaxSeconds: number;
  timeOfMinSeconds: number;
  /** Delay of the temperature maximum after the periastron before it, in [0, P); null on a circular orbit. */
  lagSeconds: number | null;
  /** Temperature swing over equilibrium swing; 1 on a circular orbit. */
  dampingRatio: number;
  /** τ = C/(4εσT³) at the equilibrium temperature of the orbit-mean absorbed flux, s. */
  radiativeTimeSeconds: number;
  tauOverPeriod: number;
  /** Present only when a window is given. */
  timeInRange?: { lowK: number; highK: number; fraction: number; seconds: number };
  /** Time-mean absorbed power (stellar + internal), W m⁻². */
  meanAbsorbedWPerM2: number;
  /** Time-mean emitted power εσT⁴, W m⁻². */
  meanEmittedWPerM2: number;
  /** (absorbed − emitted) / absorbed over the cycle; ≈ 0 at periodic steady state. */
  energyBalanceResidual: number;
  /** Wien peak wavelengths at T min and T max, m. */
  wienPeakAtMinM: number;
  wienPeakAtMaxM: number;
}

export interface SummaryInput {
  thermal: ThermalCase;
  balance: LumpedBalance;
  forcing: Forcing;
  equilibriumAt: (E: number) => number;
  /** Uniform grid in E over one orbit, both ends included. */
  statsE: Float64Array;
  statsT: Float64Array;
  meanEquilibriumOfMeanFluxK: number;
}

export function cycleSummary(input: SummaryInput): CycleSummary {
  const { thermal, balance, forcing, statsE, statsT } = input;
  const { orbit, surface } = thermal;
  const count = statsE.length;
  const dtdE = new Float64Array(count);
  const dTdE = new Float64Array(count);
  const teq = new Float64Array(count);
  const absorbed = new Float64Array(count);
  const emitted = new Float64Array(count);
  const y = new Float64Array(1);
  const dy = new Float64Array(1);
  const emission = surface.emissivity * STEFAN_BOLTZMANN;
  for (let k = 0; k < count; k++) {
    const E = statsE[k]!;
    dtdE[k] = balance.timePerAnomaly(E);
    y[0] = statsT[k]!;
    balance.derivative(E, y, dy);
    dTdE[k] = dy[0]!;
    teq[k] = input.equilibriumAt(E);
    absorbed[k] = forcing.absorbedAt(E) + surface.internalFluxWPerM2;
    emitted[k] = emission * statsT[k]! ** 4;
  }

  const tMax = hermiteExtremum(statsE, statsT, dTdE, 1);
  const tMin = hermiteExtremum(statsE, statsT, dTdE, -1);
  const eqMax = refinedExtremum(statsE, teq, input.equilibriumAt, 1);
  const eqMin = refinedExtremum(statsE, teq, input.equilibriumAt, -1);
  const temperature = stats(tMin.value, tMax.value, timeMean(statsT, dtdE));
  const equilibrium = stats(eqMin.value, eqMax.value, timeMean(teq, dtdE));

  const periodSeconds = orbit.periodSeconds;
  const timeOfMaxSeconds = timeAtEccentric(orbit, tMax.x);
  const timeOfMinSeconds = timeAtEccentric(orbit, tMin.x);
  const circular = orbit.eccentricity === 0;
  const periastron = firstPeriastronSeconds(orbit);
  const lagSeconds = circular ? null : positiveModulo(timeOfMaxSeconds - periastron, periodSeconds);
  const dampingRatio = circular || equilibrium.swingK === 0 ? 1 : temperature.swingK / equilibrium.swingK;

  const meanAbsorbed = timeMean(absorbed, dtdE);
  const meanEmitted = timeMean(emitted, dtdE);
  const tau = radiativeTimeSeconds(surface.heatCapacityJPerM2K, surface.emissivity, input.meanEquilibriumOfMeanFluxK);

  const summary: CycleSummary = {
    periodSeconds,
    temperature,
    equilibrium,
    timeOfMaxSeconds,
    timeOfMinSeconds,
    lagSeconds,
    dampingRatio,
    radiativeTimeSeconds: tau,
    tauOverPeriod: tau / periodSeconds,
    meanAbsorbedWPerM2: meanAbsorbed,
    meanEmittedWPerM2: meanEmitted,
    energyBalanceResidual: (meanAbsorbed - meanEmitted) / meanAbsorbed,
    wienPeakAtMinM: wienPeakWavelengthM(temperature.minK),
    wienPeakAtMaxM: wienPeakWavelengthM(temperature.maxK),
  };
  if (thermal.windowK) {
    const [lowK, highK] = thermal.windowK;
    const cycleSeconds = timeAtEccentric(orbit, statsE[count - 1]!) - timeAtEccentric(orbit, statsE[0]!);
    const seconds = timeInWindow(statsE, statsT, dTdE, lowK, highK, (E) => timeAtEccentric(orbit, E));
    summary.timeInRange = { lowK, highK, fraction: seconds / cycleSeconds, seconds };
  }
  return summary;
}

function stats(minK: number, maxK: number, meanK: number): TemperatureStats {
  return { minK, maxK, meanK, swingK: maxK - minK };
}

function positiveModulo(x: number, m: number): number {
  const r = x - m * Math.floor(x / m);
  return r >= m ? r - m : r;
}
