/**
 * Slab cells that exchange heat (the conductance exchange, `src/physics/conductance.ts`), solved
 * to their periodic state by the dense shooting (few cells) or the matrix-free Newton–Krylov
 * shooting (many cells, `src/solve/periodicKrylov.ts`). The surfaces come from a test-only row of
 * the regimes table (no regime builds many exchanging cells yet).
 */
import { describe, expect, it, vi } from "vitest";
import { STEFAN_BOLTZMANN } from "../src/constants.js";
import type { RegimeEntry, Regime } from "../src/model/regimes.js";
import type { ConductanceLink } from "../src/physics/conductance.js";
import { lumpedForcing, NO_FORCING, scaledForcing } from "../src/physics/forcing.js";
import { nominalCase } from "./helpers.js";

/** What the test row builds: each cell's share of a lumped forcing and area weight, and the links. */
const setup = {
  lit: "global" as "global" | "substellar",
  shares: [1] as number[],
  weights: [1] as number[],
  links: [] as ConductanceLink[],
};


const CELLS: RegimeEntry = {
  words: "test only: slab cells linked by conductances",
  menuLabel: "cells (test)",
  colour: "#56B4E9",
  pipeline: "surface",
  heatStores: ["slab"],
  fields: ["exchange"],
  surface: (t) => {
    const full = lumpedForcing(setup.lit, t.surface.albedo, t.star.luminosityW, t.orbit);
    return {
      cells: setup.shares.map((share, i) => ({
        name: `cell${i}`,
        areaWeight: setup.weights[i]!,
        forcing: share === 0 ? NO_FORCING : scaledForcing(full, share),
      })),
      cycleOrbits: 1,
      commensurate: true,
      forcingHasCorners: false,
    };
  },
  exchange: () => ({ kind: "conductance", links: setup.links }),
};

vi.mock("../src/model/regimes.js", async (importOriginal) => {
  const original = await importOriginal<typeof import("../src/model/regimes.js")>();
  // Two surface points at longitudes 0 and 2 rad as the independent cells of one surface.
  const point = original.REGIME_TABLE.point;
  const points: RegimeEntry = {
    ...point,
    surface: (t) => {
      const at = (longitudeRad: number) => point.surface({ ...t, location: { latitudeRad: 0.3, longitudeRad } });
      return { ...at(0), cells: [0, 2].map((longitudeRad, i) => ({ ...at(longitudeRad).cells[0]!, name: `point${i}`, areaWeight: 0.5 })) };
    },
  };
  const table = { ...original.REGIME_TABLE, cells: CELLS, points } as unknown as typeof original.REGIME_TABLE;
  return {
    ...original,
    REGIMES: [...original.REGIMES, "cells", "points"],
    REGIME_TABLE: table,
    regimeEntry: (thermal: Parameters<typeof original.regimeEntry>[0], kind: Parameters<typeof original.regimeEntry>[1]) => original.regimeEntry(thermal, kind, table),
  };
});

const { simulate } = await import("../src/run/simulate.js");
const { ConductanceExchange } = await import("../src/physics/conductance.js");

/** A chain of n cells, neighbours linked, conductances varying along it (W m⁻² K⁻¹ per unit of the whole surface). */
function chain(n: number, g: number): ConductanceLink[] {
  return Array.from({ length: n - 1 }, (_, i) => ({ a: i, b: i + 1, conductanceWPerM2K: g * (1 + 0.5 * Math.sin(i)) }));
}
/** Shares of the forcing from 1 down to 0.2, and area weights that sum to 1 (cos-like bands). */
function bands(n: number): void {
  setup.shares = Array.from({ length: n }, (_, i) => 1 - (0.8 * i) / Math.max(1, n - 1));
  const raw = Array.from({ length: n }, (_, i) => 1 + 0.5 * Math.cos((Math.PI * i) / n));
  const sum = raw.reduce((a, b) => a + b, 0);
  setup.weights = raw.map((w) => w / sum);
}
const relative = (a: number, b: number): number => Math.abs(a / b - 1);

