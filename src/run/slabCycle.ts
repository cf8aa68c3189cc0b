/**
 * The converged cycle of a slab surface (one temperature per cell): periodic shooting on the exact
 * cycle, a seasonal run for a spin that never repeats exactly, or a transient from a given start.
 * The dense output fills the output grid (uniform in time) and the statistics grid (uniform in E).
 */
import { timeMean } from "../analysis/cycleStatistics.js";
import { anomaliesUniformInTime, type AnomalyTrig } from "../analysis/orbitSampling.js";
import { CalorbitError } from "../errors.js";
import type { SlabModel } from "../model/build.js";
import { exchangeCarriesHeat } from "../model/exchange.js";
import type { ThermalCase } from "../model/thermalCase.js";
import { integrateCycle, plainOdeTolerance, solvePeriodic, type IntegratorName } from "../solve/periodic.js";
import { switchPoints } from "../solve/corners.js";
import { chooseCellsIntegrator, choosePeriodicMethod, solvePeriodicKrylov } from "../solve/periodicKrylov.js";
import { addWork, emptyWork, type SolverWork } from "../solve/system.js";
import type { ConvergedCycle, CycleRequest, SolverReport } from "./cycle.js";
import { estimatedShare, type ProgressMeter } from "./progress.js";

const TWO_PI = 2 * Math.PI;
/** Step caps of one orbit's integration: a runaway guard, raised for a point that sees many sunrises. */
const MIN_STEP_CAP = 200_000;
const STEPS_PER_SOLAR_DAY = 500;
/** Most coupled cells the dense periodic solve takes (n + n² components: 100 cells cost ~10 s, 200 cannot be factorised). */
const MOST_DENSE_CELLS = 100;
/** A non-commensurate spin: the most orbits integrated to forget the start. */
const MAX_SEASONAL_ORBITS = 2000;
/**
 * Cycles a periodic solve typically integrates, for its progress estimate only: dense shooting
 * 3 (the 1:1000 bench point and the demos take 2-4 passes), Newton–Krylov ~20 counting its
 * linearised cycles (50 coupled cells: 22).
 */
const TYPICAL_SHOOTING_CYCLES = 3;
const TYPICAL_KRYLOV_CYCLES = 20;

