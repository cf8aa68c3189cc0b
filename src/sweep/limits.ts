/** Sweep limits that the CLI's help shows (a module of its own, so that help loads nothing else). */

/** The cap on a sweep's cases unless --max-cases raises it: a grid past it is almost always a typo. */
export const DEFAULT_MAX_CASES = 1_000_000_000;
