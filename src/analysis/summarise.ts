/**
 * The summary of one converged cycle: temperature and equilibrium extremes and time means, the
 * lag of the maximum after periastron, the damping ratio, the radiative time, time in a window,
 * and the energy budget with its residual. Multi-state models (day and night) get one block per
 * state; the top-level numbers describe the first state.
 */
import { wienPeakWavelengthM } from "../physics/flux.js";
import { firstPeriastronSeconds, timeAtEccentric, type Orbit } from "../physics/orbit.js";
import type { SlabModel } from "../model/build.js";
import { explicitTimeMean, hermiteExtremum, positiveModulo, refinedExtremum, timeInWindow, timeMean } from "./cycleStatistics.js";

export interface TemperatureStats {
  minK: number;
  maxK: number;
  /** Time mean over the cycle. */
  meanK: number;
  /** max − min. */
  swingK: number;
}

/** The statistics of one state (a surface, a hemisphere). */
export interface StateSummary {
  temperature: TemperatureStats;
  equilibrium: TemperatureStats;
  /** Time from the start of the run to the temperature maximum / minimum (last cycle), s. */
  timeOfMaxSeconds: number;
  timeOfMinSeconds: number;
  /** Delay of the temperature maximum after the periastron before it, in [0, P); null on a circular orbit or when T does not swing. */
  lagSeconds: number | null;
  /** Temperature swing over equilibrium swing; 1 when the equilibrium does not swing. */
  dampingRatio: number;
  /** Present only when a window is given. */
  timeInRange?: { lowK: number; highK: number; fraction: number; seconds: number };
  /** Time-mean stellar + internal power absorbed by this state, W m⁻² (before any exchange); at the top level of a two-state model, the mean over both. */
  meanAbsorbedWPerM2: number;
  /** Time-mean emitted power εσT⁴, W m⁻². */
  meanEmittedWPerM2: number;
  /** Wien peak wavelengths at T min and T max, m. */
  wienPeakAtMinM: number;
  wienPeakAtMaxM: number;
}

export interface CycleSummary extends StateSummary {
  periodSeconds: number;
  /** Length of the forcing cycle summarised (one orbit, or q orbits for a p:q resonance), s. */
  cycleSeconds: number;
  /** τ = C/(4εσT³) at the equilibrium of the cycle-mean absorbed flux, s. */
  radiativeTimeSeconds: number;
  tauOverPeriod: number;
  /** (absorbed − emitted) / absorbed over the cycle, all states together; ≈ 0 at periodic steady state. */
  energyBalanceResidual: number;
  /** Mean solar day (point regime), s; null for a synchronous spin. */
  solarDaySeconds?: number | null;
  /** A surface of several cells: each cell's statistics, in cell order (the top-level numbers are cell 0's; the energy fields the area-weighted whole). */
  cells?: (StateSummary & { name: string; areaWeight: number })[];
  /** Day/night regime: the two hemispheres. */
  day?: StateSummary;
  night?: StateSummary;
}

export interface SummaryInput {
  model: SlabModel;
  orbit: Orbit;
  windowK?: readonly [number, number];
  /** Uniform grid in E over the summarised cycle, both ends included. */
  statsE: Float64Array;
  /** States at the grid points, component-major: statsY[k·n + i]. */
  statsY: Float64Array;
}

export function cycleSummary(input: SummaryInput): CycleSummary {
  const { model, orbit, statsE, statsY } = input;
  const n = model.system.dimension;
  const count = statsE.length;
  const dtdE = new Float64Array(count);
  const derivatives = new Float64Array(count * n);
  const equilibria = new Float64Array(count * n);
  const dy = new Float64Array(n);
  const eq = new Float64Array(n);
  const y = new Float64Array(n);
  for (let k = 0; k < count; k++) {
    const E = statsE[k]!;
    dtdE[k] = model.timePerAnomaly(E);
    for (let i = 0; i < n; i++) y[i] = statsY[k * n + i]!;
    model.system.derivative(E, y, dy);
    model.equilibriumAt(E, eq);
    for (let i = 0; i < n; i++) {
      derivatives[k * n + i] = dy[i]!;
      equilibria[k * n + i] = eq[i]!;
    }
  }
  const states: StateSummary[] = [];
  // The whole surface: area-weighted means over its cells.
  let totalAbsorbed = 0;
  let totalEmitted = 0;
  for (let i = 0; i < n; i++) {
    const s = stateSummary(input, i, dtdE, derivatives, equilibria);
    states.push(s);
    totalAbsorbed += model.areaWeights[i]! * s.meanAbsorbedWPerM2;
    totalEmitted += model.areaWeights[i]! * s.meanEmittedWPerM2;
  }
  const cycleSeconds = timeAtEccentric(orbit, statsE[count - 1]!) - timeAtEccentric(orbit, statsE[0]!);
  const summary: CycleSummary = {
    periodSeconds: orbit.periodSeconds,
    cycleSeconds,
    ...states[0]!,
    radiativeTimeSeconds: model.radiativeTimeSeconds,
    tauOverPeriod: model.radiativeTimeSeconds / orbit.periodSeconds,
    energyBalanceResidual: (totalAbsorbed - totalEmitted) / totalAbsorbed,
  };
  if (model.solarDaySeconds !== undefined) summary.solarDaySeconds = model.solarDaySeconds;
  if (n > 1) {
    summary.meanAbsorbedWPerM2 = totalAbsorbed;
    summary.meanEmittedWPerM2 = totalEmitted;
    summary.cells = states.map((s, i) => ({ name: model.stateNames[i]!, areaWeight: model.areaWeights[i]!, ...s }));
  }
  if (model.stateNames[0] === "day" && states.length === 2) {
    summary.day = states[0]!;
    summary.night = states[1]!;
  }
  return summary;
}

