/**
 * The machine-readable result: one JSON document that says how it was made (calorbit version,
 * the resolved scenario in SI units) and what came out (summary, solver work, optional series).
 */
import { CalorbitError } from "../errors.js";
import { heatStoreOf } from "../model/heatStore.js";
import type { ColumnSpec, ThermalCase } from "../model/thermalCase.js";
import type { ResolvedScenario } from "../scenario/resolve.js";
import type { Simulation } from "../run/simulate.js";
import { VERSION } from "../version.js";

/** The resolved scenario in SI units, with the unit in every key. */
export function resolvedScenarioRecord(resolved: ResolvedScenario) {
  const { thermal } = resolved;
  const store = heatStoreOf(thermal);
  return {
    name: thermal.name,
    star: {
      luminosityW: thermal.star.luminosityW,
      massKg: Number.isFinite(thermal.star.massKg) ? thermal.star.massKg : null,
      radiusM: thermal.star.radiusM ?? null,
      effectiveTemperatureK: thermal.star.effectiveTemperatureK ?? null,
    },
    orbit: {
      semiMajorAxisM: thermal.orbit.semiMajorAxisM,
      eccentricity: thermal.orbit.eccentricity,
      periodSeconds: thermal.orbit.periodSeconds,
      periodOrigin: resolved.periodOrigin,
      meanAnomalyAtStartRad: thermal.orbit.meanAnomalyAtStartRad,
    },
    body: {
      albedo: thermal.surface.albedo,
      emissivity: thermal.surface.emissivity,
      heatCapacityJPerM2K: store.kind === "slab" ? store.heatCapacityJPerM2K : null,
      heatCapacityOrigin: resolved.heatCapacityOrigin,
      internalFluxWPerM2: thermal.surface.internalFluxWPerM2,
    },
    regime: thermal.regime,
    thresholdsK: thermal.windowK ? [...thermal.windowK] : null,
    spin: thermal.spin
      ? {
          rateRadPerSecond: thermal.spin.rateRadPerSecond,
          siderealPeriodSeconds: (2 * Math.PI) / thermal.spin.rateRadPerSecond,
          orbitRatio: thermal.spin.ratio ? `${thermal.spin.ratio.spin}:${thermal.spin.ratio.orbit}` : null,
          obliquityRad: thermal.spin.obliquityRad,
          equinoxTrueAnomalyRad: thermal.spin.equinoxTrueAnomalyRad,
        }
      : null,
    surface: thermal.location ?? null,
    exchange: thermal.exchange ?? null,
  };
}

/** One cell's columns in the JSON series (surfaces of several cells). */
export interface CellSeriesRecord {
  name: string;
  temperatureK: number[];
  equilibriumK: number[];
  absorbedWPerM2: number[];
}

export interface SeriesRecord {
  timeSeconds: number[];
  meanAnomalyRad: number[];
  trueAnomalyRad: number[];
  distanceM: number[];
  stellarFluxWPerM2: number[];
  absorbedWPerM2: number[];
  temperatureK: number[];
  equilibriumK: number[];
  /** Every cell (when there are several; the top-level columns are cell 0's). */
  cells?: CellSeriesRecord[];
  /** Conduction column: the temperature at the requested depths. */
  depths?: { depthM: number; temperatureK: number[] }[];
}

export interface ResultDocument {
  calorbit: { version: string };
  scenario: ReturnType<typeof resolvedScenarioRecord>;
  /** Conduction column: its specification in SI units. */
  column?: ColumnSpec;
  summary: Simulation["summary"];
  solver: Simulation["solver"];
  series?: SeriesRecord;
}

/** Builds the JSON result; `withSeries` adds the columnar series (x = time in s). */
export function resultDocument(resolved: ResolvedScenario, sim: Simulation, withSeries: boolean): ResultDocument {
  const store = heatStoreOf(resolved.thermal);
  const doc: ResultDocument = {
    calorbit: { version: VERSION },
    scenario: resolvedScenarioRecord(resolved),
    ...(store.kind === "column" ? { column: store.column } : {}),
    summary: sim.summary,
    solver: sim.solver,
  };
  if (withSeries) {
    const s = sim.series;
    doc.series = {
      timeSeconds: Array.from(s.timeSeconds),
      meanAnomalyRad: Array.from(s.meanAnomalyRad),
      trueAnomalyRad: Array.from(s.trueAnomalyRad),
      distanceM: Array.from(s.distanceM),
      stellarFluxWPerM2: Array.from(s.stellarFluxWPerM2),
      absorbedWPerM2: Array.from(s.absorbedWPerM2),
      temperatureK: Array.from(s.temperatureK),
      equilibriumK: Array.from(s.equilibriumK),
    };
    if (s.states.length > 1) {
      doc.series.cells = s.states.map((st) => ({
        name: st.name,
        temperatureK: Array.from(st.temperatureK),
        equilibriumK: Array.from(st.equilibriumK),
        absorbedWPerM2: Array.from(st.absorbedWPerM2),
      }));
    }
    if (s.depths) doc.series.depths = s.depths.map((d) => ({ depthM: d.depthM, temperatureK: Array.from(d.temperatureK) }));
  }
  return doc;
}

/** The inverse of resolvedScenarioRecord: a ThermalCase from a result file's SI scenario (the viewer uses it). */
export function thermalCaseFromRecord(record: ReturnType<typeof resolvedScenarioRecord>): ThermalCase {
  const heatCapacity = record.body.heatCapacityJPerM2K;
  if (heatCapacity === null) {
    throw new CalorbitError("INVALID_ARGUMENT", "a conduction-column result has no lumped heat capacity to re-simulate", []);
  }
  const thermal: ThermalCase = {
    name: record.name,
    star: {
      luminosityW: record.star.luminosityW,
      massKg: record.star.massKg ?? NaN,
      ...(record.star.radiusM !== null ? { radiusM: record.star.radiusM } : {}),
      ...(record.star.effectiveTemperatureK !== null ? { effectiveTemperatureK: record.star.effectiveTemperatureK } : {}),
    },
    orbit: {
      semiMajorAxisM: record.orbit.semiMajorAxisM,
      eccentricity: record.orbit.eccentricity,
      periodSeconds: record.orbit.periodSeconds,
      meanAnomalyAtStartRad: record.orbit.meanAnomalyAtStartRad,
    },
    surface: {
      albedo: record.body.albedo,
      emissivity: record.body.emissivity,
      heatCapacityJPerM2K: heatCapacity,
      internalFluxWPerM2: record.body.internalFluxWPerM2,
    },
    regime: record.regime,
    ...(record.thresholdsK ? { windowK: [record.thresholdsK[0]!, record.thresholdsK[1]!] as const } : {}),
    ...(record.exchange ? { exchange: record.exchange } : {}),
    ...(record.surface ? { location: record.surface } : {}),
  };
  if (record.spin) {
    const ratio = record.spin.orbitRatio ? record.spin.orbitRatio.split(":").map(Number) : null;
    thermal.spin = {
      rateRadPerSecond: record.spin.rateRadPerSecond,
      ...(ratio ? { ratio: { spin: ratio[0]!, orbit: ratio[1]! } } : {}),
      obliquityRad: record.spin.obliquityRad,
      equinoxTrueAnomalyRad: record.spin.equinoxTrueAnomalyRad,
    };
  }
  return thermal;
}
