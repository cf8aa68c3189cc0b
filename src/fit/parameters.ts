/**
 * Free parameters of a fit: `KEY[=LOW..HIGH[ log|lin]]`. KEY is any scenario key a sweep accepts
 * (the bounds are read by the sweep's own axis parser, so units work exactly as in `--vary`), or
 * `timeOffset`, the shift added to the data's times to put them on the model's clock.
 *
 * Values live in the unit written in the bounds ("0.5 MJ/m2/K..5 MJ/m2/K" fits in MJ/m2/K); they are
 * written into the scenario as "<value> <unit>" so the scenario parser converts them, and reported
 * in SI through the same unit tables.
 */
import { CalorbitError } from "../errors.js";
import { parseQuantity, UNIT_TABLES, type QuantityKind } from "../scenario/units.js";
import { parseAxis } from "../sweep/spec.js";

/** The pseudo-key of the time offset (model time = data time + offset). */
export const TIME_OFFSET_KEY = "timeOffset";

/**
 * Keys whose plausible values span decades: fitted in log space (and given a log-flat prior) unless
 * the bounds say "lin".
 */
export const LOG_SCALE_KEYS: readonly string[] = [
  "body.heatCapacity",
  "body.layer.thickness",
  "body.column.thermalInertia",
  "body.column.conductivity",
  "body.column.profile.surfaceConductivity",
  "body.column.profile.deepConductivity",
  "body.column.profile.eFoldingDepth",
  "body.exchangeCoefficient",
  "climate.diffusion",
];

/** Bounds used when `--free KEY` gives none (only for keys with a natural range). */
const DEFAULT_BOUNDS: Readonly<Record<string, { low: number; high: number }>> = {
  "body.albedo": { low: 0, high: 1 },
  "body.emissivity": { low: 0.01, high: 1 },
  "body.recirculation": { low: 0, high: 1 },
};

export interface FreeParameter {
  /** The key as given to --free. */
  key: string;
  /** The unit of the value and the bounds ("" when the bounds were bare numbers: the scenario's SI unit). */
  unit: string;
  low: number;
  high: number;
  /** Fitted in log space with a log-flat prior. */
  log: boolean;
  /** The quantity kind of the unit (for the SI conversion), null for a bare number. */
  kind: QuantityKind | null;
}

function bad(arg: string, allowed: string): CalorbitError {
  return new CalorbitError("USAGE", `--free: given ${JSON.stringify(arg)}; allowed: ${allowed}`, [{ path: "--free", given: JSON.stringify(arg), allowed }]);
}

/** The quantity kind whose unit table knows `unit`. */
function kindOfUnit(unit: string): QuantityKind | null {
  for (const kind of Object.keys(UNIT_TABLES) as QuantityKind[]) {
    if (parseQuantity(kind, `1 ${unit}`).ok) return kind;
  }
  return null;
}

/**
 * Parses one --free argument. `cycleSeconds` (the model's cycle) sets the default bounds of the
 * time offset: half a cycle either way.
 */
