/**
 * The regimes: the one table that says what each regime is. `REGIME_TABLE` is a
 * `Record<Regime, RegimeEntry>`, so adding a name to `REGIMES` makes the compiler ask for its
 * entry, and nothing else in the code dispatches on the regime's name: the solver reads the
 * surface, heat store and exchange the entry builds; the reports read its words; the charts and
 * the viewer read its colour and menu label. See DEVELOPERS.md, "Adding a regime".
 */
import { CalorbitError, requireNumber } from "../errors.js";
import { DAYSIDE_FACTOR } from "../physics/dayNight.js";
import { bandForcing, lumpedForcing, NO_FORCING, pointForcing, scaledForcing } from "../physics/forcing.js";
import { solarDaySeconds } from "../physics/geometry.js";
import { meanMotion } from "../physics/orbit.js";
import type { Exchange } from "./exchange.js";
import type { HeatStoreKind } from "./heatStore.js";
import { singleCell, type Surface } from "./surface.js";
import type { ThermalCase } from "./thermalCase.js";

/** Every regime calorbit integrates, in menu order. */
export const REGIMES = ["global", "dayside", "substellar", "daynight", "band", "point", "map", "zonal"] as const;
export type Regime = (typeof REGIMES)[number];

/**
 * Which solve runs a regime: "surface", the engine's `simulate` (its cells × heat store × exchange,
 * from `surface` and `exchange` below); "map", the longitude × latitude grid and its observer
 * (`src/run/simulateMap.ts`, `observeMap.ts`); "zonal", the climate of latitude bands
 * (`src/run/zonal.ts`). Commands switch on it, so a new pipeline is flagged wherever it must be run.
 */
export type Pipeline = "surface" | "map" | "zonal";

/** Scenario fields a regime reads beyond star, orbit and body (the reports describe exactly these). */
export type RegimeField = "spin.axis" | "spin.rate" | "location.latitude" | "location.longitude" | "exchange";

export interface RegimeEntry {
  /** One line for the reports: what the regime models, words with units. */
  words: string;
  /** The viewer's menu label (short). */
  menuLabel: string;
  /** Chart colour when several regimes are drawn together (Okabe–Ito palette, `src/view/palette.ts`). */
  colour: string;
  /** The solve that runs it (see `Pipeline`). */
  pipeline: Pipeline;
  /** Heat stores the regime can sit on. */
  heatStores: readonly HeatStoreKind[];
  /** Scenario fields it reads. */
  fields: readonly RegimeField[];
  /** Its cells and their forcing. Throws CalorbitError on a field it cannot take. */
  surface(thermal: ThermalCase): Surface;
  /** Lateral exchange between its cells. */
  exchange(thermal: ThermalCase): Exchange;
}

const NO_EXCHANGE: Exchange = { kind: "none" };
const DEFAULT_SPIN = (thermal: ThermalCase) =>
  thermal.spin ?? { rateRadPerSecond: meanMotion(thermal.orbit), ratio: { spin: 1, orbit: 1 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 };
const locationOf = (thermal: ThermalCase) => thermal.location ?? { latitudeRad: 0, longitudeRad: 0 };

/** Greatest common divisor of two non-negative integers. */
export function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}

/** Cycle of a spin: q orbits for a p:q resonance (or a period within 1e-9 of one, q ≤ 16); else not commensurate. */
function spinCycle(spinRate: number, n: number, ratio?: { spin: number; orbit: number }): { orbits: number; commensurate: boolean } {
  if (ratio) return { orbits: ratio.orbit / gcd(ratio.spin, ratio.orbit), commensurate: true };
  const r = spinRate / n;
  for (let q = 1; q <= 16; q++) {
    const p = Math.round(r * q);
    if (p > 0 && Math.abs(r * q - p) <= 1e-9 * r * q) return { orbits: q / gcd(p, q), commensurate: true };
  }
  return { orbits: 1, commensurate: false };
}


function wholeBody(name: "global" | "dayside" | "substellar", words: string, menuLabel: string, colour: string): RegimeEntry {
  return {
    words,
    menuLabel,
    colour,
    pipeline: "surface",
    heatStores: ["slab", "column"],
    fields: [],
    surface: (t) => singleCell(lumpedForcing(name, t.surface.albedo, t.star.luminosityW, t.orbit)),
    exchange: () => NO_EXCHANGE,
  };
}

