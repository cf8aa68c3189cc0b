/**
 * `calorbit fit` as users run it (the compiled CLI, in-process): the JSON contract, one-line refusals
 * of bad input with exit status 2, and a posterior chain that resumes after a torn write to exactly
 * the chain of an uninterrupted run.
 */
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { calorbit } from "./cliHarness.js";

let dir: string;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "calorbit-fit-"));
});

// An invented slab on an eccentric orbit; its data are made by `run --csv` of the same scenario at
// A = 0.25 and C = 1.5 MJ/m²/K, so the fit has a known answer (noise-free: χ² ≈ 0 here).
const SCENARIO = `
name: Fit CLI world (invented)
star: { luminosity: 0.8 Lsun }
orbit: { semiMajorAxis: 0.15 au, eccentricity: 0.3, period: 20 d }
body: { albedo: 0.3, emissivity: 0.95, heatCapacity: 1 MJ/m2/K }
`;

// A locked giant on an eccentric orbit seen at i = 80°: its slab's heat capacity delays and smooths the phase curve.
const MAP_SCENARIO = `
name: Fit map world (invented)
star: { radius: 0.9 Rsun, temperature: 5400 K, mass: 0.9 Msun }
orbit: { semiMajorAxis: 0.06 au, eccentricity: 0.3 }
body: { albedo: 0.3, emissivity: 1, heatCapacity: 1 MJ/m2/K, radius: 1.1 Rjup }
regime: map
spin: { orbitRatio: "1:1" }
map: { longitudes: 8, latitudes: 4 }
observer: { inclination: 80 deg, argumentOfPeriastron: 30 deg, passband: { file: band.csv } }
`;
const BAND = "# an invented response\nwavelength_um,response\n3.5,0\n4.0,1\n5.0,1\n5.5,0\n";

