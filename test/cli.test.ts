import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { VERSION } from "../src/version.js";

// The CLI is tested as users run it: the compiled executable (npm test builds it first).
const CLI = join(import.meta.dirname, "..", "dist", "src", "cli", "main.js");
const SCENARIOS = join(import.meta.dirname, "..", "scenarios");

function calorbit(...args: string[]) {
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: "utf8" });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

let dir: string;
beforeAll(() => {
  if (!existsSync(CLI)) throw new Error(`${CLI} is missing: run 'npm run build' (npm test does it)`);
  dir = mkdtempSync(join(tmpdir(), "calorbit-cli-"));
});

const validScenario = `
name: CLI check world
star: { luminosity: 1 Lsun, mass: 1 Msun }
orbit: { semiMajorAxis: 1 au, eccentricity: 0.2 }
body: { albedo: 0.3, emissivity: 0.9, heatCapacity: 1e8 J/m2/K }
thresholds: [273.15 K, 300 K]
`;

function scenarioFile(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

describe("calorbit run", () => {
  it("runs the bundled demo with a readable summary and the caution footer", () => {
    const r = calorbit("run");
    expect(r.status).toBe(0);
    expect(r.stdout).toContain("Periodic steady state");
    expect(r.stdout).toMatch(/temperature\s+\d+\.\d+ K/);
    expect(r.stdout).toContain("lag of maximum after periastron");
    expect(r.stdout).toContain("thermal-control standard");
  });

  it("prints one JSON document that carries the contract fields", () => {
    const r = calorbit("run", join(SCENARIOS, "calyndra-ocean.yaml"), "--json");
    expect(r.status).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.calorbit.version).toBe(VERSION);
    const s = doc.summary;
    expect(s.periodSeconds).toBeGreaterThan(0);
    for (const block of [s.temperature, s.equilibrium]) {
      expect(block.minK).toBeLessThanOrEqual(block.meanK);
      expect(block.meanK).toBeLessThanOrEqual(block.maxK);
    }
    expect(s.lagSeconds).toBeGreaterThanOrEqual(0);
    expect(s.lagSeconds).toBeLessThan(s.periodSeconds);
    expect(s.dampingRatio).toBeGreaterThan(0);
    expect(s.timeInRange.fraction).toBeGreaterThanOrEqual(0);
    expect(Math.abs(s.energyBalanceResidual)).toBeLessThan(1e-8);
    expect(doc.scenario.orbit.semiMajorAxisM).toBeCloseTo(0.79 * 149_597_870_700, 0);
    expect(doc.solver.evaluations).toBeGreaterThan(0);
    expect(doc.series).toBeUndefined();
  });

  it("omits timeInRange without thresholds and gives a null lag on a circular orbit", () => {
    const path = scenarioFile("circular.yaml", validScenario.replace("eccentricity: 0.2", "eccentricity: 0").replace(/thresholds.*\n/, ""));
    const doc = JSON.parse(calorbit("run", path, "--json").stdout);
    expect(doc.summary.timeInRange).toBeUndefined();
    expect(doc.summary.lagSeconds).toBeNull();
    expect(doc.summary.dampingRatio).toBe(1);
  });

  it("writes the series as CSV with the version, the resolved scenario and units in the header", () => {
    const out = join(dir, "series.csv");
    const r = calorbit("run", scenarioFile("ok.yaml", validScenario), "--csv", out, "--samples", "50");
    expect(r.status).toBe(0);
    const lines = readFileSync(out, "utf8").trim().split("\n");
    expect(lines[0]).toBe(`# calorbit ${VERSION}`);
    expect(lines[1]).toContain('"semiMajorAxisM":149597870700');
    const header = lines.find((l) => !l.startsWith("#"))!;
    expect(header).toBe("time_s,orbit_phase,true_anomaly_deg,distance_au,stellar_flux_W_m2,absorbed_flux_W_m2,temperature_K,equilibrium_K");
    expect(lines.filter((l) => !l.startsWith("#")).length).toBe(51);
  });

  it("includes the columnar series in JSON with --series", () => {
    const doc = JSON.parse(calorbit("run", scenarioFile("ok2.yaml", validScenario), "--json", "--series", "--samples", "20").stdout);
    expect(doc.series.timeSeconds).toHaveLength(20);
    expect(doc.series.temperatureK).toHaveLength(20);
  });

  it("integrates a transient from a cold start with --from and --orbits", () => {
    const doc = JSON.parse(calorbit("run", scenarioFile("ok3.yaml", validScenario), "--json", "--from", "-100degC", "--orbits", "3").stdout);
    expect(doc.solver.mode).toBe("transient");
    expect(doc.solver.orbitsIntegrated).toBe(3);
  });
});

