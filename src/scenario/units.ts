/**
 * Dimensional values at the edge: a scenario gives a number in SI base units or a string
 * "<number> <unit>"; everything past this module is SI. One table of units per quantity kind.
 */
import {
  ASTRONOMICAL_UNIT_M,
  DAY_S,
  JULIAN_YEAR_S,
  SOLAR_LUMINOSITY_W,
  EARTH_EQUATORIAL_RADIUS_M,
  JUPITER_EQUATORIAL_RADIUS_M,
  SOLAR_MASS_KG,
  SOLAR_RADIUS_M,
  ZERO_CELSIUS_K,
} from "../constants.js";
import { CalorbitError, describeValue } from "../errors.js";

export type QuantityKind =
  | "length"
  | "time"
  | "luminosity"
  | "mass"
  | "temperature"
  | "angle"
  | "arealHeatCapacity"
  | "flux"
  | "heatTransferCoefficient"
  | "angularRate";

interface UnitTable {
  /** SI unit, as written in messages and CSV headers. */
  si: string;
  /** The unit of a bare number when it is not the SI one (angles: a person types degrees). */
  bare?: string;
  /** unit spelling → (value in unit) ↦ SI value. */
  units: Record<string, (v: number) => number>;
}

const scale = (factor: number) => (v: number) => v * factor;

export const UNIT_TABLES: Readonly<Record<QuantityKind, UnitTable>> = {
  length: {
    si: "m",
    units: {
      m: scale(1),
      cm: scale(0.01),
      mm: scale(0.001),
      um: scale(1e-6),
      nm: scale(1e-9),
      km: scale(1e3),
      au: scale(ASTRONOMICAL_UNIT_M),
      Rearth: scale(EARTH_EQUATORIAL_RADIUS_M),
      Rjup: scale(JUPITER_EQUATORIAL_RADIUS_M),
      Rsun: scale(SOLAR_RADIUS_M),
    },
  },
  time: {
    si: "s",
    units: { s: scale(1), min: scale(60), h: scale(3600), d: scale(DAY_S), yr: scale(JULIAN_YEAR_S) },
  },
  luminosity: { si: "W", units: { W: scale(1), Lsun: scale(SOLAR_LUMINOSITY_W) } },
  mass: { si: "kg", units: { kg: scale(1), Msun: scale(SOLAR_MASS_KG) } },
  temperature: { si: "K", units: { K: scale(1), degC: (v) => v + ZERO_CELSIUS_K } },
  // People type angles in degrees: a bare number is degrees; radians must say "rad".
  angle: { si: "rad", bare: "deg", units: { rad: scale(1), deg: scale(Math.PI / 180) } },
  arealHeatCapacity: {
    si: "J/m2/K",
    units: { "J/m2/K": scale(1), "kJ/m2/K": scale(1e3), "MJ/m2/K": scale(1e6) },
  },
  flux: { si: "W/m2", units: { "W/m2": scale(1), "mW/m2": scale(1e-3) } },
  heatTransferCoefficient: { si: "W/m2/K", units: { "W/m2/K": scale(1) } },
  angularRate: { si: "rad/s", units: { "rad/s": scale(1), "deg/s": scale(Math.PI / 180), "deg/h": scale(Math.PI / 180 / 3600), "deg/d": scale(Math.PI / 180 / DAY_S) } },
};

/** Spellings folded to one canonical form before lookup: "J m-2 K-1", "J/(m2 K)", "J/m^2/K" → "J/m2/K". */
function canonicalUnit(unit: string): string {
  let u = unit.trim().replace(/\^/g, "").replace(/²/g, "2").replace(/·/g, " ");
  // "A B-2 C-1" (space-separated with negative exponents) → "A/B2/C"
  if (/^[A-Za-z]+(\s+[A-Za-z]+-?\d*)+$/.test(u)) {
    const [head, ...rest] = u.split(/\s+/);
    u = head + rest.map((p) => (/-\d+$/.test(p) ? "/" + p.replace(/-(\d+)$/, (_m, d: string) => (d === "1" ? "" : d)) : " " + p)).join("");
  }
  u = u.replace(/\/\(([^)]*)\)/g, (_m, inner: string) => "/" + inner.trim().split(/\s+/).join("/"));
  const aliases: Record<string, string> = {
    AU: "au", day: "d", days: "d", year: "yr", years: "yr", hr: "h", sec: "s", degrees: "deg", "°": "deg", "°C": "degC", C: "degC",
    "L☉": "Lsun", "M☉": "Msun", "R☉": "Rsun", "µm": "um", "μm": "um", micron: "um", RJ: "Rjup", "R⊕": "Rearth", "deg/day": "deg/d",
  };
  return aliases[u] ?? u;
}

export interface ParsedQuantity {
  ok: true;
  valueSI: number;
}
export interface QuantityError {
  ok: false;
  /** What is allowed, in words (for the one-line message). */
  allowed: string;
}

/** The unit a bare number is read in for this kind: SI, except angles (degrees). */
export function bareUnit(kind: QuantityKind): string {
  return UNIT_TABLES[kind].bare ?? UNIT_TABLES[kind].si;
}

export function allowedUnits(kind: QuantityKind): string {
  return Object.keys(UNIT_TABLES[kind].units).join(", ");
}

const NUMBER_AND_UNIT = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$/;

/** Converts a number (already SI) or a "<number> <unit>" string to SI. */
export function parseQuantity(kind: QuantityKind, raw: unknown): ParsedQuantity | QuantityError {
  if (typeof kind !== "string" || !Object.hasOwn(UNIT_TABLES, kind)) {
    const allowedKinds = Object.keys(UNIT_TABLES).join(", ");
    throw new CalorbitError("INVALID_ARGUMENT", `kind: given ${describeValue(kind)}; allowed: ${allowedKinds}`, [{ path: "kind", given: describeValue(kind), allowed: allowedKinds }]);
  }
  const table = UNIT_TABLES[kind];
  const allowed = `a number in ${bareUnit(kind)} or a string "<number> <unit>" with unit one of ${allowedUnits(kind)}`;
  const bare = (value: number): ParsedQuantity | QuantityError => {
    const valueSI = table.bare === undefined ? value : table.units[table.bare]!(value);
    return Number.isFinite(valueSI) ? { ok: true, valueSI } : { ok: false, allowed: `a finite number (${allowed})` };
  };
  if (typeof raw === "number") return bare(raw);
  if (typeof raw !== "string") return { ok: false, allowed };
  const match = NUMBER_AND_UNIT.exec(raw);
  if (!match) return { ok: false, allowed };
  const value = Number(match[1]);
  const unitText = match[2] ?? "";
  if (unitText === "") return Number.isFinite(value) ? bare(value) : { ok: false, allowed };
  const convert = table.units[canonicalUnit(unitText)];
  if (!convert) return { ok: false, allowed: `unit one of ${allowedUnits(kind)} (unknown unit "${unitText}")` };
  const valueSI = convert(value);
  return Number.isFinite(valueSI) ? { ok: true, valueSI } : { ok: false, allowed };
}
