import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { VERSION } from "../src/version.js";
import { calorbit, CLI } from "./cliHarness.js";

// The CLI runs in-process (the compiled program with captured stdout and stderr; npm test builds it
// first); only what needs a real process (exit status, pipes, start-up) spawns the executable.
const SCENARIOS = join(import.meta.dirname, "..", "scenarios");

function spawnCalorbit(...args: string[]) {
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: "utf8" });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

let dir: string;
beforeAll(async () => {
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

describe("calorbit run", async () => {
  it("runs the bundled demo with a readable summary and the caution footer", async () => {
    const r = await calorbit("run");
    expect(r.status).toBe(0);
    expect(r.stdout).toContain("Periodic steady state");
    expect(r.stdout).toMatch(/temperature\s+\d+\.\d+ K/);
    expect(r.stdout).toContain("lag of maximum after periastron");
    expect(r.stdout).toContain("thermal-control standard");
  });

  it("prints one JSON document that carries the contract fields", async () => {
    const r = await calorbit("run", join(SCENARIOS, "calyndra-ocean.yaml"), "--json");
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

  it("omits timeInRange without thresholds and gives a null lag on a circular orbit", async () => {
    const path = scenarioFile("circular.yaml", validScenario.replace("eccentricity: 0.2", "eccentricity: 0").replace(/thresholds.*\n/, ""));
    const doc = JSON.parse((await calorbit("run", path, "--json")).stdout);
    expect(doc.summary.timeInRange).toBeUndefined();
    expect(doc.summary.lagSeconds).toBeNull();
    expect(doc.summary.dampingRatio).toBe(1);
  });

  it("writes the series as CSV with the version, the resolved scenario and units in the header", async () => {
    const out = join(dir, "series.csv");
    const r = await calorbit("run", scenarioFile("ok.yaml", validScenario), "--csv", out, "--samples", "50");
    expect(r.status).toBe(0);
    const lines = readFileSync(out, "utf8").trim().split("\n");
    expect(lines[0]).toBe(`# calorbit ${VERSION}`);
    expect(lines[1]).toContain('"semiMajorAxisM":149597870700');
    const header = lines.find((l) => !l.startsWith("#"))!;
    expect(header).toBe("time_s,orbit_phase,true_anomaly_deg,distance_au,stellar_flux_W_m2,absorbed_flux_W_m2,temperature_K,equilibrium_K");
    expect(lines.filter((l) => !l.startsWith("#")).length).toBe(51);
  });

  it("includes the columnar series in JSON with --series", async () => {
    const doc = JSON.parse((await calorbit("run", scenarioFile("ok2.yaml", validScenario), "--json", "--series", "--samples", "20")).stdout);
    expect(doc.series.timeSeconds).toHaveLength(20);
    expect(doc.series.temperatureK).toHaveLength(20);
  });

  it("integrates a transient from a cold start with --from and --orbits", async () => {
    const doc = JSON.parse((await calorbit("run", scenarioFile("ok3.yaml", validScenario), "--json", "--from", "-100degC", "--orbits", "3")).stdout);
    expect(doc.solver.mode).toBe("transient");
    expect(doc.solver.orbitsIntegrated).toBe(3);
  });

  it("cross-checks a case with the odex package's extrapolation integrator (--integrator odex) to 1e-8", async () => {
    const path = scenarioFile("ok5.yaml", validScenario);
    const ours = JSON.parse((await calorbit("run", path, "--json", "--samples", "20")).stdout);
    const odex = JSON.parse((await calorbit("run", path, "--json", "--samples", "20", "--integrator", "odex")).stdout);
    expect(odex.solver.integrator).toBe("odex");
    expect(ours.solver.integrator).not.toBe("odex");
    expect(Math.abs(odex.summary.temperature.meanK / ours.summary.temperature.meanK - 1)).toBeLessThan(1e-8);
    expect(Math.abs(odex.summary.temperature.maxK / ours.summary.temperature.maxK - 1)).toBeLessThan(1e-8);
  });
});

describe("calorbit check, schema, equilibrium", async () => {
  it("check prints what it understood with the derived period and τ/P", async () => {
    const r = await calorbit("check", scenarioFile("ok4.yaml", validScenario));
    expect(r.status).toBe(0);
    expect(r.stdout).toContain("valid scenario");
    expect(r.stdout).toContain("Kepler's third law");
    expect(r.stdout).toMatch(/τ\/P = [\d.]+/);
  });

  it("check accepts every bundled scenario, the map and zonal ones included (they have no single-surface model)", async () => {
    for (const name of readdirSync(SCENARIOS).filter((f) => f.endsWith(".yaml"))) {
      const r = await calorbit("check", join(SCENARIOS, name));
      expect({ name, status: r.status, stderr: r.stderr }).toEqual({ name, status: 0, stderr: "" });
      expect(r.stdout).toMatch(/^ {2}derived {3}period /m);
    }
  });

  it("schema prints a JSON Schema that names the scenario keys", async () => {
    const schema = JSON.parse((await calorbit("schema")).stdout);
    expect(schema.$schema).toContain("json-schema.org");
    expect(Object.keys(schema.properties)).toEqual(expect.arrayContaining(["name", "star", "orbit", "body", "regime", "thresholds"]));
    expect(schema.properties.orbit.additionalProperties).toBe(false);
  });

  it("equilibrium gives 278.33 K at 1 au from 1 L☉ with A = 0 (IAU 2015 B3 nominal luminosity, derived)", async () => {
    const r = await calorbit("equilibrium", "--luminosity", "1Lsun", "--distance", "1au");
    expect(r.status).toBe(0);
    expect(r.stdout).toContain("278.33 K");
    expect(r.stdout).toMatch(/Wien peak\s+10\.41 µm/);
  });
});

describe("bad input: one line per problem, exit status 2, no stack trace", async () => {
  const cases: Array<[string, string, RegExp]> = [
    ["missing field", validScenario.replace("semiMajorAxis: 1 au, ", ""), /^calorbit: orbit\.semiMajorAxis: given missing; allowed: /m],
    ["e ≥ 1", validScenario.replace("eccentricity: 0.2", "eccentricity: 1.0"), /^calorbit: orbit\.eccentricity: given 1; allowed: a number with 0 ≤ e < 1$/m],
    ["negative albedo", validScenario.replace("albedo: 0.3", "albedo: -0.1"), /^calorbit: body\.albedo: given -0\.1; allowed: a number with 0 ≤ A ≤ 1$/m],
    ["unknown unit", validScenario.replace("1 au", "1 parsec"), /^calorbit: orbit\.semiMajorAxis: given "1 parsec"; allowed: unit one of m, cm, mm, um, nm, km, au, Rearth, Rjup, Rsun \(unknown unit "parsec"\)$/m],
    ["NaN", validScenario.replace("eccentricity: 0.2", "eccentricity: .nan"), /^calorbit: orbit\.eccentricity: given NaN; allowed: /m],
    ["unknown key", validScenario.replace("albedo: 0.3", "albedo: 0.3, colour: red"), /^calorbit: body\.colour: given "red"; allowed: no such key here/m],
  ];
  for (const [what, text, message] of cases) {
    it(`reports ${what}`, async () => {
      const out = join(dir, `never-${what.replace(/\W/g, "")}.csv`);
      const r = await calorbit("run", scenarioFile(`bad-${what.replace(/\W/g, "")}.yaml`, text), "--csv", out);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr).not.toMatch(/^\s+at /m);
      expect(r.stdout).toBe("");
      expect(existsSync(out)).toBe(false);
    });
  }

  it("reports every problem of a scenario, one line each", async () => {
    const text = validScenario.replace("eccentricity: 0.2", "eccentricity: 2").replace("albedo: 0.3", "albedo: 7");
    const r = await calorbit("check", scenarioFile("two.yaml", text));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatchInlineSnapshot(`
      "calorbit: orbit.eccentricity: given 2; allowed: a number with 0 ≤ e < 1
      calorbit: body.albedo: given 7; allowed: a number with 0 ≤ A ≤ 1
      "
    `);
  });

  it("reports a malformed file with its line", async () => {
    const r = await calorbit("run", scenarioFile("broken.yaml", "name: x\nstar: [unclosed\n"));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^calorbit: .*broken\.yaml: not valid YAML at line \d+, column \d+: .+$/m);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
  });

  it("reports a file that does not exist", async () => {
    const r = await calorbit("run", join(dir, "nowhere.yaml"));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/nowhere\.yaml: no such file$/m);
  });

  it("reports a bad flag value and an unknown flag", async () => {
    expect((await calorbit("run", "--samples", "many")).stderr).toMatchInlineSnapshot(`
      "calorbit: --samples: given "many"; allowed: an integer from 2 to 10000000
      "
    `);
    expect((await calorbit("run", "--integrator", "euler")).stderr).toBe('calorbit: --integrator: given "euler"; allowed: dormand-prince, odex, radau\n');
    const r = await calorbit("run", "--frobnicate");
    expect(r.status).toBe(2);
    expect(r.stderr).toContain("unknown option '--frobnicate'");
  });
});

describe("calorbit compare and insolation", async () => {
  it("puts every regime in one table, and its JSON rows agree with single-regime runs", async () => {
    const path = join(SCENARIOS, "korvath-locked.yaml");
    const table = await calorbit("compare", path);
    expect(table.status).toBe(0);
    for (const label of ["global", "dayside", "substellar", "daynight day", "daynight night", "band", "point"]) {
      expect(table.stdout).toMatch(new RegExp(`^${label}\\s+\\d`, "m"));
    }
    const doc = JSON.parse((await calorbit("compare", path, "--json", "--regimes", "global,daynight,point")).stdout);
    expect(doc.results.map((r: { regime: string }) => r.regime)).toEqual(["global", "daynight", "point"]);
    for (const row of doc.results) {
      const single = scenarioFile(`single-${row.regime}.yaml`, readFileSync(path, "utf8").replace("regime: daynight", `regime: ${row.regime}`));
      const alone = JSON.parse((await calorbit("run", single, "--json")).stdout);
      expect(row.summary.temperature.minK).toBeCloseTo(alone.summary.temperature.minK, 6);
      expect(row.summary.temperature.maxK).toBeCloseTo(alone.summary.temperature.maxK, 6);
      expect(row.summary.temperature.meanK).toBeCloseTo(alone.summary.temperature.meanK, 6);
    }
    expect(doc.results[1].summary.day.temperature.minK).toBeGreaterThan(doc.results[1].summary.night.temperature.maxK);
  });

  it("writes one column per regime on a shared time axis, tiling shorter cycles", async () => {
    const out = join(dir, "compare.csv");
    const r = await calorbit("compare", join(SCENARIOS, "miradel-resonant.yaml"), "--regimes", "global,point", "--csv", out, "--samples", "201");
    expect(r.status).toBe(0);
    const rows = readFileSync(out, "utf8").trim().split("\n").filter((l) => !l.startsWith("#"));
    expect(rows[0]).toBe("time_s,temperature_global_K,equilibrium_global_K,temperature_point_K,equilibrium_point_K");
    expect(rows).toHaveLength(202);
    // The global regime repeats each orbit; the 3:2 point needs two.
    const col = (j: number) => rows.slice(1).map((l) => Number(l.split(",")[j]));
    expect(col(1)[0]).toBeCloseTo(col(1)[100]!, 9);
    expect(col(3)[0]).not.toBeCloseTo(col(3)[100]!, 1);
  });

  it("runs day/night with no heat carried to the night side: the night at 0 K (the no-redistribution limit)", async () => {
    const doc = JSON.parse((await calorbit("compare", scenarioFile("nonight.yaml", validScenario), "--json", "--regimes", "dayside,daynight")).stdout);
    // With ε = 0 the day hemisphere is the dayside regime's f = 1/2 surface (Cowan & Agol 2011, eq. 4, uniform dayside).
    expect(doc.results[1].summary.day.temperature.meanK).toBeCloseTo(doc.results[0].summary.temperature.meanK, 6);
    expect(doc.results[1].summary.night.temperature).toEqual({ minK: 0, maxK: 0, meanK: 0, swingK: 0 });
  });

  it("rejects an unknown regime in --regimes", async () => {
    const r = await calorbit("compare", "--regimes", "global,sideways");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^calorbit: --regimes: given "global,sideways"; allowed: a comma-separated list of /m);
  });

  it("prints the seasonal insolation map as latitude × orbital phase (Berger 1978 daily means)", async () => {
    const r = await calorbit("insolation", join(SCENARIOS, "ilvane-tilted.yaml"), "--latitudes", "19", "--phases", "12");
    expect(r.status).toBe(0);
    const rows = r.stdout.trim().split("\n").filter((l) => !l.startsWith("#"));
    expect(rows).toHaveLength(20);
    expect(rows[0]!.split(",")).toHaveLength(13);
    const values = rows.slice(1).flatMap((l) => l.split(",").slice(1).map(Number));
    expect(Math.min(...values)).toBe(0); // polar night somewhere at 38° obliquity
  });
});

