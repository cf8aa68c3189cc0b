/**
 * The seasonal insolation map: daily-mean top-of-atmosphere insolation (W m⁻², Berger 1978) on a
 * latitude × orbital-phase grid, for the scenario's orbit and spin axis. Orbital phase is the
 * fraction of the orbit since periastron (mean anomaly / 2π), so columns are equal steps in time.
 */
import type { ThermalCase } from "../model/thermalCase.js";
import { stellarFlux } from "../physics/flux.js";
import { dailyMeanInsolation, stellarDeclination } from "../physics/geometry.js";
import { eccentricAnomaly, trueAnomalyFromEccentric } from "../physics/kepler.js";
import { distanceFromEccentric } from "../physics/orbit.js";
import { requireNumber } from "../errors.js";

export interface InsolationMap {
  latitudesDeg: number[];
  phases: number[];
  /** rows[i][j]: latitude i, phase j, W m⁻². */
  rows: number[][];
}

export function insolationMap(thermal: ThermalCase, latitudeCount: number, phaseCount: number): InsolationMap {
  requireNumber("latitudes", latitudeCount, (n) => Number.isInteger(n) && n >= 2 && n <= 1801, "an integer from 2 to 1801");
  requireNumber("phases", phaseCount, (n) => Number.isInteger(n) && n >= 1 && n <= 100_000, "an integer from 1 to 100,000");
  const { orbit, star } = thermal;
  const obliquity = thermal.spin?.obliquityRad ?? 0;
  const equinox = thermal.spin?.equinoxTrueAnomalyRad ?? 0;
  const latitudesDeg = Array.from({ length: latitudeCount }, (_, i) => -90 + (180 * i) / (latitudeCount - 1));
  const phases = Array.from({ length: phaseCount }, (_, j) => j / phaseCount);
  const fluxAndDeclination = phases.map((phase) => {
    const E = eccentricAnomaly(2 * Math.PI * phase, orbit.eccentricity);
    const nu = trueAnomalyFromEccentric(E, orbit.eccentricity);
    return { s: stellarFlux(star.luminosityW, distanceFromEccentric(orbit, E)), declination: stellarDeclination(obliquity, nu, equinox) };
  });
  const rows = latitudesDeg.map((lat) => fluxAndDeclination.map(({ s, declination }) => dailyMeanInsolation(s, (lat * Math.PI) / 180, declination)));
  return { latitudesDeg, phases, rows };
}
