/**
 * A surface that is the top of a conduction column instead of a lumped slab: the regime's forcing
 * (absorbed flux at the surface) drives the column to its periodic steady state, and the result is
 * summarised like a lumped run, plus the depth profile and the skin depths. Pure computation.
 */
import { CalorbitError, requireNumber } from "../errors.js";
import type { ColumnSpec, ThermalCase } from "../model/thermalCase.js";
import { buildColumnGrid, skinDepthM, specificHeatAt, thermalInertia } from "../physics/column.js";
import { STEFAN_BOLTZMANN } from "../constants.js";
import { equilibriumTemperatureFrom, wienPeakWavelengthM } from "../physics/flux.js";
import { eccentricAnomaly } from "../physics/kepler.js";
import { anomaliesUniformInTime, orbitColumns } from "../analysis/orbitSampling.js";
import { firstPeriastronSeconds, timeAtEccentric } from "../physics/orbit.js";
import { solveColumnPeriodic } from "../solve/columnSolver.js";
import { buildThermalModel } from "../model/build.js";
import type { TemperatureStats } from "../analysis/summarise.js";
import { positiveModulo } from "../analysis/cycleStatistics.js";

const TWO_PI = 2 * Math.PI;
/** A column's default tolerance on its periodicity and energy closure (its steps are second order). */
export const DEFAULT_COLUMN_TOLERANCE = 1e-6;

/**
 * The column tolerance for a command's tolerance setting: the column default when the lumped
 * default (1e-8) was left alone, else what was asked, no finer than 1e-12.
 */
export function columnToleranceFor(requested: number, lumpedDefault: number): number {
  return requested === lumpedDefault ? DEFAULT_COLUMN_TOLERANCE : Math.max(requested, 1e-12);
}

export interface DepthRow {
  depthM: number;
  minK: number;
  maxK: number;
  meanK: number;
}

export interface ColumnSummary {
  periodSeconds: number;
  cycleSeconds: number;
  temperature: TemperatureStats;
  equilibrium: TemperatureStats;
  timeOfMaxSeconds: number;
  lagSeconds: number | null;
  dampingRatio: number;
  timeInRange?: { lowK: number; highK: number; fraction: number; seconds: number };
  meanAbsorbedWPerM2: number;
  meanEmittedWPerM2: number;
  energyBalanceResidual: number;
  wienPeakAtMinM: number;
  wienPeakAtMaxM: number;
  solarDaySeconds?: number | null;
  thermalInertiaSurface: number;
  skinDepths: { diurnalM: number | null; orbitalM: number };
  depthProfile: DepthRow[];
}

export interface ColumnSimulation {
  summary: ColumnSummary;
  series: {
    timeSeconds: Float64Array;
    distanceM: Float64Array;
    trueAnomalyRad: Float64Array;
    meanAnomalyRad: Float64Array;
    stellarFluxWPerM2: Float64Array;
    absorbedWPerM2: Float64Array;
    temperatureK: Float64Array;
    equilibriumK: Float64Array;
    /** Temperature series at the requested depths, same length as the time axis. */
    depths: { depthM: number; temperatureK: Float64Array }[];
  };
  /** Layer temperatures over the cycle, thinned to at most 240 times: temperatureK[t][layer]. */
  heatMap: { timesSeconds: number[]; temperatureK: number[][] };
  solver: { mode: "periodic"; layers: number; stepsPerCycle: number; cycles: number; newtonIterations: number; periodicityResidual: number; requestedTolerance: number };
}

export type { ColumnSpec };

