/**
 * Errors as data: every failure calorbit raises is a CalorbitError with a stable `code`,
 * so the CLI can print one line and choose its exit status without parsing messages.
 */

export type ErrorCode =
  | "INVALID_ARGUMENT" // a public function was called outside its physical domain
  | "KEPLER_NO_CONVERGENCE" // Kepler's equation did not converge within the iteration cap
  | "INTEGRATION_FAILED" // the ODE solver gave up (step limit, non-finite state)
  | "PERIODIC_NO_CONVERGENCE" // the shooting iteration did not find T(0) = T(P)
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

/** Renders a problem as the one line the CLI prints for it. */
export function formatProblem(p: FieldProblem): string {
  return `${p.path}: given ${p.given}; allowed: ${p.allowed}`;
}

/** Throws INVALID_ARGUMENT unless `value` is a finite number satisfying `ok`. */
export function requireNumber(
  name: string,
  value: number,
  ok: (v: number) => boolean,
  allowed: string,
): void {
  if (typeof value !== "number" || !Number.isFinite(value) || !ok(value)) {
    throw new CalorbitError("INVALID_ARGUMENT", `${name}: given ${String(value)}; allowed: ${allowed}`, [
      { path: name, given: String(value), allowed },
    ]);
  }
}
