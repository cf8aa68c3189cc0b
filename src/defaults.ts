/**
 * The simulation defaults and integrator names that the CLI's help shows. They live apart from
 * `simulate.ts` so that a command can print its help (or `--version`) without loading the solvers.
 */

/** Relative tolerance of the temperatures unless the caller asks for another. */
export const DEFAULT_RELATIVE_TOLERANCE = 1e-8;
/** Points in an output series, uniform in time, unless the caller asks for another number. */
export const DEFAULT_SAMPLES = 1000;
/** The integrators a caller may force (`--integrator`); by default one is chosen by stiffness. */
export const INTEGRATORS = ["dormand-prince", "odex", "radau"] as const;
export type IntegratorName = (typeof INTEGRATORS)[number];
