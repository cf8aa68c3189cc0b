/**
 * The best fit of free parameters to observations: weighted least squares over the forward model
 * from several starts, then χ², the reduced χ², the residuals, and the covariance and correlations
 * from the Jacobian at the optimum (the linearised, Gaussian approximation).
 */
import { CalorbitError } from "../errors.js";
import type { ForwardModel } from "./forward.js";
import { covarianceFromJacobian, jacobian, multiStart, mulberry32, type LeastSquaresProblem } from "./leastSquares.js";
import { fromInternal, toInternal, type FreeParameter } from "./parameters.js";

export interface FitOptions {
  /** Number of LM starts: the centre of the bounds, then seeded uniform draws (default 4). */
  starts?: number;
  seed?: number;
  /** Extra start points (values in the parameters' units), tried first. */
  initial?: readonly (readonly number[])[];
  maxIterations?: number;
}

export interface ParameterEstimate {
  parameter: FreeParameter;
  /** Best-fit value in the parameter's unit. */
  value: number;
  /** 1σ from the covariance, in the parameter's unit (null when not constrained). */
  sigma: number | null;
  atBound: boolean;
}

export interface BestFit {
  estimates: ParameterEstimate[];
  /** Values in the parameters' units, in --free order. */
  values: number[];
  chiSquare: number;
  degreesOfFreedom: number;
  reducedChiSquare: number;
  /** Covariance in the parameters' units (row-major p×p), null when singular. */
  covariance: Float64Array | null;
  correlation: Float64Array | null;
  /** Model at the data times, and data − model. */
  model: Float64Array;
  residual: Float64Array;
  /** The σ used per point: the file's, or (none given) the rms residual, estimated from the fit. */
  sigmaUsed: Float64Array;
  sigmaEstimated: boolean;
  converged: boolean;
  starts: number;
  evaluations: number;
  warnings: string[];
}

/** Least-squares problem over the forward model in internal coordinates, residuals weighted by σ (1 when none). */
export function leastSquaresProblem(forward: ForwardModel, parameters: readonly FreeParameter[], sigma: Float64Array): LeastSquaresProblem {
  const obs = forward.observations;
  const n = obs.value.length;
  const values = new Float64Array(parameters.length);
  const model = new Float64Array(n);
  return {
    lower: Float64Array.from(parameters, (p) => toInternal(p, p.low)),
    upper: Float64Array.from(parameters, (p) => toInternal(p, p.high)),
    points: n,
    residuals(z, out) {
      for (let j = 0; j < parameters.length; j++) values[j] = fromInternal(parameters[j]!, z[j]!);
      try {
        forward.predict(values, model);
      } catch (err) {
        if (err instanceof CalorbitError && (err.code === "USAGE" || (err.code === "INVALID_ARGUMENT" && err.problems[0]?.path === "data"))) throw err;
        return false; // a case the engine cannot solve (out of the physical range): a wall for the optimiser
      }
      for (let i = 0; i < n; i++) {
        const r = (obs.value[i]! - model[i]!) / sigma[i]!;
        if (!Number.isFinite(r)) return false;
        out[i] = r;
      }
      return true;
    },
  };
}