describe("scenario keys for spin, surface and exchange", async () => {
  it("rejects a malformed orbit ratio, a latitude past the pole and both exchange forms at once", async () => {
    const text = validScenario
      .replace("thresholds", 'spin: { orbitRatio: "3/2" }\nsurface: { latitude: 95 deg }\nthresholds')
      .replace("heatCapacity: 1e8 J/m2/K", "heatCapacity: 1e8 J/m2/K, recirculation: 0.2, exchangeCoefficient: 1");
    const r = await calorbit("check", scenarioFile("spin-bad.yaml", text));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatchInlineSnapshot(`
      "calorbit: spin.orbitRatio: given "3/2"; allowed: a spin:orbit ratio of positive whole numbers such as "1:1" or "3:2"
      calorbit: surface.latitude: given "95 deg"; allowed: an angle from -90 to 90 deg
      "
    `);
    const both = await calorbit("check", scenarioFile("both.yaml", validScenario.replace("heatCapacity: 1e8 J/m2/K", "heatCapacity: 1e8 J/m2/K, recirculation: 0.2, exchangeCoefficient: 1")));
    expect(both.stderr).toMatch(/^calorbit: body\.exchangeCoefficient: given 1; allowed: either body\.recirculation or body\.exchangeCoefficient, not both$/m);
  });

  it("reports a point's solar day and a daynight run's two hemispheres in JSON", async () => {
    const point = JSON.parse((await calorbit("run", join(SCENARIOS, "miradel-resonant.yaml"), "--json")).stdout);
    expect(point.summary.solarDaySeconds / point.summary.periodSeconds).toBeCloseTo(2, 9);
    expect(point.summary.temperature.maxK).toBeGreaterThan(point.summary.temperature.minK);
    const dn = JSON.parse((await calorbit("run", join(SCENARIOS, "korvath-locked.yaml"), "--json")).stdout);
    for (const side of ["day", "night"]) {
      for (const key of ["minK", "maxK", "meanK"]) expect(typeof dn.summary[side].temperature[key]).toBe("number");
    }
    expect(dn.summary.temperature).toEqual(dn.summary.day.temperature);
  });

  it("writes both hemispheres and their absorbed flux to the run CSV", async () => {
    const out = join(dir, "dn.csv");
    await calorbit("run", join(SCENARIOS, "korvath-locked.yaml"), "--csv", out, "--samples", "10");
    const header = readFileSync(out, "utf8").split("\n").find((l) => !l.startsWith("#"))!;
    expect(header).toContain("absorbed_flux_W_m2");
    expect(header).toContain("temperature_night_K,equilibrium_night_K,absorbed_flux_night_W_m2");
  });
});

