/**
 * The simulation defaults and integrator names that the CLI's help shows. They live apart from
 * `simulate.ts` so that a command can print its help (or `--version`) without loading the solvers.
 */

/** Relative tolerance of the temperatures unless the caller asks for another. */
export const DEFAULT_RELATIVE_TOLERANCE = 1e-8;
/** A conduction column's default: its periodicity and energy closure (its steps are second order). */
export const DEFAULT_COLUMN_TOLERANCE = 1e-6;
/** The finest tolerance a conduction column takes (its solver's floor); callers that pass one on raise finer ones to it. */
export const MIN_COLUMN_TOLERANCE = 1e-12;
/** A map's default: the phase curve needs far less than a single point's 1e-8. */
export const MAP_DEFAULT_TOLERANCE = 1e-6;
/** Points in an output series, uniform in time, unless the caller asks for another number. */
export const DEFAULT_SAMPLES = 1000;
/** The integrators a caller may force (`--integrator`); by default one is chosen by stiffness. */
export const INTEGRATORS = ["dormand-prince", "odex", "radau"] as const;
export type IntegratorName = (typeof INTEGRATORS)[number];
