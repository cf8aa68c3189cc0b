/**
 * Where a long solve is, for a caller that wants to show it: an optional hook given in the run's
 * options, called at coarse points only (after a whole cycle or orbit, after a cell or a column),
 * never inside a step or a right-hand side. Pure: no I/O, no clock; showing it is the caller's job.
 */

import { CalorbitError, describeValue } from "../errors.js";

/** What the solve is doing when it reports. */
export type ProgressStage =
  /** Shooting toward the periodic state of a slab (each pass integrates the whole cycle). */
  | "periodic"
  /** A seasonal run integrating orbit after orbit until its start is forgotten, then its beat. */
  | "seasonal"
  /** A transient integrating the orbits asked for. */
  | "transient"
  /** Conduction columns stepped cycle after cycle to their periodic state. */
  | "column"
  /** The cells of a map, one after another. */
  | "map"
  /** The zonal climate's orbits (spin-up, Newton–Krylov, stability check). */
  | "zonal"
  /** The converged cycle reduced to its summary and series (a third of a long cycle's run: refined extremes over millions of points). */
  | "summary";

/**
 * Called with the share of the whole run done (0 to 1, rising from call to call, exactly 1 once at
 * the end) and the stage. It runs on the solving thread: keep it cheap (a throttled redraw).
 * Where the count of passes is not known beforehand the share is an estimate from the typical
 * count, never falling and never reaching 1 before the end.
 */
export type ProgressHook = (fraction: number, stage: ProgressStage) => void;

/** A hook given by a library caller: a function or nothing (anything else is a wrong argument, not a TypeError later). */
export function checkProgressHook(hook: unknown): void {
  if (hook !== undefined && typeof hook !== "function") {
    throw new CalorbitError("INVALID_ARGUMENT", "onProgress is not a function", [
      { path: "onProgress", given: describeValue(hook), allowed: "a function (fraction, stage) => void, or nothing" },
    ]);
  }
}

/** Shares below 1 are capped here until the run ends, so that 1 means "done". */
const BEFORE_END = 0.999;

/**
 * Maps the reports of a run's parts onto one rising share of the whole. One per run (the only
 * allocation); every method is a no-op without a hook, so an absent hook costs a branch.
 */
export class ProgressMeter {
  private reported = 0;
  private phaseBase = 0;
  private phaseWidth = 1;
  private base = 0;
  private width = 1;

  constructor(private readonly hook: ProgressHook | undefined) {}

  /** True when someone listens (to skip work done only for the report). */
  get active(): boolean {
    return this.hook !== undefined;
  }

  /** The run's next phase is [from, from + width) of the whole (the solve, then the summary); its parts divide it. */
  phase(from: number, width: number): void {
    this.phaseBase = from;
    this.phaseWidth = width;
    this.base = 0;
    this.width = 1;
  }

  /** The next reports are shares of the part [from, from + width) of the current phase (a cell, a column, a start). */
  part(from: number, width: number): void {
    this.base = from;
    this.width = width;
  }

  /** The current part is `local` (0 to 1) done; reported only when it moves the whole share up. */
  report(local: number, stage: ProgressStage): void {
    if (this.hook === undefined) return;
    const clamped = local > 1 ? 1 : local > 0 ? local : 0;
    const whole = Math.min(BEFORE_END, this.phaseBase + this.phaseWidth * (this.base + this.width * clamped));
    if (whole <= this.reported) return;
    this.reported = whole;
    this.hook(whole, stage);
  }

  /** The run is done: the hook gets 1, once. */
  finish(stage: ProgressStage): void {
    if (this.hook === undefined || this.reported === 1) return;
    this.reported = 1;
    this.hook(1, stage);
  }
}

/**
 * The share done after `done` passes when about `typical` are usual and the true count is known
 * only at the end: linear to 0.9 at the typical count, then creeping toward 1 (0.95 at twice it).
 */
export function estimatedShare(done: number, typical: number): number {
  if (!(done > 0)) return 0;
  return done <= typical ? (0.9 * done) / typical : 1 - (0.1 * typical) / done;
}