describe("a conduction column from the CLI", async () => {
  it("runs the regolith demo with day and night temperatures, skin depths and the depth profile", async () => {
    const path = join(SCENARIOS, "sarvek-regolith.yaml");
    const text = await calorbit("run", path);
    expect(text.status).toBe(0);
    expect(text.stdout).toContain("Depth profile");
    expect(text.stdout).toMatch(/skin depth\s+diurnal [\d.]+ m, orbital [\d.]+ m/);
    expect(text.stdout).toMatch(/≤ tolerance 1e-6\)$/m); // the column's own default
    const doc = JSON.parse((await calorbit("run", path, "--json")).stdout);
    expect(doc.summary.temperature.minK).toBeLessThan(doc.summary.temperature.maxK);
    expect(doc.summary.depthProfile.length).toBeGreaterThan(10);
    for (const row of doc.summary.depthProfile) expect(Object.keys(row)).toEqual(["depthM", "minK", "maxK", "meanK"]);
    // The daily wave dies out with depth.
    const first = doc.summary.depthProfile[0];
    const last = doc.summary.depthProfile.at(-1);
    expect(last.maxK - last.minK).toBeLessThan(0.1 * (first.maxK - first.minK));
    expect(Math.abs(doc.summary.energyBalanceResidual)).toBeLessThan(1e-6);
    const out = join(dir, "column.csv");
    await calorbit("run", path, "--csv", out, "--samples", "30");
    const header = readFileSync(out, "utf8").split("\n").find((l) => !l.startsWith("#"))!;
    expect(header).toBe("time_s,orbit_phase,true_anomaly_deg,distance_au,stellar_flux_W_m2,absorbed_flux_W_m2,temperature_K,equilibrium_K,temperature_at_0.01m_K,temperature_at_0.05m_K,temperature_at_0.3m_K");
  });

  it("keeps an explicit --tolerance 1e-8 (the slab's default value) as asked, and refuses --tolerance for the zonal climate", async () => {
    // It was taken for "not given" and silently replaced by the column's 1e-6.
    const tight = await calorbit("run", join(SCENARIOS, "sarvek-regolith.yaml"), "--tolerance", "1e-8");
    expect(tight.status).toBe(0);
    expect(tight.stdout).toMatch(/periodicity residual (\S+) ≤ tolerance 1e-8\)$/m);
    const residual = Number(/periodicity residual (\S+) ≤/.exec(tight.stdout)![1]);
    expect(residual).toBeLessThanOrEqual(1e-8);
    const zonal = await calorbit("run", join(SCENARIOS, "vaelor-zonal.yaml"), "--tolerance", "1e-6");
    expect(zonal.status).toBe(2);
    expect(zonal.stderr).toMatch(/^calorbit: --tolerance: given "1e-6"; allowed: none for the zonal climate/);
  });

  it("rejects a column given with a heat capacity, and a sweep or comparison of a column case says why", async () => {
    const text = validScenario.replace("heatCapacity: 1e8 J/m2/K", "heatCapacity: 1e8 J/m2/K, column: { thermalInertia: 50 }");
    const r = await calorbit("check", scenarioFile("colbad.yaml", text));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^calorbit: body\.column: given .*; allowed: either a column or body\.heatCapacity \/ body\.layer, not both$/m);
    const doc = JSON.parse((await calorbit("compare", join(SCENARIOS, "sarvek-regolith.yaml"), "--json", "--regimes", "global")).stdout);
    expect(doc.results[0].error).toMatch(/column/);
  });
});