export function slabCycle(thermal: ThermalCase, model: SlabModel, request: CycleRequest): ConvergedCycle {
  const { orbit } = thermal;
  const n = model.system.dimension;
  const rtol = request.relativeTolerance;
  const mode: SolverReport["mode"] = request.transient ? "transient" : model.commensurate ? "periodic" : "seasonal";
  checkHeated(model, mode);
  const startE = request.startE;
  // A seasonal run is summarised over the beat of spin and orbit: enough orbits that the time of
  // day at a given orbital phase comes back (within 2 % of a day), so the summary does not depend
  // on which orbit it happens to take.
  const beat = mode === "seasonal" ? beatOrbits(model.solarDaySeconds ? orbit.periodSeconds / model.solarDaySeconds : 0, model.statsPointsPerOrbit) : 1;
  const spanOrbits = request.transient ? request.transient.orbits : mode === "periodic" ? model.cycleOrbits : beat;
  const summaryOrbits = mode === "periodic" ? model.cycleOrbits : mode === "seasonal" ? beat : 1;
  const sampleCount = request.samples(spanOrbits);

  const scale = new Float64Array(n).fill(model.meanFluxEquilibriumK);
  // A fast-spinning point sees thousands of sunrises per orbit, each needing its own steps.
  const solarDaysPerOrbit = model.solarDaySeconds ? orbit.periodSeconds / model.solarDaySeconds : 0;
  const maxStepsPerOrbit = Math.max(MIN_STEP_CAP, STEPS_PER_SOLAR_DAY * solarDaysPerOrbit);
  const work: SolverWork = emptyWork();
  let runStartE = startE; // where the sampled span starts (seasonal mode: the last orbit)
  let sampledOrbits = spanOrbits;

  if (mode === "periodic" && model.independentCells) {
    // Block-diagonal Jacobian: each cell's periodic state on its own, sampled on the shared grids.
    const y0 = guessStart(model, thermal);
    const grids = makeGrids(orbit, startE, spanOrbits, summaryOrbits, sampleCount, model.statsPointsPerOrbit, n);
    const xs = grids.dense.xs;
    const one = { xs, ys: new Float64Array(xs.length), components: 1 };
    let iterations = 0;
    let cycles = 0;
    let residual = 0;
    let odeTol = 0;
    let integrator: IntegratorName | undefined;
    const cellCount = model.independentCells.length;
    model.independentCells.forEach((system, i) => {
      request.progress?.part(i / cellCount, 1 / cellCount);
      // A cell that nothing heats (a night side with no exchange and no internal flux) has the
      // periodic state 0 K: radiative cooling alone only approaches it, so it is set, not shot.
      if (isDark(model, i)) {
        for (let k = 0; k < xs.length; k++) grids.dense.ys[k * n + i] = 0;
        return;
      }
      const result = solvePeriodic(
        {
          system,
          start: startE,
          cycleLength: TWO_PI * model.cycleOrbits,
          guess: Float64Array.of(y0[i]!),
          scale: Float64Array.of(model.meanFluxEquilibriumK),
          stiffness: model.stiffness,
          maxStepsPerCycle: maxStepsPerOrbit * model.cycleOrbits,
          forcingHasCorners: model.forcingHasCorners,
          ...breakpointsOf(model, startE, [i]),
          memoryEstimate: -Math.expm1((-model.cycleOrbits * orbit.periodSeconds) / model.radiativeTimeSeconds),
        },
        { relativeTolerance: rtol, samples: one, ...(request.integrator ? { integrator: request.integrator } : {}), ...onCycle(request.progress, TYPICAL_SHOOTING_CYCLES) },
      );
      for (let k = 0; k < xs.length; k++) grids.dense.ys[k * n + i] = one.ys[k]!;
      addWork(work, result.work);
      iterations = Math.max(iterations, result.iterations);
      cycles += result.cyclesIntegrated;
      residual = Math.max(residual, result.periodicityResidual ?? 0);
      odeTol = Math.max(odeTol, result.odeRelativeTolerance);
      integrator = result.integrator;
    });
    const solver = report("periodic", integrator!, rtol, odeTol, iterations, cycles * model.cycleOrbits, residual, work);
    return converged(model, grids, solver, 0);
  }

  if (mode === "periodic") {
    const y0 = guessStart(model, thermal);
    const grids = makeGrids(orbit, startE, spanOrbits, summaryOrbits, sampleCount, model.statsPointsPerOrbit, n);
    // Coupled cells: the dense variational equations for a few, matrix-free Newton–Krylov for many.
    const krylov = (request.periodicMethod ?? choosePeriodicMethod(n)) === "newton-krylov";
    if (!krylov && n > MOST_DENSE_CELLS) {
      throw new CalorbitError("INVALID_ARGUMENT", `the dense periodic solve of ${n} coupled cells would integrate ${n + n * n} components`, [
        { path: "periodicMethod", given: "dense", allowed: `newton-krylov above ${MOST_DENSE_CELLS} coupled cells (dense: at most ${MOST_DENSE_CELLS})` },
      ]);
    }
    const result = (krylov ? solvePeriodicKrylov : solvePeriodic)(
      {
        system: model.system,
        start: startE,
        cycleLength: TWO_PI * model.cycleOrbits,
        guess: y0,
        scale,
        stiffness: model.stiffness,
        maxStepsPerCycle: maxStepsPerOrbit * model.cycleOrbits,
        forcingHasCorners: model.forcingHasCorners,
        ...breakpointsOf(model, startE, model.stateNames.map((_, i) => i)),
        memoryEstimate: krylov
          ? slowestMemory(model, y0, orbit.periodSeconds)
          : -Math.expm1((-model.cycleOrbits * orbit.periodSeconds) / model.radiativeTimeSeconds),
      },
      {
        relativeTolerance: rtol,
        samples: grids.dense,
        ...(request.integrator ? { integrator: request.integrator } : {}),
        ...onCycle(request.progress, krylov ? TYPICAL_KRYLOV_CYCLES : TYPICAL_SHOOTING_CYCLES),
      },
    );
    addWork(work, result.work);
    const solver = report("periodic", result.integrator, rtol, result.odeRelativeTolerance, result.iterations, result.cyclesIntegrated * model.cycleOrbits, result.periodicityResidual, work);
    return converged(model, grids, solver, 0);
  }

  const integrator = request.integrator ?? chooseCellsIntegrator(model.stiffness / model.cycleOrbits, n, model.forcingHasCorners);
  const odeTol = plainOdeTolerance(rtol, model.forcingHasCorners);
  const y = request.transient ? new Float64Array(n).fill(request.transient.startK) : guessStart(model, thermal);
  let orbitsIntegrated = 0;
  let change: number | null = null;
  if (mode === "seasonal") {
    // No exact cycle: the time of day at a given orbital phase drifts from orbit to orbit, so the
    // state never repeats. Integrate until the start has been forgotten: memory decays as
    // exp(−t/τ), τ taken 8× the mean-temperature value to cover cold nights (τ ∝ T⁻³).
    const memoryOrbits = (8 * model.radiativeTimeSeconds * Math.log(1 / rtol)) / orbit.periodSeconds;
    const spinUpOrbits = Math.ceil(Math.min(MAX_SEASONAL_ORBITS, Math.max(1, memoryOrbits)));
    const probe = makeGrids(orbit, startE, 1, 1, 0, model.statsPointsPerOrbit, n);
    let previousMean = NaN;
    while (orbitsIntegrated < spinUpOrbits) {
      const from = startE + TWO_PI * orbitsIntegrated;
      const shifted = Float64Array.from(probe.statsE, (E) => E + TWO_PI * orbitsIntegrated);
      const ys = new Float64Array(shifted.length * n);
      addWork(work, integrateCycle(model.system, integrator, from, from + TWO_PI, y, odeTol, scale, { xs: shifted, ys, components: n }, maxStepsPerOrbit));
      orbitsIntegrated++;
      request.progress?.report(orbitsIntegrated / (spinUpOrbits + beat), "seasonal");
      const t0 = Float64Array.from({ length: shifted.length }, (_, k) => ys[k * n]!);
      const dtdE = Float64Array.from(shifted, (E) => model.timePerAnomaly(E));
      const mean = timeMean(t0, dtdE);
      change = Math.abs(mean - previousMean) / mean;
      previousMean = mean;
    }
    runStartE = startE + TWO_PI * orbitsIntegrated;
    sampledOrbits = beat;
  }
  const elapsedSeconds = orbitsIntegrated * orbit.periodSeconds;
  const grids = makeGrids(orbit, runStartE, sampledOrbits, summaryOrbits, sampleCount, model.statsPointsPerOrbit, n);
  addWork(
    work,
    integrateCycle(model.system, integrator, runStartE, runStartE + TWO_PI * sampledOrbits, y, odeTol, scale, grids.dense, maxStepsPerOrbit * sampledOrbits),
  );
  orbitsIntegrated += sampledOrbits;
  const solver = report(mode, integrator, rtol, odeTol, 0, orbitsIntegrated, change, work);
  const cycle = converged(model, grids, solver, elapsedSeconds);
  if (mode === "seasonal") cycle.seasonal = { orbits: beat, orbitMeanK: orbitMeanSpread(model, cycle.statsE, cycle.statsY, beat) };
  return cycle;
}

