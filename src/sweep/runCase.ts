/**
 * One sweep case: the base scenario with the case's values set at their paths, validated and
 * simulated, reduced to one output row. A case that fails (a bad value, a solver failure) becomes
 * a row with status "error: <reason>"; it never stops the sweep.
 */
import { CalorbitError, formatProblem } from "../errors.js";
import { resolveScenario } from "../scenario/resolve.js";
import { DEFAULT_RELATIVE_TOLERANCE, simulate } from "../run/simulate.js";
import { columnToleranceFor, simulateColumn } from "../run/simulateColumn.js";
import type { ThermalCase } from "../model/thermalCase.js";
import type { TemperatureStats } from "../analysis/summarise.js";
import { VERSION } from "../version.js";
import type { CaseValues, Design, Shard } from "./design.js";
import { columnValue, setPath } from "./spec.js";

export type SweepFormat = "csv" | "jsonl";

export interface SweepDefinition {
  /** The base scenario document as parsed from its file (before validation). */
  scenario: Record<string, unknown>;
  design: Design;
  relativeTolerance: number;
  format: SweepFormat;
}

/** Summary metrics written for every case, with their units in the names. */
export const METRIC_COLUMNS = [
  "T_min_K",
  "T_max_K",
  "T_mean_K",
  "T_swing_K",
  "Teq_min_K",
  "Teq_max_K",
  "Teq_mean_K",
  "lag_s",
  "damping_ratio",
  "tau_over_period",
  "period_s",
  "time_in_range_fraction",
  "energy_residual",
  "integrator",
  "iterations",
  "orbits",
  "evaluations",
  "skin_depth_diurnal_m",
  "skin_depth_orbital_m",
  "T_deep_mean_K",
] as const;

type Metrics = Record<(typeof METRIC_COLUMNS)[number], number | string | null>;

export function inputColumns(def: SweepDefinition): string[] {
  return def.design.axes.map((a) => (a.unit ? `${a.path}_${a.unit.replace(/[^A-Za-z0-9]+/g, "_")}` : a.path));
}

export function columns(def: SweepDefinition): string[] {
  return ["case_id", ...inputColumns(def), "status", ...METRIC_COLUMNS];
}

/** The identity of a sweep: what must match for a file to be resumed or merged. */
export function fingerprint(def: SweepDefinition): string {
  return JSON.stringify({
    scenario: def.scenario,
    axes: def.design.axes.map((a) => ({ path: a.path, spec: a.spec })),
    random: def.design.random ?? null,
    tolerance: def.relativeTolerance,
    format: def.format,
  });
}

/** Header lines (CSV: '#' comments then the column row; JSON Lines: one '#'-free meta object is not used, so '#' lines too). */
export function headerLines(def: SweepDefinition, shard: Shard): string[] {
  const lines = [`# calorbit ${VERSION} sweep`, `# definition: ${fingerprint(def)}`, `# shard: ${shard.index}/${shard.count}`];
  if (def.format === "csv") lines.push(columns(def).join(","));
  return lines;
}

function csvField(v: number | string | null): string {
  if (v === null) return "";
  if (typeof v === "number") return String(v);
  return /[",\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

function failureReason(err: unknown): string {
  if (err instanceof CalorbitError) {
    return err.problems.length > 0 ? err.problems.map(formatProblem).join("; ") : err.message;
  }
  return err instanceof Error ? err.message : String(err);
}

/** The summary fields a lumped surface and a column's surface share. */
interface SurfaceSummary {
  temperature: TemperatureStats;
  equilibrium: TemperatureStats;
  lagSeconds: number | null;
  dampingRatio: number;
  periodSeconds: number;
  timeInRange?: { fraction: number };
  energyBalanceResidual: number;
}

function surfaceMetrics(s: SurfaceSummary) {
  return {
    T_min_K: s.temperature.minK,
    T_max_K: s.temperature.maxK,
    T_mean_K: s.temperature.meanK,
    T_swing_K: s.temperature.swingK,
    Teq_min_K: s.equilibrium.minK,
    Teq_max_K: s.equilibrium.maxK,
    Teq_mean_K: s.equilibrium.meanK,
    lag_s: s.lagSeconds,
    damping_ratio: s.dampingRatio,
    period_s: s.periodSeconds,
    time_in_range_fraction: s.timeInRange ? s.timeInRange.fraction : null,
    energy_residual: s.energyBalanceResidual,
  };
}

function lumpedMetrics(thermal: ThermalCase, relativeTolerance: number): Metrics {
  const sim = simulate(thermal, { relativeTolerance, samples: 0 });
  return {
    ...surfaceMetrics(sim.summary),
    tau_over_period: sim.summary.tauOverPeriod,
    integrator: sim.solver.integrator,
    iterations: sim.solver.iterations,
    orbits: sim.solver.orbitsIntegrated,
    evaluations: sim.solver.evaluations,
    skin_depth_diurnal_m: null,
    skin_depth_orbital_m: null,
    T_deep_mean_K: null,
  };
}

/**
 * A conduction column's row: its surface in the shared columns (no single τ, so tau_over_period is
 * empty; "iterations" counts its cycles and "evaluations" its time steps), plus the skin depths and the deepest layer's mean.
 */
function columnMetrics(thermal: ThermalCase, relativeTolerance: number): Metrics {
  const col = simulateColumn(thermal, thermal.column!, { relativeTolerance: columnToleranceFor(relativeTolerance, DEFAULT_RELATIVE_TOLERANCE), samples: 0 });
  const s = col.summary;
  return {
    ...surfaceMetrics(s),
    tau_over_period: null,
    integrator: "crank-nicolson",
    iterations: col.solver.cycles,
    orbits: Math.round((col.solver.cycles * s.cycleSeconds) / s.periodSeconds),
    evaluations: col.solver.stepsPerCycle * col.solver.cycles,
    skin_depth_diurnal_m: s.skinDepths.diurnalM,
    skin_depth_orbital_m: s.skinDepths.orbitalM,
    T_deep_mean_K: s.depthProfile.at(-1)?.meanK ?? null,
  };
}

/** Runs one case and returns its output line (without the newline). */
export function runCase(def: SweepDefinition, c: CaseValues): string {
  const inputs = def.design.axes.map((a, d) => columnValue(a, c.values[d]!));
  let status = "ok";
  let metrics: Metrics | null = null;
  try {
    const doc = structuredClone(def.scenario);
    def.design.axes.forEach((a, d) => setPath(doc, a.path, c.values[d]!));
    const { thermal } = resolveScenario(doc);
    metrics = thermal.column ? columnMetrics(thermal, def.relativeTolerance) : lumpedMetrics(thermal, def.relativeTolerance);
  } catch (err) {
    status = `error: ${failureReason(err)}`.replace(/\s+/g, " ");
  }
  if (def.format === "jsonl") {
    const names = inputColumns(def);
    const record: Record<string, unknown> = { case_id: c.id };
    names.forEach((n, i) => (record[n] = inputs[i]));
    record.status = status;
    if (metrics) Object.assign(record, metrics);
    return JSON.stringify(record);
  }
  const metricFields = METRIC_COLUMNS.map((k) => csvField(metrics ? metrics[k] : null));
  return [String(c.id), ...inputs.map(csvField), csvField(status), ...metricFields].join(",");
}

/** Case id of an output line (the first field in both formats); NaN if unreadable. */
export function lineCaseId(line: string, format: SweepFormat): number {
  if (format === "csv") return Number(line.slice(0, line.indexOf(",")));
  try {
    return Number((JSON.parse(line) as { case_id: unknown }).case_id);
  } catch {
    return NaN;
  }
}