describe("calorbit as a process (what needs a real one: exit status, pipes, start-up)", () => {
  it("exits with status 2 and one line, no stack trace, on bad input", () => {
    const r = spawnCalorbit("run", scenarioFile("bad-process.yaml", validScenario.replace("eccentricity: 0.2", "eccentricity: 1.0")));
    expect(r.status).toBe(2);
    expect(r.stderr).toBe("calorbit: orbit.eccentricity: given 1; allowed: a number with 0 ≤ e < 1\n");
    expect(r.stdout).toBe("");
  });

  /** Starts the CLI with its stdout pipe already closed by the reader (as `| head` does), and waits. */
  function withClosedStdout(...args: string[]): Promise<{ status: number | null; stderr: string }> {
    return new Promise((resolve, reject) => {
      const child = spawn(process.execPath, [CLI, ...args], { stdio: ["ignore", "pipe", "pipe"] });
      child.stdout.destroy();
      let stderr = "";
      child.stderr.setEncoding("utf8").on("data", (chunk: string) => (stderr += chunk));
      child.on("error", reject);
      child.on("close", (status) => resolve({ status, stderr }));
    });
  }

  it("ends quietly with status 0 when the reader closes the pipe (insolation | head, run --json --series | head, sweep merge --help | head)", async () => {
    for (const args of [["insolation", join(SCENARIOS, "ilvane-tilted.yaml")], ["run", "--json", "--series"], ["sweep", "merge", "--help"]]) {
      const r = await withClosedStdout(...args);
      expect({ args, ...r }).toEqual({ args, status: 0, stderr: "" });
    }
  });

  it("starts without loading the scenario reader (zod, YAML), the solvers, the sweep runner or the server", () => {
    // A resolve hook records every module the executable loads for --version.
    const log = join(dir, "imports.log");
    const hooks = join(dir, "record-imports.mjs");
    writeFileSync(hooks, `import { appendFileSync } from "node:fs";\nexport async function resolve(s, c, next) { const r = await next(s, c); appendFileSync(${JSON.stringify(log)}, r.url + "\\n"); return r; }\n`);
    const register = `data:text/javascript,import{register}from"node:module";register(${JSON.stringify(`file://${hooks}`)})`;
    const r = spawnSync(process.execPath, ["--import", register, CLI, "--version"], { encoding: "utf8" });
    expect(r.status).toBe(0);
    expect(r.stdout).toBe(`${VERSION}\n`);
    const loaded = readFileSync(log, "utf8").trim().split("\n");
    expect(loaded.some((url) => url.endsWith("/cli/program.js"))).toBe(true);
    const heavy = loaded.filter((url) => /node_modules\/(zod|yaml|odex|cli-progress)\/|\/src\/(simulate|cli\/sweep|cli\/viewServer|scenario\/resolve|scenario\/text)\.js$|node:(http|worker_threads)$/.test(url));
    expect(heavy).toEqual([]);
  });
});

