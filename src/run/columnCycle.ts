/**
 * The converged cycle of a surface on conduction columns: each cell's forcing drives its own column
 * (Crank–Nicolson, `src/solve/columnSolver.ts`) to its periodic state; the surface temperatures on
 * the solver's step grid (uniform in E) are the statistics grid, the output grid is interpolated
 * from it, and the depth profile, skin depths and layer map are the column's extras (the first
 * cell's, as the summary's top-level numbers are). Cells under columns exchange no heat (the model
 * refuses an exchange there), so the columns are independent and the cost is linear in the cells.
 */
import { anomaliesUniformInTime } from "../analysis/orbitSampling.js";
import { DEFAULT_COLUMN_TOLERANCE, MIN_COLUMN_TOLERANCE } from "../defaults.js";
import { CalorbitError, requireNumber } from "../errors.js";
import type { ColumnModel } from "../model/build.js";
import type { ThermalCase } from "../model/thermalCase.js";
import { buildColumnGrid, skinDepthM, specificHeatAt, thermalInertia } from "../physics/column.js";
import { timeAtEccentric } from "../physics/orbit.js";
import { solveColumnPeriodic } from "../solve/columnSolver.js";
import type { ConvergedCycle, CycleRequest } from "./cycle.js";
import { estimatedShare } from "./progress.js";

const TWO_PI = 2 * Math.PI;
/** A column's default tolerance on its periodicity and energy closure (its steps are second order). */
export { DEFAULT_COLUMN_TOLERANCE };
/** Cycles a column typically steps to its periodic state, for the progress estimate only (the bench column: 8-9). */
const TYPICAL_COLUMN_CYCLES = 9;

/** Most fixed steps in one column cycle (a cap: more would be refused by the workload check first at any usual depth). */
export const MAX_COLUMN_STEPS_PER_CYCLE = 2_000_000;

export interface ColumnLayout {
  tRef: number;
  cRef: number;
  cycleSeconds: number;
  solarDay: number | null;
  /** The shortest forcing period (the solar day, or the orbit), s. */
  shortestSeconds: number;
  shortSkin: number;
  orbitalM: number;
  grid: ReturnType<typeof buildColumnGrid>;
  /** Steps the grid's steps per shortest period ask for over the cycle, before the cap. */
  stepsAsked: number;
  stepsPerCycle: number;
}

/** The column's layers and its fixed steps per cycle, as the solve will take them (the workload check reads them first). */
export function columnLayout(thermal: ThermalCase, model: ColumnModel): ColumnLayout {
  const column = model.heatStore.column;
  const { orbit } = thermal;
  const p = column.properties;
  const tRef = model.meanFluxEquilibriumK;
  const cRef = specificHeatAt(p, tRef);
  const cycleSeconds = orbit.periodSeconds * model.cycleOrbits;
  const solarDay = model.solarDaySeconds ?? null;
  const shortest = solarDay !== null && solarDay < cycleSeconds ? solarDay : orbit.periodSeconds;
  const shortSkin = skinDepthM(p.conductivitySurface, p.densitySurface, cRef, shortest);
  const orbitalM = skinDepthM(p.conductivityDeep, p.densityDeep, cRef, cycleSeconds);
  const grid = buildColumnGrid(p, shortSkin, orbitalM, column.grid);
  const stepsAsked = Math.max(64, Math.ceil(column.grid.stepsPerShortestPeriod * (cycleSeconds / shortest)));
  return { tRef, cRef, cycleSeconds, solarDay, shortestSeconds: shortest, shortSkin, orbitalM, grid, stepsAsked, stepsPerCycle: Math.min(MAX_COLUMN_STEPS_PER_CYCLE, stepsAsked) };
}

