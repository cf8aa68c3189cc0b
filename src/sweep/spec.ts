/**
 * Sweep axes: `--vary PATH=SPEC`. SPEC is a list ("0.1,0.3,0.5", "global,dayside", "0.5 au,1 au"),
 * a linear range with a count ("0:0.9:10" or "0.5 au..2 au:7"), or a logarithmic one
 * ("1e5..1e9:9 log"). Values keep the unit written in the spec; the scenario parser converts them,
 * so every unit the scenario format knows works here too. A range's levels are computed on demand
 * (`levelAt`), so an axis costs no memory however many levels it has.
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
  /** Number of discrete levels (a grid takes each once). */
  count: number;
  /** The levels of a list, as given. */
  list?: AxisValue[];
  /** For ranges: the interval (levels and Latin hypercube draws come from it). */
  range?: { from: number; to: number; log: boolean };
}

const NUMBER = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$/;
const PATH = /^[A-Za-z][A-Za-z0-9]*(\.[A-Za-z0-9]+)*$/;

function bad(arg: string, allowed: string): CalorbitError {
  const path = arg.includes("=") ? `--vary ${arg.slice(0, arg.indexOf("=")).trim()}` : "--vary";
  return new CalorbitError("USAGE", `${path}: given ${JSON.stringify(arg)}; allowed: ${allowed}`, [{ path, given: JSON.stringify(arg), allowed }]);
}

/** Splits "12.5 au" into 12.5 and "au" ("" for a bare number); null when it is not a number. */
function numberWithUnit(text: string): { value: number; unit: string } | null {
  const m = NUMBER.exec(text);
  if (!m) return null;
  const value = Number(m[1]);
  const unit = m[2] ?? "";
  // A unit never holds range punctuation: "0..1:1e9" is not the number 0 in the unit "..1:1e9".
  if (unit.startsWith(".") || unit.includes(":")) return null;
  return Number.isFinite(value) ? { value, unit } : null;
}

/** A generated level, rounded to 15 significant digits so that 0.1·3 prints as 0.3, not 0.30000000000000004. */
function level(value: number, unit: string): AxisValue {
  const v = Number(value.toPrecision(15));
  return unit === "" ? v : `${v} ${unit}`;
}

/** Whether a spec is written as a range (FROM..TO:COUNT or FROM:TO:COUNT) rather than a list. */
function looksLikeRange(body: string): boolean {
  return !body.includes(",") && (body.includes("..") || body.split(":").length === 3);
}

export function parseAxis(arg: string): Axis {
  const eq = arg.indexOf("=");
  if (eq <= 0) throw bad(arg, "PATH=SPEC, e.g. orbit.eccentricity=0:0.9:10");
  const path = arg.slice(0, eq).trim();
  const spec = arg.slice(eq + 1).trim();
  if (!PATH.test(path)) throw bad(arg, "a dotted scenario key such as orbit.eccentricity or body.layer.thickness");
  const logMatch = /^(.*?)\s+log$/.exec(spec);
  const body = logMatch ? logMatch[1]!.trim() : spec;
  if (looksLikeRange(body)) {
    const m = /^(.+?)(?:\.\.|:)(.+):([^:]*)$/.exec(body);
    if (!m) throw bad(arg, "a range FROM..TO:COUNT or FROM:TO:COUNT, e.g. 0..0.9:10");
    const from = numberWithUnit(m[1]!);
    const to = numberWithUnit(m[2]!);
    const countText = m[3]!.trim();
    if (!from || !to) throw bad(arg, "a range FROM..TO:COUNT whose ends are numbers (with an optional unit)");
    if (from.unit !== to.unit && from.unit !== "" && to.unit !== "") throw bad(arg, "both ends of a range in the same unit");
    if (!/^\d+$/.test(countText) || Number(countText) < 1 || !Number.isSafeInteger(Number(countText))) {
      throw bad(arg, `a whole number of levels after the last ':' (given ${JSON.stringify(countText)}), e.g. 0..1:11`);
    }
    const count = Number(countText);
    const unit = from.unit || to.unit;
    const log = logMatch !== null;
    if (log && !(from.value > 0 && to.value > 0)) throw bad(arg, "a logarithmic range with both ends > 0");
    return { path, spec, unit, count, range: { from: from.value, to: to.value, log } };
  }
  if (logMatch) throw bad(arg, "'log' only after a range FROM..TO:COUNT");
  const items = body.split(",").map((s) => s.trim());
  if (items.some((s) => s === "")) throw bad(arg, "a comma-separated list without empty items");
  const parsed = items.map(numberWithUnit);
  if (parsed.every((p) => p !== null)) {
    const units = new Set(parsed.map((p) => p!.unit));
    const unit = units.size === 1 ? [...units][0]! : "";
    const list = items.map((s, i) => (unit !== "" ? `${parsed[i]!.value} ${unit}` : units.size === 1 ? parsed[i]!.value : s));
    return { path, spec, unit, count: list.length, list };
  }
  return { path, spec, unit: "", count: items.length, list: items };
}

/** The k-th level of an axis (0 ≤ k < count): a list item, or a point of the range, ends exact. */
export function levelAt(axis: Axis, k: number): AxisValue {
  if (axis.list) return axis.list[k]!;
  const { from, to, log } = axis.range!;
  const n = axis.count;
  if (k === 0) return level(from, axis.unit);
  if (k === n - 1) return level(to, axis.unit);
  const f = k / (n - 1);
  return level(log ? Math.exp(Math.log(from) + f * (Math.log(to) - Math.log(from))) : from + f * (to - from), axis.unit);
}

/**
 * Keys that say the same thing in different ways: a scenario gives one of each group. An axis over one
 * member replaces the others in the base scenario, as the user means it (varying body.heatCapacity on a
 * scenario that stores its heat in a body.layer sweeps a direct heat capacity instead).
 */
export const ALTERNATIVE_KEYS: readonly (readonly string[])[] = [
  ["body.heatCapacity", "body.layer", "body.column"],
  ["star.luminosity", "star.radius"],
  ["star.luminosity", "star.temperature"],
  ["body.recirculation", "body.exchangeCoefficient"],
  ["spin.period", "spin.orbitRatio"],
];

/** The group member a path lies under, with its alternatives (null when the path is in no group). */
export function alternativesOf(path: string): { member: string; others: string[] } | null {
  for (const group of ALTERNATIVE_KEYS) {
    const member = group.find((k) => path === k || path.startsWith(`${k}.`));
    if (member) return { member, others: group.filter((k) => k !== member) };
  }
  return null;
}

function deletePath(doc: Record<string, unknown>, path: string): void {
  const keys = path.split(".");
  let node: unknown = doc;
  for (let i = 0; i < keys.length - 1; i++) {
    if (node === null || typeof node !== "object") return;
    node = (node as Record<string, unknown>)[keys[i]!];
  }
  if (node !== null && typeof node === "object") delete (node as Record<string, unknown>)[keys[keys.length - 1]!];
}

/**
 * Sets a dotted path in a plain document, creating objects on the way (array indices allowed), and
 * removes the keys it replaces (see ALTERNATIVE_KEYS): the star's radius and temperature go together.
 */
export function setPath(doc: Record<string, unknown>, path: string, value: AxisValue): void {
  const alt = alternativesOf(path);
  if (alt) {
    const others = alt.member === "star.luminosity" ? ["star.radius", "star.temperature"] : alt.member.startsWith("star.") ? ["star.luminosity"] : alt.others;
    for (const other of others) deletePath(doc, other);
  }
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
