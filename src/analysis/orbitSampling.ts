/**
 * Sampling an orbit in time for output series: eccentric anomalies at equal time steps (Kepler's
 * equation solved once per sample, never inside an ODE) and the orbital columns every series
 * carries beside its temperatures.
 */
import { stellarFlux } from "../physics/flux.js";
import { eccentricAnomaly, wrapPi } from "../physics/kepler.js";
import { meanMotion, timeAtEccentric, type Orbit } from "../physics/orbit.js";

const TWO_PI = 2 * Math.PI;

/** Halley steps allowed to the warm-started Kepler solve before it hands the sample to the bracketed solver. */
const MAX_WARM_STEPS = 12;

/**
 * `count` eccentric anomalies at equal steps in time over `spanOrbits` orbits from `startE`, both
 * ends included. Each sample's Kepler solve starts from the previous sample's E, with
 * Halley steps from there (two per sample at 1000 samples per orbit); a sample that does not converge
 * at once (e near 1 at periastron) goes to the bracketed solver of physics/kepler.ts.
 */
export function anomaliesUniformInTime(orbit: Orbit, startE: number, spanOrbits: number, count: number): Float64Array {
  const e = orbit.eccentricity;
  const spanSeconds = spanOrbits * orbit.periodSeconds;
  const n = meanMotion(orbit);
  const startM = startE - e * Math.sin(startE);
  const out = new Float64Array(count);
  let E = startE;
  for (let j = 0; j < count; j++) {
    // The last sample is the exact end, whatever rounding the Kepler solve would add.
    if (j === count - 1) {
      out[j] = startE + TWO_PI * spanOrbits;
      break;
    }
    const m = startM + n * ((spanSeconds * j) / (count - 1));
    // Solved relative to the nearest periastron, where E is small and f = E − e sin E − M keeps its
    // precision (near periastron of an e → 1 orbit f' = 1 − e cos E is tiny and amplifies rounding).
    const offset = TWO_PI * Math.round(m / TWO_PI);
    const mReduced = m - offset;
    let reduced = E - offset;
    let converged = false;
    for (let iteration = 0; iteration < MAX_WARM_STEPS; iteration++) {
      // Halley's step (cubic convergence; f'' = e sin E comes with f): a step of 1e-7 leaves ~1e-21.
      const sinE = Math.sin(reduced);
      const f = reduced - e * sinE - mReduced;
      const fPrime = 1 - e * Math.cos(reduced);
      const step = f / (fPrime - (0.5 * f * e * sinE) / fPrime);
      reduced -= step;
      if (!Number.isFinite(reduced)) break;
      if (Math.abs(step) <= 1e-7) {
        converged = true;
        break;
      }
    }
    E = converged ? offset + reduced : eccentricAnomaly(m, e);
    out[j] = E;
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

/** Time, anomalies, distance and stellar flux at the given eccentric anomalies (one sin/cos pair per sample). */
export function orbitColumns(orbit: Orbit, luminosityW: number, anomalies: Float64Array): OrbitColumns {
  const count = anomalies.length;
  const columns: OrbitColumns = {
    timeSeconds: new Float64Array(count),
    meanAnomalyRad: new Float64Array(count),
    trueAnomalyRad: new Float64Array(count),
    distanceM: new Float64Array(count),
    stellarFluxWPerM2: new Float64Array(count),
  };
  const e = orbit.eccentricity;
  const n = meanMotion(orbit);
  const rootOneMinusE2 = Math.sqrt((1 - e) * (1 + e));
  const t0 = count > 0 ? timeAtEccentric(orbit, anomalies[0]!) : 0;
  for (let j = 0; j < count; j++) {
    const E = anomalies[j]!;
    const sinE = Math.sin(E);
    const cosE = Math.cos(E);
    const m = E - e * sinE;
    const r = orbit.semiMajorAxisM * (1 - e * cosE);
    columns.timeSeconds[j] = (m - orbit.meanAnomalyAtStartRad) / n - t0;
    columns.meanAnomalyRad[j] = m;
    // ν on the revolution of E: tan ν = √(1 − e²) sin E / (cos E − e) (Murray & Dermott 1999, eqs. 2.43–2.44),
    // placed on E's revolution (ν and E share their half-plane).
    const reduced = wrapPi(E);
    let nu = Math.atan2(rootOneMinusE2 * sinE, cosE - e);
    if (reduced < -0.5 * Math.PI && nu > 0.5 * Math.PI) nu -= TWO_PI;
    else if (reduced > 0.5 * Math.PI && nu < -0.5 * Math.PI) nu += TWO_PI;
    columns.trueAnomalyRad[j] = nu + (E - reduced);
    columns.distanceM[j] = r;
    columns.stellarFluxWPerM2[j] = stellarFlux(luminosityW, r);
  }
  return columns;
}
