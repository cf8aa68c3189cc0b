/**
 * One progress line on stderr for a long command, shared by every command: drawn only when stderr
 * is a terminal (logs, pipes and CI get nothing), only once the work has lasted about a second (a
 * short run stays silent), redrawn at most ten times a second, and erased when the work ends or
 * fails, so that what follows on stderr starts on a clean line. Never writes to stdout.
 */
import type { ProgressHook, ProgressStage } from "../run/progress.js";
import { err, errColumns, errIsTerminal } from "./output.js";

/** The work must have lasted this long before the line appears, ms. */
export const SHOW_AFTER_MS = 1000;
/** Least time between two redraws, ms. */
const REDRAW_EVERY_MS = 100;
/** Carriage return and erase to the end of the line (ECMA-48 EL). */
const ERASE = "\r\u001b[K";

const STAGE_WORDS: Record<ProgressStage, string> = {
  periodic: "toward the periodic state",
  seasonal: "seasonal spin-up",
  transient: "transient",
  column: "conduction column cycles",
  map: "map cells",
  zonal: "zonal climate orbits",
  summary: "summarising the cycle",
};

export interface ProgressLine {
  /** The share done (0 to 1) and what is being done; cheap when nothing is drawn. */
  update(fraction: number, words: string): void;
  /** For the engine: undefined when nothing will ever be drawn (quiet, or stderr not a terminal), so the engine does no work for it. */
  readonly hook: ProgressHook | undefined;
  /** Erases the line if one was drawn; call when the work ends or fails (idempotent). */
  close(): void;
}

export interface ProgressLineOptions {
  /** --quiet: draw nothing. */
  quiet?: boolean;
  /** Milliseconds on a monotonic clock (tests give their own). */
  now?: () => number;
}

/** A progress line for `label` (the command: "run", "compare", …), started now. */
export function progressLine(label: string, options: ProgressLineOptions = {}): ProgressLine {
  const now = options.now ?? (() => performance.now());
  if (options.quiet === true || !errIsTerminal()) {
    return { update: () => undefined, hook: undefined, close: () => undefined };
  }
  const started = now();
  let lastDraw = -Infinity;
  let drawn = false;
  const update = (fraction: number, words: string): void => {
    const t = now();
    if (t - started < SHOW_AFTER_MS || t - lastDraw < REDRAW_EVERY_MS || !(fraction < 1)) return;
    lastDraw = t;
    drawn = true;
    const percent = Math.floor(100 * Math.max(0, fraction));
    const text = `calorbit ${label}: ${words} ${String(percent).padStart(3)} %  ${((t - started) / 1000).toFixed(1)} s`;
    // Cut to the terminal's width less one: a line that wrapped could not be erased by one carriage return.
    const columns = errColumns();
    err(ERASE + (columns !== undefined && columns > 1 && text.length >= columns ? text.slice(0, columns - 1) : text));
  };
  return {
    update,
    hook: (fraction, stage) => update(fraction, STAGE_WORDS[stage]),
    close: () => {
      if (drawn) err(ERASE);
      drawn = false;
    },
  };
}

/** Runs `work` with a progress line, erasing it however the work ends. */
export function withProgressLine<T>(label: string, quiet: boolean | undefined, work: (hook: ProgressHook | undefined, line: ProgressLine) => T): T {
  const line = progressLine(label, { quiet: quiet === true });
  try {
    return work(line.hook, line);
  } finally {
    line.close();
  }
}
