/**
 * Reports of a fit: the text summary (each parameter with its unit and uncertainty, χ², the
 * caution that the uncertainties hold only if the model is right), the JSON document (contract:
 * parameters[].{key, value, sigma} in SI, after a posterior also median, p16, p84; chiSquare;
 * degreesOfFreedom) and the residual table (the data with the model and the residual beside them).
 */
import { sig } from "../report/format.js";
import { VERSION } from "../version.js";
import type { BestFit } from "./bestFit.js";
import type { Observations } from "./observations.js";
import { secondsPerTimeUnit } from "./observations.js";
import { parameterColumn, siPerUnit, siUnit, toSI, type FreeParameter } from "./parameters.js";
import type { PosteriorSummary } from "./posterior.js";

export const MODEL_ADEQUACY_CAUTION = [
  "Caution: the uncertainties are conditional on the model being right. A simplified thermal model",
  "fitted to real data has systematic errors (geometry, layering, emissivity, roughness) that no σ",
  "above contains; a reduced χ² far from 1 says the model or the σ do not fit the data.",
].join("\n");

function unitLabel(p: FreeParameter): string {
  return p.unit !== "" ? p.unit : siUnit(p);
}

export interface FitReportInput {
  title: string;
  observations: Observations;
  fit: BestFit;
  posterior?: PosteriorSummary;
  dataFile: string;
  outputSpec: string;
}

export function fitText(input: FitReportInput): string {
  const { fit, observations, posterior } = input;
  const lines: string[] = [];
  lines.push(`calorbit ${VERSION} fit: ${input.title}`);
  lines.push(`  data      ${input.dataFile}: ${observations.value.length} points, ${observations.columns.value} against the model's ${input.outputSpec}`);
  lines.push(
    `  σ         ${fit.sigmaEstimated ? `none in the file: estimated from the residual scatter, ${sig(fit.sigmaUsed[0]!)} (uncertainties scaled by χ²/dof)` : `from ${observations.columns.sigma}`}`,
  );
  lines.push("");
  lines.push("best fit (least squares, Levenberg–Marquardt):");
  const width = Math.max(...fit.estimates.map((e) => e.parameter.key.length));
  for (const e of fit.estimates) {
    const u = unitLabel(e.parameter);
    const s = e.sigma === null ? "(not constrained)" : `± ${sig(e.sigma, 2)}`;
    lines.push(`  ${e.parameter.key.padEnd(width)}  ${sig(e.value, 5)} ${s}${u ? ` ${u}` : ""}${e.parameter.log ? "   [log scale]" : ""}${e.atBound ? "   AT A BOUND" : ""}`);
  }
  lines.push(`  χ² = ${sig(fit.chiSquare, 5)} for ${fit.degreesOfFreedom} degrees of freedom (reduced χ² = ${sig(fit.reducedChiSquare, 4)})`);
  const rms = Math.sqrt(fit.residual.reduce((a, r) => a + r * r, 0) / fit.residual.length);
  lines.push(`  rms residual ${sig(rms, 3)}${observations.quantity === "temperature" ? " K" : " (flux ratio)"}; ${fit.starts} starts, ${fit.evaluations} model runs`);
  if (fit.correlation && fit.estimates.length > 1) {
    lines.push("  correlations:");
    const p = fit.estimates.length;
    for (let j = 0; j < p; j++) {
      for (let k = j + 1; k < p; k++) {
        lines.push(`    ${fit.estimates[j]!.parameter.key} – ${fit.estimates[k]!.parameter.key}: ${fit.correlation[j * p + k]!.toFixed(3)}`);
      }
    }
  }
  if (posterior) {
    lines.push("");
    lines.push(`posterior (${posterior.walkers} walkers × ${posterior.steps} steps, the first ${posterior.burnIn} dropped as burn-in; acceptance ${posterior.acceptance.toFixed(2)}):`);
    fit.estimates.forEach((e, j) => {
      const q = posterior.estimates[j]!;
      const u = unitLabel(e.parameter);
      lines.push(
        `  ${e.parameter.key.padEnd(width)}  ${sig(q.median, 5)} +${sig(q.p84 - q.median, 2)} −${sig(q.median - q.p16, 2)}${u ? ` ${u}` : ""}   (median, 16–84 %; τ ≈ ${Number.isFinite(q.autocorrelationSteps) ? q.autocorrelationSteps.toFixed(1) : "?"} steps)`,
      );
    });
  }
  const warnings = [...fit.warnings, ...(posterior?.warnings ?? [])];
  if (warnings.length > 0) {
    lines.push("");
    for (const w of warnings) lines.push(`warning: ${w}`);
  }
  lines.push("");
  lines.push(MODEL_ADEQUACY_CAUTION);
  return lines.join("\n") + "\n";
}

