/**
 * The zonal climate as a scenario and in its reports: the `climate` key resolved with its
 * defaults and sources, the JSON contract (summary.bands[] with latitudeDeg, areaFraction,
 * temperature.{minK,maxK,meanK}; one summary per climate), the CSV of T(latitude, time), the SVG
 * profile (parsed as XML), and bad input named by its field.
 */
import { readFileSync } from "node:fs";
import { XMLValidator } from "fast-xml-parser";
import { describe, expect, it } from "vitest";
import { parse } from "yaml";
import { CalorbitError } from "../src/errors.js";
import { zonalCsv, zonalDocument, zonalProfileSvg, zonalText, ZONAL_CSV_COLUMNS } from "../src/report/zonalReport.js";
import { simulateZonal, zonalCaseOf } from "../src/run/zonal.js";
import { resolveScenario } from "../src/scenario/resolve.js";
import { columns, runCase } from "../src/sweep/runCase.js";
import { parseAxis } from "../src/sweep/spec.js";

const demo = parse(readFileSync(new URL("../scenarios/vaelor-zonal.yaml", import.meta.url), "utf8")) as Record<string, unknown> & { climate: Record<string, unknown> };
/** The demo on a coarser grid (30 bands, 96 steps per orbit) to keep the suite fast. */
const small = { ...demo, climate: { ...demo.climate, bands: 30, stepsPerOrbit: 96 } };
/** The demo with a slab heat capacity in the body instead of the climate's land and ocean. */
const slab = { ...demo, body: { ...(demo.body as object), heatCapacity: "200 MJ/m2/K" } };

describe("the climate key", () => {
  it("resolves the demo with its laws and the documented defaults", () => {
    const { thermal } = resolveScenario({ ...slab, climate: { albedo: { law: "step" } } });
    const c = thermal.climate!;
    expect(c.bands).toBe(90);
    expect(c.diffusionWPerM2K).toBe(0.649); // North, Cahalan & Coakley 1981
    expect(c.outgoing).toEqual({ law: "blackbody", emissivity: 1 });
    expect(c.albedo).toEqual({ law: "step", warm: 0.3, ice: 1 - 0.38, iceK: 263.15, rampK: 1 }); // North 1975: −10 °C
    expect(c.heatCapacity).toEqual({ kind: "slab", heatCapacityJPerM2K: 2e8 });
    expect(c.start).toBe("both");
  });

  it("takes units: diffusion in W/m2/K, the linear law's a and b, the ice temperature in degC", () => {
    const { thermal } = resolveScenario({
      ...slab,
      climate: { diffusion: "0.3 W/m2/K", outgoing: { law: "linear", a: "210 W/m2", b: "2 W/m2/K" }, albedo: { law: "step", iceTemperature: "-5 degC", ramp: "2 K" } },
    });
    expect(thermal.climate!.diffusionWPerM2K).toBe(0.3);
    expect(thermal.climate!.outgoing).toEqual({ law: "linear", aWPerM2: 210, bWPerM2K: 2 });
    expect(thermal.climate!.albedo).toMatchObject({ iceK: 268.15, rampK: 2 });
  });

  it("belongs to regime zonal: alone it is refused, and regime zonal alone takes the defaults", () => {
    const { regime: _regime, ...withoutRegime } = slab as Record<string, unknown>;
    expect(() => resolveScenario(withoutRegime)).toThrow(CalorbitError);
    try {
      resolveScenario(withoutRegime);
    } catch (error) {
      expect((error as CalorbitError).problems.map((p) => p.path)).toEqual(["climate"]);
    }
    const { climate: _climate, ...regimeOnly } = slab as Record<string, unknown>;
    const c = resolveScenario(regimeOnly).thermal.climate!;
    expect(c).toMatchObject({ bands: 90, diffusionWPerM2K: 0.649, start: "both", stepsPerOrbit: 360, albedo: { law: "constant", value: 0.3 } });
  });

  it("names each bad field, with the value given and what is allowed", () => {
    try {
      resolveScenario({ ...slab, climate: { bands: 0, start: "lukewarm", outgoing: { law: "purple" }, heatCapacity: { oceanFraction: 2 } } });
      expect.unreachable();
    } catch (error) {
      const problems = (error as CalorbitError).problems.map((p) => p.path);
      expect(problems).toEqual(expect.arrayContaining(["climate.bands", "climate.start", "climate.outgoing.law", "climate.heatCapacity.oceanFraction"]));
    }
  });
});

const resolved = resolveScenario(small);
const zonal = zonalCaseOf(resolved.thermal);
const sim = simulateZonal(zonal);

