/**
 * Time stepping of a conduction column to its periodic steady state.
 *
 * Finite volumes on the column's layers plus a surface node without heat capacity. Crank–Nicolson
 * in time for the layers (second order: a temperature-dependent k and c are taken at the step's
 * midpoint temperature by a second pass, after a first pass with their values at the step's start;
 * with c so, ∮ c dT closes), and the surface balance F − εσT_s⁴ − G_s (T_s − T₀) = 0
 * enforced at every new time. Each step eliminates the tridiagonal system from the bottom up
 * (the Thomas algorithm run upwards) to T₀ = a + b T_s, solves the scalar surface balance by
 * Newton's method, and substitutes back down. The scheme conserves energy exactly against the
 * trapezoidal rule for the surface fluxes, so the energy residual of a cycle measures only how far
 * it is from periodic. Steps are uniform in
 * the eccentric anomaly (t(E) is explicit: no Kepler solve anywhere). Between cycles the whole
 * profile is shifted by the mean surface imbalance over 4εσ⟨T_s³⟩, a Newton step on the cycle-mean
 * balance, so deep layers start near their periodic mean and the state settles in a few cycles.
 */
import { STEFAN_BOLTZMANN } from "../constants.js";
import { CalorbitError } from "../errors.js";
import { specificHeatAt, type ColumnGrid, type ColumnProperties } from "../physics/column.js";

export interface ColumnProblem {
  properties: ColumnProperties;
  grid: ColumnGrid;
  emissivity: number;
  /** Heat flux entering the bottom of the column, W m⁻². */
  interiorFluxWPerM2: number;
  /** Absorbed stellar flux at eccentric anomaly E, W m⁻². */
  absorbedAt(E: number): number;
  /** Time at eccentric anomaly E, s (explicit: (E − e sin E − M₀)/n). */
  timeAt(E: number): number;
  startE: number;
  cycleLength: number;
  stepsPerCycle: number;
  /** Uniform starting temperature, K. */
  initialK: number;
  /** Skin depth of the shortest forcing period, m (where acceleration may act). */
  shortSkinDepthM: number;
  /** Cap on the cycles run towards the periodic state (default 400); reaching it is an error. */
  maxCycles?: number;
  /** Called after each whole cycle stepped, with the count so far (progress; never inside a cycle). */
  onCycle?: (cycles: number) => void;
}

export interface ColumnResult {
  /** E at each step of the last cycle (stepsPerCycle + 1 values). */
  stepE: Float64Array;
  surfaceK: Float64Array;
  /** Temperature of every layer at every step of the last cycle: layerK[step·n + i]. */
  layerK: Float64Array;
  profileMinK: Float64Array;
  profileMaxK: Float64Array;
  profileMeanK: Float64Array;
  cycles: number;
  /** max over layers of |T(end) − T(start)| / T on the last cycle. */
  periodicityResidual: number;
  /** (absorbed + interior − emitted) / absorbed over the last cycle. */
  energyBalanceResidual: number;
  meanAbsorbedWPerM2: number;
  meanEmittedWPerM2: number;
  newtonIterations: number;
}

const MAX_NEWTON = 30;
const MAX_SURFACE_NEWTON = 60;
export const DEFAULT_MAX_COLUMN_CYCLES = 400;

