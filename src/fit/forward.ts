/**
 * The forward model of a fit: free-parameter values → the model's prediction at each observed
 * time. The base scenario document gets the values at their keys (as a sweep case does), is
 * validated and simulated; the chosen output series of the converged cycle is interpolated at
 * the data's times plus the time offset, wrapped into the cycle (the periodic steady state repeats).
 */
import { MIN_COLUMN_TOLERANCE } from "../defaults.js";
import { CalorbitError } from "../errors.js";
import { resolveScenario } from "../scenario/resolve.js";
import { simulate } from "../run/simulate.js";
import { observeMap } from "../run/observeMap.js";
import { simulateZonal, zonalCaseOf, zonalSeries } from "../run/zonal.js";
import { setPath } from "../sweep/spec.js";
import type { ThermalCase } from "../model/thermalCase.js";
import { REGIME_TABLE } from "../model/regimes.js";
import type { ObservedQuantity, Observations } from "./observations.js";
import { offsetSeconds, scenarioValue, TIME_OFFSET_KEY, type FreeParameter } from "./parameters.js";

/**
 * Which series of the model is compared with the data:
 *  - "surface": the surface temperature (state 0 of a lumped case, a column's surface);
 *  - a state name ("day", "night" for the daynight regime);
 *  - "depth=<length>": a conduction column's temperature at that depth (e.g. "depth=0.3 m");
 *  - "fluxRatio": the map regime's planet-to-star flux ratio in the observer's passband
 *    (dimensionless; the planet's own emission, partly hidden during the occultation; no transit);
 *  - "latitude=<angle>": the zonal climate's band containing that latitude ("surface" there is the
 *    area-weighted global mean).
 * The data's quantity (a temperature or a flux ratio) is checked against the output's.
 */
export interface ModelOutput {
  spec: string;
  kind: "surface" | "state" | "depth" | "fluxRatio" | "latitude";
  state?: string;
  depthM?: number;
  latitudeRad?: number;
  quantity: ObservedQuantity;
}

export function parseModelOutput(spec: string, depthToMetres: (text: string) => number | null, latitudeToRadians: (text: string) => number | null = () => null): ModelOutput {
  const s = spec.trim();
  const latitude = /^latitude\s*=\s*(.+)$/.exec(s);
  if (latitude) {
    const rad = latitudeToRadians(latitude[1]!);
    if (rad === null || !(Math.abs(rad) <= Math.PI / 2 + 1e-12)) {
      throw new CalorbitError("USAGE", `--model-output: given ${JSON.stringify(spec)}`, [
        { path: "--model-output", given: JSON.stringify(spec), allowed: 'latitude=<angle from −90° to 90°>, e.g. "latitude=45 deg" (bare numbers are degrees)' },
      ]);
    }
    return { spec: s, kind: "latitude", latitudeRad: rad, quantity: "temperature" };
  }
  if (s === "surface") return { spec: s, kind: "surface", quantity: "temperature" };
  if (s === FLUX_RATIO_OUTPUT) return { spec: s, kind: "fluxRatio", quantity: "fluxRatio" };
  const depth = /^depth\s*=\s*(.+)$/.exec(s);
  if (depth) {
    const m = depthToMetres(depth[1]!);
    if (m === null || !(m >= 0)) {
      throw new CalorbitError("USAGE", `--model-output: given ${JSON.stringify(spec)}`, [
        { path: "--model-output", given: JSON.stringify(spec), allowed: 'depth=<length ≥ 0>, e.g. "depth=0.3 m"' },
      ]);
    }
    return { spec: s, kind: "depth", depthM: m, quantity: "temperature" };
  }
  if (/^[a-z]+$/.test(s)) return { spec: s, kind: "state", state: s, quantity: "temperature" };
  throw new CalorbitError("USAGE", `--model-output: given ${JSON.stringify(spec)}`, [
    { path: "--model-output", given: JSON.stringify(spec), allowed: 'surface, day, night (daynight regime), depth=<length> (a column), e.g. "depth=0.3 m", fluxRatio (map regime) or latitude=<angle> (zonal)' },
  ]);
}

/** The --model-output of a map's phase curve. */
export const FLUX_RATIO_OUTPUT = "fluxRatio";

