/**
 * The periodic climate of the band system through the orbit: a start T₀ (one temperature per
 * band) with Φ(T₀) = T₀, Φ the orbit map of the zonal stepper.
 *
 * 1. Spin-up: whole orbits on a coarse step grid from the requested start (warm or cold) until
 *    the pattern of iced bands stops changing and an orbit moves no band by more than 1 K. This
 *    is what makes "warm start" and "cold start" mean something: Newton alone can land on any
 *    fixed point, including the unstable partly-iced states between two climates.
 * 2. Newton–Krylov on g(T₀) = Φ(T₀) − T₀: each correction solves (∂Φ/∂T₀ − I) δ = −g by GMRES,
 *    whose products are linearised orbits (two tridiagonal solves per step; a dissipative orbit
 *    map has its spectrum inside the unit disc, so GMRES needs a handful). A backtracking line
 *    search on ‖g‖ guards against the kinks of ice switching; when it fails, plain orbits (which
 *    always head for an attractor) are integrated before Newton resumes.
 * 3. Stability: the spectral radius of ∂Φ/∂T₀ at the fixed point by power iteration. A fixed point
 *    with radius ≥ 1 is not a climate the planet would keep: the solver spins up further, and if
 *    it cannot find a stable periodic state it raises PERIODIC_NO_CONVERGENCE, naming a limit
 *    cycle or slow drift, rather than return a state the planet would not keep.
 */
import { CalorbitError } from "../errors.js";
import { gmres } from "./gmres.js";
import { cycleRecord, stepGrid, ZonalStepper, type CycleRecord, type StepGrid } from "./zonalStepper.js";

export interface ZonalPeriodicOptions {
  /** Steps per orbit of the final state. */
  stepsPerOrbit: number;
  /** Periodicity target, K: max |Φ(T₀) − T₀| (default 1e-6 K). */
  periodicityToleranceK?: number;
  /** Energy target: |Σ w ΔH| over the orbit / (absorbed energy) (default 1e-10). */
  energyTolerance?: number;
  /** Cap on whole orbits integrated at the final resolution (default 400). */
  maxOrbits?: number;
  /** Cap on spin-up orbits on the coarse grid (default 2000). */
  maxSpinUpOrbits?: number;
  /**
   * Called after each orbit integrated (coarse, fine or linearised; never inside one) with the work
   * so far in fine-orbit equivalents: a coarse orbit counts its share of the fine steps (progress).
   */
  onOrbit?: (fineOrbits: number) => void;
}

export interface ZonalPeriodicResult {
  start: Float64Array;
  grid: StepGrid;
  /** The converged orbit (step-end temperatures, quadrature sums). */
  record: CycleRecord;
  newtonIterations: number;
  /** Nonlinear orbits at the final resolution, linearised orbits (GMRES and power iteration), coarse orbits (spin-up and the coarse Newton level). */
  orbits: number;
  linearOrbits: number;
  spinUpOrbits: number;
  /** max |Φ(T₀) − T₀| on the last orbit, K. */
  periodicityResidualK: number;
  /** Spectral radius of ∂Φ/∂T₀ (< 1: the climate is stable from orbit to orbit). */
  monodromyRadius: number;
  stageNewtonIterations: number;
}

const SPIN_UP_CHANGE_K = 1;
/** The coarse level stops here, K: well inside the distance between the coarse and fine fixed points' basins, far above their difference. */
const COARSE_PERIODICITY_K = 1e-3;
const POWER_ITERATIONS = 30;
/** Power iteration stops once the estimate changes by less than this share. */
const POWER_SETTLED = 1e-3;
const MAX_STABILITY_ROUNDS = 3;

