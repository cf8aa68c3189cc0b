/**
 * One sweep case: the base scenario with the case's values set at their paths, validated and
 * simulated, reduced to one output row. A case that fails (a bad value, a solver failure) becomes
 * a row with status "error: <reason>"; it never stops the sweep.
 */
import { DAY_S } from "../constants.js";
import { CalorbitError, formatProblem } from "../errors.js";
import { resolveScenario } from "../scenario/resolve.js";
import { DEFAULT_COLUMN_TOLERANCE, simulate } from "../run/simulate.js";
import { MIN_COLUMN_TOLERANCE } from "../defaults.js";
import { heatStoreOf } from "../model/heatStore.js";
import type { ThermalCase } from "../model/thermalCase.js";
import { REGIME_TABLE } from "../model/regimes.js";
import { simulateZonal, zonalCaseOf } from "../run/zonal.js";
import { observeMap } from "../run/observeMap.js";
import { MAP_DEFAULT_TOLERANCE } from "../run/simulateMap.js";
import { VERSION } from "../version.js";
import type { CaseValues, Design, Shard } from "./design.js";
import { caseScenarios } from "./caseScenario.js";
import { columnValue, setPath } from "./spec.js";

export type SweepFormat = "csv" | "jsonl" | "parquet";

/** One cell of an output row. */
export type Cell = number | string | null;

export interface SweepDefinition {
  /** The base scenario document as parsed from its file (before validation). */
  scenario: Record<string, unknown>;
  design: Design;
  relativeTolerance: number;
  /**
   * Set when --tolerance was given: a conduction column or a map then takes it as asked; without it
   * each takes its own default (1e-6), not the slab's 1e-8 held in relativeTolerance. Absent otherwise, so
   * the definitions (and resumable files) of sweeps without --tolerance are as they were.
   */
  toleranceGiven?: true;
  format: SweepFormat;
}

/** Summary metrics written for every case, with their units in the names. */
export const METRIC_COLUMNS = [
  "temperature_min_K",
  "temperature_max_K",
  "temperature_mean_K",
  "temperature_swing_K",
  "equilibrium_min_K",
  "equilibrium_max_K",
  "equilibrium_mean_K",
  "lag_days",
  "damping_ratio",
  "tau_over_period",
  "period_s",
  "time_in_range_fraction",
  "energy_balance_residual",
  "integrator",
  "iterations",
  "orbits",
  "evaluations",
  "skin_depths_diurnal_m",
  "skin_depths_orbital_m",
  "deep_mean_K",
  "global_mean_K",
  "equator_pole_contrast_K",
  "ice_edge_min_deg",
  "ice_edge_max_deg",
  "ice_edge_mean_deg",
  "ice_fraction",
  "habitable_fraction",
  "snowball",
  "climates",
  "flux_ratio_max",
  "flux_ratio_min",
  "flux_max_after_periastron_days",
  "transit_depth",
  "occultation_depth",
] as const;

type Metrics = Record<(typeof METRIC_COLUMNS)[number], number | string | null>;

export function inputColumns(def: SweepDefinition): string[] {
  return def.design.axes.map((a) => (a.unit ? `${a.path}_${a.unit.replace(/[^A-Za-z0-9]+/g, "_")}` : a.path));
}

export function columns(def: SweepDefinition): string[] {
  return ["case_id", ...inputColumns(def), "status", ...METRIC_COLUMNS];
}

/** A column's type in a columnar file: its values, and whether a row may leave it empty. */
export interface ColumnType {
  name: string;
  type: "INT64" | "INT32" | "DOUBLE" | "STRING";
  nullable: boolean;
}

const INTEGER_METRICS = new Set<string>(["iterations", "orbits", "evaluations", "snowball", "climates"]);

/** The columns with their types (Parquet): numbers as doubles (counts as integers), text as strings. */
export function columnTypes(def: SweepDefinition): ColumnType[] {
  const inputs = inputColumns(def).map((name, d): ColumnType => {
    const a = def.design.axes[d]!;
    const numeric = a.range !== undefined || a.unit !== "" || (a.list ?? []).every((v) => typeof v === "number");
    return { name, type: numeric ? "DOUBLE" : "STRING", nullable: false };
  });
  return [
    { name: "case_id", type: "INT64", nullable: false },
    ...inputs,
    { name: "status", type: "STRING", nullable: false },
    ...METRIC_COLUMNS.map((name): ColumnType => ({ name, type: name === "integrator" ? "STRING" : INTEGER_METRICS.has(name) ? "INT32" : "DOUBLE", nullable: true })),
  ];
}

