/**
 * The summary of one periodic zonal climate: each band's time-mean, minimum and maximum, the
 * global mean, the equator-to-pole contrast, the ice edge through the orbit, the habitable
 * fraction of area × time (Spiegel, Menou & Scharf 2008, ApJ 681, 1609) and the energy budget.
 *
 * Means of temperature and of the fluxes use the stepping scheme's own quadrature (so the budget
 * is the one the scheme conserves); the ice edge and the habitable fraction use the step ends,
 * linear in time between them, with the exact time of each step end (t = (E − e sin E)/n).
 */
import type { AlbedoLaw, BandAlbedo } from "../physics/climateAlbedo.js";
import type { BandGrid } from "../physics/climateBands.js";
import type { CycleRecord, StepGrid } from "../solve/zonalStepper.js";

const DEG = 180 / Math.PI;

export interface BandSummary {
  latitudeDeg: number;
  areaFraction: number;
  temperature: { minK: number; maxK: number; meanK: number };
}

export interface ZonalSummary {
  periodSeconds: number;
  /** The global-mean temperature through the orbit: min, max, time mean (the global mean), swing. */
  temperature: { minK: number; maxK: number; meanK: number; swingK: number };
  globalMeanK: number;
  /** Time-mean temperature at the equator minus the mean of the two polar bands, K. */
  equatorPoleContrastK: number;
  /**
   * The ice edge as the latitude of a polar cap with the area of a hemisphere's ice: its min, max
   * and mean over the orbit and both hemispheres (90° ice-free, 0° iced to the equator); null
   * when the albedo has no ice.
   */
  iceEdge: { minDeg: number; maxDeg: number; meanDeg: number } | null;
  /** Share of area × time under ice (0 without an ice law). */
  iceFraction: number;
  /** Share of area × time with low ≤ T ≤ high. */
  habitableFraction: number;
  habitableWindow: { lowK: number; highK: number };
  /** Every band iced (ice share ≥ ½) through the whole orbit. */
  snowball: boolean;
  meanAbsorbedWPerM2: number;
  meanEmittedWPerM2: number;
  meanInternalWPerM2: number;
  /** (absorbed + internal − emitted)/(absorbed + internal) of the whole globe over the orbit. */
  energyBalanceResidual: number;
  bands: BandSummary[];
}

export interface ZonalSummaryInput {
  grid: BandGrid;
  steps: StepGrid;
  record: CycleRecord;
  albedo: AlbedoLaw;
  bandAlbedo: readonly BandAlbedo[];
  eccentricity: number;
  meanMotionRadPerSecond: number;
  startE: number;
  periodSeconds: number;
  window: { lowK: number; highK: number };
}

/** Share of a step (linear in time from a to b) spent in [low, high]. */
export function shareInWindow(a: number, b: number, low: number, high: number): number {
  if (a === b) return a >= low && a <= high ? 1 : 0;
  const lo = Math.min(a, b);
  const hi = Math.max(a, b);
  const overlap = Math.min(hi, high) - Math.max(lo, low);
  return overlap > 0 ? overlap / (hi - lo) : 0;
}

