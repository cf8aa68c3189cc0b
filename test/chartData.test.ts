import { XMLParser, XMLValidator } from "fast-xml-parser";
import { describe, expect, it } from "vitest";
import { DAY_S } from "../src/constants.js";
import { temperatureSvg, niceTicks } from "../src/report/svg.js";
import { simulate } from "../src/run/simulate.js";
import { ASTRONOMICAL_UNIT_M } from "../src/constants.js";
import { lagWords, windowWords } from "../src/report/wording.js";
import { chartColumns, chartMarkers, periodicResample } from "../src/view/chartData.js";
import { crc32, pngTextChunks, pngWithText, viewerCsv } from "../src/view/exportData.js";
import { cellAt, edgesFromCentres, layerEdges } from "../src/view/heatMapLayout.js";
import { CHART_COLOURS, overlayColours } from "../src/view/palette.js";
import { caseFor, PARAMETER, positionOf, sliderValue, valueAt, valuesOf } from "../src/view/parameters.js";
import { levels, parseSweepText } from "../src/view/sweepData.js";
import { decodeViewState, encodeViewState } from "../src/view/viewState.js";
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
      "case_id,orbit.eccentricity,body.albedo,status,temperature_min_K,temperature_max_K,integrator",
      "0,0,0.1,ok,250,260,odex",
      '1,0.5,0.1,"error: orbit.eccentricity: given 1.5; allowed: a number with 0 ≤ e < 1",,,',
    ].join("\n");
    const t = parseSweepText(csv);
    expect(t.inputs).toEqual(["orbit.eccentricity", "body.albedo"]);
    expect(t.metrics).toEqual(["temperature_min_K", "temperature_max_K"]);
    expect(t.ok).toEqual([true, false]);
    expect(t.columns["temperature_max_K"]![0]).toBe(260);
    expect(Number.isNaN(t.columns["temperature_max_K"]![1])).toBe(true);
    const jsonl = ['{"case_id":0,"orbit.eccentricity":0,"body.albedo":0.1,"status":"ok","temperature_min_K":250,"temperature_max_K":260,"integrator":"odex"}'].join("\n");
    expect(parseSweepText(jsonl).metrics).toEqual(["temperature_min_K", "temperature_max_K"]);
    expect(levels([0.3, 0.1, 0.3, Number.NaN, 0.2])).toEqual([0.1, 0.2, 0.3]);
  });
});

// The demo's own values (scenarios/calyndra-ocean.yaml): a = 0.79 au, 30 m of seawater, ρ c h = 1025 × 3990 × 30.
const demo = { ...nominalCase({ e: 0.32, aAu: 0.79, albedo: 0.31, emissivity: 0.96, heatCapacity: 1025 * 3990 * 30 }), windowK: [273.15, 373.15] as const };