export function solveZonalPeriodic(stepper: ZonalStepper, initial: Float64Array, iceFraction: (t: Float64Array, out: Uint8Array) => void, options: ZonalPeriodicOptions): ZonalPeriodicResult {
  const system = stepper.system;
  const n = system.grid.count;
  const tolK = options.periodicityToleranceK ?? 1e-6;
  const energyTol = options.energyTolerance ?? 1e-10;
  const maxOrbits = options.maxOrbits ?? 400;
  const maxSpin = options.maxSpinUpOrbits ?? 2000;
  const fine = stepGrid(system, options.stepsPerOrbit);
  const coarseSteps = Math.max(24, Math.round(options.stepsPerOrbit / 4));
  const coarse = coarseSteps < options.stepsPerOrbit ? stepGrid(system, coarseSteps) : fine;

  const t0 = Float64Array.from(initial);
  let spinUpOrbits = 0;
  const coarseShare = coarse.steps / fine.steps;
  const onOrbit = options.onOrbit;
  const tick = (): void => onOrbit?.((spinUpOrbits + coarseOrbits) * coarseShare + orbits + linearOrbits);
  const coarseRecord = cycleRecord(n, coarse.steps);
  const patternBefore = new Uint8Array(n);
  const patternAfter = new Uint8Array(n);
  /**
   * Coarse orbits until the pattern of iced bands has held for `calmOrbits` orbits in a row while
   * no band moved more than `changeK` over an orbit (an ice edge marches band by band, each band
   * taking several orbits: a pattern that held for one orbit proves little).
   */
  const spinUp = (limit: number, changeK: number, calmOrbits: number): void => {
    iceFraction(t0, patternBefore);
    let calm = 0;
    for (let c = 0; c < limit && spinUpOrbits < maxSpin; c++) {
      const end = stepper.cycle(coarse, t0, coarseRecord);
      spinUpOrbits++;
      tick();
      let change = 0;
      for (let j = 0; j < n; j++) change = Math.max(change, Math.abs(end[j]! - t0[j]!));
      t0.set(end);
      iceFraction(t0, patternAfter);
      let same = true;
      for (let j = 0; j < n; j++) if (patternAfter[j] !== patternBefore[j]) same = false;
      patternBefore.set(patternAfter);
      calm = same && change < changeK ? calm + 1 : 0;
      if (calm >= calmOrbits) return;
    }
  };

  let orbits = 0;
  let coarseOrbits = 0;
  let linearOrbits = 0;
  let newtonIterations = 0;
  const g = new Float64Array(n);
  const delta = new Float64Array(n);
  const candidate = new Float64Array(n);
  const product = new Float64Array(n);

  /** One level of Newton–Krylov on `grid`, from t0 (updated in place); returns the accepted orbit's record and residual. */
  const newton = (grid: StepGrid, records: [CycleRecord, CycleRecord], periodicK: number, energy: number): { record: CycleRecord; residual: number } => {
    let [accepted, trial] = records;
    const isFine = grid === fine;
    const evaluate = (start: Float64Array, record: CycleRecord, out: Float64Array): number => {
      if (isFine ? orbits >= maxOrbits : coarseOrbits >= maxOrbits) throw notSettled(orbits + coarseOrbits + spinUpOrbits, norm(out));
      const end = stepper.cycle(grid, start, record);
      if (isFine) orbits++;
      else coarseOrbits++;
      tick();
      let largest = 0;
      for (let j = 0; j < n; j++) {
        out[j] = end[j]! - start[j]!;
        largest = Math.max(largest, Math.abs(out[j]!));
      }
      if (!Number.isFinite(largest)) throw new CalorbitError("INTEGRATION_FAILED", "the band temperatures left the finite range");
      return largest;
    };
    const energyDefect = (record: CycleRecord): number => {
      const weights = system.grid.areaFraction;
      const last = grid.steps * n;
      let sum = 0;
      for (let j = 0; j < n; j++) sum += weights[j]! * (system.heatCapacity.heat(record.temperatureK[last + j]!) - system.heatCapacity.heat(record.temperatureK[j]!));
      return Math.abs(sum) / Math.max(record.absorbedSum + record.internalSum, 1e-300);
    };
    const jacobianMinusIdentity = (v: Float64Array, out: Float64Array): void => {
      stepper.linearCycle(grid, accepted, v, out);
      linearOrbits++;
      tick();
      for (let j = 0; j < n; j++) out[j] = out[j]! - v[j]!;
    };
    let residual = evaluate(t0, accepted, g);
    let stalled = 0;
    for (;;) {
      if (residual <= periodicK && energyDefect(accepted) <= energy) break;
      newtonIterations++;
      for (let j = 0; j < n; j++) g[j] = -g[j]!;
      gmres(jacobianMinusIdentity, g, delta, { relativeTolerance: 1e-4, restart: 30, maxProducts: 90 });
      for (let j = 0; j < n; j++) g[j] = -g[j]!;
      let lambda = 1;
      let improved = false;
      for (let tries = 0; tries < 5; tries++) {
        for (let j = 0; j < n; j++) candidate[j] = Math.max(t0[j]! + lambda * delta[j]!, 0.5 * t0[j]!);
        const trialResidual = evaluate(candidate, trial, product);
        if (trialResidual <= (1 - 1e-4 * lambda) * residual) {
          t0.set(candidate);
          g.set(product);
          [accepted, trial] = [trial, accepted];
          residual = trialResidual;
          improved = true;
          break;
        }
        lambda *= 0.5;
      }
      if (!improved) {
        // Rounding floor: the defect no longer shrinks but the budget already closes.
        if (residual <= 100 * periodicK && energyDefect(accepted) <= 10 * energy) break;
        stalled++;
        if (stalled > 20) throw notSettled(orbits + coarseOrbits + spinUpOrbits, residual);
        // Plain orbits head for an attractor (typically an ice edge still on the march): spin up
        // further on the coarse grid, more strictly, then Newton again.
        const before = spinUpOrbits;
        spinUp(200, 0.1 * SPIN_UP_CHANGE_K, 5);
        if (spinUpOrbits === before) throw notSettled(orbits + coarseOrbits + spinUpOrbits, residual);
        residual = evaluate(t0, accepted, g);
      }
    }
    return { record: accepted, residual };
  };

  const fineRecords: [CycleRecord, CycleRecord] = [cycleRecord(n, fine.steps), cycleRecord(n, fine.steps)];
  const coarseRecords: [CycleRecord, CycleRecord] = coarse === fine ? fineRecords : [coarseRecord, cycleRecord(n, coarse.steps)];
  for (let round = 0; round <= MAX_STABILITY_ROUNDS; round++) {
    spinUp(round === 0 ? maxSpin : 200, SPIN_UP_CHANGE_K, 3);
    // Two levels: the coarse orbit's fixed point lies within the time-step error of the fine one,
    // so Newton's long, damped first steps are taken at a quarter of the cost.
    if (coarse !== fine) newton(coarse, coarseRecords, COARSE_PERIODICITY_K, Infinity);
    const { record, residual } = newton(fine, fineRecords, tolK, energyTol);
    const radius = spectralRadius(n, (v, out) => {
      stepper.linearCycle(fine, record, v, out);
      linearOrbits++;
      tick();
    });
    if (radius < 1) {
      return {
        start: t0,
        grid: fine,
        record,
        newtonIterations,
        orbits,
        linearOrbits,
        spinUpOrbits: spinUpOrbits + coarseOrbits,
        periodicityResidualK: residual,
        monodromyRadius: radius,
        stageNewtonIterations: stepper.newtonIterations,
      };
    }
    // An unstable fixed point: nudge off it along no particular mode and spin up again.
    for (let j = 0; j < n; j++) t0[j] = t0[j]! + 0.5 * Math.sin(1.7 * j + 0.3);
    if (round === MAX_STABILITY_ROUNDS) {
      throw new CalorbitError(
        "PERIODIC_NO_CONVERGENCE",
        `the band climate has no stable periodic state here: the orbit map's fixed point is unstable (spectral radius ${radius.toFixed(3)}), so the climate changes from orbit to orbit (a limit cycle or a slow drift)`,
      );
    }
  }
  throw new CalorbitError("PERIODIC_NO_CONVERGENCE", "the band climate did not settle");
}

