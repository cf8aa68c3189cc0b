/**
 * The forward model of a fit: free-parameter values → the model's prediction at each observed
 * time. The base scenario document gets the values at their keys (as a sweep case does), is
 * validated and simulated; the chosen output series of the converged cycle is interpolated at
 * the data's times plus the time offset, wrapped into the cycle (the periodic steady state repeats).
 */
import { CalorbitError } from "../errors.js";
import { resolveScenario } from "../scenario/resolve.js";
import { simulate } from "../run/simulate.js";
import { setPath } from "../sweep/spec.js";
import type { ThermalCase } from "../model/thermalCase.js";
import type { ObservedQuantity, Observations } from "./observations.js";
import { offsetSeconds, scenarioValue, TIME_OFFSET_KEY, type FreeParameter } from "./parameters.js";

/**
 * Which series of the model is compared with the data:
 *  - "surface": the surface temperature (state 0 of a lumped case, a column's surface);
 *  - a state name ("day", "night" for the daynight regime);
 *  - "depth=<length>": a conduction column's temperature at that depth (e.g. "depth=0.3 m").
 * A flux ratio output joins this list with the map regime: the data's quantity is checked against it.
 */
export interface ModelOutput {
  spec: string;
  kind: "surface" | "state" | "depth";
  state?: string;
  depthM?: number;
  quantity: ObservedQuantity;
}

export function parseModelOutput(spec: string, depthToMetres: (text: string) => number | null): ModelOutput {
  const s = spec.trim();
  if (s === "surface") return { spec: s, kind: "surface", quantity: "temperature" };
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
    { path: "--model-output", given: JSON.stringify(spec), allowed: 'surface, day, night (daynight regime) or depth=<length> (a column), e.g. "depth=0.3 m"' },
  ]);
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
  if (thermal.column) {
    const col = simulate(thermal, { relativeTolerance: Math.max(settings.relativeTolerance, 1e-12), samples: settings.samples });
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
      throw new CalorbitError("USAGE", "the data and the model output measure different things", [
        {
          path: "--model-output",
          given: `${JSON.stringify(settings.output.spec)} (a temperature) for data with ${observations.columns.value}`,
          allowed: "a temperature output (surface, day, night, depth=…) for temperature data; flux ratios need the map regime, which calorbit does not have yet",
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
