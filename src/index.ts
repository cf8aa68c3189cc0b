/**
 * calorbit's library entry point: the engine without the CLI. Nothing exported here touches the
 * file system or the process, so the same modules run in a browser.
 */
export * from "./constants.js";
export { CalorbitError, formatProblem, type ErrorCode, type FieldProblem } from "./errors.js";
export type { ThermalCase, Regime } from "./model/thermalCase.js";
export * from "./physics/kepler.js";
export * from "./physics/orbit.js";
export * from "./physics/star.js";
export * from "./physics/flux.js";
export * from "./physics/forcing.js";
export * from "./physics/materials.js";
export * from "./physics/energyBalance.js";
export { solvePeriodic, integrateCycle, type PeriodicProblem, type PeriodicResult, type IntegratorName } from "./solve/periodic.js";
export type { OdeSystem, SolverWork } from "./solve/system.js";
export { simulate, DEFAULT_RELATIVE_TOLERANCE, DEFAULT_SAMPLES, type Simulation, type Series, type SimulateOptions, type SolverReport } from "./run/simulate.js";
export type { ProgressHook, ProgressStage } from "./run/progress.js";
export type { CycleSummary, TemperatureStats } from "./analysis/summarise.js";
export { resolveScenario, type ResolvedScenario } from "./scenario/resolve.js";
export { parseScenarioText } from "./scenario/text.js";
export { scenarioJsonSchema, scenarioSchema } from "./scenario/schema.js";
export { parseQuantity, UNIT_TABLES, type QuantityKind } from "./scenario/units.js";
export { resultDocument } from "./report/document.js";
export { seriesCsv } from "./report/csv.js";
export { summaryText, CAUTION } from "./report/text.js";
export { VERSION } from "./version.js";
// Fitting observed series (calorbit fit without the CLI): read the data, set keys free, fit, sample, report.
export { parseObservations, dataFormatFor, type Observations, type ObservedQuantity, type ObservationOptions, type DataFormat } from "./fit/observations.js";
export { parseFreeParameter, TIME_OFFSET_KEY, LOG_SCALE_KEYS, type FreeParameter } from "./fit/parameters.js";
export { ForwardModel, parseModelOutput, defaultModelOutput, checkModelOutput, modelCurve, caseFor, type ForwardSettings, type ModelOutput, type ModelCurve } from "./fit/forward.js";
export { fitBest, type BestFit, type FitOptions, type ParameterEstimate } from "./fit/bestFit.js";
export { runEnsemble, autocorrelationTime, type EnsembleState, type EnsembleOptions, type LogProbabilityBatch } from "./fit/ensemble.js";
export { logPosterior, initialWalkers, summarisePosterior, type PosteriorSummary, type PosteriorEstimate } from "./fit/posterior.js";
export { fitText, fitDocument, residualCsv, MODEL_ADEQUACY_CAUTION, type FitReportInput } from "./fit/report.js";
export { fitSvg, type FitFigure } from "./fit/svg.js";
export { fitViewDocument, type FitViewDocument } from "./fit/view.js";
export { pairDensity, chainColumns, type PairDensity } from "./fit/pairDensity.js";
