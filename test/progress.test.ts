/**
 * The engine's progress hook: on every kind of long solve (slab shooting, a seasonal spin-up, a
 * conduction column, a map's cells, the zonal climate's orbits) the share it reports only rises, stays
 * below 1 until the end, ends at exactly 1 once, and the hook changes nothing in the answer.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M } from "../src/constants.js";
import { CalorbitError } from "../src/errors.js";
import type { ThermalCase } from "../src/model/thermalCase.js";
import { DEFAULT_GRID } from "../src/physics/column.js";
import { stellarFlux } from "../src/physics/flux.js";
import { meanMotion } from "../src/physics/orbit.js";
import { observeMap } from "../src/run/observeMap.js";
import { compareRegimes } from "../src/run/compare.js";
import { estimatedShare, ProgressMeter, type ProgressStage } from "../src/run/progress.js";
import { simulate } from "../src/run/simulate.js";
import { simulateZonal, type ZonalCase } from "../src/run/zonal.js";
import { resolveScenario } from "../src/scenario/resolve.js";
import { parseScenarioText } from "../src/scenario/text.js";
import { nominalCase } from "./helpers.js";

type Report = [number, ProgressStage];

/** The bundled map demo (an invented eccentric giant), as a document. */
function mapDemo(): Record<string, unknown> {
  const path = join(import.meta.dirname, "..", "scenarios", "oruvane-eccentric.yaml");
  return parseScenarioText(readFileSync(path, "utf8"), "yaml", path) as Record<string, unknown>;
}

function recorder(): { reports: Report[]; hook: (fraction: number, stage: ProgressStage) => void } {
  const reports: Report[] = [];
  return { reports, hook: (fraction, stage) => void reports.push([fraction, stage]) };
}

/**
 * Rising, inside (0, 1), then exactly one 1 at the end; every stage the one expected, and for a run
 * of `simulate` the summary last: its start at 3/4 (the solve's share) and the end.
 */
function expectRisingToOne(reports: Report[], stage: ProgressStage, leastReports: number, summarised = true): void {
  expect(reports.length).toBeGreaterThanOrEqual(leastReports);
  for (let i = 1; i < reports.length; i++) expect(reports[i]![0]).toBeGreaterThan(reports[i - 1]![0]);
  expect(reports[0]![0]).toBeGreaterThan(0);
  expect(reports.at(-1)![0]).toBe(1);
  expect(reports.filter(([f]) => f >= 1)).toHaveLength(1);
  const solve = summarised ? reports.slice(0, -2) : reports;
  expect(new Set(solve.map(([, s]) => s))).toEqual(new Set([stage]));
  if (summarised) expect(reports.slice(-2)).toEqual([[0.75, "summary"], [1, "summary"]]);
}