/** The identity of a sweep: what must match for a file to be resumed or merged. */
export function fingerprint(def: SweepDefinition): string {
  return JSON.stringify({
    scenario: def.scenario,
    axes: def.design.axes.map((a) => ({ path: a.path, spec: a.spec })),
    random: def.design.random ?? null,
    tolerance: def.relativeTolerance,
    ...(def.toleranceGiven ? { toleranceGiven: true } : {}),
    format: def.format,
  });
}

/** The marker field of a JSON Lines sweep file's first object, which holds the version, definition and shard. */
export const JSONL_MARKER = "calorbitSweep";

/**
 * Header lines. CSV: '#' comment lines (version, definition, shard) then the column row. JSON Lines:
 * one JSON object whose only key is the marker, so that every line of the file is JSON.
 */
export function headerLines(def: SweepDefinition, shard: Shard): string[] {
  if (def.format === "jsonl") {
    return [`{"${JSONL_MARKER}":{"version":${JSON.stringify(VERSION)},"definition":${fingerprint(def)},"shard":"${shard.index}/${shard.count}"}}`];
  }
  return [`# calorbit ${VERSION} sweep`, `# definition: ${fingerprint(def)}`, `# shard: ${shard.index}/${shard.count}`, columns(def).join(",")];
}

/** What a sweep file's header says, from its first lines (null when they are not a calorbit sweep header). */
export interface SweepHeader {
  version: string;
  /** The definition's fingerprint, as written. */
  definition: string;
  format: SweepFormat;
  /** "i/N", or "merged from …" */
  shard: string;
  /** Lines the header takes (the CSV column row included). */
  lineCount: number;
}

