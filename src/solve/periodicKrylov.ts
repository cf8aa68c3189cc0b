/**
 * The periodic steady state of a large coupled state (many slab cells with a lateral exchange) by
 * matrix-free Newton–Krylov shooting. Newton's method on g(y₀) = Φ(y₀) − y₀ as in `periodic.ts`,
 * but the correction solves (∂Φ/∂y₀ − I) δ = −g by GMRES (`gmres.ts`), whose products
 * (∂Φ/∂y₀) v are one cycle of the state with ONE directional sensitivity s' = J s, s(0) = v: a
 * system of 2n components whose J s costs one pass over the couplings (`OdeSystem.jacobianProduct`).
 * The dense variational equations of `periodic.ts` carry n + n² components and cost ~n³ per step;
 * here a Newton step costs (1 + products) cycles of ~n work each. A dissipative cycle map has its
 * spectrum inside the unit disc, clustered where the cells forget alike, so GMRES needs a handful
 * of products (Brown & Saad 1990, SIAM J. Sci. Stat. Comput. 11, 450, for Newton–Krylov; Knoll &
 * Keyes 2004, J. Comput. Phys. 193, 357, for its matrix-free use). The forcing term (how exactly
 * each correction is solved) follows the remaining distance to the target, so early steps are cheap
 * and the last ones converge fast (Eisenstat & Walker 1996, SIAM J. Sci. Comput. 17, 16, in spirit).
 *
 * The same tolerances as the dense solve: early passes coarse, the final pass at the ODE tolerance
 * the memory 1 − ∂Φ/∂y₀ asks for (here from the problem's estimate: the caller gives the slowest
 * cell's), sampled for the dense output; it converges to the same periodic state.
 */
import { CalorbitError } from "../errors.js";
import { gmres } from "./gmres.js";
import {
  ARC_ODE_TOLERANCE_SHARE,
  chooseIntegrator,
  coarsePassTolerance,
  CONVERGENCE_SHARE,
  CORNER_ODE_TOLERANCE_SHARE,
  FINEST_ODE_TOLERANCE,
  FIRST_GUESS_ERROR,
  integrateCycle,
  MAX_ITERATIONS,
  ODE_TOLERANCE_SHARE,
  type IntegratorName,
  type PeriodicOptions,
  type PeriodicProblem,
  type PeriodicResult,
} from "./periodic.js";
import { addWork, emptyWork, type OdeSystem } from "./system.js";

/**
 * From this many coupled states on, the Newton–Krylov solve is cheaper than the dense variational
 * equations. Measured (CPU time per periodic solve, chains of cells under the global forcing,
 * e = 0.3–0.6, τ = 0.05–10 P, tolerance 1e-8): at 2–4 cells the two cost the same within ±40 %
 * (dense ahead for slow memory), from 6 cells Newton–Krylov is ahead in 3 of 4 cases, at 8 cells
 * 1.1–2× ahead, at 16 cells 1.2–6× with Dormand–Prince and ~70× once Radau is needed (the dense
 * solve factorises its n + n² system). The day/night pair (2 states) keeps the dense solve.
 */
export const KRYLOV_MIN_DIMENSION = 6;

export type PeriodicMethod = "dense" | "newton-krylov";
export const PERIODIC_METHODS: readonly PeriodicMethod[] = ["dense", "newton-krylov"];

/** The periodic solve for a coupled state of this many components. */
export function choosePeriodicMethod(dimension: number): PeriodicMethod {
  return dimension >= KRYLOV_MIN_DIMENSION ? "newton-krylov" : "dense";
}

/** Above this the explicit pair would meet its step cap (200,000 per cycle; about stiffness / 3 steps). */
const MOST_EXPLICIT_STIFFNESS = 2e5;

/**
 * The integrator for a coupled state of n cells (the Newton–Krylov solve, and the plain runs of a
 * seasonal or transient surface). Radau factorises the whole Jacobian densely, ~n³ per step, where a
 * Dormand–Prince step costs ~n: the explicit pair's extra steps (about the stiffness / 3 per cycle)
 * stay cheaper up to a stiffness that grows as n², the one-cell threshold up to 6 cells and ~1000×
 * it at 200 (measured: 200 coupled cells at stiffness 1171, 0.8 s with Dormand–Prince, over 300 s
 * with Radau), and below the explicit pair's step cap.
 */