/** The shooting's per-cycle report as a share of its typical count; nothing (no closure) without a listener. */
function onCycle(progress: ProgressMeter | undefined, typical: number): { onCycle?: (cycles: number) => void } {
  if (progress === undefined || !progress.active) return {};
  return { onCycle: (cycles) => progress.report(estimatedShare(cycles, typical), "periodic") };
}

/**
 * 1 − exp(−cycle/τ) of the cell that forgets slowest on its own, τ = C/(4εσT³) at its first-guess
 * temperature: a lower bound on the memory loss of the coupled cycle map (an exchange only adds
 * decay to the differences between cells), which the Newton–Krylov solve cannot measure cheaply.
 */
function slowestMemory(model: SlabModel, guess: Float64Array, periodSeconds: number): number {
  let coldest = Infinity;
  for (let i = 0; i < guess.length; i++) coldest = Math.min(coldest, guess[i]!);
  const tau = model.heatStore.heatCapacityJPerM2K / (4 * model.emissionCoefficient * coldest ** 3);
  return -Math.expm1((-model.cycleOrbits * periodSeconds) / tau);
}

/**
 * The corners of the forcing, for the periodic solve to end steps on, as the surface says to find
 * them (`Surface.cornerSearch`): located by a scan at a quarter of the statistics grid and
 * bisection, or none at all for a forcing that is smooth after all. Otherwise the solve keeps the
 * fine tolerance that corners inside steps need.
 */
