/**
 * What a distant observer receives from a planet whose surface temperature map is known through
 * the orbit: the planet-to-star flux ratio in a passband, the phase angle, the sub-observer and
 * substellar points, the disc's brightness temperature, and the transit and occultation.
 *
 * Each visible cell contributes its band radiance × its projected area: Lambertian emission,
 * F_p = Σ I(T_k) μ_k ΔA_k / D² with μ_k = n̂_k · ô > 0. The star is a uniform blackbody disc,
 * F★ = π R★² I(T★) / D² (no limb darkening). During the occultation the hidden share of the
 * planet's disc is taken as uniformly bright; during the transit the starlight blocked is the
 * overlap of two uniform discs. Reflected starlight is not included.
 */
import type { BandRadiance } from "../physics/planck.js";
import { coveredFraction, observerDirection, phaseAngle, skyOffset, type Observer } from "../physics/observer.js";
import { meanMotion, type Orbit } from "../physics/orbit.js";
import type { CellFrame, LonLatGrid } from "../physics/surfaceGrid.js";

const TWO_PI = 2 * Math.PI;

/** A temperature map through time and the geometry needed to observe it. */
export interface MapHistory {
  grid: LonLatGrid;
  orbit: Orbit;
  frame: CellFrame;
  /** Sample times, s from t = 0, and the matching unwrapped mean anomaly, true anomaly and distance. */
  timeSeconds: Float64Array;
  meanAnomalyRad: Float64Array;
  trueAnomalyRad: Float64Array;
  distanceM: Float64Array;
  /** temperatureK[s · cells + k]: cell k at sample s, K. */
  temperatureK: Float64Array;
  /** Substellar longitude in the cell frame at each sample, rad. */
  substellarLongitudeRad: Float64Array;
}

export interface Telescope {
  observer: Observer;
  band: BandRadiance;
  planetRadiusM: number;
  starRadiusM: number;
  starTemperatureK: number;
}

export interface PhaseCurveSeries {
  /** Planet / star flux in the passband (the planet partly hidden during the occultation). */
  fluxRatio: Float64Array;
  /** The same without the occultation: the planet's own emission seen from the observer. */
  planetOnlyFluxRatio: Float64Array;
  /** Share of the star's disc covered by the planet (transit), 0 outside transit. */
  transitCoveredFraction: Float64Array;
  phaseAngleRad: Float64Array;
  subObserverLongitudeRad: Float64Array;
  subObserverLatitudeRad: Float64Array;
  /** Brightness temperature of the visible disc in the passband, K. */
  brightnessTemperatureK: Float64Array;
}

/** Direction to the observer in the cell frame, as right ascension and declination (rad) in the body's equatorial frame. */
function observerInEquatorialFrame(frame: CellFrame, observer: Observer): { ra: number; dec: number } {
  const [ox, oy, oz] = observerDirection(observer);
  const beta = Math.asin(Math.max(-1, Math.min(1, oz)));
  // ecliptic longitude measured from the equinox direction, which lies at orbit-frame longitude ν_eq + π
  const l = Math.atan2(oy, ox) - frame.equinoxTrueAnomalyRad - Math.PI;
  const x = Math.cos(beta) * Math.cos(l);
  const y = Math.cos(beta) * Math.sin(l);
  const st = Math.sin(frame.obliquityRad);
  const ct = Math.cos(frame.obliquityRad);
  const yEq = y * ct - oz * st;
  const zEq = y * st + oz * ct;
  return { ra: Math.atan2(yEq, x), dec: Math.asin(Math.max(-1, Math.min(1, zEq))) };
}

/** Points of the temperature-uniform table `bandTable` builds for one map (cubic interpolation in T). */
const UNIFORM_TABLE_POINTS = 4096;

/**
 * A passband's radiance over one map's temperature range, W m⁻² sr⁻¹, on a grid uniform in T read
 * with cubic (Catmull–Rom) interpolation: no logarithm or exponential per cell. `values[j]` is the
 * band radiance at `startK + j / inversePerK`; one guard point each side of the map's range.
 */
export interface BandTable {
  band: BandRadiance;
  startK: number;
  inversePerK: number;
  values: Float64Array;
}

/**
 * The band table for a map history, built once per passband: the passband's ln-T table resampled
 * at 4,096 temperatures spanning the history's positive temperatures. A map evaluates the band
 * hundreds of thousands of times over that narrow range; the table costs 4,096 look-ups.
 */
