/** The map regime's scenario keys and reports: the demo end to end on a small grid, and its bad input. */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { XMLParser } from "fast-xml-parser";
import { describe, expect, it } from "vitest";
import { CalorbitError } from "../src/errors.js";
import { MAP_CSV_COLUMNS, mapDocument, mapSeriesCsv, mapSnapshotCsv, mapSvg, mapText } from "../src/report/mapReport.js";
import { observeMap } from "../src/run/observeMap.js";
import { parsePassbandTable } from "../src/scenario/passbandFile.js";
import { resolveScenario } from "../src/scenario/resolve.js";
import { parseScenarioText } from "../src/scenario/text.js";

const demoPath = join(import.meta.dirname, "..", "scenarios", "oruvane-eccentric.yaml");
const demo = () => parseScenarioText(readFileSync(demoPath, "utf8"), "yaml", demoPath) as Record<string, any>;

function problemsOf(doc: unknown): string[] {
  try {
    const { thermal } = resolveScenario(doc);
    observeMap(thermal, { samples: 10 });
  } catch (err) {
    if (err instanceof CalorbitError) return err.problems.map((p) => p.path);
    throw err;
  }
  return [];
}

describe("map regime: the demo and its reports", () => {
  const doc = demo();
  doc.map = { longitudes: 12, latitudes: 6 };
  const resolved = resolveScenario(doc);
  const observed = observeMap(resolved.thermal, { samples: 200 });

  it("reports the phase curve's contract fields in JSON, and a self-consistent summary", () => {
    const json = JSON.parse(JSON.stringify(mapDocument(resolved, observed, true)));
    const phase = json.summary.phaseCurve;
    for (const key of ["maxFluxRatio", "minFluxRatio", "timeOfMaxSeconds", "timeOfMaxAfterPeriastronSeconds"]) expect(typeof phase[key]).toBe("number");
    expect(phase.maxFluxRatio).toBeGreaterThan(phase.minFluxRatio);
    expect(phase.timeOfMaxAfterPeriastronSeconds).toBeLessThan(json.summary.periodSeconds);
    expect(json.summary.temperature.maxK).toBeGreaterThan(json.summary.temperature.meanK);
    expect(Math.abs(json.summary.energyBalanceResidual)).toBeLessThan(1e-6);
    expect(json.summary.transit.occurs).toBe(true);
    expect(json.summary.occultation.occurs).toBe(true);
    expect(json.series.fluxRatio).toHaveLength(200);
  });

  it("writes the phase-curve CSV with unit-suffixed columns, a map snapshot, and an SVG that parses as XML", () => {
    const csv = mapSeriesCsv(resolved, observed).split("\n");
    expect(csv[0]).toMatch(/^# calorbit /);
    expect(csv[3]).toBe(MAP_CSV_COLUMNS.join(","));
    expect(csv.filter((l) => /^\d/.test(l))).toHaveLength(200);
    const snapshot = mapSnapshotCsv(resolved, observed, 10).split("\n").filter((l) => /^-?\d/.test(l));
    expect(snapshot).toHaveLength(72);
    const svg = mapSvg(resolved, observed, 10);
    expect(() => new XMLParser().parse(svg)).not.toThrow();
    expect(svg).toContain('class="flux"');
    expect(mapText(resolved, observed)).toMatch(/flux ratio \(planet\/star\)\s+max [\d.]+ ppm/);
  });

  it("names each missing piece an observer needs, one problem per field", () => {
    const bad = demo();
    delete bad.body.radius;
    delete bad.star.radius;
    delete bad.star.temperature;
    bad.star.luminosity = "3 Lsun";
    expect(problemsOf(bad)).toEqual(["body.radius", "star.radius", "star.temperature"]);
  });

  it("refuses a map grid outside its range and an unknown passband form", () => {
    const bad = demo();
    bad.map = { longitudes: 3, latitudes: 2.5 };
    bad.observer.passband = { from: "5 um" };
    expect(problemsOf(bad).sort()).toEqual(["map.latitudes", "map.longitudes", "observer.passband"].sort());
    const reversed = demo();
    reversed.observer.passband = { from: "5 um", to: "4 um" };
    expect(problemsOf(reversed)).toEqual(["observer.passband"]);
    const uneven = demo();
    uneven.observer.passband = { wavelengths: ["4 um", "5 um"], response: [1] };
    expect(problemsOf(uneven)).toEqual(["observer.passband"]);
  });
});

describe("passband response files", () => {
  it("reads the wavelength unit from the header and refuses rows out of order", () => {
    const table = parsePassbandTable("# a test band\nwavelength_um,response\n4.0,0\n4.5,1\n5.0,0\n", "band.csv");
    [4e-6, 4.5e-6, 5e-6].forEach((l, i) => expect(table.wavelengthM[i]).toBeCloseTo(l, 18));
    expect(() => parsePassbandTable("wavelength_um,response\n5,1\n4,1\n", "band.csv")).toThrow(/not a passband table/);
    expect(() => parsePassbandTable("lambda,response\n5,1\n6,1\n", "band.csv")).toThrow(CalorbitError);
  });
});

describe("map sweeps", () => {
  it("write the phase curve's metrics in every row, equal to a single run of the same case", async () => {
    const { caseCells, columns } = await import("../src/sweep/runCase.js");
    const { caseMaker } = await import("../src/sweep/design.js");
    const { parseAxis } = await import("../src/sweep/spec.js");
    const scenario = demo();
    scenario.map = { longitudes: 8, latitudes: 4 };
    const def = {
      scenario,
      design: { axes: [parseAxis("observer.inclination=60 deg,88 deg")] },
      relativeTolerance: 1e-6,
      format: "csv" as const,
    };
    const names = columns(def as never);
    const make = caseMaker(def.design as never);
    const rows = [0, 1].map((id) => caseCells(def as never, make(id)));
    const at = (row: (string | number | null)[], name: string) => row[names.indexOf(name)];
    for (const row of rows) expect(at(row, "status")).toBe("ok");
    const single = demo();
    single.map = { longitudes: 8, latitudes: 4 };
    single.observer.inclination = "88 deg";
    const observed = observeMap(resolveScenario(single).thermal, { samples: 400 });
    expect(at(rows[1]!, "flux_ratio_max")).toBeCloseTo(observed.phase!.maxFluxRatio, 12);
    expect(at(rows[1]!, "transit_depth")).toBeCloseTo(observed.transit!.depth, 12);
    expect(Number(at(rows[0]!, "flux_ratio_max"))).toBeLessThan(Number(at(rows[1]!, "flux_ratio_max")));
    expect(at(rows[0]!, "transit_depth")).toBe(0); // at 60° the planet passes far from the star's disc
  });

  it("take a --tolerance finer than the map's default as given (it was raised to 1e-6 without a word)", async () => {
    const { caseCells, columns } = await import("../src/sweep/runCase.js");
    const { parseAxis } = await import("../src/sweep/spec.js");
    const scenario = demo();
    scenario.map = { longitudes: 8, latitudes: 4 };
    const def = { scenario, design: { axes: [parseAxis("observer.inclination=88 deg")] }, relativeTolerance: 1e-8, toleranceGiven: true as const, format: "csv" as const };
    const row = caseCells(def as never, { id: 0, values: ["88 deg"] } as never);
    const names = columns(def as never);
    const single = demo();
    single.map = { longitudes: 8, latitudes: 4 };
    single.observer.inclination = "88 deg";
    const tight = observeMap(resolveScenario(single).thermal, { relativeTolerance: 1e-8, samples: 400 });
    expect(row[names.indexOf("status")]).toBe("ok");
    expect(row[names.indexOf("flux_ratio_max")]).toBe(tight.phase!.maxFluxRatio);
  });
});
