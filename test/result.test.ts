/**
 * One result for every heat store: a slab run and a conduction-column run of the same case give
 * the same summary, series, solver report, JSON document, CSV columns, text rows and SVG chart,
 * the column adding only its extras (depth profile, skin depths, deep mean, layer map).
 */
import { describe, expect, it } from "vitest";
import { DEFAULT_GRID } from "../src/physics/column.js";
import { seriesCsv } from "../src/report/csv.js";
import { resultDocument } from "../src/report/document.js";
import { temperatureSvg } from "../src/report/svg.js";
import { summaryText } from "../src/report/text.js";
import { simulate } from "../src/run/simulate.js";
import type { ResolvedScenario } from "../src/scenario/resolve.js";
import { homogeneous, nominalCase } from "./helpers.js";

/** Every key path of a plain object (arrays of records: the keys of their first element). */
function keyPaths(value: unknown, prefix = ""): string[] {
  if (value === null || typeof value !== "object" || ArrayBuffer.isView(value)) return [];
  if (Array.isArray(value)) return value.length > 0 && typeof value[0] === "object" ? keyPaths(value[0], `${prefix.replace(/\.$/, "")}[].`) : [];
  return Object.entries(value).flatMap(([k, v]) => [`${prefix}${k}`, ...keyPaths(v, `${prefix}${k}.`)]);
}

const slabCase = nominalCase({ e: 0.3, heatCapacity: 1e7, windowK: [250, 300] });
const columnCase = {
  ...slabCase,
  column: {
    properties: homogeneous(0.5, 1500, 800),
    grid: { ...DEFAULT_GRID, growth: 1.3, stepsPerShortestPeriod: 160 },
    outputDepthsM: [0.5],
    interiorFluxWPerM2: 0,
  },
};
const slab = simulate(slabCase, { samples: 50 });
const column = simulate(columnCase, { samples: 50 });
const resolvedSlab: ResolvedScenario = { thermal: slabCase, heatCapacityOrigin: { kind: "direct" }, periodOrigin: "given" };
const resolvedColumn: ResolvedScenario = { thermal: columnCase, heatCapacityOrigin: { kind: "column" }, periodOrigin: "given" };

const COLUMN_EXTRAS = ["thermalInertiaSurface", "skinDepths", "skinDepths.diurnalM", "skinDepths.orbitalM", "depthProfile", "depthProfile[].depthM", "depthProfile[].minK", "depthProfile[].maxK", "depthProfile[].meanK", "deepMeanK", "notes", "notes.tauOverPeriod"];

describe("one result for a slab and a conduction column", () => {
  it("has the same summary fields, the column adding only its extras, and τ/P null with a reason", () => {
    expect(keyPaths(column.summary).sort()).toEqual([...keyPaths(slab.summary), ...COLUMN_EXTRAS].sort());
    expect(column.summary.tauOverPeriod).toBeNull();
    expect(column.summary.notes?.tauOverPeriod).toMatch(/skin/);
    expect(slab.summary.notes).toBeUndefined();
  });

  it("has the same series and solver report, plus the column's depth series and layer count", () => {
    expect(Object.keys(column.series).sort()).toEqual([...Object.keys(slab.series), "depths"].sort());
    expect(Object.keys(column.solver).sort()).toEqual([...Object.keys(slab.solver), "layers", "stepsPerCycle"].sort());
    expect(column.series.depths![0]!.temperatureK).toHaveLength(50);
  });

  it("writes the same JSON fields, CSV columns, text rows and chart", () => {
    const docSlab = resultDocument(resolvedSlab, slab, true);
    const docColumn = resultDocument(resolvedColumn, column, true);
    const jsonSlab = keyPaths(JSON.parse(JSON.stringify(docSlab)));
    const jsonColumn = keyPaths(JSON.parse(JSON.stringify(docColumn)));
    for (const key of jsonSlab) expect(jsonColumn).toContain(key);
    // The orbit columns a column run used to lack.
    for (const key of ["summary.timeOfMinSeconds", "summary.tauOverPeriod", "series.distanceM", "series.meanAnomalyRad", "series.trueAnomalyRad"]) expect(jsonColumn).toContain(key);
    const header = (csv: string) => csv.split("\n").find((l) => !l.startsWith("#"))!.split(",");
    expect(header(seriesCsv(resolvedColumn, column))).toEqual([...header(seriesCsv(resolvedSlab, slab)), "temperature_at_0.5m_K"]);
    const labels = (text: string) => new Set(text.split("\n").filter((l) => /^ {2}\S/.test(l)).map((l) => l.trim().split(/\s{2,}|\s+\d/)[0]));
    const slabLabels = labels(summaryText(resolvedSlab, slab));
    const columnLabels = labels(summaryText(resolvedColumn, column));
    for (const label of slabLabels) {
      if (label === "radiative time τ = C/(4εσT³)" || label === "temperature" || label === "body") continue; // a column shows skin depths, "surface" and its column instead
      expect(columnLabels).toContain(label);
    }
    const svgShape = (svg: string) => (svg.match(/<(path|polyline|line|text)\b/g) ?? []).length > 0;
    expect(svgShape(temperatureSvg("slab", slab.series, slab.summary))).toBe(true);
    expect(svgShape(temperatureSvg("column", column.series, column.summary))).toBe(true);
  });

  it("gives both the same equilibrium: at periastron T_eq = 278.33 K / √(1 − e) for f = 1/4 at 1 au", () => {
    // 278.33 K: the f = 1/4 blackbody equilibrium at 1 au (../shared/REFERENCES.md); T ∝ r^(−1/2).
    const expected = 278.33 / Math.sqrt(1 - 0.3);
    expect(Math.abs(slab.summary.equilibrium.maxK / expected - 1)).toBeLessThan(2e-5);
    expect(Math.abs(column.summary.equilibrium.maxK / slab.summary.equilibrium.maxK - 1)).toBeLessThan(1e-9);
  });
});
