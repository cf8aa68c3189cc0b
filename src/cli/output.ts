/**
 * Where the CLI's text goes. Commands write through `out` (data and reports, stdout) and `err`
 * (messages, stderr), never to `process.stdout` directly, so that `main` can run the whole program
 * in-process with captured streams (the tests do) and so that warnings never mix into data.
 */

export interface OutputStreams {
  /** Data and reports (stdout). */
  out(text: string): void;
  /** Errors, warnings and progress (stderr). */
  err(text: string): void;
  /** True when stderr is a terminal (progress lines are drawn only there); absent: not a terminal. */
  errIsTerminal?(): boolean;
  /** The terminal's width in characters, when known (a progress line is cut to fit, so it never wraps). */
  errColumns?(): number | undefined;
}

export const processStreams: OutputStreams = {
  out: (text) => void process.stdout.write(text),
  err: (text) => void process.stderr.write(text),
  errIsTerminal: () => process.stderr.isTTY === true,
  errColumns: () => process.stderr.columns,
};

let current: OutputStreams = processStreams;

/** Writes data or a report to the current stdout. */
export function out(text: string): void {
  current.out(text);
}

/** Writes a message to the current stderr. */
export function err(text: string): void {
  current.err(text);
}

/** True when the current stderr is a terminal (logs, pipes and CI are not). */
export function errIsTerminal(): boolean {
  return current.errIsTerminal?.() === true;
}

/** The current stderr terminal's width, when known. */
export function errColumns(): number | undefined {
  return current.errColumns?.();
}

/** One warning line on stderr: `calorbit: warning: …`. */
export function warn(message: string): void {
  current.err(`calorbit: warning: ${message}\n`);
}

/** Runs `body` with `streams` as the current output, restoring the previous ones afterwards. */
export async function withStreams<T>(streams: OutputStreams, body: () => Promise<T>): Promise<T> {
  const previous = current;
  current = streams;
  try {
    return await body();
  } finally {
    current = previous;
  }
}
