/**
 * Observed series for a fit: CSV or JSON Lines text → times in seconds, the observed values and
 * their optional 1σ uncertainties. Column names carry their unit as the last `_`-part, as in
 * calorbit's own CSV: `time_s` / `time_d` / `time_h` (or `time` with a unit given separately),
 * `temperature_K` (or `temperature_degC`), `sigma_K`, and `flux_ratio` for a flux ratio (dimensionless).
 * Pure: the caller reads the file. Every problem is a CalorbitError with one FieldProblem per line.
 */
import { CalorbitError, type FieldProblem } from "../errors.js";
import { parseQuantity, UNIT_TABLES } from "../scenario/units.js";

/** What the data measure: a temperature (K) or a flux ratio (dimensionless, a passband's planet/star ratio). */
export type ObservedQuantity = "temperature" | "fluxRatio";

export interface Observations {
  /** Times, s, strictly increasing (any origin: a free time offset or the orbit phase places them). */
  timeSeconds: Float64Array;
  /** Observed values in SI (K for a temperature; dimensionless for a flux ratio). */
  value: Float64Array;
  /** 1σ uncertainties in the same unit as `value`, or null when the file gives none. */
  sigma: Float64Array | null;
  quantity: ObservedQuantity;
  /** Column names as read (for the residual file). */
  columns: { time: string; value: string; sigma: string | null };
  /** The time unit of the file (for reports): "s", "d", … */
  timeUnit: string;
  /** Line number in the file of each point (1-based), for messages. */
  lines: Int32Array;
}

export type DataFormat = "csv" | "jsonl";

function problem(source: string, path: string, given: string, allowed: string): CalorbitError {
  const p: FieldProblem = { path: `${source}: ${path}`, given, allowed };
  return new CalorbitError("INVALID_ARGUMENT", `${p.path}: given ${given}; allowed: ${allowed}`, [p]);
}

/** Seconds per unit for a time unit name ("s", "d", "h", "min", "yr", or their aliases), or null. */
export function secondsPerTimeUnit(unit: string): number | null {
  const parsed = parseQuantity("time", `1 ${unit}`);
  return parsed.ok ? parsed.valueSI : null;
}

interface RawTable {
  header: string[];
  rows: { line: number; cells: (string | number | null)[] }[];
}

function splitCsv(text: string, source: string): RawTable {
  const lines = text.split(/\r?\n/);
  let header: string[] | null = null;
  const rows: RawTable["rows"] = [];
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i]!.trim();
    if (raw === "" || raw.startsWith("#")) continue;
    const cells = raw.split(",").map((c) => c.trim().replace(/^"(.*)"$/, "$1"));
    if (header === null) {
      header = cells;
      continue;
    }
    if (cells.length !== header.length) {
      throw problem(source, `line ${i + 1}`, `${cells.length} fields`, `${header.length} fields, one per header column (${header.join(", ")})`);
    }
    rows.push({ line: i + 1, cells });
  }
  if (header === null) throw problem(source, "header", "no header line", "a first line naming the columns, e.g. time_s,temperature_K,sigma_K");
  return { header, rows };
}

function splitJsonLines(text: string, source: string): RawTable {
  const lines = text.split(/\r?\n/);
  const header: string[] = [];
  const records: { line: number; record: Record<string, unknown> }[] = [];
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i]!.trim();
    if (raw === "" || raw.startsWith("#")) continue;
    let record: unknown;
    try {
      record = JSON.parse(raw);
    } catch {
      throw problem(source, `line ${i + 1}`, JSON.stringify(raw.slice(0, 40)), "one JSON object per line");
    }
    if (record === null || typeof record !== "object" || Array.isArray(record)) {
      throw problem(source, `line ${i + 1}`, JSON.stringify(raw.slice(0, 40)), "one JSON object per line");
    }
    for (const k of Object.keys(record)) if (!header.includes(k)) header.push(k);
    records.push({ line: i + 1, record: record as Record<string, unknown> });
  }
  if (records.length === 0) throw problem(source, "data", "no records", "one JSON object per line, e.g. {\"time_s\": 0, \"temperature_K\": 101.2}");
  return {
    header,
    rows: records.map(({ line, record }) => ({
      line,
      cells: header.map((k) => {
        const v = record[k];
        return typeof v === "number" || typeof v === "string" ? v : null;
      }),
    })),
  };
}

/** The unit of a column named "<stem>_<unit>" (the last `_`-part), or "" for a bare stem. */
function columnUnit(name: string, stem: string): string | null {
  if (name === stem) return "";
  if (name.startsWith(`${stem}_`)) return name.slice(stem.length + 1);
  return null;
}

function findColumn(header: string[], stem: string): { index: number; unit: string }[] {
  const found: { index: number; unit: string }[] = [];
  header.forEach((name, index) => {
    const unit = columnUnit(name, stem);
    if (unit !== null) found.push({ index, unit });
  });
  return found;
}

export interface ObservationOptions {
  format: DataFormat;
  /** Name of the source for messages (the file name). */
  source: string;
  /** Time unit for a bare `time` column (or to confirm a suffixed one). */
  timeUnit?: string;
}

