/**
 * Flag parsing shared by the commands: each helper turns one raw flag string into an SI value or
 * throws a USAGE CalorbitError with one line (flag, given value, what is allowed).
 */
import { CalorbitError, clip } from "../errors.js";
import { parseQuantity, type QuantityKind } from "../scenario/units.js";
import { INTEGRATORS, type IntegratorName } from "../defaults.js";

/** A USAGE error for one flag: `path: given …; allowed: …`. */
export function usage(path: string, given: string, allowed: string): CalorbitError {
  const echo = clip(given);
  return new CalorbitError("USAGE", `${path}: given ${echo}; allowed: ${allowed}`, [{ path, given: echo, allowed }]);
}

export function integerFlag(name: string, raw: string, min: number, max: number): number {
  const v = Number(raw);
  if (!Number.isInteger(v) || v < min || v > max) throw usage(name, JSON.stringify(raw), `an integer from ${min} to ${max}`);
  return v;
}

/** A dimensional flag ("0.8Lsun", "150K"); a bare number takes the kind's SI unit. */
export function quantityFlag(name: string, kind: QuantityKind, raw: string): number {
  const parsed = parseQuantity(kind, /^[+-]?[\d.]+([eE][+-]?\d+)?$/.test(raw.trim()) ? Number(raw) : raw);
  if (!parsed.ok) throw usage(name, JSON.stringify(raw), parsed.allowed);
  return parsed.valueSI;
}

export function toleranceFlag(raw: string): number {
  const v = Number(raw);
  if (!Number.isFinite(v) || v < 1e-13 || v > 1e-2) throw usage("--tolerance", JSON.stringify(raw), "a number from 1e-13 to 1e-2");
  return v;
}

export function integratorFlag(raw: string | undefined): IntegratorName | undefined {
  if (raw === undefined) return undefined;
  if (!(INTEGRATORS as readonly string[]).includes(raw)) throw usage("--integrator", JSON.stringify(raw), INTEGRATORS.join(", "));
  return raw as IntegratorName;
}
