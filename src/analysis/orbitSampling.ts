/**
 * Sampling an orbit in time for output series: eccentric anomalies at equal time steps (Kepler's
 * equation solved once per sample, never inside an ODE) and the orbital columns every series
 * carries beside its temperatures.
 */
import { stellarFlux } from "../physics/flux.js";
import { eccentricAnomaly, trueAnomalyFromEccentric } from "../physics/kepler.js";
import { distanceFromEccentric, meanMotion, timeAtEccentric, type Orbit } from "../physics/orbit.js";

const TWO_PI = 2 * Math.PI;

/** `count` eccentric anomalies at equal steps in time over `spanOrbits` orbits from `startE`, both ends included. */
export function anomaliesUniformInTime(orbit: Orbit, startE: number, spanOrbits: number, count: number): Float64Array {
  const spanSeconds = spanOrbits * orbit.periodSeconds;
  const startM = startE - orbit.eccentricity * Math.sin(startE);
  const out = new Float64Array(count);
  for (let j = 0; j < count; j++) {
    const t = (spanSeconds * j) / (count - 1);
    // The last sample is the exact end, whatever rounding the Kepler solve would add.
    out[j] = j === count - 1 ? startE + TWO_PI * spanOrbits : eccentricAnomaly(startM + meanMotion(orbit) * t, orbit.eccentricity);
  }
  return out;
}

export interface OrbitColumns {
  /** Time since the first sample, s. */
  timeSeconds: Float64Array;
  meanAnomalyRad: Float64Array;
  trueAnomalyRad: Float64Array;
  distanceM: Float64Array;
  stellarFluxWPerM2: Float64Array;
}

/** Time, anomalies, distance and stellar flux at the given eccentric anomalies. */
export function orbitColumns(orbit: Orbit, luminosityW: number, anomalies: Float64Array): OrbitColumns {
  const count = anomalies.length;
  const columns: OrbitColumns = {
    timeSeconds: new Float64Array(count),
    meanAnomalyRad: new Float64Array(count),
    trueAnomalyRad: new Float64Array(count),
    distanceM: new Float64Array(count),
    stellarFluxWPerM2: new Float64Array(count),
  };
  const t0 = count > 0 ? timeAtEccentric(orbit, anomalies[0]!) : 0;
  for (let j = 0; j < count; j++) {
    const E = anomalies[j]!;
    const r = distanceFromEccentric(orbit, E);
    columns.timeSeconds[j] = timeAtEccentric(orbit, E) - t0;
    columns.meanAnomalyRad[j] = E - orbit.eccentricity * Math.sin(E);
    columns.trueAnomalyRad[j] = trueAnomalyFromEccentric(E, orbit.eccentricity);
    columns.distanceM[j] = r;
    columns.stellarFluxWPerM2[j] = stellarFlux(luminosityW, r);
  }
  return columns;
}
