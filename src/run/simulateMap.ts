/**
 * A longitude × latitude map of slab cells solved through the orbit: the periodic steady state
 * when the cell frame's rotation shares a cycle with the orbit (p rotations in q orbits), else a
 * forward integration until the start is forgotten, whose last orbit is reported (and named so).
 */
import { STEFAN_BOLTZMANN } from "../constants.js";
import { MAP_DEFAULT_TOLERANCE } from "../defaults.js";
import { CalorbitError, requireNumber } from "../errors.js";
import type { MapHistory } from "../analysis/phaseCurve.js";
import { eccentricAnomaly, trueAnomalyFromEccentric } from "../physics/kepler.js";
import { meanMotion, type Orbit } from "../physics/orbit.js";
import { LumpedBalance } from "../physics/energyBalance.js";
import { CellBudget, cellForcing, lonLatGrid, MapIllumination, StarInCellFrame, type CellFrame, type MapBody, type MapSurface } from "../physics/surfaceGrid.js";
import { chooseIntegrator, integrateCycle, plainOdeTolerance, solvePeriodic } from "../solve/periodic.js";
import { addWork, emptyWork, type SolverWork } from "../solve/system.js";
import { checkProgressHook, ProgressMeter, type ProgressHook } from "./progress.js";

const TWO_PI = 2 * Math.PI;
export { MAP_DEFAULT_TOLERANCE };
export const MAP_DEFAULT_SAMPLES = 1000;
/** Largest q of a p:q cycle a map will shoot over; beyond it the map is integrated forward. */
const MAX_CYCLE_ORBITS = 16;
const MAX_FORWARD_ORBITS = 400;
/** A cell whose peak absorbed flux is below this share of the global mean is taken as unlit (its T⁴ is below 1e-9 of the scale's). */
const UNLIT_SHARE = 1e-9;
const MAX_STEPS_PER_ORBIT = 2_000_000;

export interface MapCase extends MapBody {
  /** The body's spin: rate, obliquity, equinox; `ratio` when it was given as p:q. */
  spin: { rateRadPerSecond: number; obliquityRad: number; equinoxTrueAnomalyRad: number; ratio?: { spin: number; orbit: number } };
  /** Solid-body wind relative to the ground, rad s⁻¹ (positive eastward, with the spin). */
  windRadPerSecond: number;
  longitudes: number;
  latitudes: number;
}

export interface MapOptions {
  relativeTolerance?: number;
  /** Samples of the reported orbit(s), uniform in time, both ends included. */
  samples?: number;
  /** Called as the cells are solved, with the share done (rising, 1 at the end) and the stage "map". */
  onProgress?: ProgressHook;
}

export interface MapSimulation {
  history: MapHistory;
  /** periodic: shooting on the exact p:q cycle; forward: integrated orbit after orbit (no shared cycle). */
  mode: "periodic" | "forward";
  cycleOrbits: number;
  orbitsIntegrated: number;
  iterations: number;
  work: SolverWork;
  /** Area-weighted cycle means over the whole sphere, W m⁻², and the energy residual (absorbed + internal − emitted)/(absorbed + internal). */
  energy: { absorbedWPerM2: number; emittedWPerM2: number; residual: number };
  /** Per-cell statistics over the reported samples, K. */
  cellMinK: Float64Array;
  cellMaxK: Float64Array;
  cellMeanK: Float64Array;
  /** Largest change of a cell's start temperature over the last cycle, relative to the temperature scale. */
  periodicityResidual: number;
  /** Radiative time at the mean-flux equilibrium, s. */
  radiativeTimeSeconds: number;
}

/** p:q with q ≤ MAX_CYCLE_ORBITS matching rate/n to 1e-9, or null. */
function sharedCycle(frameRate: number, n: number, ratio?: { spin: number; orbit: number }): number | null {
  if (ratio && frameRate === ratio.spin * (n / ratio.orbit)) return ratio.orbit;
  const x = frameRate / n;
  for (let q = 1; q <= MAX_CYCLE_ORBITS; q++) {
    const p = Math.round(x * q);
    if (Math.abs(x * q - p) <= 1e-9 * Math.max(1, Math.abs(x * q))) return q;
  }
  return null;
}

/**
 * Sample times uniform over the reported orbits (after `leadOrbits`), both ends included, and the
 * eccentric anomaly of each on the integration's unwrapped scale (Kepler solved once per sample).
 */
