import { describe, expect, it } from "vitest";
import { CalorbitError } from "../src/errors.js";
import { buildThermalModel } from "../src/model/build.js";
import { simulate } from "../src/run/simulate.js";
import { checkWorkload, explainStepLimit, longCycleNote, MAX_COLUMN_LAYER_STEPS, MAX_CYCLE_STATISTICS_POINTS } from "../src/run/workload.js";
import { columnLayout } from "../src/run/columnCycle.js";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parseScenarioText } from "../src/scenario/text.js";
import { calorbit } from "./cliHarness.js";
import { resolveScenario } from "../src/scenario/resolve.js";

const point = (spin: Record<string, unknown>, heatCapacity = 1e6) =>
  resolveScenario({
    name: "workload",
    star: { luminosity: "1 Lsun", mass: "1 Msun" },
    orbit: { semiMajorAxis: "1 au", eccentricity: 0.2 },
    body: { albedo: 0.3, emissivity: 0.9, heatCapacity },
    regime: "point",
    surface: { latitude: 20 },
    spin,
  }).thermal;

describe("long runs: refused up front by the field that makes them long, step limits explained", () => {
  it("refuses a p:q spin whose q-orbit cycle would not fit, naming spin.orbitRatio, before integrating anything", () => {
    // A p:q resonance repeats after q orbits (p rotations in q orbits: common practice), so 1:3000 is a 3000-orbit cycle.
    const thermal = point({ orbitRatio: "1:3000" });
    const model = buildThermalModel(thermal);
    expect(model.cycleOrbits).toBe(3000);
    expect(model.cycleOrbits * model.statsPointsPerOrbit).toBeGreaterThan(MAX_CYCLE_STATISTICS_POINTS);
    let caught: unknown;
    try {
      simulate(thermal);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(CalorbitError);
    const e = caught as CalorbitError;
    expect(e.code).toBe("SCENARIO_INVALID");
    expect(e.problems).toHaveLength(1);
    expect(e.problems[0]!.path).toBe("spin.orbitRatio");
    expect(e.problems[0]!.given).toBe('"1:3000"');
    expect(e.problems[0]!.allowed).toMatch(/^a spin whose cycle repeats within \d+ orbits \(this one repeats after 3000 orbits/);
  });

  it("words a step limit as what to change: the tolerance, and for a point with many sunrises per orbit the spin; the shooting's cap too", () => {
    // A sidereal day of 1 d on a 365.26 d prograde orbit gives 365.26 − 1 ≈ 364 solar days per orbit (common practice).
    const thermal = point({ period: "1 d", obliquity: 20 }, 1e4);
    const model = buildThermalModel(thermal);
    const limit = new CalorbitError("INTEGRATION_FAILED", "the explicit solver exceeded 200000 steps without reaching the end of the cycle");
    const explained = explainStepLimit(limit, thermal, model, 1e-8) as CalorbitError;
    expect(explained.code).toBe("INTEGRATION_FAILED");
    expect(explained.message).toMatch(/^the explicit solver exceeded 200000 steps without reaching the end of the cycle; to finish: loosen the tolerance \(--tolerance, now 1e-8: /);
    expect(explained.message).toContain("slow the spin (spin.period: 364 solar days per orbit");
    // At a loose tolerance and a slow spin there is only the general advice; other errors pass unchanged.
    const slow = point({ orbitRatio: "1:1" });
    expect((explainStepLimit(limit, slow, buildThermalModel(slow), 1e-4) as CalorbitError).message).toMatch(/; to finish: loosen the tolerance \(--tolerance\) or raise body\.heatCapacity/);
    // The odex package's wording of the same limit, and the shooting's iteration cap.
    const odexLimit = new CalorbitError("INTEGRATION_FAILED", "the ODE solver stopped after 200000 steps without reaching the end of the orbit (step limit)");
    expect((explainStepLimit(odexLimit, thermal, model, 1e-8) as CalorbitError).message).toContain("; to finish: loosen the tolerance (--tolerance, now 1e-8");
    const unsettled = explainStepLimit(new CalorbitError("PERIODIC_NO_CONVERGENCE", "no periodic steady state after 40 cycles (last relative residual 1.40e-6)"), thermal, model, 1e-8) as CalorbitError;
    expect(unsettled.code).toBe("PERIODIC_NO_CONVERGENCE");
    expect(unsettled.message).toBe("no periodic steady state after 40 cycles (last relative residual 1.40e-6); to settle it: loosen the tolerance (--tolerance, now 1e-8); or run a transient from a start (--from 250K --orbits 20) and look at how it evolves");
    const other = new CalorbitError("INTEGRATION_FAILED", "the temperature left the physical range (T ≤ 0 K)");
    expect(explainStepLimit(other, thermal, model, 1e-8)).toBe(other);
  });

  it("announces a cycle of hundreds of orbits before the run (1:1000), not a short one (3:2, 1:99) nor one it will refuse (1:3000)", () => {
    expect(longCycleNote(point({ orbitRatio: "1:1000" }))).toBe(
      'spin.orbitRatio "1:1000" repeats only after 1000 orbits, and reaching the periodic state takes several passes over them (3 for a slab, 9 for a column, measured): expect a long run (a ratio with a smaller q, or a spin.period, is quicker)',
    );
    // 2:200 is 1:100 in lowest terms (a p:q resonance repeats after q / gcd(p, q) orbits, common practice).
    expect(longCycleNote(point({ orbitRatio: "2:200" }))).toMatch(/repeats only after 100 orbits/);
    for (const orbitRatio of ["3:2", "1:99", "1:3000"]) expect({ orbitRatio, note: longCycleNote(point({ orbitRatio })) }).toEqual({ orbitRatio, note: undefined });
  });
});

/** The regolith demo (a column under a 13:1 spin), with its spin or grid changed. */
const regolithPath = join(import.meta.dirname, "..", "scenarios", "sarvek-regolith.yaml");
function regolith(change: (doc: Record<string, any>) => void): Record<string, any> {
  const doc = parseScenarioText(readFileSync(regolithPath, "utf8"), "yaml", regolithPath) as Record<string, any>;
  change(doc);
  return doc;
}
function refusal(doc: unknown): CalorbitError {
  const thermal = resolveScenario(doc).thermal;
  const model = buildThermalModel(thermal);
  try {
    checkWorkload(thermal, model, false);
  } catch (error) {
    expect(error).toBeInstanceOf(CalorbitError);
    return error as CalorbitError;
  }
  throw new Error("not refused");
}

describe("a conduction column's cycle too long to hold: refused before any step, by the field that makes it long", () => {
  it("refuses a 1:5000 spin (a 5000-orbit cycle of ~5000 solar days), naming spin.orbitRatio; holds 1:1000", () => {
    // A p:q resonance repeats after q orbits (common practice); each of its solar days takes the grid's 480 steps.
    const e = refusal(regolith((d) => (d.spin.orbitRatio = "1:5000")));
    expect(e.code).toBe("SCENARIO_INVALID");
    expect(e.problems).toHaveLength(1);
    expect(e.problems[0]!.path).toBe("spin.orbitRatio");
    expect(e.problems[0]!.given).toBe('"1:5000"');
    expect(e.problems[0]!.allowed).toMatch(/^a spin whose column cycle fits \(this one: a cycle of 5000 orbits, [\d,]+ steps × \d+ layers = [\d.]+ million layer temperatures against the 67\.1 million a run holds\): a ratio p:q with a smaller q/);
    // 1:1000 is measured to run (22.5 million layer temperatures, 9 s of CPU): not refused.
    const thermal = resolveScenario(regolith((d) => (d.spin.orbitRatio = "1:1000"))).thermal;
    const model = buildThermalModel(thermal);
    expect(model.kind).toBe("column");
    if (model.kind !== "column") return;
    const layout = columnLayout(thermal, model);
    expect((layout.stepsAsked + 1) * layout.grid.thicknessM.length).toBeLessThan(MAX_COLUMN_LAYER_STEPS);
    expect(() => checkWorkload(thermal, model, false)).not.toThrow();
  });

  it("names body.column.grid.stepsPerDay when a raised step count alone makes the cycle too long", () => {
    // 25 rotations per orbit: 24 solar days per orbit (p − q for a prograde spin, common practice), × 100,000 steps = 2.4 million steps.
    const e = refusal(
      regolith((d) => {
        d.spin.orbitRatio = "25:1";
        d.body.column.grid = { stepsPerDay: 100_000 };
      }),
    );
    expect(e.problems.map((p) => [p.path, p.given])).toEqual([["body.column.grid.stepsPerDay", "100000"]]);
    expect(e.problems[0]!.allowed).toMatch(/^fewer steps per day, e\.g\. the default 480 \(this cycle: 2,400,000 steps × \d+ layers/);
  });

  it("calorbit run exits 2 with the one line, writes nothing, and prints no stack trace", async () => {
    const dir = mkdtempSync(join(tmpdir(), "calorbit-workload-"));
    try {
      const scenario = join(dir, "long.json");
      writeFileSync(scenario, JSON.stringify(regolith((d) => (d.spin.orbitRatio = "1:5000"))));
      const csv = join(dir, "out.csv");
      const r = await calorbit("run", scenario, "--csv", csv);
      expect(r.status).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(/^calorbit: spin\.orbitRatio: given "1:5000"; allowed: a spin whose column cycle fits [^\n]*\n$/);
      expect(() => readFileSync(csv)).toThrow();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