export function simulateColumn(thermal: ThermalCase, column: ColumnSpec, options: { relativeTolerance?: number; samples?: number } = {}): ColumnSimulation {
  const rtol = options.relativeTolerance ?? DEFAULT_COLUMN_TOLERANCE;
  requireNumber("tolerance", rtol, (t) => t >= 1e-12 && t <= 1e-2, "1e-12 ≤ tolerance ≤ 1e-2");
  if (thermal.regime === "daynight") {
    throw new CalorbitError("INVALID_ARGUMENT", "a conduction column goes with one surface", [
      { path: "regime", given: "daynight", allowed: "global, dayside, substellar, band or point with body.column" },
    ]);
  }
  const model = buildThermalModel(thermal);
  if (!model.commensurate) {
    throw new CalorbitError("INVALID_ARGUMENT", "a conduction column needs an exact forcing cycle", [
      { path: "spin", given: "a spin not commensurate with the orbit", allowed: "spin.orbitRatio (p:q), or a spin period that is a p:q resonance" },
    ]);
  }
  const { orbit } = thermal;
  const p = column.properties;
  const eps = thermal.surface.emissivity;
  const tRef = model.meanFluxEquilibriumK;
  const cRef = specificHeatAt(p, tRef);
  const cycleSeconds = orbit.periodSeconds * model.cycleOrbits;
  const solarDay = model.solarDaySeconds ?? null;
  const shortest = solarDay !== null && solarDay < cycleSeconds ? solarDay : orbit.periodSeconds;
  const diurnalM = solarDay !== null ? skinDepthM(p.conductivitySurface, p.densitySurface, cRef, solarDay) : null;
  const shortSkin = skinDepthM(p.conductivitySurface, p.densitySurface, cRef, shortest);
  const orbitalM = skinDepthM(p.conductivityDeep, p.densityDeep, cRef, cycleSeconds);
  const grid = buildColumnGrid(p, shortSkin, orbitalM, column.grid);
  const stepsPerCycle = Math.min(2_000_000, Math.max(64, Math.ceil(column.grid.stepsPerShortestPeriod * (cycleSeconds / shortest))));
  const startE = eccentricAnomaly(orbit.meanAnomalyAtStartRad, orbit.eccentricity);
  const result = solveColumnPeriodic(
    {
      properties: p,
      grid,
      emissivity: eps,
      interiorFluxWPerM2: column.interiorFluxWPerM2,
      absorbedAt: (E) => model.absorbedAt(E, 0),
      timeAt: (E) => timeAtEccentric(orbit, E),
      startE,
      cycleLength: TWO_PI * model.cycleOrbits,
      stepsPerCycle,
      initialK: tRef,
      shortSkinDepthM: shortSkin,
    },
    rtol,
  );

  // Statistics on the step grid (uniform in E, t(E) explicit).
  const steps = result.stepE.length;
  const times = Float64Array.from(result.stepE, (E) => timeAtEccentric(orbit, E));
  const q = column.interiorFluxWPerM2;
  const emission = eps * STEFAN_BOLTZMANN;
  const teq = Float64Array.from(result.stepE, (E) => equilibriumTemperatureFrom(model.absorbedAt(E, 0) + q, emission));
  const stats = (values: Float64Array): { s: TemperatureStats; argMax: number } => {
    let lo = Infinity;
    let hi = -Infinity;
    let argMax = 0;
    let sum = 0;
    for (let k = 0; k < steps; k++) {
      const v = values[k]!;
      if (v < lo) lo = v;
      if (v > hi) {
        hi = v;
        argMax = k;
      }
      if (k > 0) sum += 0.5 * (v + values[k - 1]!) * (times[k]! - times[k - 1]!);
    }
    return { s: { minK: lo, maxK: hi, meanK: sum / (times[steps - 1]! - times[0]!), swingK: hi - lo }, argMax };
  };
  const surface = stats(result.surfaceK);
  const equilibrium = stats(teq).s;
  const timeOfMaxSeconds = times[surface.argMax]!;
  const lagSeconds =
    orbit.eccentricity === 0 ? null : positiveModulo(timeOfMaxSeconds - firstPeriastronSeconds(orbit), orbit.periodSeconds);
  const depthProfile: DepthRow[] = Array.from(grid.centreM, (z, i) => ({
    depthM: z,
    minK: result.profileMinK[i]!,
    maxK: result.profileMaxK[i]!,
    meanK: result.profileMeanK[i]!,
  }));
  const summary: ColumnSummary = {
    periodSeconds: orbit.periodSeconds,
    cycleSeconds,
    temperature: surface.s,
    equilibrium,
    timeOfMaxSeconds,
    lagSeconds,
    dampingRatio: equilibrium.swingK > 0 ? surface.s.swingK / equilibrium.swingK : 1,
    meanAbsorbedWPerM2: result.meanAbsorbedWPerM2 + q,
    meanEmittedWPerM2: result.meanEmittedWPerM2,
    energyBalanceResidual: result.energyBalanceResidual,
    wienPeakAtMinM: wienPeakWavelengthM(surface.s.minK),
    wienPeakAtMaxM: wienPeakWavelengthM(surface.s.maxK),
    thermalInertiaSurface: thermalInertia(p.conductivitySurface, p.densitySurface, cRef),
    skinDepths: { diurnalM, orbitalM },
    depthProfile,
  };
  if (model.solarDaySeconds !== undefined) summary.solarDaySeconds = model.solarDaySeconds;
  if (thermal.windowK) {
    const [lowK, highK] = thermal.windowK;
    let inside = 0;
    for (let k = 1; k < steps; k++) {
      const a = result.surfaceK[k - 1]!;
      const b = result.surfaceK[k]!;
      const dt = times[k]! - times[k - 1]!;
      inside += dt * fractionInside(a, b, lowK, highK);
    }
    summary.timeInRange = { lowK, highK, fraction: inside / cycleSeconds, seconds: inside };
  }

  // Output series, uniform in time, interpolated linearly from the fine step grid.
  const count = options.samples ?? 1000;
  const n = grid.thicknessM.length;
  const outputE = anomaliesUniformInTime(orbit, startE, model.cycleOrbits, count);
  const series: ColumnSimulation["series"] = {
    ...orbitColumns(orbit, thermal.star.luminosityW, outputE),
    absorbedWPerM2: new Float64Array(count),
    temperatureK: new Float64Array(count),
    equilibriumK: new Float64Array(count),
    depths: column.outputDepthsM.map((depthM) => ({ depthM, temperatureK: new Float64Array(count) })),
  };
  let k = 0;
  for (let j = 0; j < count; j++) {
    const t = series.timeSeconds[j]!;
    const E = outputE[j]!;
    while (k < steps - 2 && times[k + 1]! - times[0]! < t) k++;
    const w = Math.min(1, Math.max(0, (t - (times[k]! - times[0]!)) / (times[k + 1]! - times[k]!)));
    series.absorbedWPerM2[j] = model.absorbedAt(E, 0);
    series.temperatureK[j] = (1 - w) * result.surfaceK[k]! + w * result.surfaceK[k + 1]!;
    series.equilibriumK[j] = (1 - w) * teq[k]! + w * teq[k + 1]!;
    for (const d of series.depths) {
      // Linear in depth between layer centres (the surface node above the first centre).
      const layer = (step: number, z: number): number => {
        if (z <= grid.centreM[0]!) {
          const f = z / grid.centreM[0]!;
          return (1 - f) * result.surfaceK[step]! + f * result.layerK[step * n]!;
        }
        let i = 0;
        while (i < n - 2 && grid.centreM[i + 1]! < z) i++;
        const f = Math.min(1, (z - grid.centreM[i]!) / (grid.centreM[i + 1]! - grid.centreM[i]!));
        return (1 - f) * result.layerK[step * n + i]! + f * result.layerK[step * n + i + 1]!;
      };
      d.temperatureK[j] = (1 - w) * layer(k, d.depthM) + w * layer(k + 1, d.depthM);
    }
  }
  const stride = Math.max(1, Math.ceil((steps - 1) / 240));
  const heatMap = { timesSeconds: [] as number[], temperatureK: [] as number[][] };
  for (let kk = 0; kk < steps; kk += stride) {
    heatMap.timesSeconds.push(times[kk]! - times[0]!);
    heatMap.temperatureK.push(Array.from(result.layerK.subarray(kk * n, kk * n + n)));
  }
  return {
    summary,
    series,
    heatMap,
    solver: {
      mode: "periodic",
      layers: n,
      stepsPerCycle,
      cycles: result.cycles,
      newtonIterations: result.newtonIterations,
      periodicityResidual: result.periodicityResidual,
      requestedTolerance: rtol,
    },
  };
}

/** Fraction of a linear segment from a to b that lies inside [low, high]. */
function fractionInside(a: number, b: number, low: number, high: number): number {
  if (a === b) return a >= low && a <= high ? 1 : 0;
  const lo = Math.min(a, b);
  const hi = Math.max(a, b);
  const overlap = Math.max(0, Math.min(hi, high) - Math.max(lo, low));
  return overlap / (hi - lo);
}

