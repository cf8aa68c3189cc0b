/**
 * The summary of one converged cycle: temperature and equilibrium extremes and time means, the
 * lag of the maximum after periastron, the damping ratio, the radiative time, time in a window,
 * and the energy budget with its residual. Multi-state models (day and night) get one block per
 * state; the top-level numbers describe the first state.
 */
import { wienPeakWavelengthM } from "../physics/flux.js";
import { firstPeriastronSeconds, timeAtEccentric, type Orbit } from "../physics/orbit.js";
import type { ThermalModel } from "../model/build.js";
import { exchangeIsBudget } from "../model/exchange.js";
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
  /** Wien peak wavelengths at T min and T max, m; null at 0 K (a cell nothing heats emits nothing). */
  wienPeakAtMinM: number | null;
  wienPeakAtMaxM: number | null;
}

/** Why a summary number is null (or what it is not), keyed by the field's name. */
export type SummaryNotes = Partial<Record<"tauOverPeriod" | "energyBalanceResidual" | "dampingRatio" | "meanAbsorbedWPerM2", string>>;

/** One layer of a conduction column over the cycle. */
export interface DepthRow {
  depthM: number;
  minK: number;
  maxK: number;
  meanK: number;
}

export interface CycleSummary extends Omit<StateSummary, "dampingRatio" | "meanAbsorbedWPerM2" | "meanEmittedWPerM2"> {
  periodSeconds: number;
  /** Length of the forcing cycle summarised (one orbit, or q orbits for a p:q resonance), s. */
  cycleSeconds: number;
  /** Temperature swing over equilibrium swing (1 when the equilibrium does not swing); null for a transient, whose swing includes its drift. */
  dampingRatio: number | null;
  /** τ = C/(4εσT³) at the equilibrium of the cycle-mean absorbed flux, s; null for a column (no single τ: see its skin depths). */
  radiativeTimeSeconds: number | null;
  tauOverPeriod: number | null;
  /** Time-mean stellar + internal power absorbed by the whole surface (area-weighted), W m⁻²; null when the cells are not an energy budget. */
  meanAbsorbedWPerM2: number | null;
  /** Time-mean emitted power of the whole surface (area-weighted), W m⁻²; null likewise. */
  meanEmittedWPerM2: number | null;
  /** (absorbed − emitted) / absorbed over the cycle, all cells together; ≈ 0 at a periodic steady state; null when it is not a budget (a transient, a flux-weighted dayside). */
  energyBalanceResidual: number | null;
  /** Why a number above is null. */
  notes?: SummaryNotes;
  /** A spin not commensurate with the orbit: the orbits summarised (the beat of spin and orbit) and the lowest and highest orbit-mean temperature among them. */
  seasonal?: { orbits: number; orbitMeanK: { minK: number; maxK: number } };
  /** Mean solar day (point regime), s; null for a synchronous spin. */
  solarDaySeconds?: number | null;
  /** A surface of several cells: each cell's statistics, in cell order (the top-level numbers are cell 0's; the energy fields the area-weighted whole). */
  cells?: (StateSummary & { name: string; areaWeight: number })[];
  /** Day/night regime: the two hemispheres. */
  day?: StateSummary;
  night?: StateSummary;
  /** Conduction column only: thermal inertia at the surface (J m⁻² K⁻¹ s⁻½), skin depths, depth profile, mean of the deepest layer. */
  thermalInertiaSurface?: number;
  skinDepths?: { diurnalM: number | null; orbitalM: number };
  depthProfile?: DepthRow[];
  deepMeanK?: number;
}

export interface SummaryInput {
  model: ThermalModel;
  orbit: Orbit;
  windowK?: readonly [number, number];
  /** Uniform grid in E over the summarised cycle, both ends included. */
  statsE: Float64Array;
  /** States at the grid points, component-major: statsY[k·n + i]. */
  statsY: Float64Array;
  /** dT/dE at the grid points, same layout, K rad⁻¹ (for the refined extremes and the window crossings). */
  statsDerivative: Float64Array;
  mode: "periodic" | "seasonal" | "transient";
  /** Per state, a minimum between the grid's points known from elsewhere (a column's sunrise), or null. */
  cornerMinima?: ({ E: number; K: number } | null)[];
  /** A column's own budget over the cycle (its scheme's), used instead of the surface samples'. */
  budget?: { meanAbsorbedWPerM2: number; meanEmittedWPerM2: number; residual: number };
}

