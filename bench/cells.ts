/**
 * Many slab cells that exchange heat, and many independent conduction columns: the cost of the
 * periodic solve against the number of cells, for the dense shooting (variational equations,
 * ~n³ per step) and the matrix-free Newton–Krylov shooting, each answer checked.
 *
 * The surface: n cells under the global forcing times a share falling from 1 to 0.2 along a chain,
 * area weights like latitude bands, neighbours linked by conductances (about 3 W m⁻² K⁻¹ per unit
 * of the whole surface), e = 0.3, τ ≈ P. Checks: the two solves agree (a small n), identical cells
 * equal the single cell (symmetry), the whole surface's energy budget closes (the exchange only
 * moves heat), and on a circular orbit the periodic state is the steady state, the root of the
 * algebraic balance (solved here by Newton's method on its own Jacobian).
 *
 * `node dist/bench/cells.js [--full]` runs it alone; bench.ts calls `cellsFigures`.
 */
import { fileURLToPath } from "node:url";
import { loadavg } from "node:os";
import { buildThermalModel, type ColumnModel, type SlabModel, type ThermalModel } from "../src/model/build.js";
import { REGIME_TABLE, type RegimeEntry } from "../src/model/regimes.js";
import type { ThermalCase } from "../src/model/thermalCase.js";
import { ConductanceExchange, type ConductanceLink } from "../src/physics/conductance.js";
import { lumpedForcing, scaledForcing, type Forcing } from "../src/physics/forcing.js";
import { eccentricAnomaly } from "../src/physics/kepler.js";
import { columnCycle, DEFAULT_COLUMN_TOLERANCE } from "../src/run/columnCycle.js";
import type { ConvergedCycle } from "../src/run/cycle.js";
import { slabCycle } from "../src/run/slabCycle.js";
import { simulate } from "../src/run/simulate.js";
import type { PeriodicMethod } from "../src/solve/periodicKrylov.js";
import { columnCase, columnSpec } from "./columnCase.js";
import { slabCase } from "./cases.js";

export interface CellsFigure {
  name: string;
  value: number;
  unit: string;
  target: string;
  met: boolean;
  details: string;
}
export interface CellsFigures {
  figures: CellsFigure[];
  /** WRONG lines: an answer off its check. */
  wrong: string[];
}

/** CPU seconds of this process (user + system) while `run` runs: the machine is shared, wall time is not ours. */
function cpuSeconds<T>(run: () => T): { value: T; seconds: number } {
  const before = process.cpuUsage();
  const value = run();
  const used = process.cpuUsage(before);
  return { value, seconds: (used.user + used.system) / 1e6 };
}

interface Layout {
  shares: number[];
  weights: number[];
  links: ConductanceLink[];
}

function layout(n: number, identical = false): Layout {
  const shares = Array.from({ length: n }, (_, i) => (identical ? 1 : 1 - (0.8 * i) / Math.max(1, n - 1)));
  const raw = Array.from({ length: n }, (_, i) => 1 + 0.5 * Math.cos((Math.PI * i) / n));
  const sum = raw.reduce((a, b) => a + b, 0);
  const links = Array.from({ length: n - 1 }, (_, i) => ({ a: i, b: i + 1, conductanceWPerM2K: 3 * (1 + 0.5 * Math.sin(i)) }));
  return { shares, weights: raw.map((w) => w / sum), links };
}

function row(cells: Layout): RegimeEntry {
  return {
    words: "bench: slab cells linked by conductances",
    menuLabel: "cells (bench)",
    colour: "#56B4E9",
    pipeline: "surface",
    heatStores: ["slab", "column"],
    fields: [],
    surface: (t) => {
      const full = lumpedForcing("global", t.surface.albedo, t.star.luminosityW, t.orbit);
      return {
        cells: cells.shares.map((share, i): { name: string; areaWeight: number; forcing: Forcing } => ({
          name: `cell${i}`,
          areaWeight: cells.weights[i]!,
          forcing: scaledForcing(full, share),
        })),
        cycleOrbits: 1,
        commensurate: true,
        forcingHasCorners: false,
      };
    },
    exchange: () => (cells.links.length > 0 ? { kind: "conductance", links: cells.links } : { kind: "none" }),
  };
}

function solve(thermal: ThermalCase, cells: Layout, method?: PeriodicMethod): { cycle: ConvergedCycle; model: SlabModel; seconds: number } {
  const { value, seconds } = cpuSeconds(() => {
    const model = buildThermalModel(thermal, row(cells)) as SlabModel;
    const cycle = slabCycle(thermal, model, {
      relativeTolerance: 1e-8,
      startE: eccentricAnomaly(thermal.orbit.meanAnomalyAtStartRad, thermal.orbit.eccentricity),
      samples: () => 0,
      ...(method ? { periodicMethod: method } : {}),
    });
    return { model, cycle };
  });
  return { ...value, seconds };
}