export function columnCycle(thermal: ThermalCase, model: ColumnModel, request: CycleRequest): ConvergedCycle {
  const rtol = request.relativeTolerance;
  requireNumber("tolerance", rtol, (t) => t >= MIN_COLUMN_TOLERANCE && t <= 1e-2, `${MIN_COLUMN_TOLERANCE} ≤ tolerance ≤ 1e-2`);
  if (request.transient) {
    throw new CalorbitError("INVALID_ARGUMENT", "no transient mode for a conduction column", [
      { path: "from", given: `${request.transient.startK} K`, allowed: "no transient mode for a conduction column yet (it runs to its periodic state)" },
    ]);
  }
  if (!model.commensurate) {
    throw new CalorbitError("INVALID_ARGUMENT", "a conduction column needs an exact forcing cycle", [
      { path: "spin", given: "a spin not commensurate with the orbit", allowed: "spin.orbitRatio (p:q), or a spin period that is a p:q resonance" },
    ]);
  }
  const column = model.heatStore.column;
  const { orbit } = thermal;
  const p = column.properties;
  const { tRef, cRef, solarDay, shortSkin, orbitalM, grid, stepsPerCycle } = columnLayout(thermal, model);
  const diurnalM = solarDay !== null ? skinDepthM(p.conductivitySurface, p.densitySurface, cRef, solarDay) : null;
  // Cells that exchange no heat: one column under each, solved on its own (the same grid and steps,
  // so the step grids coincide); the first cell's column gives the depth extras.
  const cellCount = model.stateNames.length;
  const progress = request.progress?.active ? request.progress : undefined;
  const onCycle = progress ? (cycles: number) => progress.report(estimatedShare(cycles, TYPICAL_COLUMN_CYCLES), "column") : undefined;
  const results = model.stateNames.map((_, i) => {
    progress?.part(i / cellCount, 1 / cellCount);
    return solveColumnPeriodic(
      {
        properties: p,
        grid,
        emissivity: thermal.surface.emissivity,
        interiorFluxWPerM2: column.interiorFluxWPerM2,
        absorbedAt: (E) => model.absorbedAt(E, i),
        timeAt: (E) => timeAtEccentric(orbit, E),
        startE: request.startE,
        cycleLength: TWO_PI * model.cycleOrbits,
        stepsPerCycle,
        initialK: tRef,
        shortSkinDepthM: shortSkin,
        ...(onCycle ? { onCycle } : {}),
      },
      rtol,
    );
  });
  const result = results[0]!;

  // Statistics on the step grid (uniform in E). dT/dE: the harmonic mean of the two one-sided
  // slopes, zero where they differ in sign (Fritsch & Butland 1984): second order where T is smooth
  // and monotone, and no overshoot at sunrise, whose corner a central difference would round into a
  // minimum below every step (1.4 K below on the regolith demo). The last point is the first of the
  // next cycle.
  const statsE = result.stepE;
  const steps = statsE.length - 1;
  const h = statsE[1]! - statsE[0]!;
  const statsY = new Float64Array((steps + 1) * cellCount);
  const statsDerivative = new Float64Array((steps + 1) * cellCount);
  results.forEach((cell, i) => {
    const surfaceK = cell.surfaceK;
    for (let k = 0; k <= steps; k++) {
      const here = surfaceK[k]!;
      const back = (here - surfaceK[k === 0 ? steps - 1 : k - 1]!) / h;
      const ahead = (surfaceK[k === steps ? 1 : k + 1]! - here) / h;
      statsY[k * cellCount + i] = here;
      statsDerivative[k * cellCount + i] = back * ahead > 0 ? (2 * back * ahead) / (back + ahead) : 0;
    }
  });
  const sunriseMinima = results.map((cell, i) => sunriseMinimum(statsE, cell.surfaceK, (E) => model.absorbedAt(E, i)));
  const surfaceK = result.surfaceK;

  // Output grid, uniform in time, interpolated linearly in time from the fine step grid.
  const count = request.samples(model.cycleOrbits);
  const n = grid.thicknessM.length;
  const times = Float64Array.from(statsE, (E) => timeAtEccentric(orbit, E));
  const outputE = anomaliesUniformInTime(orbit, request.startE, model.cycleOrbits, count);
  const outputY = new Float64Array(count * cellCount);
  const depths = column.outputDepthsM.map((depthM) => ({ depthM, temperatureK: new Float64Array(count) }));
  const layerAt = (step: number, z: number): number => {
    // Linear in depth between layer centres (the surface node above the first centre).
    if (z <= grid.centreM[0]!) {
      const f = z / grid.centreM[0]!;
      return (1 - f) * surfaceK[step]! + f * result.layerK[step * n]!;
    }
    let i = 0;
    while (i < n - 2 && grid.centreM[i + 1]! < z) i++;
    const f = Math.min(1, (z - grid.centreM[i]!) / (grid.centreM[i + 1]! - grid.centreM[i]!));
    return (1 - f) * result.layerK[step * n + i]! + f * result.layerK[step * n + i + 1]!;
  };
  let k = 0;
  for (let j = 0; j < count; j++) {
    const t = timeAtEccentric(orbit, outputE[j]!);
    while (k < steps - 1 && times[k + 1]! < t) k++;
    const w = Math.min(1, Math.max(0, (t - times[k]!) / (times[k + 1]! - times[k]!)));
    for (let i = 0; i < cellCount; i++) outputY[j * cellCount + i] = (1 - w) * results[i]!.surfaceK[k]! + w * results[i]!.surfaceK[k + 1]!;
    for (const d of depths) d.temperatureK[j] = (1 - w) * layerAt(k, d.depthM) + w * layerAt(k + 1, d.depthM);
  }

  const stride = Math.max(1, Math.ceil(steps / 240));
  const heatMap = { depthsM: Array.from(grid.centreM), timesSeconds: [] as number[], temperatureK: [] as number[][] };
  for (let kk = 0; kk <= steps; kk += stride) {
    heatMap.timesSeconds.push(times[kk]! - times[0]!);
    heatMap.temperatureK.push(Array.from(result.layerK.subarray(kk * n, kk * n + n)));
  }
  const q = column.interiorFluxWPerM2;
  // The whole surface's budget: each column's own (its scheme's), area-weighted.
  let absorbed = 0;
  let stellar = 0;
  let emitted = 0;
  let cycles = 0;
  let mostCycles = 0;
  let periodicity = 0;
  results.forEach((cell, i) => {
    const w = model.areaWeights[i]!;
    stellar += w * cell.meanAbsorbedWPerM2;
    absorbed += w * (cell.meanAbsorbedWPerM2 + q);
    emitted += w * cell.meanEmittedWPerM2;
    cycles += cell.cycles;
    mostCycles = Math.max(mostCycles, cell.cycles);
    periodicity = Math.max(periodicity, cell.periodicityResidual);
  });
  return {
    statsE,
    statsY,
    statsDerivative,
    cornerMinima: sunriseMinima,
    outputE,
    outputY,
    outputStartSeconds: 0,
    solver: {
      mode: "periodic",
      integrator: "crank-nicolson",
      requestedTolerance: rtol,
      odeRelativeTolerance: null,
      iterations: mostCycles,
      orbitsIntegrated: cycles * model.cycleOrbits,
      periodicityResidual: periodicity,
      steps: stepsPerCycle * cycles,
      rejectedSteps: 0,
      evaluations: stepsPerCycle * cycles,
      layers: n,
      stepsPerCycle,
    },
    column: {
      thermalInertiaSurface: thermalInertia(p.conductivitySurface, p.densitySurface, cRef),
      skinDepths: { diurnalM, orbitalM },
      depthProfile: Array.from(grid.centreM, (z, i) => ({ depthM: z, minK: result.profileMinK[i]!, maxK: result.profileMaxK[i]!, meanK: result.profileMeanK[i]! })),
      depths,
      heatMap,
      energy: {
        meanAbsorbedWPerM2: absorbed,
        meanEmittedWPerM2: emitted,
        residual: cellCount === 1 ? result.energyBalanceResidual : (absorbed - emitted) / stellar,
      },
    },
  };
}

