/**
 * A sweep definition checked before its first case runs: every --vary path is a key of the scenario
 * format, no key is varied twice (or together with a key it replaces), the grid is no larger than the
 * stated limit, and every level of every axis makes a valid scenario with the file's other keys. A
 * mistake here would otherwise fail every case only after all of them had run.
 */
import { CalorbitError, type FieldProblem } from "../errors.js";
import { resolveScenario } from "../scenario/resolve.js";
import { scenarioJsonSchema } from "../scenario/schema.js";
import { caseCount, type Design } from "./design.js";
import { DEFAULT_MAX_CASES } from "./limits.js";
import { alternativesOf, levelAt, setPath, type Axis, type AxisValue } from "./spec.js";

/** Levels of one axis validated one by one; a longer range is checked at its ends and this many points between. */
const LEVELS_CHECKED = 1000;

/** The scenario format as JSON Schema, built once (zod's conversion takes a while). */
let schemaCache: JsonSchema | undefined;

type JsonSchema = { properties?: Record<string, JsonSchema>; prefixItems?: JsonSchema[]; items?: JsonSchema; anyOf?: JsonSchema[]; oneOf?: JsonSchema[] };

/** The schema node at a key under `node` (through unions), or null. */
function child(node: JsonSchema, key: string): JsonSchema | null {
  const direct = node.properties?.[key] ?? (/^\d+$/.test(key) ? (node.prefixItems?.[Number(key)] ?? node.items) : undefined);
  if (direct) return direct;
  for (const branch of [...(node.anyOf ?? []), ...(node.oneOf ?? [])]) {
    const found = child(branch, key);
    if (found) return found;
  }
  return null;
}

function keysOf(node: JsonSchema): string[] {
  return [...Object.keys(node.properties ?? {}), ...[...(node.anyOf ?? []), ...(node.oneOf ?? [])].flatMap(keysOf)];
}

/** Null when the path is a key of the scenario format, else what is allowed at the first unknown part. */
function unknownPath(schema: JsonSchema, path: string): string | null {
  let node = schema;
  const parts = path.split(".");
  for (let i = 0; i < parts.length; i++) {
    const next = child(node, parts[i]!);
    if (!next) {
      const here = parts.slice(0, i).join(".");
      const keys = keysOf(node);
      return keys.length > 0
        ? `a scenario key; ${here === "" ? "top-level keys" : `keys under ${here}`}: ${keys.join(", ")}`
        : `a scenario key (${here} has no keys under it)`;
    }
    node = next;
  }
  return null;
}

function problem(axis: Axis, given: string, allowed: string): FieldProblem {
  return { path: `--vary ${axis.path}`, given, allowed };
}

/** Paths must be distinct keys, neither inside another nor alternatives of each other. */
function clashes(axes: Axis[]): FieldProblem[] {
  const problems: FieldProblem[] = [];
  axes.forEach((a, i) => {
    for (const b of axes.slice(0, i)) {
      if (a.path === b.path) problems.push(problem(a, `twice (${JSON.stringify(b.spec)} and ${JSON.stringify(a.spec)})`, "each key varied once (list every value in one --vary)"));
      else if (a.path.startsWith(`${b.path}.`) || b.path.startsWith(`${a.path}.`)) problems.push(problem(a, `together with --vary ${b.path}`, "keys of which neither holds the other"));
      else {
        const altA = alternativesOf(a.path);
        const altB = alternativesOf(b.path);
        if (altA && altB && altA.member !== altB.member && altA.others.includes(altB.member)) {
          problems.push(problem(a, `together with --vary ${b.path}`, `one of ${altA.member} and ${altB.member}: a scenario gives one of them`));
        }
      }
    }
  });
  return problems;
}

function rendered(v: AxisValue): string {
  return typeof v === "number" ? String(v) : JSON.stringify(v);
}