/** The output compared when --model-output is not given: the surface for temperatures, the flux ratio for flux-ratio data. */
export function defaultModelOutput(quantity: ObservedQuantity): string {
  return quantity === "fluxRatio" ? FLUX_RATIO_OUTPUT : "surface";
}

export interface ForwardSettings {
  /** The scenario document as parsed (before validation). */
  scenario: Record<string, unknown>;
  parameters: readonly FreeParameter[];
  output: ModelOutput;
  /** Relative tolerance of the simulation. */
  relativeTolerance: number;
  /** Points of the simulated cycle the data are interpolated from. */
  samples: number;
}

/** A model series over one converged cycle, uniform in time. */
export interface ModelCurve {
  timeSeconds: Float64Array;
  value: Float64Array;
  /** The series repeats (a periodic steady state): times wrap into it. */
  periodic: boolean;
}

/** The scenario document with the parameter values set (time offset excluded). */
export function caseDocument(settings: ForwardSettings, values: ArrayLike<number>): Record<string, unknown> {
  const doc = structuredClone(settings.scenario);
  settings.parameters.forEach((p, i) => {
    if (p.key !== TIME_OFFSET_KEY) setPath(doc, p.key, scenarioValue(p, values[i]!));
  });
  if (settings.output.kind === "depth") setPath(doc, "body.column.outputDepths", [settings.output.depthM!] as unknown as number);
  return doc;
}

/** Resolves the case for a set of values (throws the scenario's CalorbitError for an invalid one). */
export function caseFor(settings: ForwardSettings, values: ArrayLike<number>): ThermalCase {
  return resolveScenario(caseDocument(settings, values)).thermal;
}

/** Simulates one case and returns the compared series over its cycle. */
export function modelCurve(settings: ForwardSettings, values: ArrayLike<number>): ModelCurve {
  const thermal = caseFor(settings, values);
  const out = settings.output;
  checkModelOutput(out, thermal);
  const pipeline = REGIME_TABLE[thermal.regime].pipeline;
  if (pipeline === "map") return mapCurve(settings, thermal);
  if (pipeline === "zonal") return zonalCurve(settings, thermal);
  if (out.kind === "latitude") throw outputMismatch(out, "latitude=<angle> only for the zonal climate (regime: zonal)");
  if (thermal.column) {
    const col = simulate(thermal, { relativeTolerance: Math.max(settings.relativeTolerance, MIN_COLUMN_TOLERANCE), samples: settings.samples });
    if (out.kind === "state") throw outputMismatch(out, "surface or depth=<length> for a conduction column");
    const value = out.kind === "depth" ? col.series.depths![0]!.temperatureK : col.series.temperatureK;
    return { timeSeconds: col.series.timeSeconds, value, periodic: true };
  }
  if (out.kind === "depth") throw outputMismatch(out, "a depth only with a conduction column (body.column)");
  const sim = simulate(thermal, { relativeTolerance: settings.relativeTolerance, samples: settings.samples });
  let value = sim.series.temperatureK;
  if (out.kind === "state") {
    const state = sim.series.states.find((s) => s.name === out.state);
    if (!state) throw outputMismatch(out, `one of surface, ${sim.series.states.map((s) => s.name).join(", ")} for this regime`);
    value = state.temperatureK;
  }
  return { timeSeconds: sim.series.timeSeconds, value, periodic: sim.solver.mode === "periodic" };
}

/**
 * Refuses a model output the scenario cannot give, before any fit runs (the fit treats a case that
 * fails to solve as a wall, so these must be said first): a zonal climate from two starts, a map compared with
 * anything but its flux ratio, a flux ratio from another regime, a map without its observer or
 * without a repeating cycle. (A map's missing radii are the scenario's to say: `telescopeOf`.)
 */
