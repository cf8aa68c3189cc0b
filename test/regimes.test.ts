/**
 * The regimes table is the one place a regime is defined: a test-only row, added to the table and
 * nowhere else, runs through the whole engine (model, solve, summary). The row follows the
 * contributor guide's recipe ("Adding a regime"): two independent slab cells, a lit hemisphere
 * under the star and a dark one heated from inside only.
 */
import { describe, expect, it, vi } from "vitest";
import { STEFAN_BOLTZMANN } from "../src/constants.js";
import type { RegimeEntry, Regime } from "../src/model/regimes.js";
import { lumpedForcing } from "../src/physics/forcing.js";
import { nominalCase } from "./helpers.js";

const HALVES: RegimeEntry = {
  words: "test only: a lit and a dark hemisphere, no exchange",
  menuLabel: "halves (test)",
  colour: "#56B4E9",
  pipeline: "surface",
  heatStores: ["slab"],
  fields: [],
  surface: (t) => ({
    cells: [
      { name: "lit", areaWeight: 0.5, forcing: lumpedForcing("dayside", t.surface.albedo, t.star.luminosityW, t.orbit) },
      { name: "dark", areaWeight: 0.5, forcing: { absorbedAt: () => 0, meanAbsorbedWPerM2: 0 } },
    ],
    cycleOrbits: 1,
    commensurate: true,
    forcingHasCorners: false,
  }),
  exchange: () => ({ kind: "none" }),
};

vi.mock("../src/model/regimes.js", async (importOriginal) => {
  const original = await importOriginal<typeof import("../src/model/regimes.js")>();
  const table = { ...original.REGIME_TABLE, halves: HALVES } as unknown as typeof original.REGIME_TABLE;
  return {
    ...original,
    REGIMES: [...original.REGIMES, "halves"],
    REGIME_TABLE: table,
    regimeEntry: (thermal: Parameters<typeof original.regimeEntry>[0], kind: Parameters<typeof original.regimeEntry>[1]) => original.regimeEntry(thermal, kind, table),
  };
});

const { simulate } = await import("../src/run/simulate.js");

describe("a regime added in the table only", () => {
  it("runs two independent cells: the lit one at the no-redistribution dayside limit, the dark one at its internal-flux equilibrium", () => {
    // Circular orbit at 1 au around the IAU 2015 nominal Sun, A = 0, ε = 1.
    // Lit: T⁴ = (1/2) S/σ + q/σ (Cowan & Agol 2011, ApJ 729, 54, eq. 4 with ε_r = 0; f = 1/2 is the
    // uniform dayside). Dark: T⁴ = q/σ. 278.33 K is the f = 1/4 value at 1 au (../shared/REFERENCES.md),
    // so the lit cell without q is 2^{1/4} × 278.33 K = 331.0 K.
    const q = 1;
    const sim = simulate({ ...nominalCase({ heatCapacity: 1e6, internalFlux: q }), regime: "halves" as Regime }, { samples: 5 });
    const s = sim.summary;
    const litK = s.cells![0]!.temperature.meanK;
    const darkK = s.cells![1]!.temperature.meanK;
    expect(sim.series.states.map((st) => st.name)).toEqual(["lit", "dark"]);
    expect(Math.abs(darkK / (q / STEFAN_BOLTZMANN) ** 0.25 - 1)).toBeLessThan(1e-7);
    expect(Math.abs(litK ** 4 - q / STEFAN_BOLTZMANN - (2 ** 0.25 * 278.33) ** 4) / litK ** 4).toBeLessThan(1e-4);
    // The whole surface's budget is area-weighted: absorbed (1/2)(S/2 + q) + (1/2) q = S/4 + q.
    expect(Math.abs(s.energyBalanceResidual!)).toBeLessThan(1e-8);
    expect(Math.abs(s.meanAbsorbedWPerM2! / (STEFAN_BOLTZMANN * 278.33 ** 4 + q) - 1)).toBeLessThan(1e-4);
  });
});

describe("the regimes with solves of their own", () => {
  it("are refused by the single-surface solve with a message that names the command to use", async () => {
    const { REGIME_TABLE, SURFACE_REGIMES } = await import("../src/model/regimes.js");
    for (const regime of ["map", "zonal"] as const) {
      expect(REGIME_TABLE[regime].pipeline).toBe(regime);
      expect(SURFACE_REGIMES).not.toContain(regime);
      expect(() => simulate({ ...nominalCase({ heatCapacity: 1e7 }), regime }, { samples: 0 })).toThrowError(
        expect.objectContaining({ code: "INVALID_ARGUMENT", message: `the ${regime} regime has its own solve` }),
      );
    }
    // (The mocked module keeps the real list, computed from the real table at load: "halves" is not in it here.)
    expect(SURFACE_REGIMES).toEqual(["global", "dayside", "substellar", "daynight", "band", "point"]);
  });
});