function sampleAnomalies(orbit: Orbit, startE: number, leadOrbits: number, orbits: number, count: number): { times: Float64Array; anomaly: Float64Array } {
  const e = orbit.eccentricity;
  const n = meanMotion(orbit);
  const times = new Float64Array(count);
  const anomaly = new Float64Array(count);
  const startM = startE - e * Math.sin(startE);
  const lo = startE + TWO_PI * leadOrbits;
  const hi = lo + TWO_PI * orbits;
  for (let s = 0; s < count; s++) {
    const t = leadOrbits * orbit.periodSeconds + (orbits * orbit.periodSeconds * s) / (count - 1);
    times[s] = t;
    const M = startM + n * t;
    const wraps = Math.floor((M + Math.PI) / TWO_PI);
    const E = eccentricAnomaly(M - TWO_PI * wraps, e) + TWO_PI * wraps;
    anomaly[s] = Math.min(hi, Math.max(lo, E));
  }
  return { times, anomaly };
}

export function checkMapCase(c: MapCase): void {
  requireNumber("map.longitudes", c.longitudes, (k) => Number.isInteger(k) && k >= 4 && k <= 720, "an integer from 4 to 720");
  requireNumber("map.latitudes", c.latitudes, (k) => Number.isInteger(k) && k >= 2 && k <= 360, "an integer from 2 to 360");
  requireNumber("map.wind", c.windRadPerSecond, () => true, "a finite angular speed");
  requireNumber("body.heatCapacity", c.heatCapacityJPerM2K, (v) => v > 0, "C > 0 J m⁻² K⁻¹");
}