/**
 * The lowest surface temperature at a sunrise, from the steps: a lit point's minimum falls at sunrise
 * (the forcing's corner), between two fixed steps, so the lowest step misses the end of the night's
 * cooling by the cooling rate times the part of a step left (0.024 K on the bench column, varying
 * with where sunrise falls in the grid). At each sunrise (found by bisection on the forcing), the
 * night branch, smooth up to the corner, is extrapolated to the sunrise time by the parabola through
 * the three steps before it. Null when the forcing never switches on.
 */
export function sunriseMinimum(stepE: Float64Array, surfaceK: Float64Array, absorbedAt: (E: number) => number): { E: number; K: number } | null {
  const steps = stepE.length - 1;
  const h = stepE[1]! - stepE[0]!;
  const at = (j: number): number => surfaceK[((j % steps) + steps) % steps]!; // periodic: step `steps` is step 0
  let best: { E: number; K: number } | null = null;
  let litBefore = absorbedAt(stepE[0]!) > 0;
  for (let k = 0; k < steps; k++) {
    const litAfter = absorbedAt(stepE[k + 1]!) > 0;
    if (!litBefore && litAfter) {
      let lo = stepE[k]!;
      let hi = stepE[k + 1]!;
      for (let i = 0; i < 60; i++) {
        const mid = 0.5 * (lo + hi);
        if (absorbedAt(mid) > 0) hi = mid;
        else lo = mid;
      }
      // Lagrange parabola through steps k − 2, k − 1, k at x = 0, 1, 2, evaluated at x = 2 + s. A
      // sunrise on a step's end (to rounding) is that step's own value, whichever side rounding put it.
      const s = (lo - stepE[k]!) / h;
      const x = 2 + s;
      const K = 1 - s <= 1e-9 ? at(k + 1) : (at(k - 2) * (x - 1) * (x - 2)) / 2 - at(k - 1) * x * (x - 2) + (at(k) * x * (x - 1)) / 2;
      if (best === null || K < best.K) best = { E: lo, K };
    }
    litBefore = litAfter;
  }
  return best;
}