function breakpointsOf(model: SlabModel, startE: number, cells: readonly number[]): { breakpoints?: Float64Array } {
  if (!model.forcingHasCorners) return {};
  switch (model.surface.cornerSearch) {
    case "scan": {
      // The corners of every cell integrated together (each cell its own sunrise and sunset).
      const end = startE + TWO_PI * model.cycleOrbits;
      const scan = Math.ceil((model.statsPointsPerOrbit * model.cycleOrbits) / 4);
      const found = cells.map((i) => switchPoints((E) => model.absorbedAt(E, i), startE, end, scan));
      if (found.length === 1) return { breakpoints: found[0]! };
      return { breakpoints: Float64Array.from(new Set(found.flatMap((f) => Array.from(f)))).sort() };
    }
    case "smooth":
      return { breakpoints: new Float64Array(0) };
    default:
      return {};
  }
}

/** Most orbits a seasonal summary spans, and most statistics points it may hold. */
const MAX_BEAT_ORBITS = 64;
const MAX_BEAT_POINTS = 1 << 22;

/**
 * Orbits over which the time of day at a given orbital phase comes back: the least k with k·D within
 * 0.02 of a whole number of solar days (D = solar days per orbit), capped by MAX_BEAT_ORBITS and by
 * the statistics grid's size.
 */
export function beatOrbits(solarDaysPerOrbit: number, statsPointsPerOrbit: number): number {
  const cap = Math.max(1, Math.min(MAX_BEAT_ORBITS, Math.floor(MAX_BEAT_POINTS / statsPointsPerOrbit)));
  if (!(solarDaysPerOrbit > 0)) return 1;
  for (let k = 1; k <= cap; k++) {
    const days = k * solarDaysPerOrbit;
    if (Math.abs(days - Math.round(days)) <= 0.02 && Math.round(days) >= 1) return k;
  }
  return cap;
}

/** Lowest and highest orbit-mean temperature of cell 0 over the summarised orbits, K. */
function orbitMeanSpread(model: SlabModel, statsE: Float64Array, statsY: Float64Array, orbits: number): { minK: number; maxK: number } {
  const n = model.stateNames.length;
  const perOrbit = (statsE.length - 1) / orbits;
  let minK = Infinity;
  let maxK = -Infinity;
  for (let j = 0; j < orbits; j++) {
    const t = new Float64Array(perOrbit + 1);
    const w = new Float64Array(perOrbit + 1);
    for (let k = 0; k <= perOrbit; k++) {
      t[k] = statsY[(j * perOrbit + k) * n]!;
      w[k] = model.timePerAnomaly(statsE[j * perOrbit + k]!);
    }
    const mean = timeMean(t, w);
    minK = Math.min(minK, mean);
    maxK = Math.max(maxK, mean);
  }
  return { minK, maxK };
}