describe("flags that do not apply, and outputs that would overwrite", () => {
  it("refuses --series without --json and --integrator for a conduction column in one line each, and charts a column like a slab", async () => {
    const series = await calorbit("run", "--series");
    expect(series.status).toBe(2);
    expect(series.stderr).toBe("calorbit: --series: given without --json; allowed: --series only with --json (it adds the series to the JSON document; for a table use --csv FILE)\n");
    const column = join(SCENARIOS, "sarvek-regolith.yaml");
    // One writer for every heat store: a column's surface temperature is charted as a slab's is.
    const svg = await calorbit("run", column, "--svg", join(dir, "column.svg"));
    expect(svg.status).toBe(0);
    expect(readFileSync(join(dir, "column.svg"), "utf8")).toMatch(/^<\?xml[^\n]*\n<svg[\s\S]*<\/svg>\s*$/);
    const integrator = await calorbit("run", column, "--integrator", "radau");
    expect(integrator.status).toBe(2);
    expect(integrator.stderr).toMatch(/^calorbit: --integrator: given "radau"; allowed: none for a conduction column/);
  });

  it("refuses an output that is the scenario itself, or two outputs that are one file, before writing anything", async () => {
    const path = scenarioFile("clobber.yaml", validScenario);
    for (const flag of ["--csv", "--svg"]) {
      const r = await calorbit("run", path, flag, path);
      expect(r.status).toBe(2);
      expect(r.stderr).toBe(`calorbit: ${flag}: given ${JSON.stringify(path)}; allowed: a file other than the run input (writing there would overwrite the scenario)\n`);
      expect(readFileSync(path, "utf8")).toBe(validScenario);
    }
    // The same file reached another way (./ and ..) is the same file.
    const again = join(dir, "sub", "..", "clobber.yaml");
    expect((await calorbit("compare", path, "--csv", again)).status).toBe(2);
    expect((await calorbit("insolation", path, "--out", again)).status).toBe(2);
    expect(readFileSync(path, "utf8")).toBe(validScenario);
    const both = join(dir, "both-outputs.txt");
    const r = await calorbit("run", path, "--csv", both, "--svg", both);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^calorbit: --svg: given .*; allowed: a file other than the one given to --csv/);
    expect(existsSync(both)).toBe(false);
  });

  it("compare exits 2 with a sentence when no regime can run (a column scenario)", async () => {
    const column = await calorbit("compare", join(SCENARIOS, "sarvek-regolith.yaml"), "--regimes", "global,dayside", "--csv", join(dir, "never-compare.csv"));
    expect(column.status).toBe(2);
    expect(column.stderr).toBe(
      "calorbit: compare: no regime could run for this scenario, because this case has a conduction column (body.column), and compare takes slab surfaces (body.heatCapacity or body.layer); run each regime of a column with calorbit run\n",
    );
    expect(existsSync(join(dir, "never-compare.csv"))).toBe(false);
  });

  it("view on a file it cannot show (a run --csv series) says so in one short line", async () => {
    const csv = join(dir, "series-for-view.csv");
    expect((await calorbit("run", "--csv", csv, "--samples", "300")).status).toBe(0);
    const r = await calorbit("view", csv);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`calorbit: view: given ${JSON.stringify(csv)}; allowed: a scenario, a result written with run --json --series, or a sweep file\n`);
  });
});