function norm(v: Float64Array): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s = Math.max(s, Math.abs(v[i]!));
  return s;
}

function notSettled(orbits: number, residualK: number): CalorbitError {
  return new CalorbitError(
    "PERIODIC_NO_CONVERGENCE",
    `the band climate did not settle to a periodic state within ${orbits} orbits (last change over an orbit ${residualK.toExponential(2)} K): it may oscillate from orbit to orbit (a limit cycle) or drift very slowly`,
  );
}

/** Largest |eigenvalue| of a linear map by power iteration from a fixed, mode-rich start vector. */
function spectralRadius(n: number, apply: (v: Float64Array, out: Float64Array) => void): number {
  let v = new Float64Array(n);
  let w = new Float64Array(n);
  for (let j = 0; j < n; j++) v[j] = 1 + 0.5 * Math.sin(2.3 * j + 0.7);
  let estimate = 0;
  let scale = Math.sqrt(v.reduce((s, x) => s + x * x, 0));
  for (let j = 0; j < n; j++) v[j] = v[j]! / scale;
  for (let k = 0; k < POWER_ITERATIONS; k++) {
    apply(v, w);
    scale = Math.sqrt(w.reduce((s, x) => s + x * x, 0));
    const settled = k >= 5 && Math.abs(scale - estimate) <= POWER_SETTLED * scale;
    estimate = scale;
    if (settled) break;
    if (scale === 0) return 0;
    for (let j = 0; j < n; j++) w[j] = w[j]! / scale;
    [v, w] = [w, v];
  }
  return estimate;
}
