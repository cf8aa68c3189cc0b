/**
 * Shaping results for charts (the browser viewer and the SVG export): columnar arrays as uPlot
 * takes them, x ascending, with x in days or as an orbital-phase angle; markers for periastron
 * passages and the temperature maximum; the temperature window. Pure: no DOM.
 */
import { ASTRONOMICAL_UNIT_M, DAY_S } from "../constants.js";

export type XAxis = "time" | "meanAnomaly" | "trueAnomaly";

/** What the shaping needs from a series (a `Series` or the `series` block of a result JSON). */
export interface SeriesLike {
  timeSeconds: ArrayLike<number>;
  meanAnomalyRad: ArrayLike<number>;
  trueAnomalyRad: ArrayLike<number>;
  distanceM: ArrayLike<number>;
  absorbedWPerM2: ArrayLike<number>;
  temperatureK: ArrayLike<number>;
  equilibriumK: ArrayLike<number>;
}

export interface ChartColumns {
  /** x values: days since the start, or the anomaly in degrees, unwrapped so that x ascends. */
  x: number[];
  xLabel: string;
  temperatureK: number[];
  equilibriumK: number[];
  distanceAu: number[];
  absorbedWPerM2: number[];
}

/** Unwraps an angle series (rad) to ascend continuously, in degrees from the first sample's revolution. */
function unwrapDegrees(values: ArrayLike<number>): number[] {
  const out: number[] = [];
  let offset = 0;
  let previous = NaN;
  for (let i = 0; i < values.length; i++) {
    let v = values[i]! + offset;
    if (i > 0 && v < previous - Math.PI) {
      offset += 2 * Math.PI;
      v += 2 * Math.PI;
    }
    out.push(v);
    previous = v;
  }
  const turns = Math.floor(out[0]! / (2 * Math.PI));
  return out.map((v) => ((v - 2 * Math.PI * turns) * 180) / Math.PI);
}

export function chartColumns(series: SeriesLike, axis: XAxis): ChartColumns {
  const x =
    axis === "time"
      ? Array.from(series.timeSeconds, (t) => t / DAY_S)
      : unwrapDegrees(axis === "meanAnomaly" ? series.meanAnomalyRad : series.trueAnomalyRad);
  const xLabel = axis === "time" ? "time since start (d)" : axis === "meanAnomaly" ? "mean anomaly (deg, 0 at periastron)" : "true anomaly (deg, 0 at periastron)";
  return {
    x,
    xLabel,
    temperatureK: Array.from(series.temperatureK),
    equilibriumK: Array.from(series.equilibriumK),
    distanceAu: Array.from(series.distanceM, (r) => r / ASTRONOMICAL_UNIT_M),
    absorbedWPerM2: Array.from(series.absorbedWPerM2),
  };
}

export interface Markers {
  /** x positions of periastron passages within the plotted span. */
  periastra: number[];
  /** x position and value of the temperature maximum. */
  maximum: { x: number; valueK: number } | null;
  /** The temperature window, when thresholds are set. */
  window: { lowK: number; highK: number } | null;
}

export interface SummaryLike {
  periodSeconds: number;
  timeOfMaxSeconds: number;
  lagSeconds: number | null;
  temperature: { maxK: number };
  timeInRange?: { lowK: number; highK: number };
}

/**
 * Markers in the chart's x units. Periastra are where the mean anomaly is a whole number of turns;
 * the maximum sits at its time (time axis) or at the anomaly of the nearest sample (angle axes).
 */
export function chartMarkers(series: SeriesLike, summary: SummaryLike, axis: XAxis, columns: ChartColumns): Markers {
  const periastra: number[] = [];
  const n = series.timeSeconds.length;
  if (n > 0 && summary.lagSeconds !== null) {
    const m = unwrapDegrees(series.meanAnomalyRad);
    const first = Math.ceil(m[0]! / 360 - 1e-9);
    for (let k = first; k * 360 <= m[n - 1]! + 1e-9; k++) {
      const mk = k * 360;
      // x at that mean anomaly: linear in time, so interpolate time; angles are 0 mod 360 there.
      if (axis === "time") {
        const span = m[n - 1]! - m[0]!;
        const t = series.timeSeconds[0]! + ((mk - m[0]!) / (span || 1)) * (series.timeSeconds[n - 1]! - series.timeSeconds[0]!);
        periastra.push(t / DAY_S);
      } else {
        periastra.push(mk - 360 * Math.floor(m[0]! / 360));
      }
    }
  }
  let maximum: Markers["maximum"] = null;
  if (n > 0) {
    const tMax = summary.timeOfMaxSeconds - series.timeSeconds[0]!;
    if (axis === "time") {
      maximum = { x: tMax / DAY_S, valueK: summary.temperature.maxK };
    } else {
      let best = 0;
      for (let i = 1; i < n; i++) if (Math.abs(series.timeSeconds[i]! - tMax) < Math.abs(series.timeSeconds[best]! - tMax)) best = i;
      maximum = { x: columns.x[best]!, valueK: summary.temperature.maxK };
    }
  }
  const window = summary.timeInRange ? { lowK: summary.timeInRange.lowK, highK: summary.timeInRange.highK } : null;
  return { periastra, maximum, window };
}

/**
 * Another run's values on this chart's time axis, for an overlay: the other run's cycle (its own
 * samples, first to last) is repeated to cover `times` and interpolated linearly. Equal axes give
 * the values back unchanged.
 */
export function periodicResample(times: ArrayLike<number>, otherTimes: ArrayLike<number>, otherValues: ArrayLike<number>): Float64Array {
  const n = otherTimes.length;
  const out = new Float64Array(times.length);
  if (n === 0) return out.fill(NaN);
  const t0 = otherTimes[0]!;
  const span = otherTimes[n - 1]! - t0;
  for (let i = 0; i < times.length; i++) {
    const t = times[i]!;
    if (i < n && t === otherTimes[i]) {
      out[i] = otherValues[i]!;
      continue;
    }
    let u = span > 0 ? (t - t0) % span : 0;
    if (u < 0) u += span;
    u += t0;
    // Largest j with otherTimes[j] <= u.
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (otherTimes[mid]! <= u) lo = mid;
      else hi = mid;
    }
    const ta = otherTimes[lo]!;
    const tb = otherTimes[hi]!;
    const w = tb > ta ? (u - ta) / (tb - ta) : 0;
    out[i] = otherValues[lo]! + w * (otherValues[hi]! - otherValues[lo]!);
  }
  return out;
}