export function parseFreeParameter(arg: string, cycleSeconds: number): FreeParameter {
  const eq = arg.indexOf("=");
  const key = (eq < 0 ? arg : arg.slice(0, eq)).trim();
  let spec = eq < 0 ? "" : arg.slice(eq + 1).trim();
  let scale: "log" | "lin" | null = null;
  const scaleMatch = /^(.*?)\s*\b(log|lin)$/.exec(spec);
  if (scaleMatch) {
    scale = scaleMatch[2] as "log" | "lin";
    spec = scaleMatch[1]!.trim();
  }
  let low: number;
  let high: number;
  let unit: string;
  if (spec === "") {
    if (key === TIME_OFFSET_KEY) {
      low = -cycleSeconds / 2;
      high = cycleSeconds / 2;
      unit = "s";
    } else {
      const d = DEFAULT_BOUNDS[key];
      if (!d) throw bad(arg, `bounds for ${key}: ${key}=LOW..HIGH with an optional unit, e.g. body.heatCapacity=1e5..1e8 (defaults exist for ${[...Object.keys(DEFAULT_BOUNDS), TIME_OFFSET_KEY].join(", ")})`);
      low = d.low;
      high = d.high;
      unit = "";
    }
  } else {
    if (!/\.\./.test(spec) || spec.includes(",") || /:\s*\d+$/.test(spec)) throw bad(arg, "KEY=LOW..HIGH (a range without a count), e.g. body.albedo=0.05..0.4");
    // The sweep's own parser reads the ends and their unit (a two-level range).
    let axis;
    try {
      axis = parseAxis(`${key}=${spec}:2`);
    } catch {
      throw bad(arg, "KEY=LOW..HIGH with numbers and an optional unit on either end, e.g. \"body.heatCapacity=0.1 MJ/m2/K..10 MJ/m2/K\"");
    }
    if (!axis.range) throw bad(arg, "KEY=LOW..HIGH");
    low = axis.range.from;
    high = axis.range.to;
    unit = axis.unit;
  }
  if (!(high > low)) throw bad(arg, "LOW < HIGH");
  const kind = unit === "" ? null : kindOfUnit(unit);
  if (unit !== "" && kind === null) throw bad(arg, `a unit calorbit knows (unknown unit "${unit}")`);
  if (key === TIME_OFFSET_KEY && kind !== null && kind !== "time") throw bad(arg, "a time offset in a time unit (s, min, h, d, yr)");
  const log = scale === "log" || (scale === null && LOG_SCALE_KEYS.includes(key) && low > 0);
  if (log && !(low > 0)) throw bad(arg, "a log-scale parameter with LOW > 0");
  return { key, unit, low, high, log, kind };
}

/** The value (in the parameter's unit) in SI. */
export function toSI(p: FreeParameter, value: number): number {
  if (p.kind === null) return value;
  const parsed = parseQuantity(p.kind, `${value} ${p.unit}`);
  return parsed.ok ? parsed.valueSI : NaN;
}

/** SI per unit of the parameter (the derivative of toSI; every unit is linear or affine). */
export function siPerUnit(p: FreeParameter): number {
  if (p.kind === null) return 1;
  return toSI(p, 1) - toSI(p, 0);
}

/** The time offset in seconds from its value in the parameter's unit. */
export function offsetSeconds(p: FreeParameter, value: number): number {
  return p.kind === null ? value : toSI(p, value);
}

/** What to write into the scenario at the key: a bare number or "<value> <unit>". */
export function scenarioValue(p: FreeParameter, value: number): number | string {
  return p.unit === "" ? value : `${value} ${p.unit}`;
}

/** Internal (optimiser) coordinate: ln v for log parameters, v otherwise. */
export function toInternal(p: FreeParameter, value: number): number {
  return p.log ? Math.log(value) : value;
}

export function fromInternal(p: FreeParameter, z: number): number {
  return p.log ? Math.exp(z) : z;
}

/** The column name of a parameter in chain and residual files: the key with its unit as the last `_`-part. */
export function parameterColumn(p: FreeParameter): string {
  return p.unit ? `${p.key}_${p.unit.replace(/[^A-Za-z0-9]+/g, "_")}` : p.key;
}

/** SI units of the keys whose bare numbers are SI, for reports when the bounds had no unit. */
const KEY_SI_UNITS: Readonly<Record<string, string>> = {
  "body.heatCapacity": "J/m2/K",
  "body.internalFlux": "W/m2",
  "body.exchangeCoefficient": "W/m2/K",
  "body.layer.thickness": "m",
  "body.column.thermalInertia": "J/m2/K/s^0.5",
  "body.column.conductivity": "W/m/K",
  "body.column.density": "kg/m3",
  "body.column.specificHeat": "J/kg/K",
  "climate.diffusion": "W/m2/K",
  "orbit.semiMajorAxis": "m",
  "orbit.period": "s",
  "orbit.meanAnomalyAtStart": "rad",
  [TIME_OFFSET_KEY]: "s",
};

/** The SI unit of the parameter, for reports ("" when dimensionless). */
export function siUnit(p: FreeParameter): string {
  return p.kind === null ? (KEY_SI_UNITS[p.key] ?? "") : UNIT_TABLES[p.kind].si;
}
