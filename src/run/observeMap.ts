/**
 * The map regime from a thermal case to what a telescope sees: the map solved through the orbit,
 * then, when an observer is given, the phase curve, its extremes, and the transit and occultation.
 */
import { phaseCurve, phaseCurveSummary, type PhaseCurveSeries, type PhaseCurveSummary, type Telescope } from "../analysis/phaseCurve.js";
import { CalorbitError, type FieldProblem } from "../errors.js";
import { slabHeatCapacity } from "../model/heatStore.js";
import type { ThermalCase } from "../model/thermalCase.js";
import { conjunctionTimes, coveredFraction, skyOffset } from "../physics/observer.js";
import { eccentricAnomaly, trueAnomalyFromEccentric } from "../physics/kepler.js";
import { meanAnomalyAt } from "../physics/orbit.js";
import { BandRadiance, type Passband } from "../physics/planck.js";
import { simulateMap, type MapOptions, type MapSimulation } from "./simulateMap.js";

export interface Conjunction {
  /** Time of the conjunction in the first orbit after t = 0, s. */
  timeSeconds: number;
  /** Whether the discs overlap at conjunction (a transit or an occultation happens at all). */
  occurs: boolean;
  /** Transit: the share of starlight blocked at conjunction; occultation: the planet's flux ratio that disappears. */
  depth: number;
}

export interface ObservedMap {
  sim: MapSimulation;
  telescope: Telescope | null;
  curve: PhaseCurveSeries | null;
  phase: PhaseCurveSummary | null;
  transit: Conjunction | null;
  occultation: Conjunction | null;
}

/** The telescope of a case whose passband has been read (a file passband must be replaced by its table first). */
export function telescopeOf(thermal: ThermalCase): Telescope | null {
  const observer = thermal.observer;
  if (!observer) return null;
  const problems: FieldProblem[] = [];
  if (thermal.bodyRadiusM === undefined) problems.push({ path: "body.radius", given: "missing", allowed: "the planet's radius (e.g. 1.1 Rjup), needed for the flux ratio" });
  if (thermal.star.radiusM === undefined) problems.push({ path: "star.radius", given: "missing", allowed: "the star's radius, with star.temperature, needed for the star's flux in the passband" });
  if (thermal.star.effectiveTemperatureK === undefined) problems.push({ path: "star.temperature", given: "missing", allowed: "the star's effective temperature (its flux is a blackbody's)" });
  if (observer.passband.kind === "file") problems.push({ path: "observer.passband.file", given: observer.passband.path, allowed: "a response file read before the run (calorbit run reads it)" });
  if (problems.length > 0) throw new CalorbitError("SCENARIO_INVALID", "the observer needs more of the scenario", problems);
  return {
    observer,
    band: new BandRadiance(observer.passband as Passband),
    planetRadiusM: thermal.bodyRadiusM!,
    starRadiusM: thermal.star.radiusM!,
    starTemperatureK: thermal.star.effectiveTemperatureK!,
  };
}

export function observeMap(thermal: ThermalCase, options: MapOptions = {}): ObservedMap {
  const telescope = telescopeOf(thermal);
  const spin = thermal.spin ?? { rateRadPerSecond: (2 * Math.PI) / thermal.orbit.periodSeconds, obliquityRad: 0, equinoxTrueAnomalyRad: 0, ratio: { spin: 1, orbit: 1 } };
  const grid = thermal.map ?? { longitudes: 36, latitudes: 18, windRadPerSecond: 0 };
  const sim = simulateMap(
    {
      orbit: thermal.orbit,
      luminosityW: thermal.star.luminosityW,
      albedo: thermal.surface.albedo,
      emissivity: thermal.surface.emissivity,
      heatCapacityJPerM2K: slabHeatCapacity(thermal),
      internalFluxWPerM2: thermal.surface.internalFluxWPerM2,
      spin,
      windRadPerSecond: grid.windRadPerSecond,
      longitudes: grid.longitudes,
      latitudes: grid.latitudes,
    },
    options,
  );
  if (!telescope) return { sim, telescope: null, curve: null, phase: null, transit: null, occultation: null };
  const curve = phaseCurve(sim.history, telescope);
  const phase = phaseCurveSummary(sim.history, curve);
  const { orbit } = thermal;
  const times = conjunctionTimes(orbit, telescope.observer);
  const at = (t: number): { separationM: number; towardObserverM: number } => {
    const E = eccentricAnomaly(meanAnomalyAt(orbit, t), orbit.eccentricity);
    const f = trueAnomalyFromEccentric(E, orbit.eccentricity);
    return skyOffset(telescope.observer, f, orbit.semiMajorAxisM * (1 - orbit.eccentricity * Math.cos(E)));
  };
  const rs = telescope.starRadiusM;
  const rp = telescope.planetRadiusM;
  const transitSky = at(times.transitSeconds);
  const occultationSky = at(times.occultationSeconds);
  // The planet's own flux ratio at the occultation, interpolated from the series (periodic in the cycle).
  const own = interpolatePeriodic(sim.history.timeSeconds, curve.planetOnlyFluxRatio, times.occultationSeconds, orbit.periodSeconds);
  return {
    sim,
    telescope,
    curve,
    phase,
    transit: {
      timeSeconds: times.transitSeconds,
      occurs: transitSky.separationM < rs + rp,
      depth: coveredFraction(rp, rs, transitSky.separationM),
    },
    occultation: {
      timeSeconds: times.occultationSeconds,
      occurs: occultationSky.separationM < rs + rp,
      depth: own * coveredFraction(rs, rp, occultationSky.separationM),
    },
  };
}

/** Linear interpolation of a sampled series at time t, folded into the sampled span by whole orbits. */
function interpolatePeriodic(times: Float64Array, values: Float64Array, t: number, periodSeconds: number): number {
  const first = times[0]!;
  const last = times[times.length - 1]!;
  let x = t;
  while (x < first) x += periodSeconds;
  while (x > last) x -= periodSeconds;
  if (x < first) x = first;
  let lo = 0;
  let hi = times.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (times[mid]! <= x) lo = mid;
    else hi = mid;
  }
  const span = times[hi]! - times[lo]!;
  const w = span > 0 ? (x - times[lo]!) / span : 0;
  return values[lo]! * (1 - w) + values[hi]! * w;
}
