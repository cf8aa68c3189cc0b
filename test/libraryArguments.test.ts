import { describe, expect, it } from "vitest";
import { CalorbitError, parseQuantity, resolveScenario, simulate } from "../src/index.js";
import { REGIMES } from "../src/model/thermalCase.js";

// Every public entry point answers a wrong argument with the typed error (code INVALID_ARGUMENT for
// a function's argument, SCENARIO_INVALID for a document), never a TypeError from deep inside.
function thrown(f: () => unknown): unknown {
  try {
    f();
  } catch (error) {
    return error;
  }
  return undefined;
}

const cyclic: Record<string, unknown> = { name: "loop" };
cyclic.self = cyclic;

describe("public functions refuse bad arguments with CalorbitError", () => {
  const cases: Array<[string, () => unknown, string]> = [
    ["simulate(undefined)", () => simulate(undefined as never), "INVALID_ARGUMENT"],
    ["simulate({})", () => simulate({} as never), "INVALID_ARGUMENT"],
    ["simulate(a cyclic object)", () => simulate(cyclic as never), "INVALID_ARGUMENT"],
    ["simulate(an unknown regime)", () => simulate({ star: {}, orbit: {}, surface: {}, regime: "sideways" } as never), "INVALID_ARGUMENT"],
    ["resolveScenario(a cyclic object)", () => resolveScenario(cyclic), "SCENARIO_INVALID"],
    ["resolveScenario(a BigInt)", () => resolveScenario({ name: "b", star: { luminosity: 10n } }), "SCENARIO_INVALID"],
    ["resolveScenario(10n)", () => resolveScenario(10n), "SCENARIO_INVALID"],
    ["parseQuantity(an unknown kind)", () => parseQuantity("bogus" as never, "1 m"), "INVALID_ARGUMENT"],
    ["parseQuantity(undefined)", () => parseQuantity(undefined as never, undefined), "INVALID_ARGUMENT"],
  ];
  for (const [what, call, code] of cases) {
    it(`${what} throws ${code}`, () => {
      const error = thrown(call);
      expect(error).toBeInstanceOf(CalorbitError);
      expect((error as CalorbitError).code).toBe(code);
      for (const p of (error as CalorbitError).problems) expect(p.given.length).toBeLessThanOrEqual(80);
    });
  }

  it("names the regime, not the sky, when the regime is unknown", () => {
    const error = thrown(() => simulate({ star: {}, orbit: {}, surface: {}, regime: "sideways" } as never)) as CalorbitError;
    expect(error.problems[0]).toEqual({ path: "thermal.regime", given: '"sideways"', allowed: REGIMES.join(", ") });
    expect(REGIMES).toContain("point");
  });
});
