/**
 * A surface of several cells on conduction columns: each cell its own column (the cells exchange
 * no heat), combined as the slab path combines cells (summary.cells, series.states). Exchanging
 * cells on columns are refused with one clear line. The surfaces come from test-only rows of the
 * regimes table (no regime builds several column cells yet).
 */
import { describe, expect, it, vi } from "vitest";
import { CalorbitError } from "../src/errors.js";
import type { RegimeEntry, Regime } from "../src/model/regimes.js";
import type { ColumnSpec } from "../src/model/heatStore.js";
import { DEFAULT_GRID } from "../src/physics/column.js";
import { lumpedForcing, scaledForcing } from "../src/physics/forcing.js";
import { nominalCase } from "./helpers.js";

/** Shares of the global (f = 1/4) forcing, and the cells' area weights. */
const SHARES = [1, 0.5, 0.1] as const;
const WEIGHTS = [0.5, 0.3, 0.2] as const;

const SHADES: RegimeEntry = {
  words: "test only: three cells under the global forcing times 1, 0.5 and 0.1, no exchange",
  menuLabel: "shades (test)",
  colour: "#56B4E9",
  pipeline: "surface",
  heatStores: ["slab", "column"],
  fields: [],
  surface: (t) => {
    const full = lumpedForcing("global", t.surface.albedo, t.star.luminosityW, t.orbit);
    return {
      cells: SHARES.map((share, i) => ({ name: `shade${i}`, areaWeight: WEIGHTS[i]!, forcing: scaledForcing(full, share) })),
      cycleOrbits: 1,
      commensurate: true,
      forcingHasCorners: false,
    };
  },
  exchange: () => ({ kind: "none" }),
};

/** Two cells with the day/night exchange, offered on columns: the model must refuse it. */
const COUPLED: RegimeEntry = {
  ...SHADES,
  words: "test only: two cells exchanging heat",
  surface: (t) => ({ ...SHADES.surface(t), cells: SHADES.surface(t).cells.slice(0, 2).map((c) => ({ ...c, areaWeight: 0.5 })) }),
  exchange: () => ({ kind: "dayNight", recirculation: 0.5, coefficientWPerM2K: 0, weighting: "uniform" }),
};

vi.mock("../src/model/regimes.js", async (importOriginal) => {
  const original = await importOriginal<typeof import("../src/model/regimes.js")>();
  const table = { ...original.REGIME_TABLE, shades: SHADES, coupled: COUPLED } as unknown as typeof original.REGIME_TABLE;
  return {
    ...original,
    REGIMES: [...original.REGIMES, "shades", "coupled"],
    REGIME_TABLE: table,
    regimeEntry: (thermal: Parameters<typeof original.regimeEntry>[0], kind: Parameters<typeof original.regimeEntry>[1]) => original.regimeEntry(thermal, kind, table),
  };
});

const { simulate } = await import("../src/run/simulate.js");

/** A basalt-like homogeneous column, 30 days of orbit so the grid stays small. */
const COLUMN: ColumnSpec = {
  properties: {
    densitySurface: 2000,
    densityDeep: 2000,
    conductivitySurface: 0.5,
    conductivityDeep: 0.5,
    eFoldingDepthM: Infinity,
    specificHeatPolynomial: [800],
    radiativeChi: 0,
  },
  grid: { ...DEFAULT_GRID, stepsPerShortestPeriod: 240 },
  outputDepthsM: [0.1],
  interiorFluxWPerM2: 0,
};
const PERIOD_SECONDS = 30 * 86_400;

describe("several cells on conduction columns", () => {
  it("puts each column of a circular orbit at its own equilibrium, 278.33 K × share^¼ (Stefan–Boltzmann; ../shared/REFERENCES.md: f = 1/4 at 1 au)", () => {
    const base = nominalCase({ e: 0, periodSeconds: PERIOD_SECONDS, regime: "shades" as Regime });
    const sim = simulate({ ...base, column: COLUMN }, { samples: 16 });
    expect(sim.series.states.map((s) => s.name)).toEqual(["shade0", "shade1", "shade2"]);
    expect(sim.summary.cells!.map((c) => c.areaWeight)).toEqual([0.5, 0.3, 0.2]);
    SHARES.forEach((share, i) => {
      const expected = 278.33 * share ** 0.25; // 278.33 is rounded to 2e-5
      const cell = sim.summary.cells![i]!;
      expect(Math.abs(cell.temperature.meanK / expected - 1)).toBeLessThan(3e-5);
      expect(cell.temperature.swingK).toBeLessThan(1e-6 * expected);
      expect(Math.abs(sim.series.states[i]!.temperatureK[7]! / expected - 1)).toBeLessThan(3e-5);
    });
    // The whole surface's budget: absorbed = emitted, area-weighted over the three columns.
    expect(Math.abs(sim.summary.energyBalanceResidual!)).toBeLessThan(1e-6);
    expect(sim.series.depths).toHaveLength(1);
  });

  it("gives each cell of an eccentric orbit the temperatures of its column run alone (global forcing with the star's luminosity scaled by the cell's share)", () => {
    // Independent columns: a cell's forcing is share × the global forcing, which is the global
    // forcing of a star share × as luminous (flux ∝ L; common practice).
    const base = nominalCase({ e: 0.3, periodSeconds: PERIOD_SECONDS, regime: "shades" as Regime });
    const sim = simulate({ ...base, column: COLUMN }, { samples: 16 });
    SHARES.forEach((share, i) => {
      const alone = simulate(
        { ...base, regime: "global", star: { ...base.star, luminosityW: share * base.star.luminosityW }, column: COLUMN },
        { samples: 16 },
      );
      const cell = sim.summary.cells![i]!;
      for (const key of ["minK", "maxK", "meanK"] as const) {
        expect(Math.abs(cell.temperature[key] / alone.summary.temperature[key] - 1)).toBeLessThan(1e-6);
      }
      expect(Math.abs(sim.series.states[i]!.temperatureK[5]! - alone.series.temperatureK[5]!)).toBeLessThan(1e-4);
    });
    // Top-level numbers are the first cell's, as for slab cells.
    expect(sim.summary.temperature.meanK).toBe(sim.summary.cells![0]!.temperature.meanK);
    expect(Math.abs(sim.summary.energyBalanceResidual!)).toBeLessThan(1e-5);
  });

  it("refuses cells that exchange heat on columns, in one line naming the field, the value and what is allowed", () => {
    const base = nominalCase({ e: 0.1, periodSeconds: PERIOD_SECONDS, regime: "coupled" as Regime });
    let caught: unknown;
    try {
      simulate({ ...base, column: COLUMN });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(CalorbitError);
    const error = caught as CalorbitError;
    expect(error.code).toBe("INVALID_ARGUMENT");
    expect(error.message).toBe("cells that exchange heat (dayNight) cannot sit on conduction columns yet");
    expect(error.problems).toEqual([
      {
        path: "body.column",
        given: "a conduction column under cells with a dayNight exchange",
        allowed: "a slab (body.heatCapacity or body.layer) under exchanging cells, or columns under cells with no exchange",
      },
    ]);
    // The same cells on a slab run.
    expect(simulate({ ...base, surface: { ...base.surface, heatCapacityJPerM2K: 1e6 } }, { samples: 4 }).summary.cells).toHaveLength(2);
  });
});