/** The dense output split into the two grids, with dT/dE on the statistics grid from the system itself. */
function converged(model: SlabModel, grids: Grids, solver: SolverReport, outputStartSeconds: number): ConvergedCycle {
  const { outputY, statsY } = grids.scatter();
  const n = model.system.dimension;
  const statsDerivative = new Float64Array(statsY.length);
  const y = new Float64Array(n);
  const dy = new Float64Array(n);
  for (let k = 0; k < grids.statsE.length; k++) {
    for (let i = 0; i < n; i++) y[i] = statsY[k * n + i]!;
    model.system.derivative(grids.statsE[k]!, y, dy);
    for (let i = 0; i < n; i++) statsDerivative[k * n + i] = dy[i]!;
  }
  return { statsE: grids.statsE, statsY, statsDerivative, outputE: grids.outputE, outputY, outputTrig: grids.outputTrig, outputStartSeconds, solver };
}

function report(
  mode: SolverReport["mode"],
  integrator: IntegratorName,
  rtol: number,
  odeTol: number,
  iterations: number,
  orbits: number,
  residual: number | null,
  work: SolverWork,
): SolverReport {
  return {
    mode,
    integrator,
    requestedTolerance: rtol,
    odeRelativeTolerance: odeTol,
    iterations,
    orbitsIntegrated: orbits,
    periodicityResidual: residual,
    steps: work.steps,
    rejectedSteps: work.rejected,
    evaluations: work.evaluations,
  };
}

/** True for a cell that nothing heats: no starlight over the cycle, no internal flux, no exchange into it. */
export function isDark(model: SlabModel, cell: number): boolean {
  return model.surface.cells[cell]!.forcing.meanAbsorbedWPerM2 <= 0 && !(model.internalFluxWPerM2 > 0) && !exchangeCarriesHeat(model.exchange);
}

/**
 * A surface that nothing heats cools toward 0 K: there is no periodic state to find. One dark cell
 * among independent lit cells is fine (it is 0 K, the night side's published limit); a dark
 * single cell, or one the solver could not separate from its neighbours, is refused.
 */
function checkHeated(model: SlabModel, mode: SolverReport["mode"]): void {
  if (mode === "transient") return;
  for (let i = 0; i < model.surface.cells.length; i++) {
    if (!isDark(model, i)) continue;
    const cell = model.surface.cells[i]!;
    if (model.surface.cells.length > 1) {
      if (mode === "periodic" && model.independentCells && model.surface.cells.some((_, j) => !isDark(model, j))) continue;
      throw new CalorbitError("INVALID_ARGUMENT", `the ${cell.name} side has no heat source: give body.recirculation or body.exchangeCoefficient a value above 0 to carry heat from the day side, or body.internalFlux one above 0`, [
        { path: "body", given: "no recirculation, exchange coefficient or internal flux", allowed: "body.recirculation > 0, body.exchangeCoefficient > 0 or body.internalFlux > 0" },
      ]);
    }
    throw new CalorbitError("INVALID_ARGUMENT", "the surface never sees the star", [
      { path: "surface", given: "a point or band in permanent night", allowed: "a place that is lit during the cycle, or body.internalFlux > 0" },
    ]);
  }
}

/**
 * First guess of the periodic start state from linear response: each state's T_eq expanded in
 * harmonics of the mean anomaly, each passed through the first-order filter 1/(1 + i k ωτ)
 * (standard), the mean moved from ⟨T_eq⟩ toward the mean-flux equilibrium as memory grows.
 * Newton then has only the nonlinearity to remove: typically two or three cycles.
 */