describe("messages stay short and in our words", () => {
  it("cuts an echoed value at about 80 characters, whatever was pasted into the field", async () => {
    const r = await calorbit("check", scenarioFile("long.yaml", validScenario.replace("eccentricity: 0.2", `eccentricity: "${"x".repeat(5000)}"`)));
    expect(r.status).toBe(2);
    const line = r.stderr.split("\n").find((l) => l.includes("orbit.eccentricity"))!;
    const given = /given (.*); allowed/.exec(line)![1]!;
    expect(given.length).toBeLessThanOrEqual(80);
    expect(given.endsWith("…")).toBe(true);
  });

  it("accepts a UTF-8 byte-order mark before JSON and YAML", async () => {
    const json = JSON.stringify({ name: "bom", star: { luminosity: "1 Lsun", mass: "1 Msun" }, orbit: { semiMajorAxis: "1 au", eccentricity: 0.1 }, body: { albedo: 0.3, emissivity: 0.9, heatCapacity: 1e8 } });
    for (const [name, text] of [["bom.json", json], ["bom.yaml", validScenario]] as const) {
      const r = await calorbit("check", scenarioFile(name, `\uFEFF${text}`));
      expect({ name, status: r.status, stderr: r.stderr }).toEqual({ name, status: 0, stderr: "" });
    }
  });

  it("never shows the validation library's own wording", async () => {
    const r = await calorbit("check", scenarioFile("wrong-types.yaml", validScenario.replace("star: { luminosity: 1 Lsun, mass: 1 Msun }", "star: 5").replace("thresholds: [273.15 K, 300 K]", "thresholds: 7")));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^calorbit: star: given 5; allowed: a mapping of keys$/m);
    expect(r.stderr).not.toMatch(/Invalid input|expected \w+, received/);
  });
});