export function cycleSummary(input: SummaryInput): CycleSummary {
  const { model, orbit, statsE, statsDerivative } = input;
  const n = model.stateNames.length;
  const count = statsE.length;
  const dtdE = new Float64Array(count);
  const equilibria = new Float64Array(count * n);
  // The forcing at the statistics points, once per cell: the equilibria, the absorbed means and the
  // corner-split means below all read it (each evaluated it again before).
  const absorbedAll = new Float64Array(count * n);
  const eq = new Float64Array(n);
  const ofAbsorbed = model.equilibriumOfAbsorbed;
  for (let k = 0; k < count; k++) {
    const E = statsE[k]!;
    dtdE[k] = model.timePerAnomaly(E);
    for (let i = 0; i < n; i++) absorbedAll[k * n + i] = model.absorbedAt(E, i);
    if (ofAbsorbed) {
      for (let i = 0; i < n; i++) equilibria[k * n + i] = ofAbsorbed(absorbedAll[k * n + i]!);
    } else {
      model.equilibriumAt(E, eq);
      for (let i = 0; i < n; i++) equilibria[k * n + i] = eq[i]!;
    }
  }
  const derivatives = statsDerivative;
  const states: StateSummary[] = [];
  // The whole surface: area-weighted means over its cells.
  let totalAbsorbed = 0;
  let totalEmitted = 0;
  for (let i = 0; i < n; i++) {
    const s = stateSummary(input, i, dtdE, derivatives, equilibria, absorbedAll);
    states.push(s);
    totalAbsorbed += model.areaWeights[i]! * s.meanAbsorbedWPerM2;
    totalEmitted += model.areaWeights[i]! * s.meanEmittedWPerM2;
  }
  const cycleSeconds = timeAtEccentric(orbit, statsE[count - 1]!) - timeAtEccentric(orbit, statsE[0]!);
  const notes: SummaryNotes = {};
  const tau = model.radiativeTimeSeconds;
  if (tau === null) notes.tauOverPeriod = "a conduction column has no single radiative time: see skinDepths";
  let meanAbsorbed: number | null = input.budget?.meanAbsorbedWPerM2 ?? totalAbsorbed;
  let meanEmitted: number | null = input.budget?.meanEmittedWPerM2 ?? totalEmitted;
  let residual: number | null = input.budget?.residual ?? (totalAbsorbed - totalEmitted) / totalAbsorbed;
  if (!exchangeIsBudget(model.exchange)) {
    meanAbsorbed = null;
    meanEmitted = null;
    residual = null;
    const note = "the flux-weighted dayside (f = 2/3) is the brightness seen at full phase, not an energy budget: see day and night";
    notes.meanAbsorbedWPerM2 = note;
    notes.energyBalanceResidual = note;
  }
  let dampingRatio: number | null = states[0]!.dampingRatio;
  if (input.mode === "transient") {
    residual = null;
    dampingRatio = null;
    notes.energyBalanceResidual = "a transient stores or releases heat: absorbed − emitted over its last orbit is the storage change, not a balance residual";
    notes.dampingRatio = "a transient's swing includes its drift toward the periodic state";
  }
  const summary: CycleSummary = {
    periodSeconds: orbit.periodSeconds,
    cycleSeconds,
    ...states[0]!,
    dampingRatio,
    radiativeTimeSeconds: tau,
    tauOverPeriod: tau === null ? null : tau / orbit.periodSeconds,
    meanAbsorbedWPerM2: meanAbsorbed,
    meanEmittedWPerM2: meanEmitted,
    energyBalanceResidual: residual,
  };
  if (Object.keys(notes).length > 0) summary.notes = notes;
  if (model.solarDaySeconds !== undefined) summary.solarDaySeconds = model.solarDaySeconds;
  if (n > 1) summary.cells = states.map((s, i) => ({ name: model.stateNames[i]!, areaWeight: model.areaWeights[i]!, ...s }));
  if (model.exchange.kind === "dayNight" && states.length === 2) {
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
  absorbedAll: Float64Array,
): StateSummary {
  const { model, orbit, statsE, statsY } = input;
  const n = model.stateNames.length;
  const count = statsE.length;
  const t = new Float64Array(count);
  const d = new Float64Array(count);
  const teq = new Float64Array(count);
  const emitted = new Float64Array(count);
  const absorbed = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    absorbed[k] = absorbedAll[k * n + state]!;
    const T = statsY[k * n + state]!;
    t[k] = T;
    d[k] = derivatives[k * n + state]!;
    teq[k] = equilibria[k * n + state]!;
    const T2 = T * T;
    emitted[k] = model.emissionCoefficient * T2 * T2;
  }
  const eqBuffer = new Float64Array(n);
  const ofAbsorbed = model.equilibriumOfAbsorbed;
  const equilibriumOfState = ofAbsorbed
    ? (E: number): number => ofAbsorbed(model.absorbedAt(E, state))
    : (E: number): number => {
        model.equilibriumAt(E, eqBuffer);
        return eqBuffer[state]!;
      };
  const tMax = hermiteExtremum(statsE, t, d, 1);
  const gridMin = hermiteExtremum(statsE, t, d, -1);
  const corner = input.cornerMinima?.[state] ?? null;
  const tMin = corner !== null && corner.K < gridMin.value ? { x: corner.E, value: corner.K } : gridMin;
  const eqMax = refinedExtremum(statsE, teq, equilibriumOfState, 1);
  const eqMin = refinedExtremum(statsE, teq, equilibriumOfState, -1);
  const temperature = stats(tMin.value, tMax.value, timeMean(t, dtdE));
  const timePerAnomaly = (E: number) => model.timePerAnomaly(E);
  // Smooth forcing: the trapezoidal rule on the samples converges geometrically; corners need splitting.
  const corners = model.forcingHasCorners;
  const equilibrium = stats(eqMin.value, eqMax.value, corners ? explicitTimeMean(statsE, equilibriumOfState, timePerAnomaly, { values: teq, timePerAnomaly: dtdE }) : timeMean(teq, dtdE));

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
      (corners ? explicitTimeMean(statsE, (E) => model.absorbedAt(E, state), timePerAnomaly, { values: absorbed, timePerAnomaly: dtdE }) : timeMean(absorbed, dtdE)) + model.internalFluxWPerM2,
    meanEmittedWPerM2: timeMean(emitted, dtdE),
    wienPeakAtMinM: temperature.minK > 0 ? wienPeakWavelengthM(temperature.minK) : null,
    wienPeakAtMaxM: temperature.maxK > 0 ? wienPeakWavelengthM(temperature.maxK) : null,
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