export function simulateMap(c: MapCase, options: MapOptions = {}): MapSimulation {
  checkMapCase(c);
  const rtol = options.relativeTolerance ?? MAP_DEFAULT_TOLERANCE;
  requireNumber("tolerance", rtol, (t) => t >= 1e-12 && t <= 1e-2, "1e-12 ≤ tolerance ≤ 1e-2");
  const sampleCount = options.samples ?? MAP_DEFAULT_SAMPLES;
  requireNumber("samples", sampleCount, (k) => Number.isInteger(k) && k >= 2 && k <= 100_000, "an integer from 2 to 100,000");
  const { orbit } = c;
  const n = meanMotion(orbit);
  const frame: CellFrame = {
    rateRadPerSecond: c.spin.rateRadPerSecond + c.windRadPerSecond,
    obliquityRad: c.spin.obliquityRad,
    equinoxTrueAnomalyRad: c.spin.equinoxTrueAnomalyRad,
  };
  const grid = lonLatGrid(c.longitudes, c.latitudes);
  const surface: MapSurface = { ...c, grid, frame };
  const illumination = new MapIllumination(surface);
  const cells = illumination.cells;
  const cycle = sharedCycle(frame.rateRadPerSecond, n, c.spin.ratio);
  const cycleOrbits = cycle ?? 1;

  // Each cell's cycle-mean and largest absorbed flux (trapezoid in E, weighted by dt/dE): the first guess and the stiffness.
  const e = orbit.eccentricity;
  const startE = eccentricAnomaly(orbit.meanAnomalyAtStartRad, e);
  const quadrature = 256 * cycleOrbits + Math.ceil(16 * Math.abs(frame.rateRadPerSecond / n - 1) * cycleOrbits);
  const absorbed = new Float64Array(cells);
  const meanAbsorbed = new Float64Array(cells);
  const peakAbsorbed = new Float64Array(cells);
  const everDark = new Uint8Array(cells);
  let weight = 0;
  for (let s = 0; s < quadrature; s++) {
    const E = startE + (TWO_PI * cycleOrbits * s) / quadrature;
    const w = 1 - e * Math.cos(E);
    illumination.absorbedAt(E, absorbed);
    for (let k = 0; k < cells; k++) {
      meanAbsorbed[k] = meanAbsorbed[k]! + w * absorbed[k]!;
      if (absorbed[k]! > peakAbsorbed[k]!) peakAbsorbed[k] = absorbed[k]!;
      if (absorbed[k] === 0) everDark[k] = 1;
    }
    weight += w;
  }
  const emission = c.emissivity * STEFAN_BOLTZMANN;
  let globalMean = 0;
  for (let k = 0; k < cells; k++) {
    meanAbsorbed[k] = meanAbsorbed[k]! / weight;
    globalMean += grid.areaFraction[k]! * meanAbsorbed[k]!;
  }
  const q = c.internalFluxWPerM2;
  const scaleK = Math.sqrt(Math.sqrt((globalMean + q) / emission));
  if (!(scaleK > 0)) {
    throw new CalorbitError("INVALID_ARGUMENT", "the planet absorbs nothing and has no internal heat", [
      { path: "body", given: "no absorbed or internal flux", allowed: "albedo below 1, or body.internalFlux > 0" },
    ]);
  }
  const radiativeTimeSeconds = c.heatCapacityJPerM2K / (4 * emission * scaleK ** 3);
  const reportedOrbits = cycleOrbits;
  let mode: MapSimulation["mode"] = cycle !== null ? "periodic" : "forward";
  let leadOrbits = 0;
  if (cycle === null) {
    // No shared cycle: forget the start (memory decays as exp(−t/τ), τ taken at the mean-flux temperature × 8 for cold nights).
    leadOrbits = Math.max(1, Math.ceil(((8 * radiativeTimeSeconds) / orbit.periodSeconds) * Math.log(1 / rtol)));
    if (leadOrbits + 1 > MAX_FORWARD_ORBITS) {
      throw new CalorbitError("INVALID_ARGUMENT", "this map has no shared cycle and too long a memory to integrate forward", [
        {
          path: "spin",
          given: `a cell frame turning ${(frame.rateRadPerSecond / n).toPrecision(6)} times per orbit with τ/P = ${(radiativeTimeSeconds / orbit.periodSeconds).toPrecision(3)}`,
          allowed: `a spin (with the wind) of p rotations in q ≤ ${MAX_CYCLE_ORBITS} orbits, or a radiative time short enough to forget the start within ${MAX_FORWARD_ORBITS} orbits`,
        },
      ]);
    }
  }
  const sampled = sampleAnomalies(orbit, startE, leadOrbits, reportedOrbits, sampleCount);
  const samples = new Float64Array(sampleCount * cells);
  const cellSamples = new Float64Array(sampleCount);
  const work = emptyWork();
  let iterations = 0;
  let periodicityResidual = 0;
  let absorbedEnergy = 0;
  let emittedEnergy = 0;
  const from = startE + TWO_PI * leadOrbits;
  const to = from + TWO_PI * reportedOrbits;
  const budgetScale = new Float64Array(3);
  // With the spin axis along the orbit normal the star never leaves the equator's plane, so a cell
  // and its mirror across the equator see the same sunlight: solve the northern rows and copy.
  const mirrored = Math.abs(Math.sin(frame.obliquityRad)) < 1e-15;
  const { longitudes, latitudes } = grid;
  checkProgressHook(options.onProgress);
  const progress = new ProgressMeter(options.onProgress);
  for (let k = 0; k < cells; k++) {
    progress.report(k / cells, "map");
    const area = grid.areaFraction[k]!;
    const row = Math.floor(k / longitudes);
    if (mirrored && row < latitudes - 1 - row) {
      continue; // filled from its mirror below
    }
    if (peakAbsorbed[k]! <= UNLIT_SHARE * globalMean && q === 0) {
      // Never lit (or lit at grazing incidence only, a cell centred on the terminator) and no
      // internal heat: the cell sits at 0 K (below 1 % of the scale), and its budget is negligible.
      continue;
    }
    const forcing = cellForcing(surface, k, meanAbsorbed[k]!);
    const balance = new LumpedBalance(orbit, surface, forcing);
    const hotK = Math.sqrt(Math.sqrt((peakAbsorbed[k]! + q) / emission));
    const stiffness = (cycleOrbits * orbit.periodSeconds * 4 * emission * hotK ** 3) / c.heatCapacityJPerM2K;
    const guessK = Math.sqrt(Math.sqrt((meanAbsorbed[k]! + q) / emission));
    // Sunrise and sunset put corners in the forcing of cells that are lit only part of the time.
    const corners = everDark[k] === 1;
    const scale = new Float64Array([scaleK]);
    const start = new Float64Array([guessK]);
    if (mode === "periodic") {
      const result = solvePeriodic(
        { system: balance, start: startE, cycleLength: TWO_PI * cycleOrbits, guess: start, scale, stiffness, forcingHasCorners: corners, maxStepsPerCycle: MAX_STEPS_PER_ORBIT * cycleOrbits },
        { relativeTolerance: rtol },
      );
      addWork(work, result.work);
      iterations = Math.max(iterations, result.iterations);
      periodicityResidual = Math.max(periodicityResidual, result.periodicityResidual);
      start[0] = result.start[0]!;
    }
    // The reported cycle (after the lead-in of a forward run), with the energy budget integrated beside T.
    const integrator = chooseIntegrator(stiffness / cycleOrbits, corners);
    const odeTolerance = plainOdeTolerance(rtol, corners);
    const budget = new CellBudget(surface, forcing);
    const y = new Float64Array([start[0]!, 0, 0]);
    if (leadOrbits > 0) {
      addWork(work, integrateCycle(balance, integrator, startE, from, start, odeTolerance, scale, undefined, MAX_STEPS_PER_ORBIT * leadOrbits));
      y[0] = start[0]!;
    }
    const startOfReport = y[0]!;
    const cycleEnergy = (meanAbsorbed[k]! + q) * reportedOrbits * orbit.periodSeconds;
    budgetScale[0] = scaleK;
    budgetScale[1] = budgetScale[2] = Math.max(cycleEnergy, 1);
    addWork(
      work,
      integrateCycle(budget, integrator, from, to, y, odeTolerance, budgetScale, { xs: sampled.anomaly, ys: cellSamples, components: 1 }, MAX_STEPS_PER_ORBIT * reportedOrbits),
    );
    if (mode === "forward") periodicityResidual = Math.max(periodicityResidual, Math.abs(y[0]! - startOfReport) / scaleK);
    absorbedEnergy += area * y[1]!;
    emittedEnergy += area * y[2]!;
    for (let s = 0; s < sampleCount; s++) samples[s * cells + k] = cellSamples[s]!;
    const mirror = (latitudes - 1 - row) * longitudes + (k % longitudes);
    if (mirrored && mirror !== k) {
      absorbedEnergy += area * y[1]!;
      emittedEnergy += area * y[2]!;
      for (let s = 0; s < sampleCount; s++) samples[s * cells + mirror] = cellSamples[s]!;
    }
  }
  const orbitsIntegrated = leadOrbits + reportedOrbits * (mode === "periodic" ? iterations + 1 : 1);
  const times = sampled.times;
  const spanSeconds = reportedOrbits * orbit.periodSeconds;
  const absorbedWPerM2 = absorbedEnergy / spanSeconds;
  const emittedWPerM2 = emittedEnergy / spanSeconds;
  const supplied = absorbedWPerM2 + c.internalFluxWPerM2;

  const star = new StarInCellFrame(orbit, frame);
  const geometry = new Float64Array(4);
  const history: MapHistory = {
    grid,
    orbit,
    frame,
    timeSeconds: times,
    meanAnomalyRad: new Float64Array(sampleCount),
    trueAnomalyRad: new Float64Array(sampleCount),
    distanceM: new Float64Array(sampleCount),
    temperatureK: samples,
    substellarLongitudeRad: new Float64Array(sampleCount),
  };
  for (let s = 0; s < sampleCount; s++) {
    const E = sampled.anomaly[s]!;
    history.meanAnomalyRad[s] = E - e * Math.sin(E);
    history.trueAnomalyRad[s] = trueAnomalyFromEccentric(E, e);
    history.distanceM[s] = orbit.semiMajorAxisM * (1 - e * Math.cos(E));
    const lambda = star.at(E, geometry);
    history.substellarLongitudeRad[s] = lambda - TWO_PI * Math.round(lambda / TWO_PI);
  }
  const cellMinK = new Float64Array(cells).fill(Infinity);
  const cellMaxK = new Float64Array(cells).fill(-Infinity);
  const cellMeanK = new Float64Array(cells);
  for (let s = 0; s < sampleCount; s++) {
    // trapezoid weights in time over the reported span
    const wt = s === 0 || s === sampleCount - 1 ? 0.5 : 1;
    for (let k = 0; k < cells; k++) {
      const t = samples[s * cells + k]!;
      if (t < cellMinK[k]!) cellMinK[k] = t;
      if (t > cellMaxK[k]!) cellMaxK[k] = t;
      cellMeanK[k] = cellMeanK[k]! + wt * t;
    }
  }
  for (let k = 0; k < cells; k++) cellMeanK[k] = cellMeanK[k]! / (sampleCount - 1);
  progress.finish("map");
  return {
    history,
    mode,
    cycleOrbits: reportedOrbits,
    orbitsIntegrated,
    iterations,
    work,
    energy: { absorbedWPerM2, emittedWPerM2, residual: (supplied - emittedWPerM2) / supplied },
    cellMinK,
    cellMaxK,
    cellMeanK,
    periodicityResidual,
    radiativeTimeSeconds,
  };
}