/** Parses observation text; throws a CalorbitError naming the file, line and column of the first bad value. */
export function parseObservations(text: string, options: ObservationOptions): Observations {
  const { source } = options;
  const table = options.format === "jsonl" ? splitJsonLines(text, source) : splitCsv(text, source);
  const { header } = table;

  const times = findColumn(header, "time");
  if (times.length !== 1) {
    throw problem(source, "header", JSON.stringify(header.join(",")), "exactly one time column: time_s, time_d, time_h, time_min, time_yr (or time with --time-unit)");
  }
  const time = times[0]!;
  let timeUnit = time.unit;
  if (options.timeUnit !== undefined) {
    if (secondsPerTimeUnit(options.timeUnit) === null) {
      throw problem(source, "--time-unit", JSON.stringify(options.timeUnit), `a time unit, one of ${Object.keys(UNIT_TABLES.time.units).join(", ")}`);
    }
    if (timeUnit !== "" && secondsPerTimeUnit(timeUnit) !== secondsPerTimeUnit(options.timeUnit)) {
      throw problem(source, header[time.index]!, `a column in ${timeUnit} with --time-unit ${options.timeUnit}`, "the same unit in both (or a bare 'time' column)");
    }
    timeUnit = options.timeUnit;
  }
  if (timeUnit === "") throw problem(source, header[time.index]!, "no unit", "a unit suffix such as time_s or time_d, or --time-unit");
  const secondsPer = secondsPerTimeUnit(timeUnit);
  if (secondsPer === null) {
    throw problem(source, header[time.index]!, `unit ${JSON.stringify(timeUnit)}`, `a time unit, one of ${Object.keys(UNIT_TABLES.time.units).join(", ")}`);
  }

  const temps = findColumn(header, "temperature");
  const fluxes = header.map((h, index) => ({ h, index })).filter((c) => c.h === "flux_ratio");
  if (temps.length + fluxes.length !== 1) {
    throw problem(source, "header", JSON.stringify(header.join(",")), "exactly one observed column: temperature_K (or temperature_degC), or flux_ratio");
  }
  const quantity: ObservedQuantity = temps.length === 1 ? "temperature" : "fluxRatio";
  const valueColumn = temps.length === 1 ? temps[0]! : { index: fluxes[0]!.index, unit: "" };
  if (quantity === "temperature" && valueColumn.unit !== "K" && valueColumn.unit !== "degC") {
    throw problem(source, header[valueColumn.index]!, `unit ${JSON.stringify(valueColumn.unit)}`, "temperature_K or temperature_degC");
  }
  const sigmas = findColumn(header, "sigma");
  if (sigmas.length > 1) throw problem(source, "header", JSON.stringify(header.join(",")), "at most one sigma column");
  const sigmaColumn = sigmas[0] ?? null;
  const sigmaUnit = quantity === "temperature" ? "K" : "";
  if (sigmaColumn && sigmaColumn.unit !== sigmaUnit) {
    throw problem(source, header[sigmaColumn.index]!, `unit ${JSON.stringify(sigmaColumn.unit)}`, quantity === "temperature" ? "sigma_K (a 1σ uncertainty in kelvin)" : "sigma (dimensionless, like flux_ratio)");
  }

  const n = table.rows.length;
  const timeSeconds = new Float64Array(n);
  const value = new Float64Array(n);
  const sigma = sigmaColumn ? new Float64Array(n) : null;
  const lines = new Int32Array(n);
  const read = (cell: string | number | null, line: number, column: string, ok: (v: number) => boolean, allowed: string): number => {
    const v = typeof cell === "number" ? cell : cell === null || cell.trim() === "" ? NaN : Number(cell);
    if (cell === null || (typeof cell === "string" && cell.trim() === "")) throw problem(source, `line ${line} ${column}`, "missing", allowed);
    if (!Number.isFinite(v) || !ok(v)) throw problem(source, `line ${line} ${column}`, JSON.stringify(String(cell)), allowed);
    return v;
  };
  table.rows.forEach((row, k) => {
    lines[k] = row.line;
    timeSeconds[k] = read(row.cells[time.index]!, row.line, header[time.index]!, () => true, "a finite number") * secondsPer;
    if (k > 0 && !(timeSeconds[k]! > timeSeconds[k - 1]!)) {
      throw problem(source, `line ${row.line} ${header[time.index]!}`, String(row.cells[time.index]), `a time after the previous row's (times strictly increasing)`);
    }
    const raw = read(row.cells[valueColumn.index]!, row.line, header[valueColumn.index]!, () => true, "a finite number");
    const si = quantity === "temperature" ? (valueColumn.unit === "degC" ? (parseQuantity("temperature", `${raw} degC`) as { valueSI: number }).valueSI : raw) : raw;
    if (quantity === "temperature" && !(si > 0)) throw problem(source, `line ${row.line} ${header[valueColumn.index]!}`, String(raw), "a temperature above 0 K");
    value[k] = si;
    if (sigma && sigmaColumn) sigma[k] = read(row.cells[sigmaColumn.index]!, row.line, header[sigmaColumn.index]!, (v) => v > 0, "a 1σ uncertainty > 0");
  });
  if (n === 0) throw problem(source, "data", "no rows", "at least one data row below the header");
  return {
    timeSeconds,
    value,
    sigma,
    quantity,
    columns: { time: header[time.index]!, value: header[valueColumn.index]!, sigma: sigmaColumn ? header[sigmaColumn.index]! : null },
    timeUnit,
    lines,
  };
}

/** Format from a file name: .jsonl / .ndjson → JSON Lines, anything else CSV. */
export function dataFormatFor(fileName: string): DataFormat {
  return /\.(jsonl|ndjson)$/i.test(fileName) ? "jsonl" : "csv";
}
