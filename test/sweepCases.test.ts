/**
 * A sweep worker builds each case's ThermalCase from the base scenario parsed once (the per-key
 * parse of src/sweep/caseScenario.ts). The reference is the whole document's parse and check,
 * `resolveScenario`, which every scenario file goes through: the two must agree on every value,
 * valid or not, and a sweep's rows must be those of its cases run one by one that way.
 */
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { resolveScenario } from "../src/scenario/resolve.js";
import { caseScenarios } from "../src/sweep/caseScenario.js";
import { caseMaker } from "../src/sweep/design.js";
import { caseCells, formatRow, type SweepDefinition } from "../src/sweep/runCase.js";
import { parseAxis, setPath, type AxisValue } from "../src/sweep/spec.js";
import { calorbit } from "./sweepCli.js";

const BASE = {
  name: "case parse world",
  star: { radius: "0.9 Rsun", temperature: "5300 K", mass: "0.9 Msun" },
  orbit: { semiMajorAxis: "0.8 au", eccentricity: 0.2 },
  body: { albedo: 0.3, emissivity: 0.95, layer: { material: "water", thickness: "2 m" } },
  spin: { period: "20 h", obliquity: "10 deg" },
  regime: "band",
  surface: { latitude: "30 deg" },
  thresholds: ["250 K", "300 K"],
};

/** The whole-document path: the base with the values set, resolved as a scenario file is (null when refused). */
function wholeParse(paths: string[], values: AxisValue[]): unknown {
  const doc = structuredClone(BASE) as Record<string, unknown>;
  paths.forEach((p, d) => setPath(doc, p, values[d]!));
  try {
    return resolveScenario(doc).thermal;
  } catch {
    return null;
  }
}

const number = (min: number, max: number) => fc.double({ min, max, noNaN: true });
const withUnit = (min: number, max: number, unit: string) => number(min, max).map((v) => `${v} ${unit}`);

/** Axes the per-key parse takes, with values inside and outside what each key allows. */
const AXES: [string, fc.Arbitrary<AxisValue>][] = [
  ["orbit.eccentricity", number(-0.2, 1.1)],
  ["orbit.semiMajorAxis", fc.oneof(withUnit(0.0001, 3, "au"), number(-1e9, 5e11), fc.constant("far"))],
  ["body.albedo", number(-0.1, 1.1)],
  // Replaces the scenario's body.layer, as the user means it.
  ["body.heatCapacity", fc.oneof(number(-1e6, 1e10), withUnit(1e4, 1e9, "J/m2/K"))],
  // Replaces the star's radius and temperature.
  ["star.luminosity", fc.oneof(withUnit(1e-6, 10, "Lsun"), number(1e20, 1e28))],
  ["spin.obliquity", fc.oneof(withUnit(-30, 200, "deg"), number(0, 3.2))],
  ["regime", fc.constantFrom("global", "dayside", "band", "point", "daynight", "nonsense")],
  ["surface.latitude", withUnit(-100, 100, "deg")],
];

describe("a sweep case's ThermalCase from the base parsed once", () => {
  it("equals the whole document's resolveScenario for any values of the axes it takes, and is refused exactly when that is", () => {
    let built = 0;
    fc.assert(
      fc.property(fc.subarray(AXES, { minLength: 1, maxLength: 4 }).chain((axes) => fc.tuple(fc.constant(axes.map(([p]) => p)), fc.tuple(...axes.map(([, v]) => v)))), ([paths, values]) => {
        const scenarios = caseScenarios(BASE, paths);
        expect(scenarios).not.toBeNull();
        const fast = scenarios!.thermal(values);
        const whole = wholeParse(paths, values);
        expect(fast).toEqual(whole);
        if (fast !== null) built++;
      }),
      { numRuns: 400, seed: 20261202 },
    );
    // Most draws are valid cases: the per-key path really built them (it is not falling back).
    expect(built).toBeGreaterThan(50);
  });

  it("sets each case's values in its document without changing the base or another case's document", () => {
    const paths = ["orbit.eccentricity", "body.heatCapacity"];
    const scenarios = caseScenarios(BASE, paths)!;
    const before = structuredClone(BASE);
    const a = scenarios.document([0.5, 1e7]);
    const b = scenarios.document([0.1, "3e6 J/m2/K"]);
    const expected = (e: number, c: AxisValue) => {
      const doc = structuredClone(BASE) as Record<string, unknown>;
      setPath(doc, paths[0]!, e);
      setPath(doc, paths[1]!, c);
      return doc;
    };
    expect(a).toEqual(expected(0.5, 1e7));
    expect(b).toEqual(expected(0.1, "3e6 J/m2/K"));
    expect(BASE).toEqual(before);
  });

  it("leaves to the whole parse the axes whose path it cannot take apart (a list item, a key inside a group the base lacks)", () => {
    expect(caseScenarios(BASE, ["thresholds.0"])).toBeNull();
    expect(caseScenarios(BASE, ["body.column.thermalInertia"])).toBeNull();
    expect(caseScenarios(BASE, ["orbit.eccentricity", "observer.inclination"])).toBeNull();
    // A base the schema refuses (an axis will replace the bad key): every case is parsed whole.
    expect(caseScenarios({ ...BASE, orbit: { semiMajorAxis: "0.8 au", eccentricity: 2 } }, ["orbit.eccentricity"])).toBeNull();
  });
});

describe("a sweep's rows", () => {
  it("from worker threads are the rows of the same cases run one by one from their whole documents, failures worded the same", async () => {
    const dir = mkdtempSync(join(tmpdir(), "calorbit-sweep-cases-"));
    const scenario = join(dir, "base.json");
    writeFileSync(scenario, JSON.stringify(BASE));
    // 5 × 10 × 4 = 200 cases: more than a sweep runs in its own thread, and enough for each worker
    // to run a warm-up case first. An albedo of 1 absorbs nothing (refused when the case runs).
    const vary = ["orbit.eccentricity=0:0.8:5", "body.heatCapacity=2e4..2e8:10 log", "body.albedo=0.3,0.5,0.7,1"];
    const out = join(dir, "rows.csv");
    const r = await calorbit(["sweep", scenario, ...vary.flatMap((v) => ["--vary", v]), "--workers", "2", "--quiet", "--out", out]);
    expect(r.status).toBe(0);
    const rows = readFileSync(out, "utf8").split("\n").filter((l) => /^\d/.test(l));
    const def: SweepDefinition = { scenario: BASE, design: { axes: vary.map(parseAxis) }, relativeTolerance: 1e-8, format: "csv" };
    const makeCase = caseMaker(def.design);
    const serial = Array.from({ length: 200 }, (_, id) => formatRow(def, caseCells(def, makeCase(id))));
    expect(rows).toEqual(serial);
    expect(rows.filter((row) => row.includes(",ok,"))).toHaveLength(150);
    expect(rows.filter((row) => row.includes("error: "))).toHaveLength(50);
  });
});