export function bandTable(history: MapHistory, band: BandRadiance): BandTable {
  let known = rangeCache.get(history);
  if (!known) {
    positiveRange(history.temperatureK);
    known = { lo: range.lo, hi: range.hi };
    rangeCache.set(history, known);
  }
  let { lo, hi } = known;
  if (!(hi > lo)) {
    // one temperature (or none above 0 K): any small span around it interpolates exactly enough
    const middle = hi > 0 ? hi : 1;
    lo = 0.999 * middle;
    hi = 1.001 * middle;
  }
  const n = UNIFORM_TABLE_POINTS;
  const step = (hi - lo) / (n - 3);
  const startK = lo - step;
  const values = new Float64Array(n);
  for (let j = 0; j < n; j++) values[j] = band.at(Math.max(startK + j * step, 0));
  return { band, startK, inversePerK: 1 / step, values };
}

/** The smallest and largest positive value of t, into `range` (its own function, like the loops below). */
function positiveRange(t: Float64Array): void {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < t.length; i++) {
    const v = t[i]!;
    if (v > 0) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  range.lo = lo;
  range.hi = hi;
}
const range = { lo: 0, hi: 0 };
/** Each history's temperature range, scanned once (a new passband needs only the range, not another pass over every cell). */
const rangeCache = new WeakMap<MapHistory, { lo: number; hi: number }>();

/**
 * The Catmull–Rom cubic through `values` (uniform in T from `startK`, spacing 1/inversePerK) at
 * temperatureK, 0 at T ≤ 0; a temperature outside the table reads the end interval's cubic.
 */
function interpolate(values: Float64Array, startK: number, inversePerK: number, temperatureK: number): number {
  const u = (temperatureK - startK) * inversePerK;
  let j = u | 0; // u ≥ 1 inside the map's range; smaller or non-finite only where T ≤ 0
  const last = values.length - 3;
  if (!(j >= 1)) j = 1;
  else if (j > last) j = last;
  const s = u - j;
  const p0 = values[j - 1]!;
  const p1 = values[j]!;
  const p2 = values[j + 1]!;
  const p3 = values[j + 2]!;
  const y = p1 + 0.5 * s * (p2 - p0 + s * (2 * p0 - 5 * p1 + 4 * p2 - p3 + s * (3 * (p1 - p2) + p3 - p0)));
  return temperatureK > 0 ? y : 0;
}

/** The band radiance of one temperature read from a band table, W m⁻² sr⁻¹ (for checks; the phase curve inlines it). */
export function tableRadiance(table: BandTable, temperatureK: number): number {
  return interpolate(table.values, table.startK, table.inversePerK, temperatureK);
}

/** The last band table built for each map history (the viewer's sliders ask for the same band again and again). */
const tableCache = new WeakMap<MapHistory, BandTable>();

/** `bandTable`, remembered per history for its last passband. */
function cachedTable(history: MapHistory, band: BandRadiance): BandTable {
  const hit = tableCache.get(history);
  if (hit && hit.band === band) return hit;
  const table = bandTable(history, band);
  tableCache.set(history, table);
  return table;
}

/**
 * Σ I(T_k) μ_k ΔA_k over the cells facing the observer (μ_k > 0) at one sample, the band radiance
 * read from the table only for those cells; leaves Σ μ_k ΔA_k in `visible.projected`. Called once
 * per sample, so the JIT optimises it within the first phase curve.
 */
function visibleSum(
  temperatureK: Float64Array,
  base: number,
  values: Float64Array,
  startK: number,
  inversePerK: number,
  normalX: Float64Array,
  normalY: Float64Array,
  normalZ: Float64Array,
  areaFraction: Float64Array,
  ox: number,
  oy: number,
  oz: number,
): number {
  let sum = 0;
  let projected = 0;
  for (let k = 0; k < normalX.length; k++) {
    const mu = normalX[k]! * ox + normalY[k]! * oy + normalZ[k]! * oz;
    if (mu > 0) {
      const w = mu * areaFraction[k]!;
      sum += interpolate(values, startK, inversePerK, temperatureK[base + k]!) * w;
      projected += w;
    }
  }
  visible.projected = projected;
  return sum;
}
const visible = { projected: 0 };

/**
 * The phase curve for one observer and passband. `table` may be passed in (from `bandTable`); by
 * default the last one built for this history and this `BandRadiance` object is reused, so a new
 * inclination (same band object) builds no table.
 */
