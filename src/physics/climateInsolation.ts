/**
 * Stellar flux reaching each latitude band of a fast rotator through the orbit: the daily-mean
 * insolation (Berger 1978, J. Atmos. Sci. 35, 2362) at the current distance and declination,
 * averaged over the band's area (composite two-point Gauss–Legendre in x = sin latitude, enough
 * points that a one-band globe receives S/4). Explicit in the eccentric anomaly E: no Kepler solve.
 */
import { stellarFlux } from "./flux.js";
import { dailyMeanInsolationOf } from "./geometry.js";
import type { Orbit } from "./orbit.js";
import type { BandGrid } from "./climateBands.js";

/** Quadrature points over the whole sphere at least (split evenly over the bands). */
const MIN_POINTS_ON_SPHERE = 256;

export interface ZonalInsolation {
  /** Top-of-atmosphere insolation of every band at E, W m⁻² (band means), written to `out`. */
  at(eccentricAnomalyRad: number, out: Float64Array): void;
}

export interface InsolationGeometry {
  luminosityW: number;
  orbit: Orbit;
  obliquityRad: number;
  /** True anomaly at the northern spring equinox, rad. */
  equinoxTrueAnomalyRad: number;
}

export function zonalInsolation(grid: BandGrid, geometry: InsolationGeometry): ZonalInsolation {
  const n = grid.count;
  const pieces = Math.max(1, Math.ceil(MIN_POINTS_ON_SPHERE / (2 * n)));
  const perBand = 2 * pieces;
  const sinLat = new Float64Array(n * perBand);
  const cosLat = new Float64Array(n * perBand);
  const g = 1 / Math.sqrt(3); // two-point Gauss–Legendre nodes ±1/√3, weights 1
  for (let j = 0; j < n; j++) {
    const width = (grid.edgeX[j + 1]! - grid.edgeX[j]!) / pieces;
    for (let p = 0; p < pieces; p++) {
      const mid = grid.edgeX[j]! + (p + 0.5) * width;
      for (let s = 0; s < 2; s++) {
        const x = mid + (s === 0 ? -g : g) * 0.5 * width;
        const k = j * perBand + 2 * p + s;
        sinLat[k] = x;
        cosLat[k] = Math.sqrt(Math.max(0, 1 - x * x));
      }
    }
  }
  const { orbit, obliquityRad, equinoxTrueAnomalyRad } = geometry;
  const e = orbit.eccentricity;
  const atA = stellarFlux(geometry.luminosityW, orbit.semiMajorAxisM);
  const trueAnomalyFactor = Math.sqrt((1 + e) / (1 - e));
  const sinObliquity = Math.sin(obliquityRad);
  return {
    at(E, out) {
      const w = 1 - e * Math.cos(E);
      const flux = atA / (w * w);
      const nu = 2 * Math.atan(trueAnomalyFactor * Math.tan(E / 2));
      const sinDecl = sinObliquity * Math.sin(nu - equinoxTrueAnomalyRad);
      const cosDecl = Math.sqrt(1 - sinDecl * sinDecl);
      for (let j = 0; j < n; j++) {
        let sum = 0;
        for (let k = j * perBand; k < (j + 1) * perBand; k++) sum += dailyMeanInsolationOf(flux, sinLat[k]!, cosLat[k]!, sinDecl, cosDecl);
        out[j] = sum / perBand;
      }
    },
  };
}
