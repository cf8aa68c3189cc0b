/** The text report says what its numbers are (issue 15): a short lag is not "0.000 of the orbit", a two-orbit cycle is not "the orbit". */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { summaryText } from "../src/report/text.js";
import { lagWords } from "../src/report/wording.js";
import { simulate } from "../src/run/simulate.js";
import { resolveScenario } from "../src/scenario/resolve.js";
import { parseScenarioText } from "../src/scenario/text.js";

describe("the text report's words", () => {
  it("gives the 3:2 demo's lag in seconds with a non-zero share, and its time in the window as a share of the two-orbit cycle (a 3:2 spin repeats every 2 orbits; common practice)", () => {
    const path = join(import.meta.dirname, "..", "scenarios", "miradel-resonant.yaml");
    const resolved = resolveScenario(parseScenarioText(readFileSync(path, "utf8"), "yaml", path));
    const text = summaryText(resolved, simulate(resolved.thermal, { samples: 0 }));
    expect(text).toMatch(/lag of maximum after periastron\s+[\d.]+ s \([\d.]+ % of the orbit\)/);
    expect(text).not.toMatch(/0\.000 of the orbit/);
    expect(text).toMatch(/% of the cycle \(2 orbits\)/);
  });

  it("does not print a lag its solve cannot resolve: a column's extremes sit on its time steps", () => {
    const s = { lagSeconds: 0, periodSeconds: 86_400 * 100, temperature: { swingK: 300, maxK: 400 } };
    expect(lagWords(s, 0.1, 5000)).toBe("under one time step (1.39 h): not resolved");
    expect(lagWords({ ...s, lagSeconds: 7200 }, 0.1, 5000)).toBe("2 h (0.083 % of the orbit)");
    expect(lagWords(s, 0.1)).toBe("0 s (0 of the orbit)");
  });
});