export function chooseCellsIntegrator(stiffness: number, cells: number, forcingHasCorners = false): IntegratorName {
  if (stiffness > MOST_EXPLICIT_STIFFNESS) return "radau";
  return chooseIntegrator(stiffness / Math.max(1, (cells / KRYLOV_MIN_DIMENSION) ** 2), forcingHasCorners);
}

/** Most GMRES products per Newton correction (restarted every 30). */
const MAX_PRODUCTS = 120;
const GMRES_RESTART = 30;
/** Bounds of the forcing term η (GMRES relative residual). */
const LOOSEST_FORCING = 1e-2;
const TIGHTEST_FORCING = 1e-8;
/** Products need no finer integration than this share of η × memory (and never coarser than 1e-6). */
const PRODUCT_TOLERANCE_SHARE = 0.01;

/** The state with one directional sensitivity: [y (n), s (n)], s' = J(x, y) s. Allocation-free. */
class WithDirection implements OdeSystem {
  readonly dimension: number;
  private readonly v: Float64Array;
  private readonly product: Float64Array;
  private readonly jac: Float64Array;
  constructor(private readonly base: OdeSystem) {
    const n = base.dimension;
    this.dimension = 2 * n;
    this.v = new Float64Array(n);
    this.product = new Float64Array(n);
    this.jac = new Float64Array(n * n);
  }
  derivative(x: number, y: ArrayLike<number>, out: Float64Array): void {
    const n = this.base.dimension;
    this.base.derivative(x, y, out);
    for (let i = 0; i < n; i++) this.v[i] = y[n + i]!;
    if (this.base.jacobianProduct) this.base.jacobianProduct(x, y, this.v, this.product);
    else {
      const jac = this.jac;
      this.base.jacobian(x, y, jac);
      for (let r = 0; r < n; r++) {
        let s = 0;
        for (let c = 0; c < n; c++) s += jac[r * n + c]! * this.v[c]!;
        this.product[r] = s;
      }
    }
    for (let i = 0; i < n; i++) out[n + i] = this.product[i]!;
  }
  /** Block-diagonal (J on both blocks; the ∂(J s)/∂y term dropped): only Radau's simplified Newton iteration reads it. */
  jacobian(x: number, y: ArrayLike<number>, out: Float64Array): void {
    const n = this.base.dimension;
    const m = this.dimension;
    const jac = this.jac;
    this.base.jacobian(x, y, jac);
    out.fill(0);
    for (let r = 0; r < n; r++) {
      for (let c = 0; c < n; c++) {
        out[r * m + c] = jac[r * n + c]!;
        out[(n + r) * m + n + c] = jac[r * n + c]!;
      }
    }
  }
}