function write(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

const FAST = ["--tolerance", "1e-5", "--samples", "200", "--starts", "2"];

async function syntheticData(): Promise<string> {
  const truth = write("truth.yaml", SCENARIO.replace("albedo: 0.3", "albedo: 0.25").replace("heatCapacity: 1 MJ/m2/K", "heatCapacity: 1.5 MJ/m2/K"));
  const csv = join(dir, "truth.csv");
  const r = await calorbit("run", truth, "--csv", csv, "--samples", "41", "--tolerance", "1e-9");
  expect(r.status).toBe(0);
  // run's CSV: time_s first, temperature_K among the columns; keep the two and add σ = 0.5 K.
  const lines = readFileSync(csv, "utf8").split("\n").filter((l) => l !== "" && !l.startsWith("#"));
  const header = lines[0]!.split(",");
  const it = header.indexOf("time_s");
  const iT = header.indexOf("temperature_K");
  expect(it).toBeGreaterThanOrEqual(0);
  expect(iT).toBeGreaterThan(0);
  const rows = lines.slice(1, -1).map((l) => {
    const f = l.split(",");
    return `${f[it]},${f[iT]},0.5`;
  });
  return write("data.csv", ["time_s,temperature_K,sigma_K", ...rows].join("\n") + "\n");
}

describe("calorbit fit", () => {
  it("recovers noise-free values and prints the JSON contract in SI", async () => {
    const scenario = write("world.yaml", SCENARIO);
    const data = await syntheticData();
    const r = await calorbit("fit", scenario, "--data", data, "--free", "body.heatCapacity=0.2 MJ/m2/K..20 MJ/m2/K", "--free", "body.albedo=0..0.6", ...FAST, "--json");
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.parameters.map((p: { key: string }) => p.key)).toEqual(["body.heatCapacity", "body.albedo"]);
    const [c, a] = doc.parameters;
    expect(c.value / 1.5e6).toBeCloseTo(1, 2); // SI: J m⁻² K⁻¹
    expect(a.value).toBeCloseTo(0.25, 3);
    expect(c.sigma).toBeGreaterThan(0);
    expect(c.sigma / c.sigmaInUnit).toBeCloseTo(1e6, 6); // MJ → J
    expect(doc.degreesOfFreedom).toBe(40 - 2);
    expect(doc.chiSquare).toBeGreaterThanOrEqual(0);
    expect(doc.covariance[0][1] / Math.sqrt(doc.covariance[0][0] * doc.covariance[1][1])).toBeCloseTo(doc.correlation[0][1], 10);
  });

  it("refuses bad input with one line per problem and exit status 2", async () => {
    const scenario = write("world2.yaml", SCENARIO);
    const backwards = write("backwards.csv", "time_d,temperature_K\n0,300\n1,290\n0.5,280\n2,270\n");
    let r = await calorbit("fit", scenario, "--data", backwards, "--free", "body.albedo");
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`calorbit: ${backwards}: line 4 time_d: given 0.5; allowed: a time after the previous row's (times strictly increasing)\n`);
    const two = write("two.csv", "time_d,temperature_K\n0,300\n1,290\n");
    r = await calorbit("fit", scenario, "--data", two, "--free", "body.albedo", "--free", "body.heatCapacity=1e5..1e8", ...FAST);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe("calorbit: data: given 2 points for 2 free parameters; allowed: more points than free parameters (at least 3)\n");
    r = await calorbit("fit", scenario, "--data", two, "--free", "body.albedo=0..2");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^calorbit: body\.albedo: given 2; allowed: /);
    r = await calorbit("fit", scenario, "--data", two, "--free", "body.albedo", "--residuals", two);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain("--residuals");
    expect(readFileSync(two, "utf8")).toBe("time_d,temperature_K\n0,300\n1,290\n");
    // A flux ratio is dimensionless: temperature data against a map, or flux data against a slab, are refused by name.
    const map = write("map-refused.yaml", MAP_SCENARIO);
    write("band.csv", BAND);
    const temperatures = write("temperatures.csv", "time_d,temperature_K\n0,300\n1,290\n2,280\n");
    r = await calorbit("fit", map, "--data", temperatures, "--free", "body.albedo");
    expect(r.status).toBe(2);
    expect(r.stderr).toBe("calorbit: --data: given a temperature column for a map scenario; allowed: a flux_ratio column (the dimensionless planet-to-star flux in the observer's passband, not a temperature) with --model-output fluxRatio\n");
    const fluxes = write("fluxes.csv", "time_d,flux_ratio\n0,1e-4\n1,2e-4\n2,3e-4\n");
    r = await calorbit("fit", scenario, "--data", fluxes, "--free", "body.albedo");
    expect(r.status).toBe(2);
    expect(r.stderr).toBe("calorbit: --model-output: given \"fluxRatio\"; allowed: surface, day, night or depth=<length>: fluxRatio needs regime: map with an observer (this scenario's regime is global)\n");
    // The zonal climate: two starts may reach two climates, so the fit asks for one; with one it runs.
    const zonal = (start: string) => write(`zonal-${start}.yaml`, `${SCENARIO}regime: zonal\nclimate: { bands: 6, stepsPerOrbit: 24, start: ${start} }\n`);
    r = await calorbit("fit", zonal("both"), "--data", temperatures, "--free", "climate.diffusion=0.1..10");
    expect(r.status).toBe(2);
    expect(r.stderr).toBe("calorbit: climate.start: given both; allowed: warm or cold: the fit follows the climate reached from that start (two starts can reach two climates)\n");
    r = await calorbit("fit", zonal("warm"), "--data", temperatures, "--free", "climate.diffusion=0.1..10", "--model-output", "latitude=30", "--starts", "1", "--json");
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).parameters[0].key).toBe("climate.diffusion");
  });

  it("fits a map's phase curve (flux_ratio data, the passband read from its file) back to the values that made it", async () => {
    write("band.csv", BAND);
    const truth = write("map-truth.yaml", MAP_SCENARIO.replace("albedo: 0.3", "albedo: 0.15").replace("heatCapacity: 1 MJ/m2/K", "heatCapacity: 3 MJ/m2/K"));
    const csv = join(dir, "map-truth.csv");
    expect((await calorbit("run", truth, "--csv", csv, "--samples", "41", "--tolerance", "1e-9")).status).toBe(0);
    const lines = readFileSync(csv, "utf8").split("\n").filter((l) => l !== "" && !l.startsWith("#"));
    const header = lines[0]!.split(",");
    const it = header.indexOf("time_s");
    const iF = header.indexOf("flux_ratio");
    expect(iF).toBeGreaterThan(0);
    const rows = lines.slice(1, -1).map((l) => `${l.split(",")[it]},${l.split(",")[iF]},1e-5`);
    const data = write("map-data.csv", ["time_s,flux_ratio,sigma", ...rows].join("\n") + "\n");
    const scenario = write("map-world.yaml", MAP_SCENARIO);
    const r = await calorbit("fit", scenario, "--data", data, "--free", "body.heatCapacity=0.2 MJ/m2/K..20 MJ/m2/K", "--free", "body.albedo=0..0.6", "--tolerance", "1e-6", "--samples", "100", "--starts", "1", "--json");
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    const [c, a] = JSON.parse(r.stdout).parameters;
    // Noise-free data from the same model at a finer tolerance: back to well inside the 1e-5 σ's uncertainty.
    expect(Math.abs(c.value - 3e6)).toBeLessThan(0.1 * c.sigma);
    expect(Math.abs(a.value - 0.15)).toBeLessThan(0.1 * a.sigma);
  });

  it("resumes a torn chain to exactly the uninterrupted chain, and refuses another fit's chain", async () => {
    const scenario = write("world3.yaml", SCENARIO);
    const data = await syntheticData();
    const args = (chain: string, steps: number) => ["fit", scenario, "--data", data, "--free", "body.heatCapacity=0.2 MJ/m2/K..20 MJ/m2/K", "--free", "body.albedo=0..0.6", ...FAST, "--posterior", String(steps), "--walkers", "8", "--workers", "1", "--chain", chain, "--seed", "3", "--json"];
    const whole = join(dir, "whole.csv");
    const r = await calorbit(...args(whole, 30));
    expect(r.status).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.parameters[0].p16).toBeLessThanOrEqual(doc.parameters[0].median);
    expect(doc.parameters[0].median).toBeLessThanOrEqual(doc.parameters[0].p84);
    const text = readFileSync(whole, "utf8");
    expect(text.trim().split("\n").length).toBe(3 + 30 * 8);
    // A run killed mid-write: the file ends inside step 17's rows, in the middle of a line.
    const torn = join(dir, "torn.csv");
    const cut = text.indexOf("\n17,3,") + 9;
    writeFileSync(torn, text.slice(0, cut));
    expect((await calorbit(...args(torn, 30))).status).toBe(0);
    expect(readFileSync(torn, "utf8")).toBe(text);
    // A shorter run extended later gives the same chain too.
    const grown = join(dir, "grown.csv");
    expect((await calorbit(...args(grown, 12))).status).toBe(0);
    expect((await calorbit(...args(grown, 30))).status).toBe(0);
    expect(readFileSync(grown, "utf8")).toBe(text);
    const other = [...args(whole, 30)];
    other[other.indexOf("--seed") + 1] = "4";
    const refused = await calorbit(...other);
    expect(refused.status).toBe(2);
    expect(refused.stderr).toMatch(/^calorbit: --chain: given .*; allowed: the chain of this same fit/);
    expect(readFileSync(whole, "utf8")).toBe(text);
  });
});