describe("progress of a single run", () => {
  it("slab shooting: one report per cycle integrated, rising to 1; the answer is the same with and without the hook", () => {
    const e = 0.3;
    const thermal = nominalCase({ e, heatCapacity: 1e8 });
    const { reports, hook } = recorder();
    const hooked = simulate(thermal, { samples: 50, onProgress: hook });
    const plain = simulate(thermal, { samples: 50 });
    expectRisingToOne(reports, "periodic", 2);
    // One report per shooting pass (each integrates the cycle once), then the summary and the end.
    expect(reports.length).toBe(hooked.solver.iterations + 2);
    expect(hooked.summary).toEqual(plain.summary);
    expect(Array.from(hooked.series.temperatureK)).toEqual(Array.from(plain.series.temperatureK));
    // Time mean of the flux over an orbit S(a)/√(1 − e²), a quarter of it on a sphere (common practice).
    expect(hooked.summary.meanAbsorbedWPerM2! / (stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M) / (4 * Math.sqrt(1 - e * e)))).toBeCloseTo(1, 6);
  });

  it("seasonal run: one report per spin-up orbit, then 1 after the beat", () => {
    // C = 1e7 J m⁻² K⁻¹: a radiative time of weeks, so the start is forgotten over several orbits.
    const base = nominalCase({ e: 0.3, heatCapacity: 1e7 });
    // 3.3001 rotations per orbit: no p:q cycle with q ≤ 16, so the run is seasonal (as in seasonal.test.ts).
    const point: ThermalCase = {
      ...base,
      regime: "point",
      location: { latitudeRad: 0, longitudeRad: 0 },
      spin: { rateRadPerSecond: 3.3001 * meanMotion(base.orbit), obliquityRad: 0, equinoxTrueAnomalyRad: 0 },
    };
    const { reports, hook } = recorder();
    const sim = simulate(point, { samples: 50, onProgress: hook });
    expect(sim.solver.mode).toBe("seasonal");
    expectRisingToOne(reports, "seasonal", 3);
    const spinUpOrbits = sim.solver.orbitsIntegrated - sim.summary.seasonal!.orbits;
    expect(reports.length).toBe(spinUpOrbits + 2);
    // After the spin-up the share is the spin-up's part of all orbits integrated, of the solve's 3/4.
    expect(reports.at(-3)![0]).toBeCloseTo((0.75 * spinUpOrbits) / sim.solver.orbitsIntegrated, 12);
  });

  it("transient: nothing on the way (one integration), then the summary and 1 at the end", () => {
    const { reports, hook } = recorder();
    simulate(nominalCase({ e: 0.2, heatCapacity: 1e7 }), { samples: 20, transient: { startK: 200, orbits: 3 }, onProgress: hook });
    expect(reports).toEqual([
      [0.75, "summary"],
      [1, "summary"],
    ]);
  });

  it("conduction column: one report per column cycle, rising to 1", () => {
    const base = nominalCase({ e: 0.3, heatCapacity: 1e6 });
    const { reports, hook } = recorder();
    const sim = simulate(
      {
        ...base,
        column: {
          properties: { densitySurface: 1500, densityDeep: 1500, conductivitySurface: 0.5, conductivityDeep: 0.5, eFoldingDepthM: Infinity, specificHeatPolynomial: [800], radiativeChi: 0 },
          grid: { ...DEFAULT_GRID, stepsPerShortestPeriod: 200 },
          outputDepthsM: [],
          interiorFluxWPerM2: 0,
        },
      },
      { samples: 20, onProgress: hook },
    );
    expectRisingToOne(reports, "column", 3);
    expect(reports.length).toBe(sim.solver.iterations + 2);
  });

  it("map: one report per cell solved (the mirrored half skipped), rising to 1", () => {
    const doc = mapDemo();
    doc.map = { longitudes: 6, latitudes: 4 };
    const { reports, hook } = recorder();
    observeMap(resolveScenario(doc).thermal, { samples: 10, onProgress: hook });
    expectRisingToOne(reports, "map", 6, false);
    // Cell k reports k/24 before it is solved (k = 1 … 23; cell 0 reports 0, which is not a rise), then 1.
    expect(reports.length).toBe(24);
    expect(reports[0]![0]).toBeCloseTo(1 / 24, 12);
  });

  it("zonal climate from both starts: reports per orbit, the second start after the first, rising to 1", () => {
    const zonal: ZonalCase = {
      luminosityW: SOLAR_LUMINOSITY_W,
      orbit: { semiMajorAxisM: ASTRONOMICAL_UNIT_M, eccentricity: 0.1, periodSeconds: 3.15576e7, meanAnomalyAtStartRad: 0 },
      obliquityRad: (23.5 * Math.PI) / 180,
      equinoxTrueAnomalyRad: 0,
      internalFluxWPerM2: 0,
      climate: {
        bands: 12,
        diffusionWPerM2K: 0.649,
        outgoing: { law: "blackbody", emissivity: 1 },
        albedo: { law: "constant", value: 0.3 },
        heatCapacity: { kind: "slab", heatCapacityJPerM2K: 1e8 },
        start: "both",
        stepsPerOrbit: 48,
      },
    };
    const { reports, hook } = recorder();
    const sim = simulateZonal(zonal, { onProgress: hook });
    const plain = simulateZonal(zonal);
    expectRisingToOne(reports, "zonal", 10, false);
    // The warm start fills the first half, the cold start the second.
    expect(reports.some(([f]) => f > 0.5 && f < 1)).toBe(true);
    expect(sim.climates.map((c) => c.summary)).toEqual(plain.climates.map((c) => c.summary));
  });

  it("compare: each regime's run is its share of the whole, one after another, rising to 1", () => {
    const thermal = nominalCase({ e: 0.3, heatCapacity: 1e7 });
    const { reports, hook } = recorder();
    const comparison = compareRegimes(thermal, ["global", "daynight"], { samples: 40, onProgress: hook });
    expect(comparison.rows.map((row) => row.error)).toEqual([undefined, undefined]);
    for (let i = 1; i < reports.length; i++) expect(reports[i]![0]).toBeGreaterThan(reports[i - 1]![0]);
    expect(reports.at(-1)).toEqual([1, "summary"]);
    // The first regime's passes, summary and end fall in the first half (its end at exactly 1/2), the second's in the second.
    const first = comparison.rows[0]!.simulation!.solver.iterations + 2;
    expect(reports.slice(0, first).every(([f]) => f <= 0.5)).toBe(true);
    expect(reports[first - 1]![0]).toBe(0.5);
    expect(reports.slice(first, -1).every(([f]) => f > 0.5 && f < 1)).toBe(true);
  });

  it("refuses a hook that is not a function as a wrong argument (one line naming onProgress), never a TypeError mid-run", () => {
    for (const run of [
      () => simulate(nominalCase({}), { onProgress: 5 as never }),
      () => observeMap(resolveScenario({ ...mapDemo(), map: { longitudes: 4, latitudes: 2 } }).thermal, { onProgress: "yes" as never }),
    ]) {
      let caught: unknown;
      try {
        run();
      } catch (error) {
        caught = error;
      }
      expect(caught).toBeInstanceOf(CalorbitError);
      expect((caught as CalorbitError).code).toBe("INVALID_ARGUMENT");
      expect((caught as CalorbitError).problems.map((p) => p.path)).toEqual(["onProgress"]);
    }
  });

  it("the meter: phases and their parts map onto the whole, nothing falls, and without a hook nothing is called", () => {
    const { reports, hook } = recorder();
    const meter = new ProgressMeter(hook);
    meter.phase(0, 0.5);
    meter.part(0.5, 0.5);
    meter.report(0.5, "column"); // 0.5 × (0.5 + 0.5 × 0.5)
    meter.phase(0, 1);
    meter.part(0, 0.5);
    meter.report(0.5, "column");
    meter.report(0.4, "column"); // a fall: not reported
    meter.part(0.5, 0.5);
    meter.report(1, "column"); // the whole run's end is `finish`, not a part's end
    meter.finish("column");
    meter.finish("column");
    expect(reports).toEqual([
      [0.375, "column"],
      [0.999, "column"],
      [1, "column"],
    ]);
    const silent = new ProgressMeter(undefined);
    silent.report(0.5, "map");
    silent.finish("map");
    expect(silent.active).toBe(false);
    // The estimate for an unknown count: linear to 0.9 at the typical count, then creeping, never 1.
    const shares = [1, 2, 3, 4, 10, 1000].map((k) => estimatedShare(k, 3));
    expect(shares.slice(0, 3)).toEqual([0.3, 0.6, 0.9]);
    for (let i = 1; i < shares.length; i++) expect(shares[i]!).toBeGreaterThan(shares[i - 1]!);
    expect(shares.at(-1)!).toBeLessThan(1);
  });
});
