/**
 * The same scenario under several regimes, side by side, on a shared time axis. A regime that
 * cannot run for this scenario (a night side with no heat source, say) is reported with its
 * reason instead of stopping the others.
 */
import { CalorbitError } from "../errors.js";
import { heatStoreOf } from "../model/heatStore.js";
import type { Regime, ThermalCase } from "../model/thermalCase.js";
import { simulate, type Simulation, type SimulateOptions } from "./simulate.js";
import { buildThermalModel, gcd } from "../model/build.js";
import { ProgressMeter } from "./progress.js";

/** One state's temperature and equilibrium on the shared time axis. */
export interface CompareColumn {
  name: string;
  temperatureK: Float64Array;
  equilibriumK: Float64Array;
}

export interface CompareRow {
  regime: Regime;
  simulation?: Simulation;
  /** The regime's states on the shared axis (its own cycle repeated to fill it). */
  columns?: CompareColumn[];
  /** Why the regime could not run, when it could not. */
  error?: string;
}

export interface Comparison {
  rows: CompareRow[];
  /** Shared time axis over the longest cycle, s. */
  timeSeconds: Float64Array;
  /** Orbits spanned by the shared axis (the least common multiple of the regimes' cycles). */
  spanOrbits: number;
}

export function compareRegimes(thermal: ThermalCase, regimes: readonly Regime[], options: SimulateOptions & { samples: number }): Comparison {
  if (heatStoreOf(thermal).kind === "column") {
    // Each regime of a column case is its own column solve at its own tolerance; compare keeps to slabs.
    const error = "this case has a conduction column (body.column), and compare takes slab surfaces (body.heatCapacity or body.layer); run each regime of a column with calorbit run";
    return { rows: regimes.map((regime) => ({ regime, error })), timeSeconds: new Float64Array(0), spanOrbits: 1 };
  }
  const cycles = regimes.map((regime) => {
    try {
      return buildThermalModel({ ...thermal, regime }).cycleOrbits;
    } catch {
      return 1;
    }
  });
  const spanOrbits = cycles.reduce((l, c) => (l * c) / gcd(l, c), 1);
  // N − 1 intervals on the shared axis must split evenly into every regime's own cycle.
  const intervals = Math.max(spanOrbits, Math.round((options.samples - 1) / spanOrbits) * spanOrbits);
  // Each regime's run is its share of the whole comparison's progress.
  const progress = new ProgressMeter(options.onProgress);
  const rows: CompareRow[] = regimes.map((regime, r) => {
    const repeats = spanOrbits / cycles[r]!;
    progress.part(r / regimes.length, 1 / regimes.length);
    const { onProgress: _whole, ...rest } = options;
    try {
      const simulation = simulate(
        { ...thermal, regime },
        { ...rest, samples: intervals / repeats + 1, ...(progress.active ? { onProgress: (f, stage) => progress.report(f, stage) } : {}) },
      );
      const columns = simulation.series.states.map((st) => ({
        name: simulation.series.states.length > 1 ? `${regime}_${st.name}` : regime,
        temperatureK: tile(st.temperatureK, repeats),
        equilibriumK: tile(st.equilibriumK, repeats),
      }));
      return { regime, simulation, columns };
    } catch (err) {
      // The message is the sentence that says why (the problem list is the one-line form for `run`).
      if (err instanceof CalorbitError) return { regime, error: err.message };
      throw err;
    }
  });
  progress.finish("summary");
  const timeSeconds = Float64Array.from({ length: intervals + 1 }, (_, j) => (spanOrbits * thermal.orbit.periodSeconds * j) / intervals);
  return { rows, timeSeconds, spanOrbits };
}

/** Repeats a sampled cycle `repeats` times (its last sample is the first of the next cycle). */
function tile(a: Float64Array, repeats: number): Float64Array {
  if (repeats === 1) return a;
  const per = a.length - 1;
  const out = new Float64Array(per * repeats + 1);
  for (let r = 0; r < repeats; r++) out.set(a.subarray(0, per), r * per);
  out[per * repeats] = a[per]!;
  return out;
}