export function checkModelOutput(out: ModelOutput, thermal: ThermalCase): void {
  if (REGIME_TABLE[thermal.regime].pipeline === "zonal") {
    if (out.kind !== "surface" && out.kind !== "latitude") throw outputMismatch(out, "surface (the global mean) or latitude=<angle> (a band) for the zonal climate");
    if (thermal.climate?.start === "both") {
      throw new CalorbitError("USAGE", "a fit needs one climate", [
        { path: "climate.start", given: "both", allowed: "warm or cold: the fit follows the climate reached from that start (two starts can reach two climates)" },
      ]);
    }
    return;
  }
  if (REGIME_TABLE[thermal.regime].pipeline !== "map") {
    if (out.kind === "fluxRatio") throw outputMismatch(out, `surface, day, night or depth=<length>: fluxRatio needs regime: map with an observer (this scenario's regime is ${thermal.regime})`);
    return;
  }
  if (out.kind !== "fluxRatio") {
    throw new CalorbitError("USAGE", "a map is fitted through its flux ratio", [
      {
        path: "--data",
        given: "a temperature column for a map scenario",
        allowed: "a flux_ratio column (the dimensionless planet-to-star flux in the observer's passband, not a temperature) with --model-output fluxRatio",
      },
    ]);
  }
  if (!thermal.observer) {
    throw new CalorbitError("USAGE", "a flux-ratio fit needs an observer", [
      { path: "observer", given: "missing", allowed: "the observer's inclination, argumentOfPeriastron and passband (the flux ratio is what it receives)" },
    ]);
  }
  const ratio = thermal.spin?.ratio;
  if (thermal.spin && (!ratio || ratio.orbit > MAP_MAX_CYCLE_ORBITS)) {
    throw new CalorbitError("USAGE", "a map without a repeating cycle", [
      {
        path: "spin",
        given: ratio ? `${ratio.spin}:${ratio.orbit}` : "a rotation rate",
        allowed: `a spin.orbitRatio p:q with q ≤ ${MAP_MAX_CYCLE_ORBITS} (e.g. "1:1", "3:2"): the data are placed on the repeating cycle of the phase curve`,
      },
    ]);
  }
}

/**
 * The zonal climate through its periodic orbit (from the one start the scenario names): the global
 * (area-weighted) mean, or the band that contains the asked latitude.
 */
function zonalCurve(settings: ForwardSettings, thermal: ThermalCase): ModelCurve {
  const out = settings.output;
  const input = zonalCaseOf(thermal);
  const sim = simulateZonal(input);
  const series = zonalSeries(input, sim, sim.climates[0]!, settings.samples);
  const { grid } = sim;
  const n = grid.count;
  const count = series.timeSeconds.length;
  const value = new Float64Array(count);
  if (out.kind === "latitude") {
    const x = Math.sin(out.latitudeRad!);
    let band = 0;
    while (band < n - 1 && x > grid.edgeX[band + 1]!) band++;
    for (let s = 0; s < count; s++) value[s] = series.temperatureK[s * n + band]!;
  } else {
    for (let s = 0; s < count; s++) {
      let mean = 0;
      for (let j = 0; j < n; j++) mean += grid.areaFraction[j]! * series.temperatureK[s * n + j]!;
      value[s] = mean;
    }
  }
  return { timeSeconds: series.timeSeconds, value, periodic: true };
}

/** The longest p:q cycle (in orbits) the map solves as a periodic state (src/run/simulateMap.ts). */
const MAP_MAX_CYCLE_ORBITS = 16;

/**
 * The map's phase curve: the flux ratio at the reported samples of its periodic cycle. A map whose
 * spin shares no cycle with the orbit is integrated forward and never repeats exactly, so the data
 * could not be placed on it: refused.
 */
function mapCurve(settings: ForwardSettings, thermal: ThermalCase): ModelCurve {
  const observed = observeMap(thermal, { relativeTolerance: settings.relativeTolerance, samples: settings.samples });
  if (observed.sim.mode !== "periodic") {
    throw new CalorbitError("INVALID_ARGUMENT", "a map without a repeating cycle", [
      { path: "spin", given: "a rotation that shares no cycle with the orbit", allowed: 'a spin.orbitRatio p:q with q ≤ 16 (e.g. "1:1", "3:2"): data times are placed on the repeating cycle' },
    ]);
  }
  return { timeSeconds: observed.sim.history.timeSeconds, value: observed.curve!.fluxRatio, periodic: true };
}