export function solvePeriodicKrylov(problem: PeriodicProblem, options: PeriodicOptions): PeriodicResult {
  const base = problem.system;
  const n = base.dimension;
  const directional = new WithDirection(base);
  const integrator = options.integrator ?? chooseCellsIntegrator(problem.stiffness, n, problem.forcingHasCorners);
  const rtol = options.relativeTolerance;
  const corners = problem.forcingHasCorners === true && problem.breakpoints === undefined;
  const share = corners ? CORNER_ODE_TOLERANCE_SHARE : problem.breakpoints && problem.breakpoints.length > 0 ? ARC_ODE_TOLERANCE_SHARE : ODE_TOLERANCE_SHARE;
  const memory = Math.min(1, Math.max(problem.memoryEstimate ?? 1, 1e-6));
  const finalTolerance = Math.max(FINEST_ODE_TOLERANCE, share * rtol * memory);
  // The start state's error is g/(1 − Φ'): |g| ≤ share·rtol·scale·(1 − Φ') makes y₀ meet rtol.
  const target = CONVERGENCE_SHARE * rtol * memory;
  const scale = problem.scale;
  const scale2 = new Float64Array(2 * n);
  let reference = 0;
  for (let i = 0; i < n; i++) {
    scale2[i] = scale2[n + i] = scale[i]!;
    reference = Math.max(reference, scale[i]!);
  }
  const from = problem.start;
  const to = problem.start + problem.cycleLength;
  const work = emptyWork();
  const y0 = Float64Array.from(problem.guess);
  const y = new Float64Array(n);
  const g = new Float64Array(n);
  const delta = new Float64Array(n);
  const augmented = new Float64Array(2 * n);
  let passTolerance = coarsePassTolerance(FIRST_GUESS_ERROR, memory, finalTolerance);
  let productTolerance = passTolerance;
  let cycles = 0;
  let residual = Infinity;
  let previousFinalResidual = Infinity;

  // (∂Φ/∂y₀ − I) v: one cycle from y₀ with s(0) = v scaled to temperature size (the map is linear in v).
  const jacobianMinusIdentity = (v: Float64Array, out: Float64Array): void => {
    let largest = 0;
    for (let i = 0; i < n; i++) largest = Math.max(largest, Math.abs(v[i]!));
    if (largest === 0) {
      out.fill(0);
      return;
    }
    const c = reference / largest;
    for (let i = 0; i < n; i++) {
      augmented[i] = y0[i]!;
      augmented[n + i] = c * v[i]!;
    }
    addWork(work, integrateCycle(directional, integrator, from, to, augmented, productTolerance, scale2, undefined, problem.maxStepsPerCycle, problem.breakpoints));
    cycles++;
    options.onCycle?.(cycles);
    for (let i = 0; i < n; i++) out[i] = augmented[n + i]! / c - v[i]!;
  };

  for (let iteration = 1; iteration <= MAX_ITERATIONS; iteration++) {
    const finalPass = passTolerance <= finalTolerance * 1.000001;
    y.set(y0);
    addWork(
      work,
      integrateCycle(base, integrator, from, to, y, passTolerance, scale, finalPass ? options.samples : undefined, problem.maxStepsPerCycle, problem.breakpoints),
    );
    cycles++;
    options.onCycle?.(cycles);
    residual = 0;
    for (let i = 0; i < n; i++) {
      g[i] = y[i]! - y0[i]!;
      residual = Math.max(residual, Math.abs(g[i]!) / scale[i]!);
    }
    if (!Number.isFinite(residual)) throw new CalorbitError("INTEGRATION_FAILED", "the cell temperatures left the finite range");
    // Stagnation: a final pass that fails to halve a residual already within 10× the target has
    // reached the integrator's noise floor; take the start and report what was reached.
    const stagnated = finalPass && residual > 0.5 * previousFinalResidual && residual <= 10 * target;
    if (finalPass) previousFinalResidual = residual;
    if (finalPass && (residual <= target || stagnated)) {
      return {
        start: y0,
        iterations: iteration,
        cyclesIntegrated: cycles,
        periodicityResidual: residual,
        monodromyDiagonal: new Float64Array(0),
        integrator,
        odeRelativeTolerance: passTolerance,
        work,
      };
    }
    // Solve (Φ' − I) δ = −g only as exactly as the step can use: after it the start is off by about
    // η × the error before it plus Newton's quadratic remainder (≈ residual², relative), so η need
    // not be below the residual itself, nor below what brings the error to a tenth of the target.
    const forcing = Math.min(LOOSEST_FORCING, Math.max(TIGHTEST_FORCING, residual, (0.1 * target) / Math.max(residual, 1e-300)));
    productTolerance = Math.max(passTolerance, Math.min(1e-6, PRODUCT_TOLERANCE_SHARE * forcing * memory));
    for (let i = 0; i < n; i++) g[i] = -g[i]!;
    gmres(jacobianMinusIdentity, g, delta, { relativeTolerance: forcing, restart: GMRES_RESTART, maxProducts: MAX_PRODUCTS });
    let stepSize = 0;
    for (let i = 0; i < n; i++) {
      // Temperatures stay positive: never step below a tenth of the current value.
      const next = Math.max(y0[i]! + delta[i]!, 0.1 * y0[i]!);
      stepSize = Math.max(stepSize, Math.abs(next - y0[i]!) / scale[i]!);
      y0[i] = next;
    }
    // After the step the start is off by about η Δ + Δ² (plus this pass's integration error over
    // 1 − Φ'): when that meets the target, the next pass is the final one.
    const expectedError = forcing * stepSize + stepSize * stepSize + passTolerance / memory;
    passTolerance = expectedError <= target ? finalTolerance : coarsePassTolerance(expectedError, memory, finalTolerance);
  }
  throw new CalorbitError(
    "PERIODIC_NO_CONVERGENCE",
    `no periodic steady state of the ${n} coupled cells after ${MAX_ITERATIONS} Newton–Krylov steps (last relative residual ${residual.toExponential(2)})`,
  );
}
