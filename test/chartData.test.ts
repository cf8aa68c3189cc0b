import { XMLParser, XMLValidator } from "fast-xml-parser";
import { describe, expect, it } from "vitest";
import { DAY_S } from "../src/constants.js";
import { temperatureSvg, niceTicks } from "../src/report/svg.js";
import { simulate } from "../src/run/simulate.js";
import { chartColumns, chartMarkers } from "../src/view/chartData.js";
import { levels, parseSweepText } from "../src/view/sweepData.js";
import { nominalCase } from "./helpers.js";

const sim = simulate({ ...nominalCase({ e: 0.4, heatCapacity: 5e7, meanAnomalyAtStartRad: 2 }), windowK: [250, 300] }, { samples: 401 });

describe("chart data shaping", () => {
  it("turns the series into uPlot columns with x ascending in days", () => {
    const cols = chartColumns(sim.series, "time");
    expect(cols.x).toHaveLength(401);
    expect(cols.x[0]).toBe(0);
    expect(cols.x[400]! * DAY_S).toBeCloseTo(sim.summary.periodSeconds, 3);
    for (let i = 1; i < cols.x.length; i++) expect(cols.x[i]!).toBeGreaterThan(cols.x[i - 1]!);
    expect(cols.temperatureK).toEqual(Array.from(sim.series.temperatureK));
    expect(cols.distanceAu[0]).toBeCloseTo(sim.series.distanceM[0]! / 149_597_870_700, 12);
  });

  it("unwraps the anomaly axes so they ascend across periastron", () => {
    for (const axis of ["meanAnomaly", "trueAnomaly"] as const) {
      const cols = chartColumns(sim.series, axis);
      for (let i = 1; i < cols.x.length; i++) expect(cols.x[i]!).toBeGreaterThan(cols.x[i - 1]!);
      expect(cols.x[400]! - cols.x[0]!).toBeCloseTo(360, 6);
    }
  });

  it("marks the periastron inside the span, the maximum and the window", () => {
    const cols = chartColumns(sim.series, "time");
    const m = chartMarkers(sim.series, sim.summary, "time", cols);
    // Starting at M = 2 rad, periastron comes (2π − 2)/n after the start.
    expect(m.periastra).toHaveLength(1);
    expect(m.periastra[0]! * DAY_S).toBeCloseTo(((2 * Math.PI - 2) / (2 * Math.PI)) * sim.summary.periodSeconds, 0);
    expect(m.maximum!.x * DAY_S).toBeCloseTo(sim.summary.timeOfMaxSeconds, 3);
    expect(m.window).toEqual({ lowK: 250, highK: 300 });
    const angle = chartMarkers(sim.series, sim.summary, "meanAnomaly", chartColumns(sim.series, "meanAnomaly"));
    expect(angle.periastra).toEqual([360]);
  });

  it("has no periastron or lag markers on a circular orbit", () => {
    const circular = simulate(nominalCase({ e: 0 }), { samples: 11 });
    expect(chartMarkers(circular.series, circular.summary, "time", chartColumns(circular.series, "time")).periastra).toEqual([]);
  });

  it("chooses round tick values", () => {
    expect(niceTicks(0, 10)).toEqual([0, 2, 4, 6, 8, 10]);
    expect(niceTicks(241.3, 287.9)).toEqual([250, 260, 270, 280]);
  });
});

describe("SVG export", () => {
  it("parses as XML and holds both series, axes with units and a legend", () => {
    const svg = temperatureSvg("test world", sim.series, sim.summary);
    expect(XMLValidator.validate(svg)).toBe(true);
    const doc = new XMLParser({ ignoreAttributes: false }).parse(svg);
    const paths = ([] as Array<Record<string, string>>).concat(doc.svg.path);
    const ids = paths.map((p) => p["@_id"]);
    expect(ids).toEqual(expect.arrayContaining(["temperature", "equilibrium"]));
    for (const p of paths) expect((p["@_d"]!.match(/L/g) ?? []).length).toBe(400);
    expect(svg).toContain("temperature (K)");
    expect(svg).toContain("time since start (d)");
    expect(svg).toContain("T_eq, instantaneous equilibrium");
  });
});

describe("sweep files for the viewer", () => {
  it("reads inputs, metrics and status from CSV and from JSON Lines alike", () => {
    const csv = [
      "# calorbit 0.1.0 sweep",
      "# definition: {}",
      "# shard: 1/1",
      "case_id,orbit.eccentricity,body.albedo,status,T_min_K,T_max_K,integrator",
      "0,0,0.1,ok,250,260,odex",
      '1,0.5,0.1,"error: orbit.eccentricity: given 1.5; allowed: a number with 0 ≤ e < 1",,,',
    ].join("\n");
    const t = parseSweepText(csv);
    expect(t.inputs).toEqual(["orbit.eccentricity", "body.albedo"]);
    expect(t.metrics).toEqual(["T_min_K", "T_max_K"]);
    expect(t.ok).toEqual([true, false]);
    expect(t.columns["T_max_K"]![0]).toBe(260);
    expect(Number.isNaN(t.columns["T_max_K"]![1])).toBe(true);
    const jsonl = ['{"case_id":0,"orbit.eccentricity":0,"body.albedo":0.1,"status":"ok","T_min_K":250,"T_max_K":260,"integrator":"odex"}'].join("\n");
    expect(parseSweepText(jsonl).metrics).toEqual(["T_min_K", "T_max_K"]);
    expect(levels([0.3, 0.1, 0.3, Number.NaN, 0.2])).toEqual([0.1, 0.2, 0.3]);
  });
});