describe("reports of a zonal run", () => {
  it("finds two climates in the demo: a partly iced warm one and a snowball", () => {
    expect(sim.startsAgree).toBe(false);
    expect(sim.climates.map((c) => c.start)).toEqual(["warm", "cold"]);
    expect(sim.climates[0]!.summary.snowball).toBe(false);
    expect(sim.climates[1]!.summary.snowball).toBe(true);
  });

  it("writes the JSON contract: summary.bands[] and one summary per climate", () => {
    const doc = JSON.parse(JSON.stringify(zonalDocument(resolved, sim, resolved.thermal.climate!)));
    expect(doc.summary.bands).toHaveLength(30);
    const band = doc.summary.bands[0];
    expect(Object.keys(band).sort()).toEqual(["areaFraction", "latitudeDeg", "temperature"]);
    expect(Object.keys(band.temperature).sort()).toEqual(["maxK", "meanK", "minK"]);
    expect(band.areaFraction).toBeCloseTo(1 / 30, 14);
    for (const key of ["minK", "maxK", "meanK", "swingK"]) expect(typeof doc.summary.temperature[key]).toBe("number");
    for (const key of ["globalMeanK", "equatorPoleContrastK", "habitableFraction", "energyBalanceResidual", "periodSeconds"]) expect(typeof doc.summary[key]).toBe("number");
    expect(Object.keys(doc.summary.iceEdge).sort()).toEqual(["maxDeg", "meanDeg", "minDeg"]);
    expect(doc.summary.climates.map((c: { start: string }) => c.start)).toEqual(["warm", "cold"]);
    expect(doc.summary.climates[1].snowball).toBe(true);
    // A self-consistent result: the band means lie inside each band's min–max, the global mean inside the bands'.
    for (const c of doc.summary.climates) {
      for (const b of c.bands) expect(b.temperature.minK <= b.temperature.meanK && b.temperature.meanK <= b.temperature.maxK).toBe(true);
      expect(Math.abs(c.energyBalanceResidual)).toBeLessThan(1e-8);
    }
  });

  it("follows `thresholds` for the habitable window", () => {
    const narrow = simulateZonal(zonalCaseOf(resolveScenario({ ...small, thresholds: ["280 K", "290 K"], climate: { ...small.climate, start: "warm" } }).thermal));
    const s = narrow.climates[0]!.summary;
    expect(s.habitableWindow).toEqual({ lowK: 280, highK: 290 });
    expect(s.habitableFraction).toBeLessThan(sim.climates[0]!.summary.habitableFraction);
  });

  it("writes T(latitude, time) as CSV: one row per climate, time and band", () => {
    const csv = zonalCsv(resolved, zonal, sim, 12).trimEnd().split("\n");
    const header = csv.findIndex((l) => !l.startsWith("#"));
    expect(csv[header]).toBe(ZONAL_CSV_COLUMNS.join(","));
    expect(csv.length - header - 1).toBe(2 * 12 * 30);
    const first = csv[header + 1]!.split(",");
    expect(first[0]).toBe("warm");
    expect(Number(first[5])).toBeCloseTo(sim.climates[0]!.summary.bands[0]!.latitudeDeg, 5);
  });

  it("draws the annual-mean profile as well-formed SVG with one curve per climate", () => {
    const svg = zonalProfileSvg("Vaelor b", sim);
    expect(XMLValidator.validate(svg)).toBe(true);
    expect(svg).toContain('id="mean-warm"');
    expect(svg).toContain('id="mean-cold"');
  });

  it("prints both climates and a latitude table", () => {
    const text = zonalText(resolved, sim, resolved.thermal.climate!);
    expect(text).toContain("Periodic climate from a warm start");
    expect(text).toContain("Periodic climate from a cold start");
    expect(text).toContain("keep different climates");
    expect(text).toMatch(/latitude\s+mean\s+min\s+max/);
    // The spin axis is described once (it was printed twice after zonal became a row of the regimes table).
    expect(text.match(/^ {2}axis {6}obliquity/gm)).toHaveLength(1);
  });
});

describe("sweeps of the zonal climate", () => {
  it("write the global metrics of each case: global mean, contrast, ice edge, habitable fraction, snowball, climates", () => {
    const def = { scenario: small as Record<string, unknown>, design: { axes: [parseAxis("orbit.eccentricity=0.1,0.3")] }, relativeTolerance: 1e-8, format: "csv" as const };
    const header = columns(def);
    for (const name of ["global_mean_K", "equator_pole_contrast_K", "ice_edge_min_deg", "ice_edge_max_deg", "ice_edge_mean_deg", "ice_fraction", "habitable_fraction", "snowball", "climates"]) {
      expect(header).toContain(name);
    }
    const row = runCase(def, { id: 1, values: [0.3] }).split(",");
    const value = (name: string) => row[header.indexOf(name)]!;
    expect(value("status")).toBe("ok");
    const warm = sim.climates[0]!.summary;
    expect(Number(value("global_mean_K"))).toBe(warm.globalMeanK);
    expect(Number(value("habitable_fraction"))).toBe(warm.habitableFraction);
    expect(Number(value("ice_edge_mean_deg"))).toBe(warm.iceEdge!.meanDeg);
    expect(value("snowball")).toBe("0");
    expect(value("climates")).toBe("2");
  });
});

describe("the zonal view's data", () => {
  it("gives each climate T(latitude, time), its ice edges (the equatormost band below the ice-edge temperature) and its annual-mean profile", async () => {
    const { zonalViewDocument } = await import("../src/report/zonalReport.js");
    const resolved = resolveScenario({ ...small, climate: { ...small.climate, start: "both" } });
    const zonal = zonalCaseOf(resolved.thermal);
    const sim = simulateZonal(zonal);
    const doc = zonalViewDocument(resolved, zonal, sim, resolved.thermal.climate!, 24);
    expect(doc.latitudeDeg).toHaveLength(30);
    expect(doc.views).toHaveLength(sim.climates.length);
    for (const [i, v] of doc.views.entries()) {
      expect(v.temperatureK).toHaveLength(24);
      expect(v.meanProfileK).toEqual(sim.climates[i]!.summary.bands.map((b) => b.temperature.meanK));
      v.northEdgeDeg.forEach((edge, s) => {
        if (edge === null) {
          for (let j = 0; j < 30; j++) if (doc.latitudeDeg[j]! >= 0) expect(v.temperatureK[s]![j]!).toBeGreaterThanOrEqual(doc.iceEdgeK ?? -Infinity);
        } else {
          const j = doc.latitudeDeg.indexOf(edge);
          expect(v.temperatureK[s]![j]!).toBeLessThan(doc.iceEdgeK!);
        }
      });
    }
  });
});
