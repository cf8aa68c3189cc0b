/**
 * A planet's surface as a longitude × latitude grid of slab cells, lit by cos z as the body spins,
 * and the energy balance of all cells as one system in the eccentric anomaly E.
 *
 * Cells are equal steps in longitude and latitude; a cell's area fraction is exact on the sphere,
 * Δλ (sin φ_top − sin φ_bottom) / 4π. Each cell is a slab, C dT/dt = (1 − A) S(r) max(cos z, 0)
 * + q − εσT⁴, lit at its centre. An optional solid-body wind carries the slabs eastward at a fixed
 * angular speed relative to the ground, so the cells are parcels in a frame that turns at Ω + ω_wind
 * (with no mixing between parcels, as in a one-layer advective model: Cowan & Agol 2011, ApJ 726,
 * 82); longitudes below are measured in that frame, which is the ground when there is no wind.
 *
 * The star's direction in the cell frame follows calorbit's spin convention (src/physics/geometry.ts):
 * declination sin δ = sin θ sin(ν − ν_eq), right ascension tan α = cos θ tan(ν − ν_eq), and the
 * substellar longitude λ★ = α(ν) − α(0) − Ω_frame (t − t_p), so longitude 0 is under the star at
 * periastron. Everything is explicit in E: no Kepler solve in the right-hand side.
 */
import { STEFAN_BOLTZMANN } from "../constants.js";
import type { OdeSystem } from "../solve/system.js";
import type { Forcing } from "./forcing.js";
import { stellarFlux } from "./flux.js";
import type { SpinGeometry } from "./geometry.js";
import { meanMotion, type Orbit } from "./orbit.js";

export interface LonLatGrid {
  longitudes: number;
  latitudes: number;
  /** Cell centres, rad; cell k = j·longitudes + i (latitude row j from south, longitude column i from −180°). */
  longitudeRad: Float64Array;
  latitudeRad: Float64Array;
  /** Area fraction of the sphere, summing to 1. */
  areaFraction: Float64Array;
  /** Cell normal in the body's equatorial frame: (cos φ cos λ, cos φ sin λ, sin φ). */
  normalX: Float64Array;
  normalY: Float64Array;
  normalZ: Float64Array;
}

/** An equal-angle grid: `longitudes` columns from −180° and `latitudes` rows from −90°. */
export function lonLatGrid(longitudes: number, latitudes: number): LonLatGrid {
  const n = longitudes * latitudes;
  const grid: LonLatGrid = {
    longitudes,
    latitudes,
    longitudeRad: new Float64Array(n),
    latitudeRad: new Float64Array(n),
    areaFraction: new Float64Array(n),
    normalX: new Float64Array(n),
    normalY: new Float64Array(n),
    normalZ: new Float64Array(n),
  };
  const dLon = (2 * Math.PI) / longitudes;
  const dLat = Math.PI / latitudes;
  for (let j = 0; j < latitudes; j++) {
    const south = -Math.PI / 2 + j * dLat;
    const lat = south + dLat / 2;
    const area = (dLon * (Math.sin(south + dLat) - Math.sin(south))) / (4 * Math.PI);
    for (let i = 0; i < longitudes; i++) {
      const k = j * longitudes + i;
      const lon = -Math.PI + (i + 0.5) * dLon;
      grid.longitudeRad[k] = lon;
      grid.latitudeRad[k] = lat;
      grid.areaFraction[k] = area;
      grid.normalX[k] = Math.cos(lat) * Math.cos(lon);
      grid.normalY[k] = Math.cos(lat) * Math.sin(lon);
      grid.normalZ[k] = Math.sin(lat);
    }
  }
  return grid;
}

/** The rotating frame of the cells: the spin plus any wind. */
export interface CellFrame extends SpinGeometry {
  /** Rotation rate of the cell frame, Ω + ω_wind, rad s⁻¹ (the spin's own rate when there is no wind). */
  rateRadPerSecond: number;
}

/** Where the star is in the cell frame at E: writes [sin δ, cos δ, cos λ★, sin λ★] into `out`; returns λ★. */
export class StarInCellFrame {
  private readonly e: number;
  private readonly sqrtOneMinusE2: number;
  private readonly sinTheta: number;
  private readonly cosTheta: number;
  private readonly sinEq: number;
  private readonly cosEq: number;
  private readonly alphaAtPeriastron: number;
  private readonly framePerAnomaly: number;

  constructor(orbit: Orbit, frame: CellFrame) {
    this.e = orbit.eccentricity;
    this.sqrtOneMinusE2 = Math.sqrt(1 - this.e * this.e);
    this.sinTheta = Math.sin(frame.obliquityRad);
    this.cosTheta = Math.cos(frame.obliquityRad);
    this.sinEq = Math.sin(frame.equinoxTrueAnomalyRad);
    this.cosEq = Math.cos(frame.equinoxTrueAnomalyRad);
    this.alphaAtPeriastron = Math.atan2(this.cosTheta * -this.sinEq, this.cosEq);
    this.framePerAnomaly = frame.rateRadPerSecond / meanMotion(orbit);
  }