describe("the viewer's parameters", () => {
  it("computes the scenario's exact case until a value is changed", () => {
    const v = valuesOf(demo);
    expect(v.a).toBe(0.79);
    expect(v.C).toBe(122_692_500);
    const same = caseFor(demo, v);
    expect(same.orbit).toEqual(demo.orbit);
    expect(same.surface).toEqual(demo.surface);
    // The old page kept log10 C and log10 a on the slider's grid: the first touch made 1.259e8 and 0.794 au.
    expect(10 ** (Math.round(Math.log10(122_692_500) / 0.05) * 0.05)).not.toBe(122_692_500);
  });

  it("gives a slider's exact starting value back when the slider returns to where it started", () => {
    for (const key of ["C", "a", "e"] as const) {
      const spec = PARAMETER[key];
      const exact = valuesOf(demo)[key];
      // Where a browser puts the slider for the exact value: snapped to the step.
      const start = spec.min + Math.round((positionOf(spec, exact) - spec.min) / spec.step) * spec.step;
      const anchor = { value: exact, position: start };
      const away = sliderValue(spec, start + 3 * spec.step, anchor);
      expect(away).not.toBe(exact);
      expect(sliderValue(spec, start, anchor)).toBe(exact);
    }
    // Away from the anchor a log slider means a rounded value (four significant figures).
    expect(valueAt(PARAMETER.C, 8.1)).toBe(1.259e8);
    expect(valueAt(PARAMETER.e, 0.3210000001)).toBe(0.321);
  });

  it("follows Kepler's third law when a changes (P ∝ a^1.5, common practice), and a resonant spin follows the period", () => {
    const base = { ...demo, spin: { rateRadPerSecond: (3 / 2) * ((2 * Math.PI) / demo.orbit.periodSeconds), ratio: { spin: 3, orbit: 2 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 } };
    const v = { ...valuesOf(base), a: 1.58, regime: "point" as const };
    const moved = caseFor(base, v);
    expect(moved.orbit.semiMajorAxisM).toBe(1.58 * ASTRONOMICAL_UNIT_M);
    expect(moved.orbit.periodSeconds / base.orbit.periodSeconds).toBeCloseTo(2 ** 1.5, 12);
    expect(moved.spin!.rateRadPerSecond * moved.orbit.periodSeconds).toBeCloseTo(3 * Math.PI, 9);
    expect(valuesOf(base).spin).toBe("3:2");
  });

  it("keeps the view in the URL with the exact numbers, and reads the old log-scale links", () => {
    const initial = { values: valuesOf(demo), x: "time" as const, overlay: false };
    const state = { values: { ...initial.values, e: 0.4567, C: 98_765_432.1, regime: "daynight" as const, recirculation: 0.35 }, x: "trueAnomaly" as const, overlay: true };
    expect(decodeViewState(encodeViewState(state), initial)).toEqual(state);
    const old = decodeViewState("e=0.600&albedo=0.310&emissivity=0.960&logC=8.089&logA=-0.1024&regime=global&x=time&overlay=0", initial);
    expect(old.values.e).toBe(0.6);
    expect(old.values.C).toBeCloseTo(10 ** 8.089, 0);
    // Unreadable or disallowed values keep the initial ones.
    expect(decodeViewState("e=1.5&regime=nonsense&x=sideways", initial)).toEqual(initial);
  });
});

describe("honest summary words", () => {
  it("says why there is no lag: a circular orbit, or no swing on an eccentric one", () => {
    const flat = { lagSeconds: null, periodSeconds: 1e7, temperature: { swingK: 0, maxK: 300 } };
    expect(lagWords(flat, 0)).toBe("none (circular orbit)");
    expect(lagWords(flat, 0.1)).toBe("none (no swing)");
  });

  it("writes a lag in a readable unit with a fraction of the orbit that never reads as zero", () => {
    expect(lagWords({ lagSeconds: 46.6 * 86400, periodSeconds: 284.97 * 86400, temperature: { swingK: 13, maxK: 287 } }, 0.32)).toBe("46.6 d (0.164 of the orbit)");
    // 2.3 h of a 285-day orbit: 3.4e-4 of it (the old text printed "0.000 of the orbit").
    expect(lagWords({ lagSeconds: 2.3 * 3600, periodSeconds: 284.97 * 86400, temperature: { swingK: 13, maxK: 287 } }, 0.32)).toBe("2.3 h (0.034 % of the orbit)");
  });

  it("gives time in a window as a share of the cycle when the cycle spans two orbits (a 3:2 spin's solar day is two orbits, common practice)", () => {
    const point = simulate(
      { ...nominalCase({ e: 0.2, heatCapacity: 1e6, regime: "point", windowK: [250, 350] }), spin: { rateRadPerSecond: 1.5 * ((2 * Math.PI) / 3.15576e7), ratio: { spin: 3, orbit: 2 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 } },
      { samples: 101 },
    );
    expect(point.summary.cycleSeconds / point.summary.periodSeconds).toBeCloseTo(2, 9);
    const words = windowWords(point.summary)!;
    expect(words).toMatch(/ % of the cycle \(2 orbits\) \(/);
    expect(words.startsWith((100 * point.summary.timeInRange!.fraction).toFixed(2))).toBe(true);
    expect(windowWords(sim.summary)).toMatch(/ % of the orbit \(/);
  });
});

describe("overlays and exports", () => {
  it("gives every overlaid regime a colour no other curve uses", () => {
    const regimes = ["global", "dayside", "substellar", "daynight", "band", "point"];
    for (const main of regimes) {
      const reserved = [CHART_COLOURS.temperature, CHART_COLOURS.equilibrium, ...(main === "daynight" ? [CHART_COLOURS.night] : [])];
      const colours = overlayColours(regimes.filter((r) => r !== main), reserved);
      const all = [...reserved, ...colours].map((c) => c.toUpperCase());
      expect(new Set(all).size).toBe(all.length);
    }
  });

  it("puts another run's cycle on the chart's time axis, repeating a shorter cycle", () => {
    const other = Float64Array.from({ length: 101 }, (_, i) => i / 100);
    const values = other.map((t) => Math.sin(2 * Math.PI * t));
    expect(Array.from(periodicResample(other, other, values))).toEqual(Array.from(values));
    const longer = Float64Array.from({ length: 201 }, (_, i) => (2 * i) / 200 + 0.005);
    const out = periodicResample(longer, other, values);
    for (let i = 0; i < longer.length; i++) expect(out[i]!).toBeCloseTo(Math.sin(2 * Math.PI * longer[i]!), 3);
  });

  it("writes the version, the parameters and the case into the CSV's # lines", () => {
    const values = valuesOf(demo);
    const csv = viewerCsv({ version: "9.9.9", name: "Calyndra b", values, thermal: demo, link: "e=0.32" }, [
      { name: "time_d", values: [0, 1] },
      { name: "temperature_K", values: [280, 281] },
    ]);
    const lines = csv.trim().split("\n");
    const comments = lines.filter((l) => l.startsWith("#"));
    expect(comments[0]).toBe("# calorbit 9.9.9 viewer export — Calyndra b");
    expect(comments.join("\n")).toContain("eccentricity = 0.32, Bond albedo = 0.31, emissivity = 0.96, heat capacity = 122692500 J m⁻² K⁻¹, semi-major axis = 0.79 au");
    expect(JSON.parse(comments.find((l) => l.startsWith("# case (SI units): "))!.slice(19)).orbit.semiMajorAxisM).toBe(demo.orbit.semiMajorAxisM);
    expect(lines.filter((l) => !l.startsWith("#"))).toEqual(["time_d,temperature_K", "0.000000000,280.0000000", "1.000000000,281.0000000"]);
  });

  it("adds text chunks to a PNG with the CRC the PNG specification gives (IEND: AE 42 60 82)", () => {
    expect(crc32(new TextEncoder().encode("IEND"))).toBe(0xae426082);
    // The smallest PNG: signature, IHDR of a 1×1 grey image, IDAT, IEND (chunk CRCs computed here, then checked below).
    const chunk = (type: string, data: number[]) => {
      const body = Uint8Array.from([...type].map((c) => c.charCodeAt(0)).concat(data));
      const crc = crc32(body);
      return [0, 0, 0, data.length, ...body, crc >>> 24, (crc >>> 16) & 255, (crc >>> 8) & 255, crc & 255];
    };
    const png = Uint8Array.from([137, 80, 78, 71, 13, 10, 26, 10, ...chunk("IHDR", [0, 0, 0, 1, 0, 0, 0, 1, 8, 0, 0, 0, 0]), ...chunk("IDAT", [120, 1, 1, 2, 0, 253, 255, 0, 0, 0, 2, 0, 1]), ...chunk("IEND", [])]);
    const tagged = pngWithText(png, { Software: "calorbit 0.1.0", Description: "e = 0.32, ε = 0.96" });
    expect(pngTextChunks(tagged)).toEqual({ Software: "calorbit 0.1.0", Description: "e = 0.32, ε = 0.96" });
    expect(Array.from(tagged.subarray(tagged.length - 12))).toEqual(Array.from(png.subarray(png.length - 12)));
    // Every chunk's stored CRC matches its type and data.
    const view = new DataView(tagged.buffer);
    for (let at = 8; at < tagged.length; ) {
      const length = view.getUint32(at);
      expect(view.getUint32(at + 8 + length)).toBe(crc32(tagged.subarray(at + 4, at + 8 + length)));
      at += 12 + length;
    }
  });
});

describe("heat map geometry", () => {
  it("places a column's layers at their depths in metres (each centre midway between its edges)", () => {
    // Layers 0.01, 0.02, 0.04 m thick from the surface: centres 0.005, 0.02, 0.05.
    const edges = layerEdges([0.005, 0.02, 0.05]);
    expect(edges.map((e) => Number(e.toFixed(12)))).toEqual([0, 0.01, 0.03, 0.07]);
    expect(cellAt(edges, 0.025)).toBe(1);
    expect(cellAt(edges, 0.069)).toBe(2);
    expect(cellAt(edges, 0.08)).toBe(-1);
    expect(edgesFromCentres([1, 2, 3])).toEqual([0.5, 1.5, 2.5, 3.5]);
  });
});
