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

/** Points of the temperature-uniform table `cellRadiance` builds for one map (cubic interpolation in T). */
const UNIFORM_TABLE_POINTS = 4096;

/**
 * Band radiance of every cell at every sample, W m⁻² sr⁻¹ (computed once per passband). A map
 * evaluates the band hundreds of thousands of times over a narrow range of temperatures, so the
 * passband's ln-T table is resampled once on a grid uniform in T over that range and read with
 * cubic (Catmull–Rom) interpolation: no logarithm or exponential per cell.
 */
export function cellRadiance(history: MapHistory, band: BandRadiance): Float64Array {
  const t = history.temperatureK;
  const out = new Float64Array(t.length);
  positiveRange(t);
  const { lo, hi } = range;
  if (!(hi > lo)) {
    for (let i = 0; i < t.length; i++) out[i] = band.at(t[i]!);
    return out;
  }
  const n = UNIFORM_TABLE_POINTS;
  const step = (hi - lo) / (n - 3);
  const start = lo - step; // one guard point each side for the cubic's outer neighbours
  const table = new Float64Array(n);
  for (let j = 0; j < n; j++) table[j] = band.at(Math.max(start + j * step, 0));
  interpolateUniform(t, table, start, 1 / step, out);
  return out;
}

/** The smallest and largest positive value of t, into `range` (its own function, like the loop below). */
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

/**
 * out[i] = the Catmull–Rom cubic through `table` (uniform in T from `start`, spacing 1/inverse) at
 * t[i], 0 where t[i] ≤ 0. Its own function so that the JIT optimises this loop on its first call.
 */
function interpolateUniform(t: Float64Array, table: Float64Array, start: number, inverse: number, out: Float64Array): void {
  const last = table.length - 3;
  for (let i = 0; i < t.length; i++) {
    const v = t[i]!;
    const u = (v - start) * inverse;
    let j = u | 0; // u ≥ 1 for every v ≥ lo; smaller or non-finite only where v ≤ 0
    if (!(j >= 1)) j = 1;
    else if (j > last) j = last;
    const s = u - j;
    const p0 = table[j - 1]!;
    const p1 = table[j]!;
    const p2 = table[j + 1]!;
    const p3 = table[j + 2]!;
    const y = p1 + 0.5 * s * (p2 - p0 + s * (2 * p0 - 5 * p1 + 4 * p2 - p3 + s * (3 * (p1 - p2) + p3 - p0)));
    out[i] = v > 0 ? y : 0;
  }
}

/** The last band radiances computed for each map history (the viewer's sliders ask for the same band again and again). */
const radianceCache = new WeakMap<MapHistory, { band: BandRadiance; radiance: Float64Array }>();

/** `cellRadiance`, remembered per history for its last passband. */
function cachedRadiance(history: MapHistory, band: BandRadiance): Float64Array {
  const hit = radianceCache.get(history);
  if (hit && hit.band === band) return hit.radiance;
  const radiance = cellRadiance(history, band);
  radianceCache.set(history, { band, radiance });
  return radiance;
}

/** Σ radiance[base + k] μ_k ΔA_k over the cells facing the observer (μ_k > 0); leaves Σ μ_k ΔA_k in `visible.projected`. */
function visibleSum(
  radiance: Float64Array,
  base: number,
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
      sum += radiance[base + k]! * w;
      projected += w;
    }
  }
  visible.projected = projected;
  return sum;
}
const visible = { projected: 0 };

/**
 * The phase curve for one observer and passband. `radiance` may be passed in (from
 * `cellRadiance`); by default the last one computed for this history and this `BandRadiance` object
 * is reused, so a new inclination (same band object) recomputes no band radiance.
 */
export function phaseCurve(history: MapHistory, telescope: Telescope, radiance = cachedRadiance(history, telescope.band)): PhaseCurveSeries {
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
  let guessK: number | undefined;
  for (let s = 0; s < count; s++) {
    const sinceperiastron = history.meanAnomalyRad[s]! / n;
    const lon = ra - alphaAtPeriastron - frame.rateRadPerSecond * sinceperiastron;
    const ox = cosDec * Math.cos(lon);
    const oy = cosDec * Math.sin(lon);
    const sum = visibleSum(radiance, s * cells, normalX, normalY, normalZ, areaFraction, ox, oy, sinDec);
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
