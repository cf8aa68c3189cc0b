/**
 * What the browser viewer needs to show a fit (`calorbit fit --view`): the JSON document of the fit
 * (the same contract as `fit --json`), the data with their σ, the model and the residuals at the data
 * times, the best-fit curve on a fine grid, the parameters in their own units, and the posterior's
 * pair plot already binned. Times are in the data file's unit, on the data's clock.
 */
import type { FitFigure } from "./svg.js";
import { fitDocument, type FitReportInput } from "./report.js";
import { secondsPerTimeUnit } from "./observations.js";
import { chainColumns, pairDensity, type PairDensity } from "./pairDensity.js";
import { siUnit } from "./parameters.js";

export interface FitViewParameter {
  key: string;
  /** The unit the values below are in (the bounds' unit, or the key's SI unit for bare numbers; "" when dimensionless). */
  unit: string;
  value: number;
  sigma: number | null;
  low: number;
  high: number;
  logScale: boolean;
  atBound: boolean;
  posterior: { median: number; p16: number; p84: number; autocorrelationSteps: number } | null;
}

export interface FitViewDocument {
  kind: "fit";
  /** `fit --json`'s document (parameters in SI, χ², degrees of freedom, covariance, warnings, caution). */
  fit: Record<string, unknown>;
  title: string;
  quantity: "temperature" | "fluxRatio";
  timeUnit: string;
  dataFile: string;
  outputSpec: string;
  chiSquare: number;
  degreesOfFreedom: number;
  reducedChiSquare: number;
  sigmaEstimated: boolean;
  data: { time: number[]; observed: number[]; sigma: number[]; model: number[]; residual: number[] };
  curve: { time: number[]; value: number[] };
  parameters: FitViewParameter[];
  /** Samples after the burn-in (walkers × steps) and their binning, or null without a posterior. */
  posterior: { samples: number; density: PairDensity } | null;
  warnings: string[];
  caution: string;
}

export function fitViewDocument(input: FitReportInput, figure: Pick<FitFigure, "curve" | "chain" | "parameters">): FitViewDocument {
  const { fit, observations: obs, posterior } = input;
  const perUnit = secondsPerTimeUnit(obs.timeUnit) ?? 1;
  const document = fitDocument(input);
  const chain = figure.chain && figure.chain.length > 0 ? figure.chain : null;
  return {
    kind: "fit",
    fit: document,
    title: input.title,
    quantity: obs.quantity,
    timeUnit: obs.timeUnit,
    dataFile: input.dataFile,
    outputSpec: input.outputSpec,
    chiSquare: fit.chiSquare,
    degreesOfFreedom: fit.degreesOfFreedom,
    reducedChiSquare: fit.reducedChiSquare,
    sigmaEstimated: fit.sigmaEstimated,
    data: {
      time: Array.from(obs.timeSeconds, (t) => t / perUnit),
      observed: Array.from(obs.value),
      sigma: Array.from(fit.sigmaUsed),
      model: Array.from(fit.model),
      residual: Array.from(fit.residual),
    },
    curve: { time: Array.from(figure.curve.timeSeconds, (t) => t / perUnit), value: Array.from(figure.curve.value) },
    parameters: fit.estimates.map((e, j) => {
      const q = posterior?.estimates[j];
      return {
        key: e.parameter.key,
        unit: e.parameter.unit !== "" ? e.parameter.unit : siUnit(e.parameter),
        value: e.value,
        sigma: e.sigma,
        low: e.parameter.low,
        high: e.parameter.high,
        logScale: e.parameter.log,
        atBound: e.atBound,
        posterior: q ? { median: q.median, p16: q.p16, p84: q.p84, autocorrelationSteps: q.autocorrelationSteps } : null,
      };
    }),
    posterior: chain ? { samples: chain.length * (chain[0]?.positions.length ?? 0), density: pairDensity(chainColumns(chain, figure.parameters.length)) } : null,
    warnings: document.warnings as string[],
    caution: document.caution as string,
  };
}
