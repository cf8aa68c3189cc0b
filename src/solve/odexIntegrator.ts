/**
 * The one place calorbit talks to `odex` (Hairer & Wanner's ODEX, Gragg–Bulirsch–Stoer
 * extrapolation; Hairer, Nørsett & Wanner, Solving Ordinary Differential Equations I, §II.9).
 * odex is untyped CommonJS; this wrapper gives it a typed face and adapts it to our OdeSystem.
 * odex itself allocates a little per step (it copies state arrays); our right-hand side does not.
 */
import odexModule from "odex";
import { CalorbitError } from "../errors.js";
import { perDimension, type IntegrateOptions, type Integrator, type OdeSystem, type SolverWork } from "./system.js";

interface OdexResult {
  y: number[];
  outcome: number;
  nStep: number;
  nAccept: number;
  nReject: number;
  nEval: number;
}
type Interpolate = (component: number, x: number) => number;
type SolutionObserver = (
  stepNumber: number,
  xOld: number,
  x: number,
  y: number[],
  interpolate: Interpolate | false,
) => boolean | void;
interface OdexSolver {
  relativeTolerance: number | number[];
  absoluteTolerance: number | number[];
  maxSteps: number;
  denseOutput: boolean;
  denseComponents: number[] | undefined;
  initialStepSize: number;
  solve(
    f: (x: number, y: number[]) => number[] | Float64Array,
    x0: number,
    y0: number[],
    x1: number,
    observer?: SolutionObserver,
  ): OdexResult;
}
const { Solver } = odexModule as unknown as { Solver: new (n: number) => OdexSolver };

const OUTCOME_CONVERGED = 0;
const DEFAULT_MAX_STEPS = 200_000;

/** Cached solvers per dimension: odex solvers are reusable and building one is not free. */
const solverFor = perDimension((dimension) => new Solver(dimension));

export const integrateOdex: Integrator = (
  system: OdeSystem,
  x0: number,
  y: Float64Array,
  x1: number,
  options: IntegrateOptions,
): SolverWork => {
  const n = system.dimension;
  const solver = solverFor(n);
  solver.relativeTolerance = options.relativeTolerance;
  solver.absoluteTolerance = Array.from(options.absoluteTolerance);
  solver.maxSteps = options.maxSteps ?? DEFAULT_MAX_STEPS;
  solver.initialStepSize = (x1 - x0) * 1e-3;

  // odex copies whatever we return into its own array, so one reusable buffer suffices.
  const dy = new Float64Array(n);
  const f = (x: number, state: number[]): Float64Array => {
    system.derivative(x, state, dy);
    return dy;
  };

  const samples = options.samples;
  let observer: SolutionObserver | undefined;
  if (samples) {
    solver.denseOutput = true;
    const stored = samples.components;
    solver.denseComponents = Array.from({ length: stored }, (_, i) => i);
    const xs = samples.xs;
    const ys = samples.ys;
    let next = 0;
    observer = (_step, _xOld, x, state, interpolate) => {
      while (next < xs.length && xs[next]! <= x) {
        const base = next * stored;
        for (let i = 0; i < stored; i++) {
          // At the very first call (x = x0) odex offers no interpolant; the state is exact there.
          ys[base + i] = interpolate && xs[next]! !== x ? interpolate(i, xs[next]!) : state[i]!;
        }
        next++;
      }
    };
  } else {
    solver.denseOutput = false;
    solver.denseComponents = undefined;
  }

  const result = solver.solve(f, x0, Array.from(y), x1, observer);
  if (result.outcome !== OUTCOME_CONVERGED) {
    throw new CalorbitError(
      "INTEGRATION_FAILED",
      `the ODE solver stopped after ${result.nStep} steps without reaching the end of the orbit (step limit)`,
    );
  }
  if (samples) fillTrailingSamples(samples, x1, result.y);
  for (let i = 0; i < n; i++) {
    const v = result.y[i]!;
    if (!Number.isFinite(v)) {
      throw new CalorbitError("INTEGRATION_FAILED", "the ODE solution became non-finite");
    }
    y[i] = v;
  }
  return { steps: result.nAccept, rejected: result.nReject, evaluations: result.nEval };
};

/** Samples that rounding put a hair past the last step's end take the final state. */
function fillTrailingSamples(samples: { xs: Float64Array; ys: Float64Array; components: number }, x1: number, y: number[]): void {
  const slack = Math.abs(x1) * 1e-12 + 1e-300;
  for (let k = samples.xs.length - 1; k >= 0 && samples.xs[k]! > x1 - slack; k--) {
    if (samples.xs[k]! > x1 + slack) continue;
    for (let i = 0; i < samples.components; i++) samples.ys[k * samples.components + i] = y[i]!;
  }
}
