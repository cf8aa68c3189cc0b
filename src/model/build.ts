/**
 * From a thermal case to the model the solver integrates. The regime's entry in `regimes.ts` gives
 * the surface (cells, forcing, cycle) and the lateral exchange; the heat store picks the solve:
 * a slab becomes an ODE system in the eccentric anomaly (one temperature per cell), a column is
 * handed to the column solver with the same forcing. Also: each cell's instantaneous equilibrium,
 * the stiffness and the resolution the statistics need.
 */
import { STEFAN_BOLTZMANN } from "../constants.js";
import { CalorbitError, requireNumber } from "../errors.js";
import type { ThermalCase } from "./thermalCase.js";
import { ConductanceExchange } from "../physics/conductance.js";
import { DayNightBalance } from "../physics/dayNight.js";
import { LumpedBalance, radiativeTimeSeconds, type SurfaceProperties } from "../physics/energyBalance.js";
import { equilibriumTemperatureFrom } from "../physics/flux.js";
import { checkOrbit, meanMotion } from "../physics/orbit.js";
import type { OdeSystem } from "../solve/system.js";
import { exchangeCarriesHeat, type Exchange } from "./exchange.js";
import { heatStoreOf, type ColumnStore, type HeatStore, type SlabStore } from "./heatStore.js";
import { regimeEntry, type RegimeEntry } from "./regimes.js";
import { SlabCells } from "./slabCells.js";
import { checkSurfaceCells, meanAbsorbedOf, type Surface } from "./surface.js";

export { gcd } from "./regimes.js";

const TWO_PI = 2 * Math.PI;

interface ModelCommon {
  regime: RegimeEntry;
  surface: Surface;
  exchange: Exchange;
  /** Names of the cells (the state components of a slab): ["surface"], or ["day", "night"]. */
  stateNames: readonly string[];
  /** Area weight of each cell (sum 1). */
  areaWeights: readonly number[];
  /** Orbits in one forcing cycle. */
  cycleOrbits: number;
  /** False when the spin is not commensurate with the orbit: no exact cycle exists. */
  commensurate: boolean;
  /** dt/dE, s rad⁻¹. */
  timePerAnomaly(E: number): number;
  /** Stellar power absorbed by cell i at E, W m⁻² (before exchange; no internal heat). */
  absorbedAt(E: number, state: number): number;
  /** Instantaneous equilibrium of every cell at E, K, into `out`. */
  equilibriumAt(E: number, out: Float64Array): void;
  /**
   * A cell's instantaneous equilibrium from its own absorbed stellar flux (W m⁻² → K), when that is
   * all it depends on (cells that exchange no heat); null otherwise (then use `equilibriumAt`).
   */
  equilibriumOfAbsorbed: ((absorbedWPerM2: number) => number) | null;
  /** εσ, W m⁻² K⁻⁴. */
  emissionCoefficient: number;
  internalFluxWPerM2: number;
  /** Area-weighted cycle-mean stellar absorbed flux of the whole surface, W m⁻². */
  meanAbsorbedWPerM2: number;
  /** Equilibrium of the cycle-mean absorbed flux of cell 0, K (a temperature scale). */
  meanFluxEquilibriumK: number;
  /** Statistics grid resolution. */
  statsPointsPerOrbit: number;
  /** True when the absorbed flux has corners (sunrise, sunset, polar night): means then split intervals there. */
  forcingHasCorners: boolean;
  /** Mean solar day, s; null when synchronous; undefined for regimes without a spin. */
  solarDaySeconds?: number | null;
}

/** A slab under every cell: an ODE system in E with one temperature per cell. */
export interface SlabModel extends ModelCommon {
  kind: "slab";
  heatStore: SlabStore;
  system: OdeSystem;
  /**
   * Cells with no exchange: one system per cell. The Jacobian of `system` is then diagonal, and the
   * periodic solve runs cell by cell (cost linear in the cells, where the dense variational
   * equations of the whole state cost about N³).
   */
  independentCells?: readonly OdeSystem[];
  /** τ = C/(4εσT³) at the mean-flux equilibrium, s. */
  radiativeTimeSeconds: number;
  /** max |∂f/∂y| over the cycle × the cycle length in E: about the cycle over τ. */
  stiffness: number;
}

/** A conduction column under every cell (cells with no exchange: one column solve each). */
export interface ColumnModel extends ModelCommon {
  kind: "column";
  heatStore: ColumnStore;
  /** A column has no single radiative time (see its skin depths). */
  radiativeTimeSeconds: null;
}

export type ThermalModel = SlabModel | ColumnModel;