export const REGIME_TABLE: Readonly<Record<Regime, RegimeEntry>> = {
  global: wholeBody("global", "f = 1/4: fast rotator, heat shared over the whole sphere", "global (f = 1/4)", "#0072B2"),
  dayside: wholeBody("dayside", "f = 1/2: locked dayside, no heat carried to the night side", "dayside (f = 1/2)", "#E69F00"),
  substellar: wholeBody("substellar", "f = 1: the point under the star", "substellar (f = 1)", "#D55E00"),
  daynight: {
    words: "two hemispheres exchanging heat",
    menuLabel: "day + night",
    colour: "#009E73",
    pipeline: "surface",
    heatStores: ["slab"],
    fields: ["exchange"],
    surface(t) {
      const { weighting } = this.exchange(t) as Extract<Exchange, { kind: "dayNight" }>;
      const full = lumpedForcing("substellar", t.surface.albedo, t.star.luminosityW, t.orbit); // (1 − A) S
      return {
        cells: [
          { name: "day", areaWeight: 0.5, forcing: scaledForcing(full, DAYSIDE_FACTOR[weighting]) },
          { name: "night", areaWeight: 0.5, forcing: NO_FORCING },
        ],
        cycleOrbits: 1,
        commensurate: true,
        forcingHasCorners: false,
      };
    },
    exchange(t) {
      const ex = t.exchange ?? { recirculation: 0, coefficientWPerM2K: 0, weighting: "uniform" as const };
      requireNumber("body.recirculation", ex.recirculation, (r) => r >= 0 && r <= 1, "0 ≤ ε ≤ 1");
      requireNumber("body.exchangeCoefficient", ex.coefficientWPerM2K, (k) => k >= 0, "k ≥ 0 W m⁻² K⁻¹");
      return { kind: "dayNight", ...ex };
    },
  },
  band: {
    words: "daily-mean insolation at one latitude of a fast rotator",
    menuLabel: "latitude band",
    colour: "#CC79A7",
    pipeline: "surface",
    heatStores: ["slab", "column"],
    fields: ["spin.axis", "location.latitude"],
    surface(t) {
      const spin = DEFAULT_SPIN(t);
      const latitudeRad = locationOf(t).latitudeRad;
      const forcing = bandForcing(t.surface.albedo, t.star.luminosityW, t.orbit, latitudeRad, spin.obliquityRad, spin.equinoxTrueAnomalyRad);
      // The daily mean has corners only where polar day or night begins: |latitude| + tilt ≥ 90°.
      const tilt = Math.min(spin.obliquityRad, Math.PI - spin.obliquityRad);
      const smooth = Math.abs(latitudeRad) + tilt < 0.5 * Math.PI - 1e-6;
      return singleCell(forcing, { cycleOrbits: 1, commensurate: true, forcingHasCorners: true, ...(smooth ? { cornerSearch: "smooth" as const } : {}) });
    },
    exchange: () => NO_EXCHANGE,
  },
  point: {
    words: "one place on a spinning surface, hour by hour",
    menuLabel: "surface point",
    colour: "#000000",
    pipeline: "surface",
    heatStores: ["slab", "column"],
    fields: ["spin.rate", "spin.axis", "location.latitude", "location.longitude"],
    surface(t) {
      const spin = DEFAULT_SPIN(t);
      requireNumber("spin.period", spin.rateRadPerSecond, (w) => w > 0, "a spin period > 0 s");
      const n = meanMotion(t.orbit);
      const cycle = spinCycle(spin.rateRadPerSecond, n, spin.ratio);
      const location = locationOf(t);
      const forcing = pointForcing(t.surface.albedo, t.star.luminosityW, t.orbit, location.latitudeRad, location.longitudeRad, spin, cycle.orbits, t.surface.albedoIncidence);
      return singleCell(forcing, {
        cycleOrbits: cycle.orbits,
        commensurate: cycle.commensurate,
        solarDaySeconds: solarDaySeconds(spin.rateRadPerSecond, n, spin.obliquityRad),
        forcingHasCorners: true,
        cornerSearch: "scan",
      });
    },
    exchange: () => NO_EXCHANGE,
  },
  map: {
    words: "a longitude × latitude grid of cells, and what a distant observer receives",
    menuLabel: "surface map",
    colour: "#56B4E9",
    // Hundreds of cells that exchange no heat, each solved alone, and an observer's phase curve.
    pipeline: "map",
    heatStores: ["slab"],
    fields: ["spin.rate", "spin.axis"],
    surface: () => ownSolve("map"),
    exchange: () => NO_EXCHANGE,
  },
  zonal: {
    words: "the globe in latitude bands sharing heat by meridional diffusion, with ice and outgoing-radiation laws (climate)",
    menuLabel: "latitude bands (climate)",
    colour: "#F0E442",
    // Bands coupled by diffusion, an albedo that feeds back on temperature, one or two climates.
    pipeline: "zonal",
    heatStores: ["slab"],
    fields: ["spin.axis"],
    surface: () => ownSolve("zonal"),
    exchange: () => NO_EXCHANGE,
  },
};

/** The surface builder of a regime whose pipeline is not the engine's single-surface solve. */
function ownSolve(regime: Regime): never {
  throw new CalorbitError("INVALID_ARGUMENT", `the ${regime} regime has its own solve`, [
    { path: "regime", given: regime, allowed: `calorbit run, sweep or view on the ${regime} scenario (not the single-surface solve of compare or simulate)` },
  ]);
}

/** The regimes the engine's `simulate` runs (compare's default list, the live viewer's menu). */
export const SURFACE_REGIMES: readonly Regime[] = REGIMES.filter((r) => REGIME_TABLE[r].pipeline === "surface");

/** The entry of a case's regime, refusing a heat store the regime cannot sit on. */
export function regimeEntry(thermal: ThermalCase, storeKind: HeatStoreKind, table: Readonly<Record<Regime, RegimeEntry>> = REGIME_TABLE): RegimeEntry {
  const entry = table[thermal.regime];
  if (!entry.heatStores.includes(storeKind)) {
    throw new CalorbitError("INVALID_ARGUMENT", `the ${thermal.regime} regime does not take a ${storeKind === "column" ? "conduction column" : "slab"}`, [
      {
        path: "regime",
        given: thermal.regime,
        allowed: `with body.${storeKind}: ${REGIMES.filter((r) => table[r].heatStores.includes(storeKind)).join(", ")}`,
      },
    ]);
  }
  return entry;
}