export function readHeader(lines: readonly string[]): SweepHeader | null {
  const first = lines[0] ?? "";
  if (first.startsWith(`{"${JSONL_MARKER}":`)) {
    try {
      const meta = (JSON.parse(first) as Record<string, { version: string; definition: unknown; shard: string }>)[JSONL_MARKER]!;
      return { version: meta.version, definition: JSON.stringify(meta.definition), format: "jsonl", shard: meta.shard, lineCount: 1 };
    } catch {
      return null;
    }
  }
  const version = /^# calorbit (\S+) sweep$/.exec(first)?.[1];
  const definition = lines[1]?.startsWith("# definition: ") ? lines[1].slice("# definition: ".length) : undefined;
  const shard = lines[2]?.startsWith("# shard: ") ? lines[2].slice("# shard: ".length) : undefined;
  if (version === undefined || definition === undefined || shard === undefined) return null;
  let format: SweepFormat;
  try {
    format = (JSON.parse(definition) as { format: SweepFormat }).format;
  } catch {
    return null;
  }
  return { version, definition, format, shard, lineCount: lines[3]?.startsWith("case_id,") ? 4 : 3 };
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

/**
 * One case's metrics: the summary under the naming rule (the JSON name in snake_case, unit last).
 * A conduction column has no single τ (tau_over_period empty) and fills the skin depths and the
 * deepest layer's mean; its "iterations" are the cycles run to the periodic state.
 */
function metricsOf(thermal: ThermalCase, def: SweepDefinition): Metrics {
  const column = heatStoreOf(thermal).kind === "column";
  const columnTolerance = def.toleranceGiven ? Math.max(def.relativeTolerance, MIN_COLUMN_TOLERANCE) : DEFAULT_COLUMN_TOLERANCE;
  const sim = simulate(thermal, { relativeTolerance: column ? columnTolerance : def.relativeTolerance, samples: 0 });
  const s = sim.summary;
  return {
    temperature_min_K: s.temperature.minK,
    temperature_max_K: s.temperature.maxK,
    temperature_mean_K: s.temperature.meanK,
    temperature_swing_K: s.temperature.swingK,
    equilibrium_min_K: s.equilibrium.minK,
    equilibrium_max_K: s.equilibrium.maxK,
    equilibrium_mean_K: s.equilibrium.meanK,
    lag_days: s.lagSeconds === null ? null : s.lagSeconds / DAY_S,
    damping_ratio: s.dampingRatio,
    tau_over_period: s.tauOverPeriod,
    period_s: s.periodSeconds,
    time_in_range_fraction: s.timeInRange ? s.timeInRange.fraction : null,
    energy_balance_residual: s.energyBalanceResidual,
    integrator: sim.solver.integrator,
    iterations: sim.solver.iterations,
    orbits: sim.solver.orbitsIntegrated,
    evaluations: sim.solver.evaluations,
    skin_depths_diurnal_m: s.skinDepths?.diurnalM ?? null,
    skin_depths_orbital_m: s.skinDepths?.orbitalM ?? null,
    deep_mean_K: s.deepMeanK ?? null,
    ...NO_CLIMATE,
    ...NO_MAP,
  };
}

/** The map regime's phase-curve columns, empty for every other regime. */
const NO_MAP = {
  flux_ratio_max: null,
  flux_ratio_min: null,
  flux_max_after_periastron_days: null,
  transit_depth: null,
  occultation_depth: null,
};

/**
 * A map's row: the whole grid's temperature range and area-weighted mean, the sphere's energy
 * residual, and the phase curve's metrics when the scenario has an observer. A passband given as
 * a file is not read by sweep workers: give it inline ({from, to} or {wavelengths, response}).
 */
function mapMetrics(thermal: ThermalCase, def: SweepDefinition): Metrics {
  // A map's own default unless --tolerance was given (then as asked, as `run` takes it).
  const o = observeMap(thermal, { relativeTolerance: def.toleranceGiven ? def.relativeTolerance : MAP_DEFAULT_TOLERANCE, samples: 400 });
  const { sim } = o;
  let minK = Infinity;
  let maxK = -Infinity;
  let meanK = 0;
  for (let k = 0; k < sim.cellMeanK.length; k++) {
    minK = Math.min(minK, sim.cellMinK[k]!);
    maxK = Math.max(maxK, sim.cellMaxK[k]!);
    meanK += sim.history.grid.areaFraction[k]! * sim.cellMeanK[k]!;
  }
  return {
    temperature_min_K: minK,
    temperature_max_K: maxK,
    temperature_mean_K: meanK,
    temperature_swing_K: maxK - minK,
    equilibrium_min_K: null,
    equilibrium_max_K: null,
    equilibrium_mean_K: null,
    lag_days: null,
    damping_ratio: null,
    tau_over_period: sim.radiativeTimeSeconds / thermal.orbit.periodSeconds,
    period_s: thermal.orbit.periodSeconds,
    time_in_range_fraction: null,
    energy_balance_residual: sim.energy.residual,
    integrator: `cells (${sim.mode})`,
    iterations: sim.iterations,
    orbits: sim.orbitsIntegrated,
    evaluations: sim.work.evaluations,
    skin_depths_diurnal_m: null,
    skin_depths_orbital_m: null,
    deep_mean_K: null,
    ...NO_CLIMATE,
    flux_ratio_max: o.phase?.maxFluxRatio ?? null,
    flux_ratio_min: o.phase?.minFluxRatio ?? null,
    flux_max_after_periastron_days: o.phase ? o.phase.timeOfMaxAfterPeriastronSeconds / DAY_S : null,
    transit_depth: o.transit ? (o.transit.occurs ? o.transit.depth : 0) : null,
    occultation_depth: o.occultation ? (o.occultation.occurs ? o.occultation.depth : 0) : null,
  };
}

const NO_CLIMATE = {
  global_mean_K: null,
  equator_pole_contrast_K: null,
  ice_edge_min_deg: null,
  ice_edge_max_deg: null,
  ice_edge_mean_deg: null,
  ice_fraction: null,
  habitable_fraction: null,
  snowball: null,
  climates: null,
};

/**
 * A zonal climate's row: the global metrics of its first climate (the warm start when both are
 * solved), the shared columns from the global-mean temperature through the orbit, and `climates`
 * = how many different climates the starts found (2: warm and cold starts disagree).
 */
function zonalMetrics(thermal: ThermalCase): Metrics {
  const sim = simulateZonal(zonalCaseOf(thermal));
  const first = sim.climates[0]!;
  const s = first.summary;
  return {
    temperature_min_K: s.temperature.minK,
    temperature_max_K: s.temperature.maxK,
    temperature_mean_K: s.temperature.meanK,
    temperature_swing_K: s.temperature.swingK,
    equilibrium_min_K: null,
    equilibrium_max_K: null,
    equilibrium_mean_K: null,
    lag_days: null,
    damping_ratio: null,
    tau_over_period: null,
    period_s: s.periodSeconds,
    time_in_range_fraction: null,
    energy_balance_residual: s.energyBalanceResidual,
    integrator: "sdirk2",
    iterations: first.solver.newtonIterations,
    orbits: first.solver.orbitsIntegrated,
    evaluations: null,
    skin_depths_diurnal_m: null,
    skin_depths_orbital_m: null,
    deep_mean_K: null,
    global_mean_K: s.globalMeanK,
    equator_pole_contrast_K: s.equatorPoleContrastK,
    ice_edge_min_deg: s.iceEdge?.minDeg ?? null,
    ice_edge_max_deg: s.iceEdge?.maxDeg ?? null,
    ice_edge_mean_deg: s.iceEdge?.meanDeg ?? null,
    ice_fraction: s.iceFraction,
    habitable_fraction: s.habitableFraction,
    snowball: s.snowball ? 1 : 0,
    climates: sim.climates.length,
    ...NO_MAP,
  };
}

function metricsFor(thermal: ThermalCase, def: SweepDefinition): Metrics {
  switch (REGIME_TABLE[thermal.regime].pipeline) {
    case "surface":
      return metricsOf(thermal, def);
    case "map":
      return mapMetrics(thermal, def);
    case "zonal":
      return zonalMetrics(thermal);
  }
}

function cellsOf(def: SweepDefinition, c: CaseValues, status: string, metrics: Metrics | null): Cell[] {
  const cells: Cell[] = [c.id];
  def.design.axes.forEach((a, d) => cells.push(columnValue(a, c.values[d]!)));
  cells.push(status);
  for (const k of METRIC_COLUMNS) cells.push(metrics ? metrics[k] : null);
  return cells;
}

/**
 * Runs one case from its whole document (the base scenario with the case's values set, parsed and
 * checked as a scenario file is): its cells in column order (see `columns`); a failed case has
 * status "error: …" and empty metrics. The reference every faster path must equal.
 */
export function caseCells(def: SweepDefinition, c: CaseValues): Cell[] {
  let status = "ok";
  let metrics: Metrics | null = null;
  try {
    const doc = structuredClone(def.scenario);
    def.design.axes.forEach((a, d) => setPath(doc, a.path, c.values[d]!));
    metrics = metricsFor(resolveScenario(doc).thermal, def);
  } catch (err) {
    status = `error: ${failureReason(err)}`.replace(/\s+/g, " ");
  }
  return cellsOf(def, c, status, metrics);
}

/**
 * A case runner for many cases of one sweep (a worker's): the base scenario is parsed once and a
 * case re-parses only its axes' values (`caseScenarios`: the same ThermalCase as the whole parse).
 * A case that fails on that path is run again by `caseCells`, so that every failure is worded, and
 * every row is, exactly as the whole document's run gives it.
 */
export function caseRunner(def: SweepDefinition): (c: CaseValues) => Cell[] {
  const scenarios = caseScenarios(def.scenario, def.design.axes.map((a) => a.path));
  if (!scenarios) return (c) => caseCells(def, c);
  return (c) => {
    const thermal = scenarios.thermal(c.values);
    if (thermal === null) return caseCells(def, c);
    let metrics: Metrics;
    try {
      metrics = metricsFor(thermal, def);
    } catch {
      return caseCells(def, c);
    }
    return cellsOf(def, c, "ok", metrics);
  };
}

/** Index of the status cell in a row. */
export function statusIndex(def: SweepDefinition): number {
  return 1 + def.design.axes.length;
}

/** A row as its text line (without the newline): CSV, or a JSON object holding every column that has a value. */
export function formatRow(def: SweepDefinition, cells: readonly Cell[]): string {
  if (def.format === "jsonl") {
    const names = columns(def);
    const record: Record<string, Cell> = {};
    cells.forEach((v, i) => {
      if (v !== null) record[names[i]!] = v;
    });
    return JSON.stringify(record);
  }
  return cells.map(csvField).join(",");
}

/** Runs one case and returns its output line (without the newline). */
export function runCase(def: SweepDefinition, c: CaseValues): string {
  return formatRow(def, caseCells(def, c));
}

/** One chunk's rows, as a worker sends them back: text (CSV, JSON Lines) or cells (Parquet), with the failures counted. */
export interface ChunkResult {
  chunk: number;
  count: number;
  failed: number;
  firstFailure: string | null;
  text?: string;
  rows?: Cell[][];
}

/** Runs the cases of one chunk (with `run`, a `caseRunner` made once for many chunks). */
export function runChunk(
  def: SweepDefinition,
  makeCase: (id: number) => CaseValues,
  chunk: number,
  ids: readonly number[],
  run: (c: CaseValues) => Cell[] = (c) => caseCells(def, c),
): ChunkResult {
  const statusAt = statusIndex(def);
  const rows = ids.map((id) => run(makeCase(id)));
  let failed = 0;
  let firstFailure: string | null = null;
  for (const row of rows) {
    if (row[statusAt] !== "ok") {
      failed++;
      firstFailure ??= String(row[statusAt]);
    }
  }
  return def.format === "parquet"
    ? { chunk, count: rows.length, failed, firstFailure, rows }
    : { chunk, count: rows.length, failed, firstFailure, text: rows.map((r) => formatRow(def, r)).join("\n") + "\n" };
}

/** Whether a row's line records a successful case (the status field is "ok"). */
export function lineOk(line: string, def: SweepDefinition): boolean {
  if (def.format === "jsonl") {
    try {
      return (JSON.parse(line) as { status?: unknown }).status === "ok";
    } catch {
      return false;
    }
  }
  // Fields before the status are the case id and the inputs, which never hold a comma or quote.
  let at = 0;
  for (let i = 0; i < statusIndex(def); i++) at = line.indexOf(",", at) + 1;
  return line.startsWith("ok,", at) || line.length === at + 2 && line.endsWith("ok");
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
