/**
 * What a run will cost, said before it starts or when it stops: a cycle too long to hold is refused
 * up front by the field that makes it long, and a solver's step limit is explained by what to
 * change (which field or flag, in which direction). Pure: no I/O.
 */
import { CalorbitError, describeValue, type FieldProblem } from "../errors.js";
import type { ColumnModel, ThermalModel } from "../model/build.js";
import { DEFAULT_GRID } from "../physics/column.js";
import { columnLayout, MAX_COLUMN_STEPS_PER_CYCLE } from "./columnCycle.js";
import { gcd } from "../model/regimes.js";
import type { ThermalCase } from "../model/thermalCase.js";

/**
 * Statistics points (uniform in E) one periodic slab cycle may hold: the state and its sensitivity
 * are kept at each, so this bounds the memory (a 1:1000 spin's 1000-orbit cycle is 2.0 million
 * points and about 0.3 GB; measured). The seasonal run's beat has the same budget (slabCycle.ts).
 */
export const MAX_CYCLE_STATISTICS_POINTS = 1 << 22;

/** Orbits per cycle from which a run is announced as long before it starts. */
const LONG_CYCLE_ORBITS = 100;
/** Statistics points per orbit of a point's slow spin (its sunrise corners: build.ts); bounds the announced range. */
const POINT_POINTS_PER_ORBIT = 2048;

/** A tolerance above which loosening it further is no advice. */
const LOOSEST_ADVISED_TOLERANCE = 1e-5;
/** Solar days per orbit from which a fast spin is named as the cost of a point's run. */
const MANY_SOLAR_DAYS = 50;

/**
 * Layer temperatures one column cycle may hold, summed over the surface's columns (each column keeps
 * every layer at every step of its last cycle: 8 bytes each). Measured on the regolith demo's column
 * (k(T), c(T): two passes a step) stretched by its spin.orbitRatio, CPU seconds and peak memory of the
 * whole process, at load 10-14 on 2 cores (CPU time swings less with load than wall time):
 *   1:100   47,520 steps × 39 layers =  1.9 M per cycle, 6 cycles:  1.3 s CPU, 107 MB
 *   1:300  143,520 steps × 43 layers =  6.2 M,            7 cycles:  3.5 s CPU, 169 MB
 *   1:1000 479,521 steps × 47 layers = 22.5 M,            5 cycles:  9.0 s CPU, 336 MB
 *   1:2000 959,521 steps × 49 layers = 47.0 M,            9 cycles: 27.5 s CPU, 589 MB
 * so 60-80 ns per layer and step and 12-15 bytes of the process per layer temperature held. At this
 * cap (67 M) a cycle holds 0.54 GB of layers (~0.9 GB for the process) and 5-9 cycles take 25-50 s
 * of one core: the same order as the slab's cap; beyond it a run is minutes and gigabytes.
 */
export const MAX_COLUMN_LAYER_STEPS = 1 << 26;

/** Refuses a cycle too long to hold (a slab's statistics grid, a column's layers × steps), naming the field that makes it long. */
export function checkWorkload(thermal: ThermalCase, model: ThermalModel, transient: boolean): void {
  if (model.kind === "column") {
    if (!transient && model.commensurate) checkColumnWorkload(thermal, model);
    return;
  }
  if (transient || !model.commensurate) return;
  const points = model.cycleOrbits * model.statsPointsPerOrbit;
  if (points <= MAX_CYCLE_STATISTICS_POINTS) return;
  const maxOrbits = Math.floor(MAX_CYCLE_STATISTICS_POINTS / model.statsPointsPerOrbit);
  const problem: FieldProblem = {
    ...spinField(thermal),
    allowed: `a spin whose cycle repeats within ${maxOrbits} orbits (this one repeats after ${model.cycleOrbits} orbits, ${(points / 1e6).toFixed(1)} million statistics points against the ${(MAX_CYCLE_STATISTICS_POINTS / 1e6).toFixed(1)} million a run holds): a ratio p:q with a smaller q, or a spin.period that is not a ratio (its seasonal run summarises a shorter beat)`,
  };
  throw new CalorbitError("SCENARIO_INVALID", "the cycle is too long to hold", [problem]);
}

/** The spin field that sets a cycle's length, as the scenario gave it: spin.orbitRatio, or spin.period. */
function spinField(thermal: ThermalCase): { path: string; given: string } {
  const spin = thermal.spin;
  if (spin?.ratio) return { path: "spin.orbitRatio", given: describeValue(`${spin.ratio.spin}:${spin.ratio.orbit}`) };
  return { path: "spin.period", given: `${spin?.rateRadPerSecond ? ((2 * Math.PI) / spin.rateRadPerSecond).toPrecision(6) : "?"} s` };
}

/**
 * Refuses a column cycle whose layers × steps (× columns) would not fit, before any step. The field
 * named is the one that makes it long: the grid's steps per day or its layer cap when raised above
 * their defaults and enough to pass the limit on their own, else the spin (many solar days, or a p:q
 * cycle of many orbits), whose forcing periods each take the grid's steps.
 */
