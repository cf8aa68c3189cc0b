/**
 * A sweep case's ThermalCase without parsing the whole scenario again for every case. The base
 * scenario is parsed once; a case re-parses only the values its axes set, each with its own key's
 * schema, and runs every cross-field and physical check (`fromParsed`) on the result.
 *
 * Why this equals `resolveScenario` of the case's document: a strict zod object parses each key
 * with that key's schema alone (unknown keys aside, which an axis cannot add: the definition check
 * refuses paths outside the format), so the parse of a document that differs from the base only
 * at some keys is the base's parse with those keys parsed anew, and keys the case's document no
 * longer has (a key an axis replaces, see `setPath`) removed. That holds only where every object
 * on an axis's path is a plain strict object with no object-level check and exists in the base
 * scenario; for any other axis `caseThermal` is null and the case takes the whole parse.
 * A value its key's schema refuses also gives null: the whole parse then words the problem.
 */
import { z } from "zod";
import type { ThermalCase } from "../model/thermalCase.js";
import { fromParsed } from "../scenario/resolve.js";
import { scenarioSchema, type ParsedScenario } from "../scenario/schema.js";
import type { AxisValue } from "./spec.js";
import { setPath } from "./spec.js";

type Plain = Record<string, unknown>;

/** A value a key's schema refused. */
const REFUSED = Symbol("refused");
type LeafParse = unknown;

/** Levels remembered per axis: a grid's axis repeats its few levels in every case, a hypercube's never does. */
const LEVELS_REMEMBERED = 4096;

/**
 * A key's parse of one axis value, remembered: the schema's parse of a number or a text is a pure
 * function of it, and a grid repeats each level in many cases. Only a result that is itself a number
 * or a text is kept (a case may not share an object with another).
 */
function leafParse(schema: z.ZodType, levels: Map<unknown, LeafParse>, value: unknown): LeafParse {
  const known = levels.get(value);
  if (known !== undefined) return known;
  const result = schema.safeParse(value);
  const parsed = result.success ? result.data : REFUSED;
  // −0 and 0 are one key of a Map but may parse to different zeros: −0 is never remembered.
  const rememberable = typeof value === "string" || (typeof value === "number" && !Object.is(value, -0));
  if (rememberable && (parsed === REFUSED || typeof parsed === "number" || typeof parsed === "string")) {
    if (levels.size >= LEVELS_REMEMBERED) levels.clear();
    levels.set(value, parsed);
  }
  return parsed;
}

const isPlain = (v: unknown): v is Plain => v !== null && typeof v === "object" && !Array.isArray(v);

/** The object schema inside an optional, or null when the schema is no plain object (or has object-level checks). */
function objectSchema(schema: z.ZodType): z.ZodObject | null {
  const inner = schema instanceof z.ZodOptional ? (schema.unwrap() as z.ZodType) : schema;
  if (!(inner instanceof z.ZodObject)) return null;
  const checks = inner._zod.def.checks;
  return checks === undefined || checks.length === 0 ? inner : null;
}

function deepFreeze<T>(value: T): T {
  if (value !== null && typeof value === "object" && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
  }
  return value;
}

/** Builds ThermalCases for one sweep's cases, or says (null) that a case needs the whole parse. */
export interface CaseScenarios {
  /** The case's document (the base with the axis values set), sharing every part no axis touches. */
  document(values: readonly AxisValue[]): Plain;
  /** The case's ThermalCase, or null when only the whole parse can give it (or word its problem). */
  thermal(values: readonly AxisValue[]): ThermalCase | null;
}

/**
 * Prepares the cases of a sweep over `paths` on `scenario`. Returns null when an axis's path does
 * not allow the per-key parse (or the base scenario itself does not parse): every case then takes
 * `resolveScenario` of its whole document.
 */
export function caseScenarios(scenario: Plain, paths: readonly string[]): CaseScenarios | null {
  // Frozen copies: a case shares their untouched parts, which nothing may change.
  const base = deepFreeze(structuredClone(scenario));
  const parsedBase = scenarioSchema.safeParse(base);
  if (!parsedBase.success) return null;
  const parsed = deepFreeze(parsedBase.data) as unknown as Plain;
  const leaves: { keys: string[]; schema: z.ZodType; parsed: Map<unknown, LeafParse> }[] = [];
  for (const path of paths) {
    const keys = path.split(".");
    let schema: z.ZodObject = scenarioSchema;
    let raw: unknown = base;
    let out: unknown = parsed;
    for (let i = 0; i < keys.length - 1; i++) {
      const next = schema.shape[keys[i]!] as z.ZodType | undefined;
      const object = next ? objectSchema(next) : null;
      raw = isPlain(raw) ? raw[keys[i]!] : undefined;
      out = isPlain(out) ? out[keys[i]!] : undefined;
      if (!object || !isPlain(raw) || !isPlain(out)) return null;
      schema = object;
    }
    const leaf = schema.shape[keys.at(-1)!] as z.ZodType | undefined;
    if (!leaf) return null;
    leaves.push({ keys, schema: leaf, parsed: new Map() });
  }

  const document = (values: readonly AxisValue[]): Plain => {
    // Copy each object on an axis's path once, then set the values as the whole-document path does.
    const doc: Plain = { ...base };
    const copied = new Set<unknown>([doc]);
    leaves.forEach(({ keys }, d) => {
      let node = doc;
      for (let i = 0; i < keys.length - 1; i++) {
        const child = node[keys[i]!];
        if (!isPlain(child)) break;
        if (!copied.has(child)) {
          const copy = { ...child };
          copied.add(copy);
          node[keys[i]!] = copy;
          node = copy;
        } else node = child;
      }
      setPath(doc, paths[d]!, values[d]!);
    });
    return doc;
  };

  return {
    document,
    thermal(values) {
      try {
        return caseThermal(values);
      } catch {
        return null;
      }
    },
  };

  function caseThermal(values: readonly AxisValue[]): ThermalCase | null {
    const doc = document(values);
    const out: Plain = { ...parsed };
    for (let d = 0; d < leaves.length; d++) {
      const { keys, schema, parsed: parsedLevels } = leaves[d]!;
      let rawNode: Plain = doc;
      let baseRaw: Plain = base;
      let node = out;
      for (let i = 0; i < keys.length - 1; i++) {
        const key = keys[i]!;
        rawNode = rawNode[key] as Plain;
        baseRaw = baseRaw[key] as Plain;
        // The base's parse is frozen: copy each of its objects on the path before changing it.
        if (Object.isFrozen(node[key])) node[key] = { ...(node[key] as Plain) };
        node = node[key] as Plain;
        // Keys the case's document dropped (replaced by the axis's key) are gone from its parse too.
        for (const k of Object.keys(baseRaw)) if (!(k in rawNode)) delete node[k];
      }
      const result = leafParse(schema, parsedLevels, rawNode[keys.at(-1)!]);
      if (result === REFUSED) return null;
      node[keys.at(-1)!] = result;
    }
    return fromParsed(out as unknown as ParsedScenario, doc).thermal;
  }
}
