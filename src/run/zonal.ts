/**
 * The zonal climate of a fast rotator: N latitude bands coupled by meridional diffusion, forced
 * by the daily-mean insolation through the orbit, solved to its periodic state from a warm start,
 * a cold start or both (an ice–albedo feedback can hold two climates), and summarised. Pure
 * computation: no I/O.
 */
import { anomaliesUniformInTime, orbitColumns, type OrbitColumns } from "../analysis/orbitSampling.js";
import { zonalSummary, type ZonalSummary } from "../analysis/zonalSummary.js";
import { ZERO_CELSIUS_K } from "../constants.js";
import { CalorbitError, requireNumber } from "../errors.js";
import type { ThermalCase } from "../model/thermalCase.js";
import { albedoLaw, type AlbedoLaw, type BandAlbedo } from "../physics/climateAlbedo.js";
import { bandGrid, meridionalDiffusion, type BandGrid } from "../physics/climateBands.js";
import { heatCapacityLaw } from "../physics/climateHeatCapacity.js";
import { zonalInsolation, type ZonalInsolation } from "../physics/climateInsolation.js";
import { outgoingLaw } from "../physics/climateOutgoing.js";
import { COLD_START_K, WARM_START_K, type ClimateSettings } from "../physics/climateSettings.js";
import { eccentricAnomaly } from "../physics/kepler.js";
import { checkOrbit, meanMotion, type Orbit } from "../physics/orbit.js";
import { solveZonalPeriodic } from "../solve/zonalPeriodic.js";
import { ZonalStepper, type CycleRecord, type StepGrid, type ZonalSystem } from "../solve/zonalStepper.js";
import { checkProgressHook, estimatedShare, ProgressMeter, type ProgressHook } from "./progress.js";

/** Default habitable window, K: liquid water at one bar (Spiegel et al. 2008's measure uses 273–373 K). */
const HABITABLE_WINDOW_K = { lowK: ZERO_CELSIUS_K, highK: ZERO_CELSIUS_K + 100 };
/** Two starts reach the same climate when no band's time mean differs by more than this, K. */
const SAME_CLIMATE_K = 0.01;
/** Fine-orbit equivalents a start typically takes to its periodic climate, for the progress estimate only (measured: see progress.test.ts). */
const TYPICAL_ZONAL_ORBITS = 40;

export interface ZonalOptions {
  /** Called as the orbits are integrated, with the share done (rising, 1 at the end) and the stage "zonal". */
  onProgress?: ProgressHook;
}

export interface ZonalCase {
  luminosityW: number;
  orbit: Orbit;
  /** Obliquity, rad (0 … π), and the true anomaly at the northern spring equinox, rad. */
  obliquityRad: number;
  equinoxTrueAnomalyRad: number;
  internalFluxWPerM2: number;
  climate: ClimateSettings;
  /** Habitable window [low, high], K (default 273.15–373.15 K). */
  windowK?: readonly [number, number];
  /** Replaces the orbital insolation (a check against an analytic forcing). */
  insolation?: ZonalInsolation;
}

export interface ZonalSolverReport {
  method: "sdirk2 + newton-krylov";
  stepsPerOrbit: number;
  newtonIterations: number;
  /** Orbits integrated at full resolution, linearised orbits (Krylov products, stability check), coarse spin-up orbits. */
  orbitsIntegrated: number;
  linearisedOrbits: number;
  spinUpOrbits: number;
  periodicityResidualK: number;
  /** Spectral radius of the orbit map's derivative at the periodic state (< 1: stable). */
  monodromyRadius: number;
}

export interface ZonalClimate {
  start: "warm" | "cold";
  summary: ZonalSummary;
  solver: ZonalSolverReport;
  /** Step-end temperatures of the periodic orbit, [step * N + band], uniform in E. */
  record: CycleRecord;
}

export interface ZonalSimulation {
  grid: BandGrid;
  steps: StepGrid;
  /** One climate per start asked for; with start "both", one when both starts reach the same climate. */
  climates: ZonalClimate[];
  /** With start "both": true when the warm and cold starts reached the same climate (then one is listed). */
  startsAgree: boolean | null;
  startE: number;
}

/** The zonal case of a resolved thermal case (its `climate` settings, axis, star and orbit). */
export function zonalCaseOf(thermal: ThermalCase): ZonalCase {
  if (!thermal.climate) throw new CalorbitError("INVALID_ARGUMENT", "not a zonal case", [{ path: "climate", given: "missing", allowed: "climate settings (regime zonal)" }]);
  return {
    luminosityW: thermal.star.luminosityW,
    orbit: thermal.orbit,
    obliquityRad: thermal.spin?.obliquityRad ?? 0,
    equinoxTrueAnomalyRad: thermal.spin?.equinoxTrueAnomalyRad ?? 0,
    internalFluxWPerM2: thermal.surface.internalFluxWPerM2,
    climate: thermal.climate,
    ...(thermal.windowK ? { windowK: thermal.windowK } : {}),
  };
}

interface Prepared {
  system: ZonalSystem;
  albedo: AlbedoLaw;
  bandAlbedo: BandAlbedo[];
}