/** The levels of an axis that are validated: all of a short axis, else the ends and evenly spaced points. */
function checkedLevels(axis: Axis): number[] {
  if (axis.count <= LEVELS_CHECKED) return Array.from({ length: axis.count }, (_, k) => k);
  return Array.from({ length: LEVELS_CHECKED + 1 }, (_, j) => Math.round((j * (axis.count - 1)) / LEVELS_CHECKED));
}

function failure(doc: Record<string, unknown>): readonly FieldProblem[] | null {
  try {
    resolveScenario(doc);
    return null;
  } catch (err) {
    if (err instanceof CalorbitError) return err.problems.length > 0 ? err.problems : [{ path: "(scenario)", given: "", allowed: err.message }];
    throw err;
  }
}

/**
 * Throws a USAGE error (one problem per line, exit 2 at the CLI) if the definition cannot work;
 * SCENARIO_INVALID when the scenario itself is wrong in a key no axis sets.
 */
export function checkDefinition(scenario: Record<string, unknown>, design: Design, maxCases: number = DEFAULT_MAX_CASES): void {
  const { axes } = design;
  schemaCache ??= scenarioJsonSchema() as JsonSchema;
  const schema = schemaCache;
  const problems: FieldProblem[] = [];
  for (const a of axes) {
    const unknown = unknownPath(schema, a.path);
    if (unknown) problems.push(problem(a, JSON.stringify(a.path), unknown));
  }
  problems.push(...clashes(axes));
  if (problems.length > 0) throw new CalorbitError("USAGE", "the sweep definition has problems", problems);

  const total = caseCount(design);
  if (total > maxCases) {
    const sizes = axes.map((a) => a.count.toLocaleString("en-US")).join(" × ");
    const given = design.random ? `--random ${total.toLocaleString("en-US")}` : `a grid of ${sizes} = ${total.toLocaleString("en-US")} cases`;
    throw new CalorbitError("USAGE", `--vary: given ${given}`, [
      { path: "--vary", given, allowed: `at most ${maxCases.toLocaleString("en-US")} cases (split the sweep, or raise the limit with --max-cases N)` },
    ]);
  }

  const withFirstLevels = (skip: number): Record<string, unknown> => {
    const doc = structuredClone(scenario);
    axes.forEach((a, d) => {
      if (d !== skip) setPath(doc, a.path, levelAt(a, 0));
    });
    return doc;
  };
  // The scenario's own mistakes, in keys that no axis sets, fail every case: report them as such.
  // A problem belongs to an axis when it is in the axis's key, or in the group the key replaces (a
  // body.layer.thickness axis on a scenario with a direct heat capacity owns body.layer.material).
  const within = (path: string, key: string) => path === key || path.startsWith(`${key}.`) || path.startsWith(`${key}[`);
  const under = (p: FieldProblem, a: Axis) => within(p.path, a.path) || within(p.path, alternativesOf(a.path)?.member ?? a.path);
  const base = failure(withFirstLevels(-1));
  const own = base ? base.filter((p) => !axes.some((a) => under(p, a))) : [];
  if (own.length > 0) throw new CalorbitError("SCENARIO_INVALID", "the scenario has problems that no --vary changes", own);
  for (const [d, a] of axes.entries()) {
    const template = withFirstLevels(d);
    for (const k of checkedLevels(a)) {
      const value = levelAt(a, k);
      const doc = structuredClone(template);
      setPath(doc, a.path, value);
      // A problem in another axis's key is that axis's (its first level), reported when it is checked.
      const bad = failure(doc)?.filter((p) => !axes.some((b, e) => e !== d && under(p, b)));
      if (bad && bad.length > 0) {
        const first = bad[0]!;
        const where = a.count > 1 ? ` (level ${k + 1} of ${a.count.toLocaleString("en-US")})` : "";
        const allowed = first.path === a.path ? first.allowed : `${first.path}: given ${first.given}; allowed: ${first.allowed}`;
        problems.push(problem(a, `${rendered(value)}${where}`, allowed));
        break;
      }
    }
  }
  if (problems.length > 0) throw new CalorbitError("USAGE", "the sweep definition has problems", problems);
}