function checkColumnWorkload(thermal: ThermalCase, model: ColumnModel): void {
  const layout = columnLayout(thermal, model);
  const layers = layout.grid.thicknessM.length;
  const columns = model.stateNames.length;
  const held = (layout.stepsAsked + 1) * layers * columns;
  if (held <= MAX_COLUMN_LAYER_STEPS && layout.stepsAsked <= MAX_COLUMN_STEPS_PER_CYCLE) return;
  const grid = model.heatStore.column.grid;
  const periods = layout.cycleSeconds / layout.shortestSeconds;
  const wouldFit = (stepsPerPeriod: number, layerCount: number) => (Math.ceil(stepsPerPeriod * periods) + 1) * layerCount * columns <= MAX_COLUMN_LAYER_STEPS && stepsPerPeriod * periods <= MAX_COLUMN_STEPS_PER_CYCLE;
  const size = `${layout.stepsAsked.toLocaleString("en-US")} steps × ${layers} layers${columns > 1 ? ` × ${columns} columns` : ""} = ${(held / 1e6).toFixed(1)} million layer temperatures against the ${(MAX_COLUMN_LAYER_STEPS / 1e6).toFixed(1)} million a run holds`;
  let problem: FieldProblem;
  if (grid.stepsPerShortestPeriod > DEFAULT_GRID.stepsPerShortestPeriod && wouldFit(DEFAULT_GRID.stepsPerShortestPeriod, layers)) {
    problem = { path: "body.column.grid.stepsPerDay", given: String(grid.stepsPerShortestPeriod), allowed: `fewer steps per day, e.g. the default ${DEFAULT_GRID.stepsPerShortestPeriod} (this cycle: ${size})` };
  } else if (grid.maxLayers > DEFAULT_GRID.maxLayers && layers > DEFAULT_GRID.maxLayers && wouldFit(grid.stepsPerShortestPeriod, DEFAULT_GRID.maxLayers)) {
    problem = { path: "body.column.grid.maxLayers", given: String(grid.maxLayers), allowed: `fewer layers, e.g. the default ${DEFAULT_GRID.maxLayers} (this cycle: ${size})` };
  } else {
    const orbits = model.cycleOrbits;
    const what = orbits > 1 ? `a cycle of ${orbits} orbits` : `${periods.toFixed(0)} solar days per orbit`;
    problem = {
      ...spinField(thermal),
      allowed: `a spin whose column cycle fits (this one: ${what}, ${size}): ${orbits > 1 ? "a ratio p:q with a smaller q" : "a slower spin"}, fewer body.column.grid.stepsPerDay, or a slab (body.heatCapacity), whose cycle holds far less`,
    };
  }
  throw new CalorbitError("SCENARIO_INVALID", "the column cycle is too long to hold", [problem]);
}

/**
 * A solver's step-limit error, reworded to say what to change (and the shooting's iteration cap: a
 * looser tolerance, or a transient to look at); any other error unchanged. The advice follows the
 * case: a looser tolerance when it is tight, a slower spin (or the band regime's daily mean) when a
 * point sees many sunrises per orbit, a shorter cycle when it spans many orbits.
 */
export function explainStepLimit(error: unknown, thermal: ThermalCase, model: ThermalModel, relativeTolerance: number): unknown {
  if (!(error instanceof CalorbitError)) return error;
  if (error.code === "PERIODIC_NO_CONVERGENCE" && /^no periodic steady state/.test(error.message)) {
    // The shooting's cap: a looser target, or a transient from a start to see how the case behaves.
    const looser = relativeTolerance < LOOSEST_ADVISED_TOLERANCE ? `loosen the tolerance (--tolerance, now ${relativeTolerance}); or ` : "";
    return new CalorbitError("PERIODIC_NO_CONVERGENCE", `${error.message}; to settle it: ${looser}run a transient from a start (--from 250K --orbits 20) and look at how it evolves`);
  }
  if (error.code !== "INTEGRATION_FAILED" || !/exceeded \d+ steps|\(step limit\)/.test(error.message)) return error;
  const advice: string[] = [];
  if (relativeTolerance < LOOSEST_ADVISED_TOLERANCE) {
    advice.push(`loosen the tolerance (--tolerance, now ${relativeTolerance}: 1e-6 needs far fewer steps)`);
  }
  const solarDaysPerOrbit = model.solarDaySeconds ? thermal.orbit.periodSeconds / model.solarDaySeconds : 0;
  if (solarDaysPerOrbit >= MANY_SOLAR_DAYS) {
    advice.push(`slow the spin (spin.period: ${solarDaysPerOrbit.toFixed(0)} solar days per orbit, each a sunrise and a sunset to step through), or take regime band for a fast rotator's daily mean`);
  }
  if (model.cycleOrbits > 16) {
    advice.push(`shorten the cycle (spin.orbitRatio p:q with a smaller q: this one repeats after ${model.cycleOrbits} orbits)`);
  }
  if (advice.length === 0) advice.push("loosen the tolerance (--tolerance) or raise body.heatCapacity, either of which smooths the history the solver steps through");
  return new CalorbitError("INTEGRATION_FAILED", `${error.message}; to finish: ${advice.join("; or ")}`);
}

/**
 * A sentence for stderr before a run whose p:q spin makes a cycle of hundreds of orbits (issue 15: a
 * 1:1000 spin "produced nothing in 120 s"; it finishes, but in tens of seconds on a loaded machine),
 * saying what makes it long and what is quicker; undefined for any other case, and for a cycle so long
 * that the run will refuse it (`checkWorkload`).
 */
export function longCycleNote(thermal: ThermalCase): string | undefined {
  const ratio = thermal.spin?.ratio;
  if (thermal.regime !== "point" || ratio === undefined) return undefined;
  const orbits = ratio.orbit / gcd(ratio.spin, ratio.orbit);
  if (orbits < LONG_CYCLE_ORBITS || orbits * POINT_POINTS_PER_ORBIT > MAX_CYCLE_STATISTICS_POINTS) return undefined;
  return `spin.orbitRatio "${ratio.spin}:${ratio.orbit}" repeats only after ${orbits} orbits, and reaching the periodic state takes several passes over them (3 for a slab, 9 for a column, measured): expect a long run (a ratio with a smaller q, or a spin.period, is quicker)`;
}