describe("calorbit check, schema, equilibrium", () => {
  it("check prints what it understood with the derived period and τ/P", () => {
    const r = calorbit("check", scenarioFile("ok4.yaml", validScenario));
    expect(r.status).toBe(0);
    expect(r.stdout).toContain("valid scenario");
    expect(r.stdout).toContain("Kepler's third law");
    expect(r.stdout).toMatch(/τ\/P = [\d.]+/);
  });

  it("schema prints a JSON Schema that names the scenario keys", () => {
    const schema = JSON.parse(calorbit("schema").stdout);
    expect(schema.$schema).toContain("json-schema.org");
    expect(Object.keys(schema.properties)).toEqual(expect.arrayContaining(["name", "star", "orbit", "body", "regime", "thresholds"]));
    expect(schema.properties.orbit.additionalProperties).toBe(false);
  });

  it("equilibrium gives 278.33 K at 1 au from 1 L☉ with A = 0 (IAU 2015 B3 nominal luminosity, derived)", () => {
    const r = calorbit("equilibrium", "--luminosity", "1Lsun", "--distance", "1au");
    expect(r.status).toBe(0);
    expect(r.stdout).toContain("278.33 K");
    expect(r.stdout).toMatch(/Wien peak\s+10\.41 µm/);
  });
});

describe("bad input: one line per problem, exit status 2, no stack trace", () => {
  const cases: Array<[string, string, RegExp]> = [
    ["missing field", validScenario.replace("semiMajorAxis: 1 au, ", ""), /^calorbit: orbit\.semiMajorAxis: given missing; allowed: /m],
    ["e ≥ 1", validScenario.replace("eccentricity: 0.2", "eccentricity: 1.0"), /^calorbit: orbit\.eccentricity: given 1; allowed: a number with 0 ≤ e < 1$/m],
    ["negative albedo", validScenario.replace("albedo: 0.3", "albedo: -0.1"), /^calorbit: body\.albedo: given -0\.1; allowed: a number with 0 ≤ A ≤ 1$/m],
    ["unknown unit", validScenario.replace("1 au", "1 parsec"), /^calorbit: orbit\.semiMajorAxis: given "1 parsec"; allowed: unit one of m, cm, mm, km, au, Rsun \(unknown unit "parsec"\)$/m],
    ["NaN", validScenario.replace("eccentricity: 0.2", "eccentricity: .nan"), /^calorbit: orbit\.eccentricity: given NaN; allowed: /m],
    ["unknown key", validScenario.replace("albedo: 0.3", "albedo: 0.3, colour: red"), /^calorbit: body\.colour: given "red"; allowed: no such key here/m],
  ];
  for (const [what, text, message] of cases) {
    it(`reports ${what}`, () => {
      const out = join(dir, `never-${what.replace(/\W/g, "")}.csv`);
      const r = calorbit("run", scenarioFile(`bad-${what.replace(/\W/g, "")}.yaml`, text), "--csv", out);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr).not.toMatch(/^\s+at /m);
      expect(r.stdout).toBe("");
      expect(existsSync(out)).toBe(false);
    });
  }

  it("reports every problem of a scenario, one line each", () => {
    const text = validScenario.replace("eccentricity: 0.2", "eccentricity: 2").replace("albedo: 0.3", "albedo: 7");
    const r = calorbit("check", scenarioFile("two.yaml", text));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatchInlineSnapshot(`
      "calorbit: orbit.eccentricity: given 2; allowed: a number with 0 ≤ e < 1
      calorbit: body.albedo: given 7; allowed: a number with 0 ≤ A ≤ 1
      "
    `);
  });

  it("reports a malformed file with its line", () => {
    const r = calorbit("run", scenarioFile("broken.yaml", "name: x\nstar: [unclosed\n"));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^calorbit: .*broken\.yaml: not valid YAML at line \d+, column \d+: .+$/m);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
  });

  it("reports a file that does not exist", () => {
    const r = calorbit("run", join(dir, "nowhere.yaml"));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/nowhere\.yaml: no such file$/m);
  });

  it("reports a bad flag value and an unknown flag", () => {
    expect(calorbit("run", "--samples", "many").stderr).toMatchInlineSnapshot(`
      "calorbit: --samples: given "many"; allowed: an integer from 2 to 10000000
      "
    `);
    const r = calorbit("run", "--frobnicate");
    expect(r.status).toBe(2);
    expect(r.stderr).toContain("unknown option '--frobnicate'");
  });
});
