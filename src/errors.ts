/**
 * Errors as data: every failure calorbit raises is a CalorbitError with a stable `code`,
 * so the CLI can print one line and choose its exit status without parsing messages.
 */

export type ErrorCode =
  | "INVALID_ARGUMENT" // a public function was called outside its physical domain
  | "KEPLER_NO_CONVERGENCE" // Kepler's equation did not converge within the iteration cap
  | "INTEGRATION_FAILED" // the ODE solver gave up (step limit, non-finite state)
  | "PERIODIC_NO_CONVERGENCE" // the shooting iteration did not find T(0) = T(P)
  | "EQUILIBRIUM_NO_CONVERGENCE" // an instantaneous balance (day/night, a column's surface) did not converge
  | "SCENARIO_INVALID" // a scenario failed validation; `problems` holds one entry per field
  | "SCENARIO_UNREADABLE" // a scenario file is missing or cannot be parsed
  | "SWEEP_WORKER_FAILED" // a sweep worker thread died (not a case failing: those become rows)
  | "SWEEP_CASES_FAILED" // every case of a sweep failed (each is a row saying why)
  | "USAGE"; // a command-line flag is malformed

/** One problem with one input field: where it is, what was given, what is allowed. */
export interface FieldProblem {
  /** Dotted path of the field, e.g. "orbit.eccentricity". */
  path: string;
  /** The value as given, rendered for a human (may be "missing"). */
  given: string;
  /** What is allowed there, in words. */
  allowed: string;
}

export class CalorbitError extends Error {
  readonly code: ErrorCode;
  readonly problems: readonly FieldProblem[];

  constructor(code: ErrorCode, message: string, problems: readonly FieldProblem[] = []) {
    super(message);
    this.name = "CalorbitError";
    this.code = code;
    this.problems = problems;
  }
}

/** Longest echo of a given value in a message, in characters (a whole file pasted into a field stays one short line). */
export const MAX_ECHO_CHARS = 80;

/** Cuts `text` to at most `max` characters, marking the cut with "…", and puts control characters as escapes. */
export function clip(text: string, max = MAX_ECHO_CHARS): string {
  const visible = text.replace(/[\u0000-\u001f\u007f\ufeff]/g, (c) => (c === "\n" ? "\\n" : `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`));
  return visible.length > max ? `${visible.slice(0, max - 1)}…` : visible;
}

/**
 * Renders a problem as the one line the CLI prints for it. Whoever builds a problem from a user's
 * value passes it through `clip` (or `describeValue`), so that no echo runs past about 80 characters.
 */
export function formatProblem(p: FieldProblem): string {
  return `${p.path}: given ${p.given}; allowed: ${p.allowed}`;
}

/** A value as a short phrase for a message, whatever it is (undefined, a BigInt, a cyclic object, a function). */
export function describeValue(value: unknown): string {
  if (value === undefined) return "undefined";
  if (typeof value === "bigint") return `${value}n (a BigInt)`;
  if (typeof value === "function" || typeof value === "symbol") return `a ${typeof value}`;
  try {
    return clip(JSON.stringify(value) ?? String(value));
  } catch {
    return "an object that contains itself";
  }
}

/**
 * Throws INVALID_ARGUMENT unless `value` is a plain object that has every key in `keys` as an object
 * (the public functions' first guard: a wrong argument is a typed error, never a TypeError deep inside).
 */
export function requireObject(name: string, value: unknown, keys: readonly string[], allowed: string): void {
  const isObject = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);
  if (!isObject(value)) {
    throw new CalorbitError("INVALID_ARGUMENT", `${name}: given ${describeValue(value)}; allowed: ${allowed}`, [{ path: name, given: describeValue(value), allowed }]);
  }
  for (const key of keys) {
    if (!isObject(value[key])) {
      const path = `${name}.${key}`;
      throw new CalorbitError("INVALID_ARGUMENT", `${path}: given ${describeValue(value[key])}; allowed: ${allowed}`, [{ path, given: describeValue(value[key]), allowed }]);
    }
  }
}

/** Throws INVALID_ARGUMENT unless `value` is a finite number satisfying `ok`. */
export function requireNumber(
  name: string,
  value: number,
  ok: (v: number) => boolean,
  allowed: string,
): void {
  if (typeof value !== "number" || !Number.isFinite(value) || !ok(value)) {
    throw new CalorbitError("INVALID_ARGUMENT", `${name}: given ${describeValue(value)}; allowed: ${allowed}`, [
      { path: name, given: describeValue(value), allowed },
    ]);
  }
}