describe("slab cells that exchange heat", () => {
  it("conserves energy: the area-weighted exchange sums to zero for any temperatures (common practice: heat leaving one cell enters another)", () => {
    bands(7);
    const op = new ConductanceExchange(chain(7, 3), setup.weights);
    const t = Float64Array.from({ length: 7 }, (_, i) => 150 + 37 * i * i);
    const x = new Float64Array(7);
    op.addFlux(0, t, x);
    let sum = 0;
    let scale = 0;
    for (let i = 0; i < 7; i++) {
      sum += setup.weights[i]! * x[i]!;
      scale += setup.weights[i]! * Math.abs(x[i]!);
    }
    expect(scale).toBeGreaterThan(100);
    expect(Math.abs(sum) / scale).toBeLessThan(1e-14);
    // Its product with a vector is the dense Jacobian's (the product the matrix-free solve uses).
    const jac = new Float64Array(49);
    op.addJacobian(0, t, jac);
    const v = Float64Array.from({ length: 7 }, (_, i) => Math.cos(i));
    const product = new Float64Array(7);
    op.addJacobianProduct(0, t, v, product);
    for (let r = 0; r < 7; r++) {
      let s = 0;
      for (let c = 0; c < 7; c++) s += jac[r * 7 + c]! * v[c]!;
      expect(Math.abs(product[r]! - s)).toBeLessThan(1e-12);
    }
  });

  it("matches the day/night exchange coefficient k with one link G = k/2 between a lit and a dark half (Cowan & Agol 2011, ApJ 729, 54: the two-box balance, uniform dayside)", () => {
    // Day/night: C dT_d/dt = F/2 − σT_d⁴ − k (T_d − T_n); a link carries G (T_n − T_d) per unit of the
    // whole surface, i.e. 2 G per unit of each half's area: the same balance when G = k/2.
    const k = 1.5;
    setup.lit = "substellar";
    setup.shares = [0.5, 0];
    setup.weights = [0.5, 0.5];
    setup.links = [{ a: 0, b: 1, conductanceWPerM2K: k / 2 }];
    const base = nominalCase({ e: 0.2, heatCapacity: 2e7 });
    const dayNight = simulate({ ...base, regime: "daynight", exchange: { recirculation: 0, coefficientWPerM2K: k, weighting: "uniform" } }, { samples: 0 }).summary;
    for (const method of ["dense", "newton-krylov"] as const) {
      const linked = simulate({ ...base, regime: "cells" as Regime }, { samples: 0, periodicMethod: method }).summary;
      for (const key of ["minK", "maxK", "meanK"] as const) {
        expect(relative(linked.cells![0]!.temperature[key], dayNight.day!.temperature[key])).toBeLessThan(1e-7);
        expect(relative(linked.cells![1]!.temperature[key], dayNight.night!.temperature[key])).toBeLessThan(1e-7);
      }
    }
  });

  it("gives the same periodic state by the dense and the Newton–Krylov shooting (6 cells, e = 0.4, τ ≈ P/3 to 3P)", () => {
    setup.lit = "global";
    bands(6);
    setup.links = chain(6, 2);
    const base = { ...nominalCase({ e: 0.4, heatCapacity: 3e7 }), regime: "cells" as Regime };
    const dense = simulate(base, { samples: 50, periodicMethod: "dense" });
    const krylov = simulate(base, { samples: 50, periodicMethod: "newton-krylov" });
    // Both meet the requested tolerance (1e-8) on the start state: they agree to a few times it.
    for (let i = 0; i < 6; i++) {
      for (const key of ["minK", "maxK", "meanK"] as const) {
        expect(relative(krylov.summary.cells![i]!.temperature[key], dense.summary.cells![i]!.temperature[key])).toBeLessThan(3e-8);
      }
      for (let j = 0; j < 50; j += 7) expect(relative(krylov.series.states[i]!.temperatureK[j]!, dense.series.states[i]!.temperatureK[j]!)).toBeLessThan(3e-8);
    }
    // The exchange matters here: the cells are far from their uncoupled temperatures.
    expect(dense.summary.cells![5]!.temperature.meanK - 278.33 * 0.2 ** 0.25).toBeGreaterThan(5);
  });

  it("keeps identical cells identical under any exchange, each at the single-cell answer (symmetry; common practice)", () => {
    setup.lit = "global";
    const n = 24;
    bands(n);
    setup.shares = Array.from({ length: n }, () => 1);
    setup.links = [...chain(n, 0.3), { a: 0, b: n - 1, conductanceWPerM2K: 0.7 }, { a: 3, b: 17, conductanceWPerM2K: 0.2 }];
    const base = nominalCase({ e: 0.3, heatCapacity: 3e7 });
    const single = simulate(base, { samples: 0 }).summary;
    const many = simulate({ ...base, regime: "cells" as Regime }, { samples: 0 }).summary;
    for (const cell of many.cells!) {
      for (const key of ["minK", "maxK", "meanK"] as const) expect(relative(cell.temperature[key], single.temperature[key])).toBeLessThan(3e-8);
    }
  });

  it("reaches the steady state of a circular orbit, the root of F_i − σT_i⁴ + X_i(T) = 0, with 30 cells (common practice: a constant forcing's periodic state is its steady state)", () => {
    setup.lit = "global";
    const n = 30;
    bands(n);
    setup.links = chain(n, 4);
    const base = nominalCase({ e: 0, heatCapacity: 5e7 });
    const sim = simulate({ ...base, regime: "cells" as Regime }, { samples: 0 });
    // The test's own root: Newton's method on the algebraic balance with its dense Jacobian.
    const absorbed = STEFAN_BOLTZMANN * 278.33 ** 4; // S/4 at 1 au, A = 0 (../shared/REFERENCES.md; 278.33 K rounded to 2e-5)
    const op = new ConductanceExchange(setup.links, setup.weights);
    const t = Float64Array.from(setup.shares, (s) => 278.33 * s ** 0.25);
    const residual = new Float64Array(n);
    const jac = new Float64Array(n * n);
    for (let iteration = 0; iteration < 30; iteration++) {
      residual.fill(0);
      jac.fill(0);
      op.addFlux(0, t, residual);
      op.addJacobian(0, t, jac);
      for (let i = 0; i < n; i++) {
        residual[i] = residual[i]! + setup.shares[i]! * absorbed - STEFAN_BOLTZMANN * t[i]! ** 4;
        jac[i * n + i] = jac[i * n + i]! - 4 * STEFAN_BOLTZMANN * t[i]! ** 3;
      }
      // Solve jac · d = −residual (Gaussian elimination; tridiagonal here, no pivoting needed: diagonally dominant).
      const a = Float64Array.from(jac);
      const d = Float64Array.from(residual, (r) => -r);
      for (let c = 0; c < n; c++) {
        for (let r = c + 1; r < n; r++) {
          const f = a[r * n + c]! / a[c * n + c]!;
          if (f === 0) continue;
          for (let k = c; k < n; k++) a[r * n + k] = a[r * n + k]! - f * a[c * n + k]!;
          d[r] = d[r]! - f * d[c]!;
        }
      }
      for (let r = n - 1; r >= 0; r--) {
        let s = d[r]!;
        for (let k = r + 1; k < n; k++) s -= a[r * n + k]! * d[k]!;
        d[r] = s / a[r * n + r]!;
      }
      for (let i = 0; i < n; i++) t[i] = t[i]! + d[i]!;
    }
    for (let i = 0; i < n; i++) {
      expect(relative(sim.summary.cells![i]!.temperature.meanK, t[i]!)).toBeLessThan(3e-5);
      expect(sim.summary.cells![i]!.temperature.swingK).toBeLessThan(1e-6);
    }
    // Exchange moved heat from the lit end to the dim end: the dim end is well above its own equilibrium.
    expect(t[n - 1]! - 278.33 * 0.2 ** 0.25).toBeGreaterThan(10);
    expect(Math.abs(sim.summary.energyBalanceResidual!)).toBeLessThan(1e-8);
  });

  it("closes the whole surface's energy budget on an eccentric orbit with 20 exchanging cells (common practice: the exchange only moves heat)", () => {
    setup.lit = "global";
    bands(20);
    setup.links = chain(20, 0.5);
    const sim = simulate({ ...nominalCase({ e: 0.5, heatCapacity: 2e7 }), regime: "cells" as Regime }, { samples: 0 });
    expect(Math.abs(sim.summary.energyBalanceResidual!)).toBeLessThan(1e-8);
    expect(sim.summary.cells).toHaveLength(20);
  });

  it("solves independent surface points each with its own sunrises and sunsets: each equals the point regime alone (common practice: cells that exchange nothing are separate problems)", () => {
    const base = nominalCase({ e: 0.2, heatCapacity: 2e4 });
    const n = 2 * Math.PI / base.orbit.periodSeconds;
    const spun = { ...base, spin: { rateRadPerSecond: 3 * n, ratio: { spin: 3, orbit: 1 }, obliquityRad: 0.2, equinoxTrueAnomalyRad: 0 } };
    const both = simulate({ ...spun, regime: "points" as Regime }, { samples: 0 }).summary;
    [0, 2].forEach((longitudeRad, i) => {
      const alone = simulate({ ...spun, regime: "point", location: { latitudeRad: 0.3, longitudeRad } }, { samples: 0 }).summary;
      for (const key of ["minK", "maxK", "meanK"] as const) expect(relative(both.cells![i]!.temperature[key], alone.temperature[key])).toBeLessThan(1e-7);
    });
    // The two points see the star at different times of the orbit: their extremes differ.
    expect(Math.abs(both.cells![0]!.temperature.maxK - both.cells![1]!.temperature.maxK)).toBeGreaterThan(1);
  });

  it("refuses the dense solve for more coupled cells than it can carry, in one line naming the option, the value and what is allowed", () => {
    setup.lit = "global";
    bands(101);
    setup.links = chain(101, 1);
    let caught: unknown;
    try {
      simulate({ ...nominalCase({ e: 0.1, heatCapacity: 1e7 }), regime: "cells" as Regime }, { samples: 0, periodicMethod: "dense" });
    } catch (error) {
      caught = error;
    }
    const error = caught as { code: string; message: string; problems: unknown[] };
    expect(error.code).toBe("INVALID_ARGUMENT");
    expect(error.message).toBe("the dense periodic solve of 101 coupled cells would integrate 10302 components");
    expect(error.problems).toEqual([{ path: "periodicMethod", given: "dense", allowed: "newton-krylov above 100 coupled cells (dense: at most 100)" }]);
  });
});