  /** Fills out = [sin δ, cos δ, cos λ★, sin λ★] at eccentric anomaly E (unwrapped, from periastron). */
  at(E: number, out: Float64Array): number {
    const e = this.e;
    const cosE = Math.cos(E);
    const sinE = Math.sin(E);
    const w = 1 - e * cosE;
    const cosNu = (cosE - e) / w;
    const sinNu = (this.sqrtOneMinusE2 * sinE) / w;
    // l = ν − ν_eq by the angle-difference formulas (no inverse trigonometry for ν)
    const sinL = sinNu * this.cosEq - cosNu * this.sinEq;
    const cosL = cosNu * this.cosEq + sinNu * this.sinEq;
    const sinDecl = this.sinTheta * sinL;
    const alpha = Math.atan2(this.cosTheta * sinL, cosL);
    const lambda = alpha - this.alphaAtPeriastron - this.framePerAnomaly * (E - e * sinE);
    out[0] = sinDecl;
    out[1] = Math.sqrt(Math.max(0, 1 - sinDecl * sinDecl));
    out[2] = Math.cos(lambda);
    out[3] = Math.sin(lambda);
    return lambda;
  }
}

/** What every cell of a map shares: the orbit, the star's output and the slab's properties (SI). */
export interface MapBody {
  orbit: Orbit;
  luminosityW: number;
  albedo: number;
  emissivity: number;
  heatCapacityJPerM2K: number;
  internalFluxWPerM2: number;
}

export interface MapSurface extends MapBody {
  grid: LonLatGrid;
  frame: CellFrame;
}

/**
 * The absorbed flux of every cell at once (one star position per call, shared by all cells): for
 * first guesses, budgets and maps of the forcing.
 */
export class MapIllumination {
  readonly cells: number;
  private readonly surface: MapSurface;
  private readonly star: StarInCellFrame;
  private readonly geometry = new Float64Array(4);
  private readonly absorbedAtA: number;

  constructor(surface: MapSurface) {
    this.surface = surface;
    this.cells = surface.grid.longitudes * surface.grid.latitudes;
    this.star = new StarInCellFrame(surface.orbit, surface.frame);
    this.absorbedAtA = (1 - surface.albedo) * stellarFlux(surface.luminosityW, surface.orbit.semiMajorAxisM);
  }

  /** Absorbed flux of every cell at E into `out`, W m⁻². */
  absorbedAt(E: number, out: Float64Array): void {
    const g = this.geometry;
    this.star.at(E, g);
    const w = 1 - this.surface.orbit.eccentricity * Math.cos(E);
    const flux = this.absorbedAtA / (w * w);
    const { normalX, normalY, normalZ } = this.surface.grid;
    const sx = g[1]! * g[2]!;
    const sy = g[1]! * g[3]!;
    const sz = g[0]!;
    for (let k = 0; k < this.cells; k++) {
      const mu = normalX[k]! * sx + normalY[k]! * sy + normalZ[k]! * sz;
      out[k] = mu > 0 ? flux * mu : 0;
    }
  }
}

/** One cell's absorbed flux as a function of E, for the engine's one-state periodic solve. */
export function cellForcing(surface: MapSurface, cell: number, meanAbsorbedWPerM2: number): Forcing {
  const star = new StarInCellFrame(surface.orbit, surface.frame);
  const g = new Float64Array(4);
  const e = surface.orbit.eccentricity;
  const absorbedAtA = (1 - surface.albedo) * stellarFlux(surface.luminosityW, surface.orbit.semiMajorAxisM);
  const nx = surface.grid.normalX[cell]!;
  const ny = surface.grid.normalY[cell]!;
  const nz = surface.grid.normalZ[cell]!;
  return {
    absorbedAt(E: number): number {
      star.at(E, g);
      const mu = nx * g[1]! * g[2]! + ny * g[1]! * g[3]! + nz * g[0]!;
      if (mu <= 0) return 0;
      const w = 1 - e * Math.cos(E);
      return (absorbedAtA / (w * w)) * mu;
    },
    meanAbsorbedWPerM2,
  };
}

/**
 * One cell's energy budget over a cycle: state [T, ∫F dt, ∫εσT⁴ dt] (K, J m⁻², J m⁻²), so the
 * absorbed and emitted energy are integrated to the solver's own accuracy beside T.
 */
export class CellBudget implements OdeSystem {
  readonly dimension = 3;
  private readonly emission: number;
  private readonly inverseC: number;
  private readonly secondsPerAnomaly: number;

  constructor(
    private readonly surface: MapSurface,
    private readonly forcing: Forcing,
  ) {
    this.emission = surface.emissivity * STEFAN_BOLTZMANN;
    this.inverseC = 1 / surface.heatCapacityJPerM2K;
    this.secondsPerAnomaly = 1 / meanMotion(surface.orbit);
  }

  derivative(E: number, y: ArrayLike<number>, out: Float64Array): void {
    const t = y[0]!;
    const dtdE = this.secondsPerAnomaly * (1 - this.surface.orbit.eccentricity * Math.cos(E));
    const gain = this.forcing.absorbedAt(E);
    const emit = this.emission * t * t * t * t;
    out[0] = dtdE * this.inverseC * (gain + this.surface.internalFluxWPerM2 - emit);
    out[1] = dtdE * gain;
    out[2] = dtdE * emit;
  }

  jacobian(E: number, y: ArrayLike<number>, out: Float64Array): void {
    const t = y[0]!;
    const dtdE = this.secondsPerAnomaly * (1 - this.surface.orbit.eccentricity * Math.cos(E));
    out.fill(0, 0, 9);
    out[0] = -4 * dtdE * this.inverseC * this.emission * t * t * t;
    out[6] = 4 * dtdE * this.emission * t * t * t;
  }
}