/** Time-mean temperature of cell i over the statistics grid (trapezoidal in time). */
function cellMeanK(model: ThermalModel, cycle: ConvergedCycle, i: number): number {
  const n = model.stateNames.length;
  let sum = 0;
  let span = 0;
  for (let k = 0; k + 1 < cycle.statsE.length; k++) {
    const h = cycle.statsE[k + 1]! - cycle.statsE[k]!;
    const a = model.timePerAnomaly(cycle.statsE[k]!) * h;
    const b = model.timePerAnomaly(cycle.statsE[k + 1]!) * h;
    sum += 0.5 * (a * cycle.statsY[k * n + i]! + b * cycle.statsY[(k + 1) * n + i]!);
    span += 0.5 * (a + b);
  }
  return sum / span;
}

/** The whole surface's (absorbed − emitted)/absorbed over the cycle. */
function budgetResidual(model: SlabModel, cycle: ConvergedCycle): number {
  const n = model.stateNames.length;
  let absorbed = 0;
  let emitted = 0;
  for (let k = 0; k + 1 < cycle.statsE.length; k++) {
    const h = cycle.statsE[k + 1]! - cycle.statsE[k]!;
    for (const kk of [k, k + 1]) {
      const E = cycle.statsE[kk]!;
      const dt = 0.5 * model.timePerAnomaly(E) * h;
      for (let i = 0; i < n; i++) {
        const t = cycle.statsY[kk * n + i]!;
        absorbed += model.areaWeights[i]! * model.absorbedAt(E, i) * dt;
        emitted += model.areaWeights[i]! * model.emissionCoefficient * t ** 4 * dt;
      }
    }
  }
  return (absorbed - emitted) / absorbed;
}

export function cellsFigures(quick: boolean): CellsFigures {
  const figures: CellsFigure[] = [];
  const wrong: string[] = [];
  const check = (what: string, error: number, limit: number): void => {
    if (!(error <= limit)) wrong.push(`cells ${what}: relative error ${error.toExponential(2)} > ${limit.toExponential(0)}`);
  };
  const base = slabCase(0.3, 1);
  const load = () => `load ${loadavg()[0]!.toFixed(1)}`;
  solve(base, layout(4), "newton-krylov"); // warm-up: both solves' code compiled before timing
  solve(base, layout(4), "dense");

  // 1. Dense and Newton–Krylov on a small coupled surface: the same periodic state.
  {
    const cells = layout(10);
    const dense = solve(base, cells, "dense");
    const krylov = solve(base, cells, "newton-krylov");
    let worst = 0;
    for (let k = 0; k < dense.cycle.statsY.length; k++) worst = Math.max(worst, Math.abs(krylov.cycle.statsY[k]! / dense.cycle.statsY[k]! - 1));
    check("10 coupled cells, Newton–Krylov against dense", worst, 5e-8);
    figures.push({
      name: "coupled cells 10",
      value: krylov.seconds,
      unit: "CPU s",
      target: "< 0.5 s by the default (Newton–Krylov from 6 cells), no slower than the dense solve",
      met: krylov.seconds < 0.5 && krylov.seconds <= dense.seconds,
      details: `dense ${dense.seconds.toFixed(2)} s, ${dense.cycle.solver.evaluations} evaluations of ${10 + 100} components; newton-krylov ${krylov.cycle.solver.evaluations} evaluations of 10-20; the two agree to ${worst.toExponential(1)}; ${load()}`,
    });
  }
  // 2. Coupled surfaces of growing size, by the default choice (Newton–Krylov from 6 cells).
  for (const n of quick ? [50] : [50, 200]) {
    const cells = layout(n);
    const run = solve(base, cells);
    const residual = budgetResidual(run.model, run.cycle);
    check(`${n} coupled cells, energy budget`, Math.abs(residual), 1e-7);
    // Before (the dense solve, measured once, not rerun): 100 cells 9.4 s CPU; 200 cells cannot
    // run (stiffness 1171 calls for Radau, whose workspace for the 40,200-component variational system is out of reach).
    let before = n === 200 ? "; dense: 9.4 s at 100 cells, none at 200 (Radau's workspace for 40,200 components)" : "";
    if (!quick && n === 50) before = `; dense ${solve(base, cells, "dense").seconds.toFixed(1)} s`;
    const limit = n <= 50 ? 2 : 10;
    figures.push({
      name: `coupled cells ${n}`,
      value: run.seconds,
      unit: "CPU s",
      target: `< ${limit} s`,
      met: run.seconds < limit,
      details: `newton-krylov, ${run.cycle.solver.iterations} Newton steps, ${run.cycle.solver.orbitsIntegrated} cycles with the linearised ones, energy residual ${residual.toExponential(1)}${before}; ${load()}`,
    });
  }
  // 3. Identical cells stay identical and equal the single cell (symmetry).
  {
    const n = quick ? 24 : 100;
    const run = solve(base, layout(n, true));
    const single = simulate(base, { samples: 0 }).summary.temperature.meanK;
    let worst = 0;
    for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(cellMeanK(run.model, run.cycle, i) / single - 1));
    check(`${n} identical coupled cells against the single cell`, worst, 5e-8);
  }
  // 4. Circular orbit: the periodic state is the algebraic steady state.
  {
    const n = 40;
    const cells = layout(n);
    const circular = { ...base, orbit: { ...base.orbit, eccentricity: 0 } };
    const run = solve(circular, cells);
    const t = steadyState(run.model, cells);
    let worst = 0;
    for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(cellMeanK(run.model, run.cycle, i) / t[i]! - 1));
    check(`${n} coupled cells on a circular orbit against the algebraic steady state`, worst, 1e-7);
  }
  // 5. Independent conduction columns: the bench column (a regolith point, 12 solar days per
  // orbit) at n latitudes, one column solve per cell, against that column run alone.
  for (const n of quick ? [4] : [12, 36]) {
    const thermal = { ...columnCase(), column: columnSpec() };
    const latitudes = Array.from({ length: n }, (_, i) => (i === 0 ? 0 : ((i / n) * 170 - 85) * (Math.PI / 180)));
    const weights = latitudes.map((phi) => Math.cos(phi));
    const total = weights.reduce((a, b) => a + b, 0);
    const points: RegimeEntry = {
      ...REGIME_TABLE.point,
      surface: (t) => {
        const one = (phi: number) => REGIME_TABLE.point.surface({ ...t, location: { latitudeRad: phi, longitudeRad: 0 } });
        return { ...one(0), cells: latitudes.map((phi, i) => ({ ...one(phi).cells[0]!, name: `latitude${i}`, areaWeight: weights[i]! / total })) };
      },
    };
    const { value, seconds } = cpuSeconds(() => {
      const model = buildThermalModel(thermal, points) as ColumnModel;
      const cycle = columnCycle(thermal, model, {
        relativeTolerance: DEFAULT_COLUMN_TOLERANCE,
        startE: eccentricAnomaly(thermal.orbit.meanAnomalyAtStartRad, thermal.orbit.eccentricity),
        samples: () => 0,
      });
      return { model, cycle };
    });
    const alone = cpuSeconds(() => simulate(thermal, { samples: 0 }));
    check(`${n} columns: the equator's column against the column alone`, Math.abs(cellMeanK(value.model, value.cycle, 0) / alone.value.summary.temperature.meanK - 1), 1e-6);
    check(`${n} columns: energy budget`, Math.abs(value.cycle.column!.energy.residual), 1e-5);
    // Linear cost: CPU per column cycle as for the column alone (colder columns take more cycles).
    const perCycle = seconds / value.cycle.solver.orbitsIntegrated;
    const alonePerCycle = alone.seconds / alone.value.solver.orbitsIntegrated;
    figures.push({
      name: `independent columns ${n}`,
      value: seconds,
      unit: "CPU s",
      target: "CPU per column cycle <= 1.2x the column alone's (cost linear in the cells)",
      met: perCycle <= 1.2 * alonePerCycle,
      details: `${(seconds / n).toFixed(2)} s per column; ${value.cycle.solver.orbitsIntegrated} column cycles in all; the equator's column alone ${alone.seconds.toFixed(2)} s in ${alone.value.solver.iterations} cycles; ${value.cycle.solver.layers} layers, ${value.cycle.solver.stepsPerCycle} steps per cycle; ${load()}`,
    });
  }
  return { figures, wrong };
}

