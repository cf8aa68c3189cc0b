/**
 * The contract between a physical model and the integrators: a first-order system y' = f(x, y)
 * of fixed dimension, with its Jacobian. Implementations must not allocate in `derivative` or
 * `jacobian`: they run millions of times in a sweep.
 */
export interface OdeSystem {
  readonly dimension: number;
  /** Writes f(x, y) into `out` (length ≥ dimension). */
  derivative(x: number, y: ArrayLike<number>, out: Float64Array): void;
  /** Writes ∂f/∂y at (x, y) into `out`, row-major n×n. */
  jacobian(x: number, y: ArrayLike<number>, out: Float64Array): void;
  /** Optional: both at once, for systems where they share costly terms (the shooting loop calls this on every step). */
  derivativeAndJacobian?(x: number, y: ArrayLike<number>, out: Float64Array, jacobianOut: Float64Array): void;
  /** Optional: (∂f/∂y) v at (x, y) into `out`, without forming the matrix (a matrix-free periodic solve of a large state uses it). */
  jacobianProduct?(x: number, y: ArrayLike<number>, v: ArrayLike<number>, out: Float64Array): void;
  /**
   * Optional: the exact flow across an arc between two corners of the forcing, where the system
   * has one in closed form (a slab in the dark). Advances `y` from x0 to x1 and writes the state at
   * each sample in [.., x1] (its first `dimension` components, at the samples' stride); returns
   * false, touching nothing, where it has none. Allocates nothing.
   */
  exactArc?(x0: number, x1: number, y: Float64Array, samples?: DenseSamples): boolean;
  /** With `exactArc` on a one-state system: ∂y(x)/∂y(x0) along the arc it took, from y at its ends. */
  exactArcSlope?(start: number, end: number): number;
}

/** Work done by an integrator, summed over calls. */
export interface SolverWork {
  /** Accepted steps. */
  steps: number;
  /** Rejected steps. */
  rejected: number;
  /** Right-hand-side evaluations. */
  evaluations: number;
}

export function emptyWork(): SolverWork {
  return { steps: 0, rejected: 0, evaluations: 0 };
}

export function addWork(into: SolverWork, more: SolverWork): void {
  into.steps += more.steps;
  into.rejected += more.rejected;
  into.evaluations += more.evaluations;
}

/**
 * Where dense output goes: the solution at ascending abscissae `xs` (inside the integration
 * interval) is written to `ys`, component-major: ys[k * dimension + i] = y_i(xs[k]).
 * Only the first `components` components are stored (dimension of the stored block).
 */
export interface DenseSamples {
  xs: Float64Array;
  ys: Float64Array;
  components: number;
}

/**
 * A per-dimension cache of an integrator's reusable scratch (workspaces, solver objects): built
 * once for each state dimension, so no integration allocates its buffers again.
 */
export function perDimension<T>(make: (dimension: number) => T): (dimension: number) => T {
  const made = new Map<number, T>();
  return (dimension) => {
    let value = made.get(dimension);
    if (value === undefined) made.set(dimension, (value = make(dimension)));
    return value;
  };
}

/** Writes the initial state to the samples at the very start of the interval; returns the first sample still to fill. */
export function emitStart(samples: DenseSamples, x0: number, y: ArrayLike<number>): number {
  let k = 0;
  while (k < samples.xs.length && samples.xs[k]! <= x0) {
    for (let i = 0; i < samples.components; i++) samples.ys[k * samples.components + i] = y[i]!;
    k++;
  }
  return k;
}

export interface IntegrateOptions {
  relativeTolerance: number;
  /** Per-component absolute tolerance. */
  absoluteTolerance: Float64Array;
  /** Optional dense output. */
  samples?: DenseSamples;
  /** Hard cap on accepted steps; exceeding it raises INTEGRATION_FAILED. */
  maxSteps?: number;
  /** Length of the whole integration this call is one arc of (step caps are fractions of it); default x1 − x0. */
  cycleSpan?: number;
}

/** An integrator advances y from x0 to x1 in place and reports its work. */
export type Integrator = (
  system: OdeSystem,
  x0: number,
  y: Float64Array,
  x1: number,
  options: IntegrateOptions,
) => SolverWork;
