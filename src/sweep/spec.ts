/**
 * Sweep axes: `--vary PATH=SPEC`. SPEC is a list ("0.1,0.3,0.5", "global,dayside", "0.5 au,1 au"),
 * a linear range with a count ("0:0.9:10" or "0.5 au..2 au:7"), or a logarithmic one
 * ("1e5..1e9:9 log"). Values keep the unit written in the spec; the scenario parser converts them,
 * so every unit the scenario format knows works here too.
 */
import { CalorbitError } from "../errors.js";

export type AxisValue = number | string;

export interface Axis {
  /** Dotted scenario path, e.g. "orbit.eccentricity". */
  path: string;
  /** The spec as written. */
  spec: string;
  /** Unit shared by every value ("" when the values are plain numbers or text). */
  unit: string;
  /** Discrete levels (lists and ranges expand to these for a grid). */
  levels: AxisValue[];
  /** For ranges: the continuous interval, for Latin hypercube draws. */
  range?: { from: number; to: number; log: boolean };
}

const NUMBER = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$/;
const PATH = /^[A-Za-z][A-Za-z0-9]*(\.[A-Za-z0-9]+)*$/;

function bad(arg: string, allowed: string): CalorbitError {
  return new CalorbitError("USAGE", `--vary: given ${JSON.stringify(arg)}; allowed: ${allowed}`, [
    { path: "--vary", given: JSON.stringify(arg), allowed },
  ]);
}

/** Splits "12.5 au" into 12.5 and "au" ("" for a bare number); null when it is not a number. */
function numberWithUnit(text: string): { value: number; unit: string } | null {
  const m = NUMBER.exec(text);
  if (!m) return null;
  const value = Number(m[1]);
  return Number.isFinite(value) ? { value, unit: m[2] ?? "" } : null;
}

/** A generated level, rounded to 15 significant digits so that 0.1·3 prints as 0.3, not 0.30000000000000004. */
function level(value: number, unit: string): AxisValue {
  const v = Number(value.toPrecision(15));
  return unit === "" ? v : `${v} ${unit}`;
}

export function parseAxis(arg: string): Axis {
  const eq = arg.indexOf("=");
  if (eq <= 0) throw bad(arg, "PATH=SPEC, e.g. orbit.eccentricity=0:0.9:10");
  const path = arg.slice(0, eq).trim();
  const spec = arg.slice(eq + 1).trim();
  if (!PATH.test(path)) throw bad(arg, "a dotted scenario key such as orbit.eccentricity or body.layer.thickness");
  const logMatch = /^(.*?)\s+log$/.exec(spec);
  const body = logMatch ? logMatch[1]!.trim() : spec;
  const rangeMatch = /^(.+?)(?:\.\.|:)(.+?):\s*(\d+)$/.exec(body);
  if (rangeMatch && !body.includes(",")) {
    const from = numberWithUnit(rangeMatch[1]!);
    const to = numberWithUnit(rangeMatch[2]!);
    const count = Number(rangeMatch[3]);
    if (!from || !to) throw bad(arg, "a range FROM..TO:COUNT whose ends are numbers (with an optional unit)");
    if (from.unit !== to.unit && from.unit !== "" && to.unit !== "") throw bad(arg, "both ends of a range in the same unit");
    const unit = from.unit || to.unit;
    if (!(count >= 1 && count <= 10_000_000)) throw bad(arg, "a count from 1 to 10,000,000");
    const log = logMatch !== null;
    if (log && !(from.value > 0 && to.value > 0)) throw bad(arg, "a logarithmic range with both ends > 0");
    const levels: AxisValue[] = [];
    for (let k = 0; k < count; k++) {
      const f = count === 1 ? 0 : k / (count - 1);
      const v = log ? Math.exp(Math.log(from.value) + f * (Math.log(to.value) - Math.log(from.value))) : from.value + f * (to.value - from.value);
      levels.push(level(k === 0 ? from.value : k === count - 1 ? to.value : v, unit));
    }
    return { path, spec, unit, levels, range: { from: from.value, to: to.value, log } };
  }
  if (logMatch) throw bad(arg, "'log' only after a range FROM..TO:COUNT");
  const items = body.split(",").map((s) => s.trim());
  if (items.some((s) => s === "")) throw bad(arg, "a comma-separated list without empty items");
  const parsed = items.map(numberWithUnit);
  if (parsed.every((p) => p !== null)) {
    const units = new Set(parsed.map((p) => p!.unit));
    const unit = units.size === 1 ? [...units][0]! : "";
    return { path, spec, unit, levels: items.map((s, i) => (unit !== "" ? `${parsed[i]!.value} ${unit}` : units.size === 1 ? parsed[i]!.value : s)) };
  }
  return { path, spec, unit: "", levels: items };
}

/** Sets a dotted path in a plain document, creating objects on the way (array indices allowed). */
export function setPath(doc: Record<string, unknown>, path: string, value: AxisValue): void {
  const keys = path.split(".");
  let node: Record<string, unknown> = doc;
  for (let i = 0; i < keys.length - 1; i++) {
    const k = keys[i]!;
    const next = node[k];
    if (next === null || typeof next !== "object") node[k] = {};
    node = node[k] as Record<string, unknown>;
  }
  node[keys[keys.length - 1]!] = value;
}

/** The value of a level in the output column: the number in the axis unit, or the text. */
export function columnValue(axis: Axis, value: AxisValue): number | string {
  if (typeof value === "number") return value;
  if (axis.unit !== "") return Number(numberWithUnit(value)!.value);
  return value;
}