function prepare(input: ZonalCase): Prepared {
  checkOrbit(input.orbit);
  requireNumber("star.luminosity", input.luminosityW, (l) => l > 0, "L > 0 W");
  requireNumber("spin.obliquity", input.obliquityRad, (o) => o >= 0 && o <= Math.PI, "0 ≤ obliquity ≤ 180°");
  requireNumber("body.internalFlux", input.internalFluxWPerM2, (q) => q >= 0, "q ≥ 0 W m⁻²");
  requireNumber("climate.stepsPerOrbit", input.climate.stepsPerOrbit, (k) => Number.isInteger(k) && k >= 24 && k <= 100_000, "an integer from 24 to 100,000");
  const grid = bandGrid(input.climate.bands);
  const albedo = albedoLaw(input.climate.albedo);
  const bandAlbedo = Array.from(grid.centreX, (x) => albedo.forBand(x));
  const startE = eccentricAnomaly(input.orbit.meanAnomalyAtStartRad, input.orbit.eccentricity);
  const system: ZonalSystem = {
    grid,
    diffusion: meridionalDiffusion(grid, input.climate.diffusionWPerM2K),
    albedo: bandAlbedo,
    outgoing: outgoingLaw(input.climate.outgoing),
    heatCapacity: heatCapacityLaw(input.climate.heatCapacity),
    internalFluxWPerM2: input.internalFluxWPerM2,
    insolation:
      input.insolation ??
      zonalInsolation(grid, {
        luminosityW: input.luminosityW,
        orbit: input.orbit,
        obliquityRad: input.obliquityRad,
        equinoxTrueAnomalyRad: input.equinoxTrueAnomalyRad,
      }),
    eccentricity: input.orbit.eccentricity,
    meanMotionRadPerSecond: meanMotion(input.orbit),
    startE,
  };
  return { system, albedo, bandAlbedo };
}

/** Solves the case from the start(s) its settings ask for. */
export function simulateZonal(input: ZonalCase, options: ZonalOptions = {}): ZonalSimulation {
  const { system, albedo, bandAlbedo } = prepare(input);
  const n = system.grid.count;
  const window = input.windowK ? { lowK: input.windowK[0], highK: input.windowK[1] } : HABITABLE_WINDOW_K;
  const starts: ("warm" | "cold")[] = input.climate.start === "both" ? ["warm", "cold"] : [input.climate.start];
  const iced = (t: Float64Array, out: Uint8Array): void => {
    for (let j = 0; j < n; j++) out[j] = bandAlbedo[j]!.iceFraction(t[j]!) >= 0.5 ? 1 : 0;
  };
  const climates: ZonalClimate[] = [];
  let steps: StepGrid | null = null;
  checkProgressHook(options.onProgress);
  const progress = new ProgressMeter(options.onProgress);
  const onOrbit = progress.active ? (orbits: number) => progress.report(estimatedShare(orbits, TYPICAL_ZONAL_ORBITS), "zonal") : undefined;
  for (const [index, start] of starts.entries()) {
    progress.part(index / starts.length, 1 / starts.length);
    const stepper = new ZonalStepper(system);
    const initial = new Float64Array(n).fill(start === "warm" ? WARM_START_K : COLD_START_K);
    const result = solveZonalPeriodic(stepper, initial, iced, { stepsPerOrbit: input.climate.stepsPerOrbit, ...(onOrbit ? { onOrbit } : {}) });
    steps = result.grid;
    const summary = zonalSummary({
      grid: system.grid,
      steps: result.grid,
      record: result.record,
      albedo,
      bandAlbedo,
      eccentricity: system.eccentricity,
      meanMotionRadPerSecond: system.meanMotionRadPerSecond,
      startE: system.startE,
      periodSeconds: input.orbit.periodSeconds,
      window,
    });
    climates.push({
      start,
      summary,
      record: result.record,
      solver: {
        method: "sdirk2 + newton-krylov",
        stepsPerOrbit: result.grid.steps,
        newtonIterations: result.newtonIterations,
        orbitsIntegrated: result.orbits,
        linearisedOrbits: result.linearOrbits,
        spinUpOrbits: result.spinUpOrbits,
        periodicityResidualK: result.periodicityResidualK,
        monodromyRadius: result.monodromyRadius,
      },
    });
  }
  let startsAgree: boolean | null = null;
  if (climates.length === 2) {
    const [warm, cold] = climates as [ZonalClimate, ZonalClimate];
    startsAgree = warm.summary.bands.every((b, j) => Math.abs(b.temperature.meanK - cold.summary.bands[j]!.temperature.meanK) <= SAME_CLIMATE_K);
    if (startsAgree) climates.pop();
  }
  progress.finish("zonal");
  return { grid: system.grid, steps: steps!, climates, startsAgree, startE: system.startE };
}

/** T(latitude, time) of one climate at `count` times uniform over the orbit (linear in E between step ends). */
export interface ZonalSeries extends OrbitColumns {
  /** [sample * N + band], K. */
  temperatureK: Float64Array;
}

export function zonalSeries(input: ZonalCase, simulation: ZonalSimulation, climate: ZonalClimate, count: number): ZonalSeries {
  requireNumber("samples", count, (k) => Number.isInteger(k) && k >= 2 && k <= 1_000_000, "an integer from 2 to 1,000,000");
  const n = simulation.grid.count;
  const anomalies = anomaliesUniformInTime(input.orbit, simulation.startE, 1, count);
  const columns = orbitColumns(input.orbit, input.luminosityW, anomalies);
  const temperatureK = new Float64Array(count * n);
  const { steps } = simulation;
  const T = climate.record.temperatureK;
  for (let s = 0; s < count; s++) {
    const u = (anomalies[s]! - simulation.startE) / steps.stepE;
    const k = Math.min(steps.steps - 1, Math.max(0, Math.floor(u)));
    const f = u - k;
    for (let j = 0; j < n; j++) temperatureK[s * n + j] = (1 - f) * T[k * n + j]! + f * T[(k + 1) * n + j]!;
  }
  return { ...columns, temperatureK };
}
