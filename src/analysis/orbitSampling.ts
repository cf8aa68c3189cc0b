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

/** sin E and cos E at each sample of an anomaly grid (filled by `anomaliesUniformInTime`, read by `orbitColumns`). */
export interface AnomalyTrig {
  sinE: Float64Array;
  cosE: Float64Array;
}

/**
 * `count` eccentric anomalies at equal steps in time over `spanOrbits` orbits from `startE`, both
 * ends included; with `trig`, their sines and cosines too (so that the orbit columns need no more).
 * Each sample's Kepler solve starts from a second-order prediction off the previous sample
 * (dE/dM = 1/(1 − e cos E), d²E/dM² = −e sin E/(1 − e cos E)³), so one Halley step usually
 * lands within 1e-17 rad; a sample whose step is too large for that gets more steps, and one that
 * does not converge (e near 1 at periastron) goes to the bracketed solver of physics/kepler.ts.
 */
export function anomaliesUniformInTime(orbit: Orbit, startE: number, spanOrbits: number, count: number, trig?: AnomalyTrig): Float64Array {
  const e = orbit.eccentricity;
  const spanSeconds = spanOrbits * orbit.periodSeconds;
  const n = meanMotion(orbit);
  const startM = startE - e * Math.sin(startE);
  const out = new Float64Array(count);
  let E = startE;
  let sinE = Math.sin(startE);
  let cosE = Math.cos(startE);
  let previousM = startM;
  for (let j = 0; j < count; j++) {
    // The last sample is the exact end, whatever rounding the Kepler solve would add.
    if (j === count - 1) {
      E = startE + TWO_PI * spanOrbits;
      out[j] = E;
      if (trig) {
        trig.sinE[j] = Math.sin(E);
        trig.cosE[j] = Math.cos(E);
      }
      break;
    }
    const m = startM + n * ((spanSeconds * j) / (count - 1));
    // Solved relative to the nearest periastron, where E is small and f = E − e sin E − M keeps its
    // precision (near periastron of an e → 1 orbit f' = 1 − e cos E is tiny and amplifies rounding).
    const offset = TWO_PI * Math.round(m / TWO_PI);
    const mReduced = m - offset;
    const dM = m - previousM;
    const w0 = 1 - e * cosE;
    let reduced = E - offset + dM / w0 - (0.5 * dM * dM * e * sinE) / (w0 * w0 * w0);
    let converged = false;
    let s = 0;
    let c = 1;
    let step = 0;
    for (let iteration = 0; iteration < MAX_WARM_STEPS; iteration++) {
      // Halley's step (cubic convergence; f'' = e sin E comes with f).
      s = Math.sin(reduced);
      c = Math.cos(reduced);
      const f = reduced - e * s - mReduced;
      const fPrime = 1 - e * c;
      step = f / (fPrime - (0.5 * f * e * s) / fPrime);
      reduced -= step;
      if (!Number.isFinite(reduced)) break;
      // The error left is about K·step³ with K ≤ (e/f')(1 + e/f') (Halley's error constant).
      const k = e / fPrime;
      const cube = step * step * step;
      if (Math.abs(cube) * k * (1 + k) <= 1e-17 && Math.abs(step) <= 1e-5) {
        converged = true;
        break;
      }
    }
    if (converged) {
      E = offset + reduced;
      // sin and cos at the corrected E from those before the last step (Taylor to step³: below 2e-16).
      const step2 = 0.5 * step * step;
      sinE = s * (1 - step2) - c * step;
      cosE = c * (1 - step2) + s * step;
    } else {
      E = eccentricAnomaly(m, e);
      sinE = Math.sin(E);
      cosE = Math.cos(E);
    }
    previousM = m;
    out[j] = E;
    if (trig) {
      trig.sinE[j] = sinE;
      trig.cosE[j] = cosE;
    }
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

/**
 * Time, anomalies, distance and stellar flux at the given eccentric anomalies (one sin/cos pair per
 * sample, or none when `trig` holds them already).
 */
export function orbitColumns(orbit: Orbit, luminosityW: number, anomalies: Float64Array, trig?: AnomalyTrig): OrbitColumns {
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
    const sinE = trig ? trig.sinE[j]! : Math.sin(E);
    const cosE = trig ? trig.cosE[j]! : Math.cos(E);
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