export function fitBest(forward: ForwardModel, parameters: readonly FreeParameter[], options: FitOptions = {}): BestFit {
  const obs = forward.observations;
  const n = obs.value.length;
  const p = parameters.length;
  if (p === 0) throw new CalorbitError("USAGE", "--free: missing", [{ path: "--free", given: "missing", allowed: "at least one KEY[=LOW..HIGH], e.g. --free body.albedo=0..0.6" }]);
  if (n <= p) {
    throw new CalorbitError("INVALID_ARGUMENT", "fewer points than free parameters", [
      { path: "data", given: `${n} points for ${p} free parameters`, allowed: `more points than free parameters (at least ${p + 1})` },
    ]);
  }
  const sigmaGiven = obs.sigma !== null;
  const unitSigma = obs.sigma ?? new Float64Array(n).fill(1);
  const problem = leastSquaresProblem(forward, parameters, unitSigma);
  const startCount = Math.max(1, options.starts ?? 4);
  const rng = mulberry32(options.seed ?? 1);
  const starts: Float64Array[] = [];
  for (const v of options.initial ?? []) starts.push(Float64Array.from(parameters, (q, j) => toInternal(q, v[j]!)));
  starts.push(Float64Array.from(parameters, (_q, j) => 0.5 * (problem.lower[j]! + problem.upper[j]!)));
  while (starts.length < startCount + (options.initial?.length ?? 0)) {
    starts.push(Float64Array.from(parameters, (_q, j) => problem.lower[j]! + rng() * (problem.upper[j]! - problem.lower[j]!)));
  }
  const before = forward.evaluations;
  const found = multiStart(problem, starts, { maxIterations: options.maxIterations ?? 100 });
  if (!found) {
    throw new CalorbitError("INTEGRATION_FAILED", "the model could not be evaluated at any start inside the bounds; narrow the --free bounds");
  }
  const { best } = found;
  const values = Array.from(best.z, (z, j) => fromInternal(parameters[j]!, z));
  const dof = n - p;
  const reduced = best.chiSquare / dof;
  const warnings: string[] = [];

  // Covariance in internal coordinates from a central-difference Jacobian at the optimum, then in
  // the parameters' units: C_v = D C_z D with D = dv/dz (v for a log parameter).
  const jac = new Float64Array(n * p);
  let covariance: Float64Array | null = null;
  if (jacobian(problem, best.z, 1e-5, jac) >= 0) {
    const cz = covarianceFromJacobian(jac, n, p);
    if (cz) {
      // Without σ in the file, the residual scatter estimates it: scale by χ²/dof (common practice).
      const scale = sigmaGiven ? 1 : reduced;
      covariance = new Float64Array(p * p);
      for (let j = 0; j < p; j++) {
        for (let k = 0; k < p; k++) {
          const dj = parameters[j]!.log ? values[j]! : 1;
          const dk = parameters[k]!.log ? values[k]! : 1;
          covariance[j * p + k] = cz[j * p + k]! * dj * dk * scale;
        }
      }
    } else {
      warnings.push("the Jacobian is singular at the best fit: some free parameters are not constrained by these data (no uncertainties)");
    }
  } else {
    warnings.push("the model could not be evaluated around the best fit: no uncertainties");
  }
  const correlation = covariance ? new Float64Array(p * p) : null;
  if (covariance && correlation) {
    for (let j = 0; j < p; j++) {
      for (let k = 0; k < p; k++) correlation[j * p + k] = covariance[j * p + k]! / Math.sqrt(covariance[j * p + j]! * covariance[k * p + k]!);
    }
  }
  const model = new Float64Array(n);
  forward.predict(values, model);
  const residual = Float64Array.from(obs.value, (y, i) => y - model[i]!);
  const sigmaUsed = sigmaGiven ? Float64Array.from(obs.sigma!) : new Float64Array(n).fill(Math.sqrt(reduced));
  const estimates = parameters.map((parameter, j) => {
    const v = covariance ? covariance[j * p + j]! : NaN;
    return { parameter, value: values[j]!, sigma: v >= 0 && Number.isFinite(v) ? Math.sqrt(v) : null, atBound: best.atBound[j]! };
  });
  for (const e of estimates) {
    if (e.atBound) warnings.push(`${e.parameter.key} ended on a bound of its range: widen it, or read the value as a limit (its σ is not meaningful)`);
  }
  if (!best.converged) warnings.push("the least-squares iteration stopped at its iteration cap before converging");
  if (sigmaGiven && dof > 0) {
    // χ² of a right model with right σ has mean dof and sd √(2 dof) (common practice): flag 3 sd off.
    const z = (best.chiSquare - dof) / Math.sqrt(2 * dof);
    if (z > 3) warnings.push(`χ² is ${best.chiSquare.toPrecision(4)} for ${dof} degrees of freedom: the model does not describe the data within the given σ (or σ is too small)`);
    if (z < -3) warnings.push(`χ² is ${best.chiSquare.toPrecision(4)} for ${dof} degrees of freedom: the given σ look too large`);
  }
  return {
    estimates,
    values,
    chiSquare: best.chiSquare,
    degreesOfFreedom: dof,
    reducedChiSquare: reduced,
    covariance,
    correlation,
    model,
    residual,
    sigmaUsed,
    sigmaEstimated: !sigmaGiven,
    converged: best.converged,
    starts: starts.length,
    evaluations: forward.evaluations - before,
    warnings,
  };
}