/**
 * Statistics grid, points per orbit in E. The periastron peak of the integrand has a width in E of
 * about √(2(1 − e)), so the grid grows as that width shrinks (256 points up to e = 0.6, 512 at
 * e = 0.9, 8192 at e = 0.999); a spinning point needs at least 96 points per solar day on top:
 * its temperature has a corner in the second derivative at sunrise and sunset, where the
 * trapezoidal rule drops to third order (measured on points with 0.7–1.8-day solar days: the
 * energy residual is 9e-8 with 48 points per day, 4e-9–8e-9 with 96).
 */
const STATISTICS_POINTS_PER_SOLAR_DAY = 96;
/**
 * A slab whose forcing has corners also needs points within its radiative time τ: after each
 * sunrise the temperature climbs toward the equilibrium over about τ, and a grid that steps over
 * the climb loses the means' accuracy there. Measured on points with 20 solar days per orbit at
 * tolerance 1e-8 (the solution itself conserving energy to 3e-10 against a 400,001-sample run):
 * with C = 1e5 J m⁻² K⁻¹ (τ = 9e-4 P, about 2 points per τ) the energy residual was 1.6e-6, and
 * with C = 1e4 the mean temperature was 6.4e-6 off; with 8 points per τ, 1.9e-9 and 2.4e-10.
 * Capped per orbit, and per cycle so that a long p:q cycle (few sunrises per orbit) is not
 * multiplied into a grid too large to hold.
 */
const STATISTICS_POINTS_PER_RADIATIVE_TIME = 8;
const MOST_POINTS_PER_ORBIT_FOR_RADIATIVE_TIME = 16_384;
const MOST_POINTS_PER_CYCLE_FOR_RADIATIVE_TIME = 1 << 20;

/** A slab's climb after sunrise, for the grid: its radiative time over the orbit's period, and the orbits in its cycle. */
interface Climb {
  periodOverRadiativeTime: number;
  cycleOrbits: number;
}

function statisticsPointsPerOrbit(eccentricity: number, solarDaysPerOrbit: number, corners: boolean, climb?: Climb): number {
  const width = Math.sqrt(2 * (1 - eccentricity));
  const forPeriastron = Math.min(8192, Math.max(256, Math.ceil((512 * Math.sqrt(0.2)) / width / 64) * 64));
  // Sunrise and sunset put corners in the integrands, where the rules lose their order: more points.
  const forCorners = corners ? 2048 : 0;
  const points = Math.min(1 << 20, Math.max(forPeriastron, forCorners, Math.ceil(STATISTICS_POINTS_PER_SOLAR_DAY * solarDaysPerOrbit)));
  if (!corners || !climb) return points;
  const forClimb = Math.ceil(STATISTICS_POINTS_PER_RADIATIVE_TIME * climb.periodOverRadiativeTime);
  const most = Math.min(MOST_POINTS_PER_ORBIT_FOR_RADIATIVE_TIME, Math.floor(MOST_POINTS_PER_CYCLE_FOR_RADIATIVE_TIME / climb.cycleOrbits));
  return Math.max(points, Math.min(most, forClimb));
}

/**
 * The model of a case. `regime` is the case's row of the regimes table by default; a caller-made
 * row serves surfaces that no regime builds yet (a benchmark's many exchanging cells).
 */