/** The JSON document; values and σ in SI, the parameter's own unit beside them. */
export function fitDocument(input: FitReportInput): Record<string, unknown> {
  const { fit, posterior } = input;
  const p = fit.estimates.length;
  const scale = fit.estimates.map((e) => siPerUnit(e.parameter));
  return {
    calorbit: VERSION,
    title: input.title,
    data: { file: input.dataFile, points: input.observations.value.length, observed: input.observations.columns.value, modelOutput: input.outputSpec, sigmaEstimated: fit.sigmaEstimated },
    parameters: fit.estimates.map((e, j) => {
      const entry: Record<string, unknown> = {
        key: e.parameter.key,
        value: toSI(e.parameter, e.value),
        sigma: e.sigma === null ? null : e.sigma * scale[j]!,
        siUnit: siUnit(e.parameter),
        unit: e.parameter.unit,
        valueInUnit: e.value,
        sigmaInUnit: e.sigma,
        bounds: [toSI(e.parameter, e.parameter.low), toSI(e.parameter, e.parameter.high)],
        logScale: e.parameter.log,
        atBound: e.atBound,
      };
      if (posterior) {
        const q = posterior.estimates[j]!;
        entry.median = toSI(e.parameter, q.median);
        entry.p16 = toSI(e.parameter, q.p16);
        entry.p84 = toSI(e.parameter, q.p84);
        entry.autocorrelationSteps = q.autocorrelationSteps;
      }
      return entry;
    }),
    chiSquare: fit.chiSquare,
    degreesOfFreedom: fit.degreesOfFreedom,
    reducedChiSquare: fit.reducedChiSquare,
    covariance: fit.covariance ? Array.from({ length: p }, (_, j) => Array.from({ length: p }, (_, k) => fit.covariance![j * p + k]! * scale[j]! * scale[k]!)) : null,
    correlation: fit.correlation ? Array.from({ length: p }, (_, j) => Array.from(fit.correlation!.subarray(j * p, j * p + p))) : null,
    converged: fit.converged,
    modelRuns: fit.evaluations,
    ...(posterior
      ? { posterior: { walkers: posterior.walkers, steps: posterior.steps, burnIn: posterior.burnIn, acceptance: posterior.acceptance } }
      : {}),
    warnings: [...fit.warnings, ...(posterior?.warnings ?? [])],
    caution: MODEL_ADEQUACY_CAUTION.replace(/\n/g, " "),
  };
}

/** The data rows with the best-fit model, the residual and the normalised residual beside them. */
export function residualCsv(observations: Observations, fit: BestFit, parameters: readonly FreeParameter[]): string {
  const perUnit = secondsPerTimeUnit(observations.timeUnit) ?? 1;
  const isT = observations.quantity === "temperature";
  const header = [`time_${observations.timeUnit}`, isT ? "observed_K" : "observed_flux_ratio", isT ? "sigma_K" : "sigma", isT ? "model_K" : "model_flux_ratio", isT ? "residual_K" : "residual", "normalised_residual"];
  const lines = [
    `# calorbit ${VERSION} fit residuals (residual = observed − model; normalised = residual / σ${fit.sigmaEstimated ? ", σ estimated from the scatter" : ""})`,
    `# best fit: ${parameters.map((p, j) => `${parameterColumn(p)}=${fit.values[j]}`).join(" ")}`,
    header.join(","),
  ];
  for (let i = 0; i < observations.value.length; i++) {
    const r = fit.residual[i]!;
    lines.push([observations.timeSeconds[i]! / perUnit, observations.value[i]!, fit.sigmaUsed[i]!, fit.model[i]!, r, r / fit.sigmaUsed[i]!].map(String).join(","));
  }
  return lines.join("\n") + "\n";
}