function stateSummary(
  input: SummaryInput,
  state: number,
  dtdE: Float64Array,
  derivatives: Float64Array,
  equilibria: Float64Array,
): StateSummary {
  const { model, orbit, statsE, statsY } = input;
  const n = model.system.dimension;
  const count = statsE.length;
  const t = new Float64Array(count);
  const d = new Float64Array(count);
  const teq = new Float64Array(count);
  const emitted = new Float64Array(count);
  const absorbed = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    absorbed[k] = model.absorbedAt(statsE[k]!, state);
    const T = statsY[k * n + state]!;
    t[k] = T;
    d[k] = derivatives[k * n + state]!;
    teq[k] = equilibria[k * n + state]!;
    const T2 = T * T;
    emitted[k] = model.emissionCoefficient * T2 * T2;
  }
  const eqBuffer = new Float64Array(n);
  const equilibriumOfState = (E: number): number => {
    model.equilibriumAt(E, eqBuffer);
    return eqBuffer[state]!;
  };
  const tMax = hermiteExtremum(statsE, t, d, 1);
  const tMin = hermiteExtremum(statsE, t, d, -1);
  const eqMax = refinedExtremum(statsE, teq, equilibriumOfState, 1);
  const eqMin = refinedExtremum(statsE, teq, equilibriumOfState, -1);
  const temperature = stats(tMin.value, tMax.value, timeMean(t, dtdE));
  const timePerAnomaly = (E: number) => model.timePerAnomaly(E);
  // Smooth forcing: the trapezoidal rule on the samples converges geometrically; corners need splitting.
  const corners = model.forcingHasCorners;
  const equilibrium = stats(eqMin.value, eqMax.value, corners ? explicitTimeMean(statsE, equilibriumOfState, timePerAnomaly) : timeMean(teq, dtdE));

  const periodSeconds = orbit.periodSeconds;
  const timeOfMaxSeconds = timeAtEccentric(orbit, tMax.x);
  const timeOfMinSeconds = timeAtEccentric(orbit, tMin.x);
  const circular = orbit.eccentricity === 0;
  // No lag on a circular orbit, nor for a state that does not swing (its "maximum" is anywhere).
  const flat = temperature.swingK <= 1e-9 * temperature.maxK;
  const lagSeconds = circular || flat ? null : positiveModulo(timeOfMaxSeconds - firstPeriastronSeconds(orbit), periodSeconds);
  const dampingRatio = equilibrium.swingK <= 1e-12 * equilibrium.maxK ? 1 : temperature.swingK / equilibrium.swingK;
  const summary: StateSummary = {
    temperature,
    equilibrium,
    timeOfMaxSeconds,
    timeOfMinSeconds,
    lagSeconds,
    dampingRatio,
    meanAbsorbedWPerM2:
      (corners ? explicitTimeMean(statsE, (E) => model.absorbedAt(E, state), timePerAnomaly) : timeMean(absorbed, dtdE)) + model.internalFluxWPerM2,
    meanEmittedWPerM2: timeMean(emitted, dtdE),
    wienPeakAtMinM: wienPeakWavelengthM(temperature.minK),
    wienPeakAtMaxM: wienPeakWavelengthM(temperature.maxK),
  };
  if (input.windowK) {
    const [lowK, highK] = input.windowK;
    const cycleSeconds = timeAtEccentric(orbit, statsE[count - 1]!) - timeAtEccentric(orbit, statsE[0]!);
    const seconds = timeInWindow(statsE, t, d, lowK, highK, (E) => timeAtEccentric(orbit, E));
    summary.timeInRange = { lowK, highK, fraction: seconds / cycleSeconds, seconds };
  }
  return summary;
}

function stats(minK: number, maxK: number, meanK: number): TemperatureStats {
  return { minK, maxK, meanK, swingK: maxK - minK };
}