export function buildThermalModel(thermal: ThermalCase, regime?: RegimeEntry): ThermalModel {
  checkOrbit(thermal.orbit);
  requireNumber("star.luminosity", thermal.star.luminosityW, (l) => l > 0, "L > 0 W");
  const store: HeatStore = heatStoreOf(thermal);
  const entry = regime ?? regimeEntry(thermal, store.kind);
  if (thermal.surface.albedoIncidence && thermal.regime !== "point" && thermal.regime !== "substellar") {
    throw new CalorbitError("INVALID_ARGUMENT", "an incidence-dependent albedo needs one place on the surface", [
      { path: "body.albedoIncidence", given: `with regime ${thermal.regime}`, allowed: "regime point (or substellar, where it is A₀)" },
    ]);
  }
  const { orbit } = thermal;
  const q = thermal.surface.internalFluxWPerM2;
  const emission = thermal.surface.emissivity * STEFAN_BOLTZMANN;
  const n = meanMotion(orbit);
  const inverseN = 1 / n;
  const e = orbit.eccentricity;
  const surface = entry.surface(thermal);
  checkSurfaceCells(surface);
  const exchange = entry.exchange(thermal);
  const cells = surface.cells;
  // ε is validated by the balances' constructors (checkSurface) before teqOf is first used.
  const teqOf = (absorbed: number): number => equilibriumTemperatureFrom(absorbed + q, emission);
  const solarDaysPerOrbit = surface.solarDaySeconds ? orbit.periodSeconds / surface.solarDaySeconds : 0;
  const scaleK = teqOf(cells[0]!.forcing.meanAbsorbedWPerM2);
  const common: ModelCommon = {
    regime: entry,
    surface,
    exchange,
    stateNames: cells.map((c) => c.name),
    areaWeights: cells.map((c) => c.areaWeight),
    cycleOrbits: surface.cycleOrbits,
    commensurate: surface.commensurate,
    timePerAnomaly: (E) => (1 - e * Math.cos(E)) * inverseN,
    absorbedAt: (E, i) => cells[i]!.forcing.absorbedAt(E),
    equilibriumAt: (E, out) => {
      for (let i = 0; i < cells.length; i++) out[i] = teqOf(cells[i]!.forcing.absorbedAt(E));
    },
    equilibriumOfAbsorbed: teqOf,
    emissionCoefficient: emission,
    internalFluxWPerM2: q,
    meanAbsorbedWPerM2: meanAbsorbedOf(surface),
    meanFluxEquilibriumK: scaleK,
    statsPointsPerOrbit: statisticsPointsPerOrbit(e, solarDaysPerOrbit, surface.forcingHasCorners),
    forcingHasCorners: surface.forcingHasCorners,
  };
  if (surface.solarDaySeconds !== undefined) common.solarDaySeconds = surface.solarDaySeconds;

  switch (store.kind) {
    case "column":
      if (exchange.kind !== "none") {
        // Exchanging cells on columns would couple their surface balances (one Jacobian over every
        // cell's layers): not solved yet, so refused rather than run as independent columns.
        throw new CalorbitError("INVALID_ARGUMENT", `cells that exchange heat (${exchange.kind}) cannot sit on conduction columns yet`, [
          { path: "body.column", given: `a conduction column under cells with a ${exchange.kind} exchange`, allowed: "a slab (body.heatCapacity or body.layer) under exchanging cells, or columns under cells with no exchange" },
        ]);
      }
      return { ...common, kind: "column", heatStore: store, radiativeTimeSeconds: null };
    case "slab": {
      const properties: SurfaceProperties = { ...thermal.surface, heatCapacityJPerM2K: store.heatCapacityJPerM2K };
      let system: OdeSystem;
      let independentCells: OdeSystem[] | undefined;
      switch (exchange.kind) {
        case "none":
          // One cell: the lumped balance; several independent cells: one slab each, integrated together.
          if (cells.length === 1) system = new LumpedBalance(orbit, properties, cells[0]!.forcing);
          else {
            system = new SlabCells(orbit, properties, cells, null);
            independentCells = cells.map((cell) => new LumpedBalance(orbit, properties, cell.forcing));
          }
          break;
        case "conductance":
          system = new SlabCells(orbit, properties, cells, new ConductanceExchange(exchange.links, common.areaWeights));
          break;
        case "dayNight": {
          const balance = new DayNightBalance(orbit, properties, thermal.star.luminosityW, exchange);
          system = balance;
          common.equilibriumAt = (E, out) => balance.equilibrium(E, out);
          common.equilibriumOfAbsorbed = null;
          // No recirculation and no exchange coefficient: the hemispheres do not touch, and each
          // is solved on its own (an unheated night side stays at 0 K, the published limit).
          if (!exchangeCarriesHeat(exchange)) independentCells = cells.map((cell) => new LumpedBalance(orbit, properties, cell.forcing));
          break;
        }
      }
      const tauSeconds = radiativeTimeSeconds(store.heatCapacityJPerM2K, thermal.surface.emissivity, scaleK);
      const climb: Climb = { periodOverRadiativeTime: orbit.periodSeconds / tauSeconds, cycleOrbits: surface.cycleOrbits };
      const model: SlabModel = {
        ...common,
        kind: "slab",
        heatStore: store,
        system,
        radiativeTimeSeconds: tauSeconds,
        statsPointsPerOrbit: statisticsPointsPerOrbit(e, solarDaysPerOrbit, surface.forcingHasCorners, climb),
        stiffness: 0,
        ...(independentCells ? { independentCells } : {}),
      };
      model.stiffness = stiffnessOf(system, surface.cycleOrbits, model.equilibriumAt);
      return model;
    }
  }
}

/** max |∂f/∂y| × cycle length, probing the system at its instantaneous equilibrium around the cycle. */
function stiffnessOf(system: OdeSystem, cycleOrbits: number, equilibriumAt: (E: number, out: Float64Array) => void): number {
  const d = system.dimension;
  const y = new Float64Array(d);
  const jac = new Float64Array(d * d);
  let worst = 0;
  const probes = 64 * cycleOrbits;
  for (let k = 0; k < probes; k++) {
    const E = (TWO_PI * cycleOrbits * k) / probes;
    equilibriumAt(E, y);
    for (let i = 0; i < d; i++) if (!(y[i]! > 0)) y[i] = 1; // a dark nightside: probe at 1 K instead of 0
    system.jacobian(E, y, jac);
    let rowMax = 0;
    for (let i = 0; i < d * d; i++) rowMax = Math.max(rowMax, Math.abs(jac[i]!));
    worst = Math.max(worst, rowMax);
  }
  return worst * TWO_PI * cycleOrbits;
}