function outputMismatch(out: ModelOutput, allowed: string): CalorbitError {
  return new CalorbitError("USAGE", `--model-output: given ${JSON.stringify(out.spec)}`, [{ path: "--model-output", given: JSON.stringify(out.spec), allowed }]);
}

/** The time offset in seconds among the values (0 when it is not free). */
export function timeOffsetOf(settings: ForwardSettings, values: ArrayLike<number>): number {
  const i = settings.parameters.findIndex((p) => p.key === TIME_OFFSET_KEY);
  return i < 0 ? 0 : offsetSeconds(settings.parameters[i]!, values[i]!);
}

/**
 * The curve at the given times (s, already shifted by the offset): cubic (Catmull–Rom) interpolation
 * on the uniform grid, wrapped into the cycle when it is periodic. Writes into `out`.
 */
export function interpolateCurve(curve: ModelCurve, times: ArrayLike<number>, out: Float64Array): void {
  const t = curve.timeSeconds;
  const y = curve.value;
  const n = t.length;
  const t0 = t[0]!;
  const span = t[n - 1]! - t0;
  const h = span / (n - 1);
  // Periodic: the first and last samples are the same instant; the ring has n − 1 distinct points.
  const ring = n - 1;
  const at = (k: number): number => {
    if (curve.periodic) return y[((k % ring) + ring) % ring]!;
    return y[Math.min(n - 1, Math.max(0, k))]!;
  };
  for (let i = 0; i < times.length; i++) {
    let u = times[i]! - t0;
    if (curve.periodic) u -= span * Math.floor(u / span);
    else if (u < -1e-9 * span || u > span * (1 + 1e-9)) {
      throw new CalorbitError("INVALID_ARGUMENT", "a data time outside the simulated span", [
        { path: "data", given: `a time ${times[i]} s (with the offset)`, allowed: `0 to ${span} s: this case has no repeating cycle (a non-commensurate spin), so data must fall inside the one simulated orbit` },
      ]);
    }
    const x = u / h;
    const k = Math.min(Math.floor(x), n - 2);
    const f = x - k;
    const p0 = at(k - 1);
    const p1 = at(k);
    const p2 = at(k + 1);
    const p3 = at(k + 2);
    out[i] = p1 + 0.5 * f * (p2 - p0 + f * (2 * p0 - 5 * p1 + 4 * p2 - p3 + f * (3 * (p1 - p2) + p3 - p0)));
  }
}

/** A reusable forward model over fixed observations. */
export class ForwardModel {
  readonly settings: ForwardSettings;
  readonly observations: Observations;
  private readonly shifted: Float64Array;
  /** Model evaluations so far (each is one simulation). */
  evaluations = 0;

  constructor(settings: ForwardSettings, observations: Observations) {
    if (observations.quantity !== settings.output.quantity) {
      const fluxData = observations.quantity === "fluxRatio";
      throw new CalorbitError("USAGE", "the data and the model output measure different things", [
        {
          path: "--model-output",
          given: fluxData
            ? `${JSON.stringify(settings.output.spec)} (a temperature, K) for data in ${observations.columns.value} (a dimensionless flux ratio)`
            : `${JSON.stringify(settings.output.spec)} (a dimensionless flux ratio) for data in ${observations.columns.value} (a temperature)`,
          allowed: fluxData
            ? "fluxRatio (a map scenario with an observer) for flux_ratio data"
            : "a temperature output (surface, day, night, depth=…) for temperature data; fluxRatio needs a flux_ratio column (dimensionless, not kelvin)",
        },
      ]);
    }
    this.settings = settings;
    this.observations = observations;
    this.shifted = new Float64Array(observations.timeSeconds.length);
  }

  /** Predictions at the observed times; throws the engine's CalorbitError when the case cannot be solved. */
  predict(values: ArrayLike<number>, out: Float64Array = new Float64Array(this.observations.timeSeconds.length)): Float64Array {
    this.evaluations++;
    const curve = modelCurve(this.settings, values);
    const offset = timeOffsetOf(this.settings, values);
    const ts = this.observations.timeSeconds;
    for (let i = 0; i < ts.length; i++) this.shifted[i] = ts[i]! + offset;
    interpolateCurve(curve, this.shifted, out);
    return out;
  }
}