export function zonalSummary(input: ZonalSummaryInput): ZonalSummary {
  const { grid, steps, record, bandAlbedo, window } = input;
  const n = grid.count;
  const K = steps.steps;
  const T = record.temperatureK;
  const w = grid.areaFraction;
  const time = (E: number): number => (E - input.eccentricity * Math.sin(E)) / input.meanMotionRadPerSecond;

  const bands: BandSummary[] = [];
  let globalMean = 0;
  for (let j = 0; j < n; j++) {
    const meanK = record.bandTemperatureSum[j]! / record.quadratureSeconds;
    globalMean += w[j]! * meanK;
    bands.push({
      latitudeDeg: grid.latitudeRad[j]! * DEG,
      areaFraction: w[j]!,
      temperature: { minK: record.minK[j]!, maxK: record.maxK[j]!, meanK },
    });
  }

  const hasIce = input.albedo.iceEdgeK !== null;
  let globalMin = Infinity;
  let globalMax = -Infinity;
  let habitable = 0;
  let iceTime = 0;
  let edgeSum = 0;
  let edgeMin = Infinity;
  let edgeMax = -Infinity;
  let snowball = hasIce;
  let totalTime = 0;
  const edges = new Float64Array(2 * (K + 1)); // south, north at each step end
  const ice = new Float64Array(K + 1);
  for (let k = 0; k <= K; k++) {
    let g = 0;
    let south = 0;
    let north = 0;
    let iced = 0;
    for (let j = 0; j < n; j++) {
      const t = T[k * n + j]!;
      g += w[j]! * t;
      const f = bandAlbedo[j]!.iceFraction(t);
      if (f < 0.5) snowball = false;
      iced += w[j]! * f;
      // A band across the equator gives half of its area to each hemisphere.
      const x0 = grid.edgeX[j]!;
      const x1 = grid.edgeX[j + 1]!;
      const southShare = x1 <= 0 ? 1 : x0 >= 0 ? 0 : -x0 / (x1 - x0);
      south += w[j]! * f * southShare;
      north += w[j]! * f * (1 - southShare);
    }
    globalMin = Math.min(globalMin, g);
    globalMax = Math.max(globalMax, g);
    // Hemisphere ice share a (of 1/2 of the sphere) ↔ a cap poleward of asin(1 − a).
    edges[2 * k] = Math.asin(Math.max(0, Math.min(1, 1 - 2 * south))) * DEG;
    edges[2 * k + 1] = Math.asin(Math.max(0, Math.min(1, 1 - 2 * north))) * DEG;
    ice[k] = iced;
  }
  for (let k = 0; k < K; k++) {
    const dt = time(input.startE + (k + 1) * steps.stepE) - time(input.startE + k * steps.stepE);
    totalTime += dt;
    for (let j = 0; j < n; j++) habitable += dt * w[j]! * shareInWindow(T[k * n + j]!, T[(k + 1) * n + j]!, window.lowK, window.highK);
    iceTime += (dt * (ice[k]! + ice[k + 1]!)) / 2;
    edgeSum += (dt * (edges[2 * k]! + edges[2 * k + 1]! + edges[2 * k + 2]! + edges[2 * k + 3]!)) / 4;
  }
  for (let i = 0; i < edges.length; i++) {
    edgeMin = Math.min(edgeMin, edges[i]!);
    edgeMax = Math.max(edgeMax, edges[i]!);
  }

  const contrast = equatorMinusPole(bands);
  const absorbed = record.absorbedSum / record.quadratureSeconds;
  const emitted = record.emittedSum / record.quadratureSeconds;
  const internal = record.internalSum / record.quadratureSeconds;
  return {
    periodSeconds: input.periodSeconds,
    temperature: { minK: globalMin, maxK: globalMax, meanK: globalMean, swingK: globalMax - globalMin },
    globalMeanK: globalMean,
    equatorPoleContrastK: contrast,
    iceEdge: hasIce ? { minDeg: edgeMin, maxDeg: edgeMax, meanDeg: edgeSum / totalTime } : null,
    iceFraction: hasIce ? iceTime / totalTime : 0,
    habitableFraction: habitable / totalTime,
    habitableWindow: { ...window },
    snowball,
    meanAbsorbedWPerM2: absorbed,
    meanEmittedWPerM2: emitted,
    meanInternalWPerM2: internal,
    energyBalanceResidual: (absorbed + internal - emitted) / (absorbed + internal),
    bands,
  };
}

/** Equator (the middle band, or the mean of the two middle bands) minus the mean of the two polar bands, K. */
function equatorMinusPole(bands: readonly BandSummary[]): number {
  const n = bands.length;
  const mean = (j: number): number => bands[j]!.temperature.meanK;
  const equator = n % 2 === 1 ? mean((n - 1) / 2) : 0.5 * (mean(n / 2 - 1) + mean(n / 2));
  const pole = 0.5 * (mean(0) + mean(n - 1));
  return equator - pole;
}