/** The steady state of constant forcing (cells at E = 0 of a circular orbit): Newton's method on the algebraic balance, a chain's tridiagonal Jacobian. */
function steadyState(model: SlabModel, cells: Layout): Float64Array {
  const n = cells.shares.length;
  const op = new ConductanceExchange(cells.links, cells.weights);
  const t = new Float64Array(n).fill(250);
  const f = new Float64Array(n);
  const jac = new Float64Array(n * n);
  const c = new Float64Array(n);
  const d = new Float64Array(n);
  const eps = model.emissionCoefficient;
  for (let iteration = 0; iteration < 40; iteration++) {
    f.fill(0);
    jac.fill(0);
    op.addFlux(0, t, f);
    op.addJacobian(0, t, jac);
    for (let i = 0; i < n; i++) {
      f[i] = f[i]! + model.absorbedAt(0, i) - eps * t[i]! ** 4;
      jac[i * n + i] = jac[i * n + i]! - 4 * eps * t[i]! ** 3;
    }
    // Thomas algorithm on jac · d = −f.
    for (let i = 0; i < n; i++) {
      const lower = i > 0 ? jac[i * n + i - 1]! : 0;
      const denom = jac[i * n + i]! - lower * (i > 0 ? c[i - 1]! : 0);
      c[i] = i < n - 1 ? jac[i * n + i + 1]! / denom : 0;
      d[i] = (-f[i]! - lower * (i > 0 ? d[i - 1]! : 0)) / denom;
    }
    for (let i = n - 2; i >= 0; i--) d[i] = d[i]! - c[i]! * d[i + 1]!;
    for (let i = 0; i < n; i++) t[i] = t[i]! + d[i]!;
  }
  return t;
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const { figures, wrong } = cellsFigures(!process.argv.includes("--full"));
  for (const f of figures) console.log(`${f.name}: ${f.value.toFixed(2)} ${f.unit} (target ${f.target}: ${f.met ? "met" : "MISSED"}; ${f.details})`);
  for (const line of wrong) console.log(`WRONG ${line}`);
  if (wrong.length > 0) process.exitCode = 1;
}