export function phaseCurve(history: MapHistory, telescope: Telescope, table = cachedTable(history, telescope.band)): PhaseCurveSeries {
  const { grid, orbit, frame } = history;
  const count = history.timeSeconds.length;
  const cells = grid.longitudes * grid.latitudes;
  const { observer, planetRadiusM: rp, starRadiusM: rs } = telescope;
  const starRadiance = telescope.band.at(telescope.starTemperatureK);
  const fluxScale = (4 * rp * rp) / (rs * rs * starRadiance);
  const { ra, dec } = observerInEquatorialFrame(frame, observer);
  const alphaAtPeriastron = Math.atan2(Math.cos(frame.obliquityRad) * Math.sin(-frame.equinoxTrueAnomalyRad), Math.cos(-frame.equinoxTrueAnomalyRad));
  const n = meanMotion(orbit);
  const sinDec = Math.sin(dec);
  const cosDec = Math.cos(dec);
  const out: PhaseCurveSeries = {
    fluxRatio: new Float64Array(count),
    planetOnlyFluxRatio: new Float64Array(count),
    transitCoveredFraction: new Float64Array(count),
    phaseAngleRad: new Float64Array(count),
    subObserverLongitudeRad: new Float64Array(count),
    subObserverLatitudeRad: new Float64Array(count).fill(dec),
    brightnessTemperatureK: new Float64Array(count),
  };
  const { normalX, normalY, normalZ, areaFraction } = grid;
  const { values, startK, inversePerK } = table;
  const temperatureK = history.temperatureK;
  let guessK: number | undefined;
  for (let s = 0; s < count; s++) {
    const sinceperiastron = history.meanAnomalyRad[s]! / n;
    const lon = ra - alphaAtPeriastron - frame.rateRadPerSecond * sinceperiastron;
    const ox = cosDec * Math.cos(lon);
    const oy = cosDec * Math.sin(lon);
    const sum = visibleSum(temperatureK, s * cells, values, startK, inversePerK, normalX, normalY, normalZ, areaFraction, ox, oy, sinDec);
    const projected = visible.projected;
    const own = sum * fluxScale;
    const { separationM, towardObserverM } = skyOffset(observer, history.trueAnomalyRad[s]!, history.distanceM[s]!);
    const hidden = towardObserverM < 0 ? coveredFraction(rs, rp, separationM) : 0;
    out.planetOnlyFluxRatio[s] = own;
    out.fluxRatio[s] = own * (1 - hidden);
    out.transitCoveredFraction[s] = towardObserverM > 0 ? coveredFraction(rp, rs, separationM) : 0;
    out.phaseAngleRad[s] = phaseAngle(observer, history.trueAnomalyRad[s]!);
    out.subObserverLongitudeRad[s] = lon - TWO_PI * Math.round(lon / TWO_PI);
    // disc-averaged intensity: Σ I μ ΔA over the projected disc area Σ μ ΔA (= 1/4 of the sphere's area)
    const brightness = projected > 0 ? telescope.band.brightnessTemperature(sum / projected, guessK) : 0;
    out.brightnessTemperatureK[s] = brightness;
    if (brightness > 0) guessK = brightness;
  }
  return out;
}

export interface PhaseCurveSummary {
  maxFluxRatio: number;
  minFluxRatio: number;
  timeOfMaxSeconds: number;
  /** Time of the maximum after the periastron passage that precedes it, s. */
  timeOfMaxAfterPeriastronSeconds: number;
}

/** Extremes of the planet's own emission (outside the occultation), the maximum's time refined by a parabola through three samples. */
export function phaseCurveSummary(history: MapHistory, series: PhaseCurveSeries): PhaseCurveSummary {
  const f = series.planetOnlyFluxRatio;
  const t = history.timeSeconds;
  let best = 0;
  let min = Infinity;
  for (let s = 0; s < f.length; s++) {
    if (f[s]! > f[best]!) best = s;
    min = Math.min(min, f[s]!);
  }
  let tMax = t[best]!;
  let fMax = f[best]!;
  if (best > 0 && best < f.length - 1) {
    const a = f[best - 1]!;
    const b = f[best]!;
    const c = f[best + 1]!;
    const denominator = a - 2 * b + c;
    if (denominator < 0) {
      const shift = (0.5 * (a - c)) / denominator;
      const h = 0.5 * (t[best + 1]! - t[best - 1]!);
      tMax = t[best]! + shift * h;
      fMax = b - 0.25 * (a - c) * shift;
    }
  }
  const period = history.orbit.periodSeconds;
  const meanAnomalyAtMax = history.orbit.meanAnomalyAtStartRad + meanMotion(history.orbit) * tMax;
  const sincePeriastron = ((meanAnomalyAtMax % TWO_PI) + TWO_PI) % TWO_PI;
  return {
    maxFluxRatio: fMax,
    minFluxRatio: min,
    timeOfMaxSeconds: tMax,
    timeOfMaxAfterPeriastronSeconds: (sincePeriastron / TWO_PI) * period,
  };
}