export function solveColumnPeriodic(problem: ColumnProblem, relativeTolerance: number): ColumnResult {
  const { grid, properties: p } = problem;
  const n = grid.thicknessM.length;
  const steps = problem.stepsPerCycle;
  const emission = problem.emissivity * STEFAN_BOLTZMANN;
  const q = problem.interiorFluxWPerM2;
  const stepE = Float64Array.from({ length: steps + 1 }, (_, k) => problem.startE + (problem.cycleLength * k) / steps);
  const stepT = Float64Array.from(stepE, (E) => problem.timeAt(E));
  const forcing = Float64Array.from(stepE, (E) => problem.absorbedAt(E));

  // State and work arrays, allocated once.
  const T = new Float64Array(n).fill(problem.initialK);
  let ts = problem.initialK;
  const Tn = new Float64Array(n);
  const offset = new Float64Array(n); // elimination: T_i = offset_i + slope_i T_{i−1}
  const slope = new Float64Array(n);
  const conductance = new Float64Array(n + 1); // [0]: surface–layer 0; [i]: layer i−1 – layer i
  const capacity = new Float64Array(n);
  const surfaceK = new Float64Array(steps + 1);
  const layerK = new Float64Array((steps + 1) * n);
  const profileMinK = new Float64Array(n);
  const profileMaxK = new Float64Array(n);
  const profileMeanK = new Float64Array(n);
  const startOfCycle = new Float64Array(n);
  const previousChange = new Float64Array(n);
  let newtonIterations = 0;

  const constantCoefficients = p.radiativeChi === 0 && p.specificHeatPolynomial.length === 1;
  // A second pass re-takes c(T) and k(T) at the step's midpoint temperature (second order in time).
  const passes = p.specificHeatPolynomial.length > 1 || p.radiativeChi !== 0 ? 2 : 1;
  const midT = new Float64Array(n);
  const chi = p.radiativeChi / (350 * 350 * 350);
  const conductivity = (i: number, temperature: number) =>
    chi === 0 ? grid.contactConductivity[i]! : grid.contactConductivity[i]! * (1 + chi * temperature * temperature * temperature);
  const fillConductances = (out: Float64Array, layers: Float64Array, surface: number) => {
    out[0] = conductivity(0, 0.5 * (surface + layers[0]!)) / (0.5 * grid.thicknessM[0]!);
    for (let i = 1; i < n; i++) {
      const r = (0.5 * grid.thicknessM[i - 1]!) / conductivity(i - 1, layers[i - 1]!) + (0.5 * grid.thicknessM[i]!) / conductivity(i, layers[i]!);
      out[i] = 1 / r;
    }
    out[n] = 0;
  };

  // The anchor: the first layer three short-period skin depths down (where that wave is e⁻³ ≈ 5 %).
  let anchor = 0;
  while (anchor < n - 1 && grid.centreM[anchor]! < 3 * problem.shortSkinDepthM) anchor++;
  let lastPeriodicity = Infinity;
  let lastResidual = Infinity;
  let meanAbsorbed = 0;
  let meanEmitted = 0;
  const maxCycles = problem.maxCycles ?? DEFAULT_MAX_COLUMN_CYCLES;
  for (let cycle = 1; cycle <= maxCycles; cycle++) {
    startOfCycle.set(T);
    profileMinK.fill(Infinity);
    profileMaxK.fill(-Infinity);
    profileMeanK.fill(0);
    // The surface at the cycle's start is in balance with the first layer.
    ts = solveSurface(forcing[0]!, T[0]!, ts, emission, conductivity(0, 0.5 * (ts + T[0]!)) / (0.5 * grid.thicknessM[0]!));
    let surfaceFlux = forcing[0]! - emission * ts ** 4;
    let absorbedEnergy = 0;
    let emittedEnergy = 0;
    let cubeSum = 0;

    record(0);
    for (let k = 0; k < steps; k++) {
      const dt = stepT[k + 1]! - stepT[k]!;
      Tn.set(T);
      const tsOld = ts;
      // Conductances at the step's start (lagged when k depends on T; computed once when not). The
      // same conductances serve both halves of the step, so the interior fluxes telescope and the
      // step conserves energy exactly. Capacities start there too; with c(T) the second pass below
      // replaces them by their value at the step's midpoint temperature.
      if (!constantCoefficients || (cycle === 1 && k === 0)) {
        fillConductances(conductance, Tn, tsOld);
        for (let i = 0; i < n; i++) capacity[i] = grid.density[i]! * specificHeatAt(p, Tn[i]!) * grid.thicknessM[i]!;
      }
      const fNew = forcing[k + 1]!;
      // With c(T), a second pass takes the capacity at the step's midpoint temperature, so that
      // over a closed cycle Σ C ΔT vanishes as ∮ c dT does (a capacity lagged at the step's start
      // would leave a first-order energy bias and a false imbalance).
      for (let pass = 0; pass < passes; pass++) {
        if (pass > 0) {
          for (let i = 0; i < n; i++) {
            midT[i] = 0.5 * (Tn[i]! + T[i]!);
            capacity[i] = grid.density[i]! * specificHeatAt(p, midT[i]!) * grid.thicknessM[i]!;
          }
          // k(T) at the midpoint too: taken at the step's start it left the scheme first order, which
          // biased the deep layers' means (the rectification that k(T) makes of the surface wave):
          // 7.2e-4 of the deepest mean at the default steps on the bench column, halving with the steps.
          if (chi !== 0) fillConductances(conductance, midT, 0.5 * (tsOld + ts));
        }
        // Eliminate the layers from the bottom up: T_i' = a_i + b_i T_{i−1}' (T_{−1} = T_s').
        for (let i = n - 1; i >= 0; i--) {
          const cOverDt = capacity[i]! / dt;
          const gAbove = conductance[i]!;
          const gBelow = i === n - 1 ? 0 : conductance[i + 1]!;
          // Old-half gain of layer i. From above, layer 0 takes the flux the last surface balance
          // delivered (F − εσT_s⁴) rather than G_s(T_s − T₀) with this step's G_s, which keeps the
          // energy exact when k depends on T; from below, the bottom layer takes the interior flux.
          const fromAbove = i === 0 ? surfaceFlux : gAbove * (Tn[i - 1]! - Tn[i]!);
          const fromBelow = i === n - 1 ? q : gBelow * (Tn[i + 1]! - Tn[i]!);
          const right = cOverDt * Tn[i]! + 0.5 * (fromAbove + fromBelow) + (i === n - 1 ? 0.5 * q : 0);
          const diagonal = cOverDt + 0.5 * (gAbove + gBelow);
          const below = i === n - 1 ? 0 : -0.5 * gBelow;
          const pivot = diagonal + (i === n - 1 ? 0 : below * slope[i + 1]!);
          offset[i] = (right - (i === n - 1 ? 0 : below * offset[i + 1]!)) / pivot;
          slope[i] = (0.5 * gAbove) / pivot;
        }
        // The surface: F − εσT_s⁴ − G_s (T_s − a₀ − b₀ T_s) = 0, by Newton's method.
        const gs = conductance[0]!;
        let t = tsOld;
        for (let iteration = 0; ; iteration++) {
          if (iteration >= MAX_NEWTON) {
            throw new CalorbitError("EQUILIBRIUM_NO_CONVERGENCE", `the column's surface balance did not converge in ${MAX_NEWTON} Newton steps (step ${k + 1} of ${steps}, cycle ${cycle})`);
          }
          newtonIterations++;
          const t3 = t * t * t;
          const r = fNew - emission * t3 * t - gs * (t - offset[0]! - slope[0]! * t);
          const d = -4 * emission * t3 - gs * (1 - slope[0]!);
          const next = Math.max(0.5 * t, t - r / d);
          const change = Math.abs(next - t);
          t = next;
          if (!Number.isFinite(t)) throw new CalorbitError("INTEGRATION_FAILED", "the column's surface temperature left the physical range");
          if (change <= 1e-13 * t) break;
        }
        ts = t;
        let above = ts;
        for (let i = 0; i < n; i++) {
          T[i] = offset[i]! + slope[i]! * above;
          above = T[i]!;
        }
      }
      surfaceFlux = fNew - emission * ts ** 4; // after the passes: the next step's old-half flux
      absorbedEnergy += 0.5 * (forcing[k]! + fNew) * dt;
      emittedEnergy += 0.5 * emission * (tsOld ** 4 + ts ** 4) * dt;
      cubeSum += 0.5 * (tsOld ** 3 + ts ** 3) * dt;
      record(k + 1);
    }
    const span = stepT[steps]! - stepT[0]!;
    meanAbsorbed = absorbedEnergy / span;
    meanEmitted = emittedEnergy / span;
    for (let i = 0; i < n; i++) profileMeanK[i]! /= span;
    let periodicity = 0;
    for (let i = 0; i < n; i++) periodicity = Math.max(periodicity, Math.abs(T[i]! - startOfCycle[i]!) / T[i]!);
    const imbalance = meanAbsorbed + q - meanEmitted;
    lastPeriodicity = periodicity;
    lastResidual = imbalance / meanAbsorbed;
    problem.onCycle?.(cycle);
    if (periodicity <= relativeTolerance && Math.abs(lastResidual) <= relativeTolerance) {
      return {
        stepE,
        surfaceK,
        layerK,
        profileMinK,
        profileMaxK,
        profileMeanK,
        cycles: cycle,
        periodicityResidual: periodicity,
        energyBalanceResidual: lastResidual,
        meanAbsorbedWPerM2: meanAbsorbed,
        meanEmittedWPerM2: meanEmitted,
        newtonIterations,
      };
    }
    // Acceleration. (1) After the first cycle only, an initial guess for the deep layers: below
    // the reach of the shortest wave the mean profile is near the steady conduction of q,
    // ⟨T(z)⟩ ≈ ⟨T(z_a)⟩ + q ∫ dz/k from an anchor layer z_a. (2) Every cycle, the slow modes that
    // remain decay geometrically: the cycle's change d is extrapolated by ρ/(1 − ρ), ρ the ratio of
    // successive changes (Aitken's Δ² process, applied to the whole profile). (3) A Newton step on
    // the cycle-mean surface balance shifts the whole profile. Each move vanishes at the periodic
    // state, so they change how fast it is reached, not where it is.
    if (cycle === 1) {
      let resistance = 0;
      for (let i = anchor + 1; i < n; i++) {
        resistance += (0.5 * (grid.thicknessM[i - 1]! + grid.thicknessM[i]!)) / conductivity(i, profileMeanK[i]!);
        T[i]! += profileMeanK[anchor]! + q * resistance - profileMeanK[i]!;
      }
    } else {
      let dot = 0;
      let norm = 0;
      for (let i = 0; i < n; i++) {
        const d = T[i]! - startOfCycle[i]!;
        dot += d * previousChange[i]!;
        norm += previousChange[i]! * previousChange[i]!;
      }
      const ratio = norm > 0 ? dot / norm : 0;
      if (ratio > 0.3 && ratio < 0.98) {
        const factor = ratio / (1 - ratio);
        for (let i = 0; i < n; i++) T[i]! += factor * (T[i]! - startOfCycle[i]!);
      }
    }
    for (let i = 0; i < n; i++) previousChange[i] = T[i]! - startOfCycle[i]!;
    const shift = imbalance / (4 * emission * (cubeSum / span));
    for (let i = 0; i < n; i++) T[i]! += shift;
    ts += shift;
  }
  throw new CalorbitError(
    "PERIODIC_NO_CONVERGENCE",
    `the column did not reach a periodic state in ${maxCycles} cycle(s) (periodicity ${lastPeriodicity.toExponential(2)}, energy residual ${lastResidual.toExponential(2)}; tolerance ${relativeTolerance.toExponential(2)})`,
  );

  function record(k: number): void {
    surfaceK[k] = ts;
    const dtWeight = k === 0 ? 0.5 * (stepT[1]! - stepT[0]!) : k === steps ? 0.5 * (stepT[steps]! - stepT[steps - 1]!) : 0.5 * (stepT[k + 1]! - stepT[k - 1]!);
    for (let i = 0; i < n; i++) {
      const v = T[i]!;
      layerK[k * n + i] = v;
      if (v < profileMinK[i]!) profileMinK[i] = v;
      if (v > profileMaxK[i]!) profileMaxK[i] = v;
      profileMeanK[i]! += v * dtWeight;
    }
  }
}

/**
 * Surface temperature in balance with absorbed flux F and a layer at T₀ through conductance G
 * (Newton's method; the residual is monotonic in T, so it converges from any positive start unless
 * the inputs are not finite). Throws EQUILIBRIUM_NO_CONVERGENCE at the cap.
 */
export function solveSurface(f: number, t0: number, guess: number, emission: number, g: number, maxIterations = MAX_SURFACE_NEWTON): number {
  let t = guess > 0 ? guess : t0;
  let change = NaN;
  for (let i = 0; i < maxIterations; i++) {
    const r = f - emission * t ** 4 - g * (t - t0);
    const d = -4 * emission * t ** 3 - g;
    const next = Math.max(0.5 * t, t - r / d);
    change = next - t;
    if (Math.abs(change) <= 1e-13 * t) return next;
    t = next;
  }
  throw new CalorbitError(
    "EQUILIBRIUM_NO_CONVERGENCE",
    `the column's surface balance at the cycle's start did not converge in ${maxIterations} Newton steps (last step ${change.toExponential(2)} K at ${t.toPrecision(6)} K)`,
  );
}