function guessStart(model: SlabModel, thermal: ThermalCase): Float64Array {
  const n = model.system.dimension;
  const e = thermal.orbit.eccentricity;
  const points = 64;
  const harmonics = 3;
  const a = new Float64Array((harmonics + 1) * n);
  const b = new Float64Array((harmonics + 1) * n);
  const fourth = new Float64Array(n); // ⟨T_eq⁴⟩: a slab with long memory sits near its fourth root
  const eq = new Float64Array(n);
  for (let j = 0; j < points; j++) {
    const E = (TWO_PI * j) / points;
    const M = E - e * Math.sin(E);
    const weight = (1 - e * Math.cos(E)) / points; // dM/dE over 2π, trapezoidal in E
    model.equilibriumAt(E, eq);
    const c1 = Math.cos(M);
    const s1 = Math.sin(M);
    let ck = 1; // cos kM and sin kM by the angle-addition recurrence
    let sk = 0;
    for (let k = 0; k <= harmonics; k++) {
      for (let i = 0; i < n; i++) {
        a[k * n + i]! += eq[i]! * ck * weight;
        b[k * n + i]! += eq[i]! * sk * weight;
      }
      const next = ck * c1 - sk * s1;
      sk = sk * c1 + ck * s1;
      ck = next;
    }
    for (let i = 0; i < n; i++) fourth[i]! += eq[i]! ** 4 * weight;
  }
  const omegaTau = (TWO_PI * model.radiativeTimeSeconds) / thermal.orbit.periodSeconds;
  const memory = (omegaTau * omegaTau) / (1 + omegaTau * omegaTau);
  const m0 = thermal.orbit.meanAnomalyAtStartRad;
  const guess = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let t = memory * Math.sqrt(Math.sqrt(fourth[i]!)) + (1 - memory) * a[i]!;
    for (let k = 1; k <= harmonics; k++) {
      // 2 Re[(a − i b) e^{ikM₀} / (1 + i k ωτ)]
      const x = k * omegaTau;
      const c = Math.cos(k * m0);
      const s = Math.sin(k * m0);
      const re = a[k * n + i]! * c + b[k * n + i]! * s;
      const im = a[k * n + i]! * s - b[k * n + i]! * c;
      t += (2 * (re + x * im)) / (1 + x * x);
    }
    guess[i] = Math.max(t, 0.3 * model.meanFluxEquilibriumK);
  }
  return guess;
}

interface Grids {
  outputE: Float64Array;
  outputTrig: AnomalyTrig;
  statsE: Float64Array;
  dense: { xs: Float64Array; ys: Float64Array; components: number };
  /** Splits the dense output back into the two grids. */
  scatter(): { outputY: Float64Array; statsY: Float64Array };
}

/**
 * The output grid (uniform in time over the span; Kepler solved once per sample, never inside the
 * ODE) and the statistics grid (uniform in E over the last `summaryOrbits` orbits), merged into one
 * ascending grid so that a single dense pass fills both.
 */
function makeGrids(
  orbit: ThermalCase["orbit"],
  startE: number,
  spanOrbits: number,
  summaryOrbits: number,
  sampleCount: number,
  statsPointsPerOrbit: number,
  n: number,
): Grids {
  const outputTrig = { sinE: new Float64Array(sampleCount), cosE: new Float64Array(sampleCount) };
  const outputE = anomaliesUniformInTime(orbit, startE, spanOrbits, sampleCount, outputTrig);
  const statsCount = statsPointsPerOrbit * summaryOrbits + 1;
  const statsStart = startE + TWO_PI * (spanOrbits - summaryOrbits);
  const statsE = new Float64Array(statsCount);
  for (let k = 0; k < statsCount; k++) statsE[k] = statsStart + (TWO_PI * k) / statsPointsPerOrbit;

  const total = sampleCount + statsCount;
  const xs = new Float64Array(total);
  const origin = new Int32Array(total); // ≥ 0: output index; < 0: −(stats index) − 1
  let i = 0;
  let j = 0;
  for (let k = 0; k < total; k++) {
    if (j >= statsCount || (i < sampleCount && outputE[i]! <= statsE[j]!)) {
      xs[k] = outputE[i]!;
      origin[k] = i++;
    } else {
      xs[k] = statsE[j]!;
      origin[k] = -(j++) - 1;
    }
  }
  const dense = { xs, ys: new Float64Array(total * n), components: n };
  return {
    outputE,
    outputTrig,
    statsE,
    dense,
    scatter() {
      const outputY = new Float64Array(sampleCount * n);
      const statsY = new Float64Array(statsCount * n);
      for (let k = 0; k < total; k++) {
        const o = origin[k]!;
        const target = o >= 0 ? outputY : statsY;
        const index = o >= 0 ? o : -o - 1;
        for (let c = 0; c < n; c++) target[index * n + c] = dense.ys[k * n + c]!;
      }
      return { outputY, statsY };
    },
  };
}