describe("physical sanity: impossible geometry refused, doubtful results warned on stderr and in JSON", () => {
  it("refuses a periastron at or inside the star's radius, naming the orbit", async () => {
    // The Sun's radius is 6.957e8 m (IAU 2015 B3); a = 0.004 au with e = 0.2 puts periastron at 4.79e8 m.
    const text = validScenario.replace("star: { luminosity: 1 Lsun, mass: 1 Msun }", "star: { radius: 1 Rsun, temperature: 5772 K, mass: 1 Msun }").replace("semiMajorAxis: 1 au", "semiMajorAxis: 0.004 au");
    const r = await calorbit("run", scenarioFile("inside-star.yaml", text));
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('calorbit: orbit.semiMajorAxis: given "0.004 au"; allowed: an orbit whose periastron a(1 − e) clears the star\'s radius 6.957e+8 m (here a(1 − e) = 4.787e+8 m)\n');
  });

  it("names the user's own field for physics no run can give: albedo 1, a place never lit, c(T) ≤ 0, C below any surface's", async () => {
    const body = "body: { albedo: 0.3, emissivity: 0.9, heatCapacity: 1e8 J/m2/K }";
    const cases: [string, string, RegExp][] = [
      // (1 − A) S = 0 at A = 1: nothing absorbed, no steady temperature (common practice).
      ["albedo-one", validScenario.replace("albedo: 0.3", "albedo: 1"), /^calorbit: body\.albedo: given 1; allowed: an albedo below 1 /],
      // cos z = sin φ sin δ + cos φ cos δ cos H is 0 at φ = 90° when δ = 0 (obliquity 0): the star on the horizon (common practice).
      ["pole-band", validScenario.replace(/thresholds.*\n/, "regime: band\nsurface: { latitude: 90 }\n"), /^calorbit: surface\.latitude: given 90 deg; allowed: a latitude the star rises over \(with spin\.obliquity 0 /],
      // A synchronous (1:1) circular orbit keeps longitude 180° in night (common practice).
      ["far-side", validScenario.replace("eccentricity: 0.2", "eccentricity: 0").replace(/thresholds.*\n/, "regime: point\nsurface: { longitude: 180 }\n"), /^calorbit: surface\.longitude: given 180 deg; allowed: a longitude the star rises over/],
      // c(T) = 800 − 10 T J/kg/K is 0 at 80 K, inside this orbit's 41–413 K (arithmetic).
      ["negative-c", validScenario.replace(body, "body: { albedo: 0.3, emissivity: 0.9, column: { thermalInertia: 50, specificHeatPolynomial: [800, -10] } }"), /^calorbit: body\.column\.specificHeatPolynomial: given \[800,-10\]; allowed: coefficients whose c\(T\) stays above 0 J kg⁻¹ K⁻¹ from \d+ K to \d+ K, the temperatures this orbit can give \(here c\(8\d K\) = -/],
      ["tiny-C", validScenario.replace("heatCapacity: 1e8 J/m2/K", "heatCapacity: 1e-30"), /^calorbit: body\.heatCapacity: given 1e-30; allowed: an areal heat capacity of at least 1e-4 J\/m2\/K/],
    ];
    for (const [name, text, line] of cases) {
      const out = join(dir, `${name}.csv`);
      const r = await calorbit("run", scenarioFile(`${name}.yaml`, text), "--csv", out);
      expect({ name, status: r.status, lines: r.stderr.trim().split("\n").length }).toEqual({ name, status: 2, lines: 1 });
      expect(r.stderr).toMatch(line);
      expect(existsSync(out)).toBe(false);
    }
    // Internal heat warms a place the star never reaches, so the same pole is a valid case with it.
    const heated = validScenario.replace(/thresholds.*\n/, "regime: band\nsurface: { latitude: 90 }\n").replace("heatCapacity: 1e8 J/m2/K", "heatCapacity: 1e8 J/m2/K, internalFlux: 0.1");
    expect((await calorbit("check", scenarioFile("pole-heated.yaml", heated))).status).toBe(0);
  });

  it("warns when the temperature exceeds the star's own, on stderr and in the JSON warnings, never in stdout's data", async () => {
    // A grey surface (ε = 0.05, absorbing all) at 2.15 solar radii from a 5772 K star: the substellar
    // equilibrium T★ (R/r)^½ ((1 − A)/ε)^¼ ≈ 8300 K is above T★, which Kirchhoff's law forbids for a real surface.
    const text = validScenario
      .replace("star: { luminosity: 1 Lsun, mass: 1 Msun }", "star: { radius: 1 Rsun, temperature: 5772 K, mass: 1 Msun }")
      .replace("semiMajorAxis: 1 au, eccentricity: 0.2", "semiMajorAxis: 0.01 au, eccentricity: 0")
      .replace("albedo: 0.3, emissivity: 0.9", "albedo: 0, emissivity: 0.05")
      .replace(/thresholds.*\n/, "regime: substellar\n");
    const path = scenarioFile("hotter-than-star.yaml", text);
    const json = await calorbit("run", path, "--json");
    expect(json.status).toBe(0);
    const doc = JSON.parse(json.stdout);
    expect(doc.summary.temperature.maxK).toBeGreaterThan(5772);
    expect(doc.warnings).toHaveLength(1);
    expect(doc.warnings[0]).toMatch(/^the maximum temperature \d+\.\d+ K is above the star's own 5772 K/);
    expect(json.stderr).toBe(`calorbit: warning: ${doc.warnings[0]}\n`);
    const text2 = await calorbit("run", path);
    expect(text2.stdout).not.toContain("warning");
    expect(text2.stderr).toContain("above the star's own 5772 K");
    // A sound case has an empty list.
    expect(JSON.parse((await calorbit("run", "--json", "--samples", "20")).stdout).warnings).toEqual([]);
  });

  it("keeps a stiff result's extremes inside the equilibrium range (P = 1e6 yr, C = 1 J m-2 K-1: τ/P ≈ 1e-14)", async () => {
    // A slab with τ ≪ P follows its equilibrium, so min Teq ≤ T ≤ max Teq (energy balance, common
    // practice). The refined extremes used to leave it by hundreds of kelvin (a minimum of −1665 K).
    const text = validScenario.replace("eccentricity: 0.2 }", "eccentricity: 0.2, period: 1e6 yr }").replace("heatCapacity: 1e8 J/m2/K", "heatCapacity: 1 J/m2/K");
    const r = await calorbit("run", scenarioFile("stiff-long.yaml", text), "--json");
    expect(r.status).toBe(0);
    const doc = JSON.parse(r.stdout);
    const { temperature: t, equilibrium: eq } = doc.summary;
    expect(t.maxK).toBeLessThanOrEqual(eq.maxK * (1 + 1e-9));
    expect(t.minK).toBeGreaterThanOrEqual(eq.minK * (1 - 1e-9));
    expect(doc.warnings).toEqual([]);
  });

  it("warns that a bare-number luminosity is watts, in a scenario and in equilibrium (and suggests Lsun)", async () => {
    const r = await calorbit("run", scenarioFile("one-watt.yaml", validScenario.replace("luminosity: 1 Lsun", "luminosity: 1")), "--json", "--samples", "20");
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).warnings).toEqual(['star.luminosity: 1 was read as 1 W, far below any star\'s (the faintest are about 1e-5 Lsun); for solar units write "1 Lsun"']);
    const eq = await calorbit("equilibrium", "--luminosity", "1", "--distance", "1au");
    expect(eq.status).toBe(0);
    expect(eq.stderr).toBe('calorbit: warning: --luminosity: 1 was read as 1 W, far below any star\'s (the faintest are about 1e-5 Lsun); for solar units write "1 Lsun"\n');
    expect((await calorbit("equilibrium", "--luminosity", "3.828e26", "--distance", "1au")).stderr).toBe("");
  });

  it("warns of a bare-number luminosity on the zonal and map paths, in compare and insolation too, on stderr and in their JSON", async () => {
    const warning = 'star.luminosity: 1e+20 was read as 1e+20 W, far below any star\'s (the faintest are about 1e-5 Lsun); for solar units write "1e+20 Lsun"';
    const zonalText = readFileSync(join(SCENARIOS, "vaelor-zonal.yaml"), "utf8").replace(/luminosity: [^\n#]*/, "luminosity: 1e20 ");
    const map = "name: map warn\nstar: { luminosity: 1e20, mass: 1 Msun }\norbit: { semiMajorAxis: 0.001 au, eccentricity: 0.1 }\nbody: { albedo: 0.3, emissivity: 0.9, heatCapacity: 1e5 }\nregime: map\nmap: { longitudes: 8, latitudes: 4 }\n";
    for (const [name, text] of [["zonal-watts.yaml", zonalText], ["map-watts.yaml", map]] as const) {
      const r = await calorbit("run", scenarioFile(name, text), "--json");
      expect({ name, status: r.status }).toEqual({ name, status: 0 });
      expect(JSON.parse(r.stdout).warnings).toEqual([warning]);
      expect(r.stderr).toBe(`calorbit: warning: ${warning}\n`);
    }
    // compare (JSON too) and insolation read the same scenario and say the same.
    const global = scenarioFile("global-watts.yaml", map.replace(/regime: map\nmap: .*\n/, ""));
    const compared = await calorbit("compare", global, "--regimes", "global", "--json");
    expect(JSON.parse(compared.stdout).warnings).toEqual([warning]);
    expect(compared.stderr).toBe(`calorbit: warning: ${warning}\n`);
    expect((await calorbit("insolation", global, "--latitudes", "3", "--phases", "2")).stderr).toContain(`calorbit: warning: ${warning}\n`);
  });

  it("warns that daily means do not describe a slow or resonant rotator (3:2), and not for a fast one", async () => {
    const resonant = await calorbit("insolation", join(SCENARIOS, "miradel-resonant.yaml"));
    expect(resonant.status).toBe(0);
    expect(resonant.stderr).toMatch(/^calorbit: warning: these daily means assume many solar days per orbit, but its solar day is 2\.00 orbits long/);
    expect((await calorbit("insolation", join(SCENARIOS, "ilvane-tilted.yaml"))).stderr).toBe("");
  });
});

describe("users' habits", () => {
  it("equilibrium --json gives 278.33 K at 1 au from 1 L☉ (IAU 2015 B3 nominal luminosity, derived)", async () => {
    const r = await calorbit("equilibrium", "--luminosity", "1Lsun", "--distance", "1au", "--json");
    expect(r.status).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.equilibriumK).toBeCloseTo(278.33, 2);
    expect(doc.stellarFluxWPerM2).toBeCloseTo(1361.2, 1); // IAU 2015 B3 nominal solar constant 1361 W m⁻²
    expect(doc.geometryFactor).toBe(0.25);
    expect(doc.warnings).toEqual([]);
  });

  it("--celsius adds the temperature rows in °C (0 °C = 273.15 K, SI brochure), and is refused with --json", async () => {
    const r = await calorbit("run", scenarioFile("celsius.yaml", validScenario), "--celsius");
    expect(r.status).toBe(0);
    const kelvin = /^ {2}temperature\s+([\d.]+) K\s+([\d.]+) K\s+([\d.]+) K\s+([\d.]+) K$/m.exec(r.stdout)!;
    const celsius = /^ {2}temperature\s+(-?[\d.]+) °C\s+(-?[\d.]+) °C\s+(-?[\d.]+) °C\s+([\d.]+) °C$/m.exec(r.stdout)!;
    for (const i of [1, 2, 3]) expect(Number(celsius[i])).toBeCloseTo(Number(kelvin[i]) - 273.15, 2);
    expect(celsius[4]).toBe(kelvin[4]); // a swing is a difference: the same in K and °C
    expect(r.stdout).toMatch(/time in 273\.15–300\.00 K \(0\.00–26\.85 °C\)/);
    const both = await calorbit("run", "--celsius", "--json");
    expect(both.status).toBe(2);
    expect(both.stderr).toMatch(/^calorbit: --celsius: given with --json; allowed: --celsius only with the text report/);
  });

  it("writes sweep lags in days (lag_days), the run's lagSeconds over 86400 s (the day, SI brochure)", async () => {
    const path = scenarioFile("lag-days.yaml", validScenario);
    const run = JSON.parse((await calorbit("run", path, "--json")).stdout);
    const out = join(dir, "lag-days.csv");
    const r = await calorbit("sweep", path, "--vary", "body.albedo=0.3", "--workers", "1", "--quiet", "--out", out);
    expect({ status: r.status, stderr: r.stderr }).toEqual({ status: 0, stderr: "" });
    const [header, row] = readFileSync(out, "utf8").trim().split("\n").filter((l) => !l.startsWith("#"));
    const columns = header!.split(",");
    expect(columns).not.toContain("lag_s");
    const lagDays = Number(row!.split(",")[columns.indexOf("lag_days")]);
    expect(run.summary.lagSeconds).toBeGreaterThan(86400); // a seasonal lag of days: the case the unit is for
    expect(lagDays).toBeCloseTo(run.summary.lagSeconds / 86400, 9);
  });

  it("reads bare angles as degrees in scenario files and sweep axes (--vary surface.latitude=0,30,60)", async () => {
    const band = validScenario.replace(/thresholds.*\n/, "regime: band\nspin: { obliquity: 23.44 }\nsurface: { latitude: 30 }\n");
    const bare = JSON.parse((await calorbit("run", scenarioFile("band-bare.yaml", band), "--json", "--samples", "20")).stdout);
    const spelled = JSON.parse((await calorbit("run", scenarioFile("band-deg.yaml", band.replace("latitude: 30", "latitude: 30 deg").replace("obliquity: 23.44", "obliquity: 23.44 deg")), "--json", "--samples", "20")).stdout);
    expect(bare.scenario.surface.latitudeRad).toBeCloseTo(Math.PI / 6, 12);
    expect(bare.summary.temperature.meanK).toBe(spelled.summary.temperature.meanK);
    const out = join(dir, "latitudes.csv");
    const r = await calorbit("sweep", scenarioFile("band-sweep.yaml", band), "--vary", "surface.latitude=0,30,60", "--workers", "1", "--quiet", "--out", out);
    expect({ status: r.status, stderr: r.stderr }).toEqual({ status: 0, stderr: "" });
    const rows = readFileSync(out, "utf8").trim().split("\n").filter((l) => !l.startsWith("#"));
    expect(rows).toHaveLength(4);
    expect(rows.slice(1).map((l) => l.split(",")[2])).toEqual(["ok", "ok", "ok"]);
    // Radians still work when they say so.
    expect((await calorbit("check", scenarioFile("band-rad.yaml", band.replace("latitude: 30", "latitude: 0.5 rad")))).status).toBe(0);
  });
});
