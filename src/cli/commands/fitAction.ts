/**
 * The work of `calorbit fit` (registered in fit.ts, loaded only when the command runs): reads the
 * scenario and the data, runs the best fit and the posterior (worker threads, a resumable chain
 * file), writes the reports. The fitting itself lives in src/fit/.
 */
import { existsSync, openSync, closeSync, readFileSync, writeSync, ftruncateSync } from "node:fs";
import { dirname, resolve as resolvePath } from "node:path";
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { CalorbitError } from "../../errors.js";
import { resolveScenario } from "../../scenario/resolve.js";
import { parseQuantity } from "../../scenario/units.js";
import { parsePassbandTable } from "../../scenario/passbandFile.js";
import { buildThermalModel } from "../../model/build.js";
import { REGIME_TABLE } from "../../model/regimes.js";
import { fitBest } from "../../fit/bestFit.js";
import { telescopeOf } from "../../run/observeMap.js";
import { caseFor, checkModelOutput, defaultModelOutput, ForwardModel, parseModelOutput, type ForwardSettings } from "../../fit/forward.js";
import { dataFormatFor, parseObservations, type Observations } from "../../fit/observations.js";
import { parseFreeParameter } from "../../fit/parameters.js";
import { runEnsemble, type EnsembleState } from "../../fit/ensemble.js";
import { chainHeader, chainRows, initialWalkers, parseChain, summarisePosterior, type PosteriorSummary, type SavedChain } from "../../fit/posterior.js";
import { fitDocument, fitText, residualCsv } from "../../fit/report.js";
import { fitSvg } from "../../fit/svg.js";
import { loadScenarioDocument, writeFilesAtomic } from "../io.js";
import { progressLine } from "../progressLine.js";
import { estimatedShare } from "../../run/progress.js";
import { refuseUnwritable } from "../outputPaths.js";
import { integerFlag, usage } from "../flags.js";
import { err, out } from "../output.js";

export interface FitFlags {
  data?: string;
  free?: string[];
  timeUnit?: string;
  modelOutput?: string;
  starts: string;
  seed: string;
  tolerance: string;
  samples: string;
  json?: boolean;
  residuals?: string;
  svg?: string;
  posterior?: string;
  walkers: string;
  chain?: string;
  burnIn?: string;
  workers?: string;
  quiet?: boolean;
  view?: boolean;
  port: string;
}

/** Refuses an output path that is one of the inputs (no output may overwrite an input). */
function checkOutputs(inputs: string[], outputs: [string, string | undefined][]): void {
  const ins = new Set(inputs.map((p) => resolvePath(p)));
  const seen = new Set<string>();
  for (const [flag, path] of outputs) {
    if (path === undefined) continue;
    const full = resolvePath(path);
    if (ins.has(full)) throw usage(flag, JSON.stringify(path), "a file that is not one of the inputs (the scenario or the data)");
    if (seen.has(full)) throw usage(flag, JSON.stringify(path), "a file different from the other outputs");
    seen.add(full);
  }
  refuseUnwritable(outputs);
}

export async function fitCommand(scenarioPath: string, flags: FitFlags): Promise<void> {
  if (flags.data === undefined) throw usage("--data", "missing", "the observed series, a CSV or JSON Lines file with time_s (or time_d …) and temperature_K");
  if (!flags.free || flags.free.length === 0) throw usage("--free", "missing", "at least one KEY[=LOW..HIGH], e.g. --free body.albedo=0..0.6");
  const starts = integerFlag("--starts", flags.starts, 1, 1000);
  const seed = integerFlag("--seed", flags.seed, 0, 4_294_967_295);
  const samples = integerFlag("--samples", flags.samples, 16, 1_000_000);
  const tolerance = Number(flags.tolerance);
  if (!Number.isFinite(tolerance) || tolerance < 1e-12 || tolerance > 1e-2) throw usage("--tolerance", JSON.stringify(flags.tolerance), "a number from 1e-12 to 1e-2");
  const steps = flags.posterior === undefined ? 0 : integerFlag("--posterior", flags.posterior, 1, 10_000_000);
  const walkers = integerFlag("--walkers", flags.walkers, 4, 100_000);
  if (walkers % 2 !== 0) throw usage("--walkers", JSON.stringify(flags.walkers), "an even number of walkers (the ensemble is updated in two halves)");
  if (steps > 0 && flags.chain === undefined) throw usage("--chain", "missing", "with --posterior: the chain file to write (rerunning the same command resumes it)");
  if (steps === 0 && flags.chain !== undefined) throw usage("--chain", JSON.stringify(flags.chain), "only with --posterior N");
  const burnIn = flags.burnIn === undefined ? Math.floor(steps / 2) : integerFlag("--burn-in", flags.burnIn, 0, Math.max(0, steps - 1));
  const port = integerFlag("--port", flags.port, 0, 65535);
  if (flags.port !== "0" && !flags.view) throw usage("--port", JSON.stringify(flags.port), "only with --view");
  const workerCount = flags.workers === undefined ? Math.max(1, Math.min(availableParallelism(), 8)) : integerFlag("--workers", flags.workers, 1, 256);
  checkOutputs(
    [scenarioPath, flags.data],
    [
      ["--residuals", flags.residuals],
      ["--svg", flags.svg],
      ["--chain", flags.chain],
    ],
  );

  const scenario = loadScenarioDocument(scenarioPath).document as Record<string, unknown>;
  inlinePassband(scenario, scenarioPath);
  const base = resolveScenario(structuredClone(scenario)).thermal;
  // The map has its own cell-by-cell solve: its cycle is the spin's p:q (q orbits); the zonal climate's
  // (daily-mean insolation) is one orbit; the single-surface regimes' is their model's.
  const pipeline = REGIME_TABLE[base.regime].pipeline;
  const cycleOrbits = pipeline === "map" ? (base.spin?.ratio?.orbit ?? 1) : pipeline === "zonal" ? 1 : buildThermalModel(base).cycleOrbits;
  const cycleSeconds = base.orbit.periodSeconds * cycleOrbits;
  const parameters = flags.free.map((a) => parseFreeParameter(a, cycleSeconds));
  const keys = new Set<string>();
  for (const p of parameters) {
    if (keys.has(p.key)) throw usage("--free", JSON.stringify(p.key), "each key once");
    keys.add(p.key);
  }
  if (!existsSync(flags.data)) throw usage("--data", JSON.stringify(flags.data), "an existing file");
  const observations = parseObservations(readFileSync(flags.data, "utf8"), {
    format: dataFormatFor(flags.data),
    source: flags.data,
    ...(flags.timeUnit !== undefined ? { timeUnit: flags.timeUnit } : {}),
  });
  const output = parseModelOutput(
    flags.modelOutput ?? defaultModelOutput(observations.quantity),
    (text) => {
      const q = parseQuantity("length", /^[+-]?[\d.]+([eE][+-]?\d+)?$/.test(text.trim()) ? Number(text) : text);
      return q.ok ? q.valueSI : null;
    },
    (text) => {
      const q = parseQuantity("angle", text.trim()); // bare numbers are degrees, as in scenarios
      return q.ok ? q.valueSI : null;
    },
  );
  const settings: ForwardSettings = { scenario, parameters, output, relativeTolerance: tolerance, samples };
  // The least squares' progress: model runs against a typical count (~15 Levenberg–Marquardt
  // iterations of p + 1 runs per start), shown on a terminal once the fit has lasted a second.
  const fitLine = progressLine("fit", { quiet: flags.quiet === true });
  const typicalRuns = starts * 15 * (parameters.length + 1);
  const forward = new ForwardModel(settings, observations);
  const shownForward = fitLine.hook === undefined ? forward : withRunCount(forward, (runs) => fitLine.update(estimatedShare(runs, typicalRuns), `least squares: ${runs} model runs from ${starts} starts`));
  // Every key and both ends of its bounds must be something the scenario accepts: say so now, not as a failed fit.
  const centre = parameters.map((p) => (p.log ? Math.sqrt(p.low * p.high) : 0.5 * (p.low + p.high)));
  parameters.forEach((p, j) => {
    for (const end of [p.low, p.high]) {
      const values = centre.slice();
      values[j] = end;
      caseFor(settings, values);
    }
  });
  // And the output must be one this scenario gives (a fit treats a case that fails as a wall, so say it now).
  const centreCase = caseFor(settings, centre);
  checkModelOutput(output, centreCase);
  if (REGIME_TABLE[centreCase.regime].pipeline === "map") telescopeOf(centreCase);
  let fit: ReturnType<typeof fitBest>;
  try {
    fit = fitBest(shownForward, parameters, { starts, seed });
  } finally {
    fitLine.close();
  }

  let posterior: PosteriorSummary | undefined;
  let chainSteps: SavedChain["steps"] | undefined;
  if (steps > 0) {
    chainSteps = await samplePosterior(flags.chain!, settings, observations, fit.sigmaUsed, fit.values, fit.estimates.map((e) => e.sigma), { steps, walkers, seed, workers: workerCount, quiet: flags.quiet === true });
    posterior = summarisePosterior(chainSteps, parameters, Math.min(burnIn, chainSteps.length - 1));
  }
  const title = String((scenario as { name?: unknown }).name ?? scenarioPath);
  const report = { title, observations, fit, dataFile: flags.data, outputSpec: output.spec, ...(posterior ? { posterior } : {}) };
  const keptChain = chainSteps ? { chain: chainSteps.slice(posterior!.burnIn) } : {};
  const curve = flags.svg !== undefined || flags.view ? fitCurve(settings, fit.values, observations) : null;
  // Every output built first, then all written together: a failure leaves none of them half done.
  const files: [string, string][] = [];
  if (flags.residuals !== undefined) files.push([flags.residuals, residualCsv(observations, fit, parameters)]);
  if (flags.svg !== undefined) files.push([flags.svg, fitSvg({ title, observations, fit, parameters, curve: curve!, ...keptChain })]);
  writeFilesAtomic(files);
  if (flags.json) {
    out(JSON.stringify(fitDocument(report), null, 2) + "\n");
  } else {
    out(fitText(report));
    if (flags.residuals !== undefined) out(`residuals written to ${flags.residuals}\n`);
    if (flags.chain !== undefined) out(`chain written to ${flags.chain}\n`);
    if (flags.svg !== undefined) out(`figure written to ${flags.svg}\n`);
  }
  if (flags.view) {
    const [{ fitViewDocument }, { serveUntilStopped }] = await Promise.all([import("../../fit/view.js"), import("../viewServer.js")]);
    // With --json the document owns stdout: the viewer's address goes to stderr.
    await serveUntilStopped(JSON.stringify(fitViewDocument(report, { curve: curve!, parameters, ...keptChain })), port, flags.json ? err : out);
  }
}

/**
 * A passband given as a file (relative to the scenario) is read once and written into the document as
 * its table, so every model run (and every posterior worker) has it without touching the disk.
 */
function inlinePassband(scenario: Record<string, unknown>, scenarioPath: string): void {
  const observer = scenario["observer"] as { passband?: unknown } | undefined;
  const band = observer?.passband as { file?: unknown } | undefined;
  if (!observer || typeof band !== "object" || band === null || typeof band.file !== "string") return;
  const path = resolvePath(dirname(scenarioPath), band.file);
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch {
    throw new CalorbitError("SCENARIO_INVALID", "the passband file cannot be read", [
      { path: "observer.passband.file", given: band.file, allowed: "a readable CSV of wavelength_<unit>,response (relative to the scenario)" },
    ]);
  }
  const table = parsePassbandTable(text, band.file);
  observer.passband = { wavelengths: table.wavelengthM.map((m) => `${m} m`), response: [...table.response] };
}

/** The same forward model, calling `onRun` with the count after each model run (for the progress line). */
function withRunCount(forward: ForwardModel, onRun: (runs: number) => void): ForwardModel {
  const predict = forward.predict.bind(forward);
  let runs = 0;
  forward.predict = (values, out) => {
    const result = predict(values, out);
    onRun(++runs);
    return result;
  };
  return forward;
}

/** The best-fit model on a fine grid over the data's time span (for the figure). */
function fitCurve(settings: ForwardSettings, values: number[], observations: Observations): { timeSeconds: Float64Array; value: Float64Array } {
  const n = 600;
  const t0 = observations.timeSeconds[0]!;
  const t1 = observations.timeSeconds[observations.timeSeconds.length - 1]!;
  const times = Float64Array.from({ length: n }, (_, i) => t0 + ((t1 - t0) * i) / (n - 1));
  const fine: Observations = { ...observations, timeSeconds: times, value: new Float64Array(n), sigma: null, lines: new Int32Array(n) };
  const value = new ForwardModel(settings, fine).predict(values);
  return { timeSeconds: times, value };
}

interface SamplerRun {
  steps: number;
  walkers: number;
  seed: number;
  workers: number;
  quiet: boolean;
}

/**
 * Runs (or resumes) the ensemble into the chain file. The file's second line holds the run's
 * definition; a file with another definition is refused, a torn last step is cut before appending.
 */
async function samplePosterior(
  chainPath: string,
  settings: ForwardSettings,
  observations: Observations,
  sigma: Float64Array,
  best: number[],
  bestSigma: (number | null)[],
  run: SamplerRun,
): Promise<SavedChain["steps"]> {
  const dim = settings.parameters.length;
  const definition = JSON.stringify({
    scenario: settings.scenario,
    free: settings.parameters.map((p) => ({ key: p.key, unit: p.unit, low: p.low, high: p.high, log: p.log })),
    output: settings.output.spec,
    tolerance: settings.relativeTolerance,
    samples: settings.samples,
    data: { t: Array.from(observations.timeSeconds), y: Array.from(observations.value), s: Array.from(sigma) },
    walkers: run.walkers,
    seed: run.seed,
    start: best,
  });
  let saved: SavedChain = { steps: [], completeLength: 0 };
  if (existsSync(chainPath)) {
    const parsed = parseChain(readFileSync(chainPath, "utf8"), hashText(definition), run.walkers, dim);
    if (parsed === null) throw usage("--chain", JSON.stringify(chainPath), "a new file, or a chain written by calorbit fit (this file is something else; it was left alone)");
    if (parsed === "different") throw usage("--chain", JSON.stringify(chainPath), "the chain of this same fit (scenario, data, --free, --walkers, --seed): this one is of another run; give a new file");
    saved = parsed;
  }
  const done = saved.steps.length;
  let fd: number;
  if (done === 0) {
    fd = openSync(chainPath, "w");
    writeSync(fd, chainHeader(settings.parameters, hashText(definition)));
  } else {
    fd = openSync(chainPath, "r+");
    ftruncateSync(fd, saved.completeLength);
    closeSync(fd);
    fd = openSync(chainPath, "a");
  }
  const pool = new LogPosteriorPool(run.workers, settings, observations, sigma);
  const line = progressLine("fit", { quiet: run.quiet });
  try {
    let state: EnsembleState;
    if (done === 0) {
      const positions = initialWalkers(best, bestSigma, settings.parameters, run.walkers, run.seed);
      state = { positions, logProbability: await pool.evaluate(positions) };
      if (state.logProbability.every((v) => v === -Infinity)) throw new CalorbitError("INTEGRATION_FAILED", "the model fails at every starting walker");
    } else {
      const last = saved.steps[done - 1]!;
      state = { positions: last.positions.map((x) => Float64Array.from(x)), logProbability: [...last.logProbability] };
    }
    const steps = saved.steps;
    await runEnsemble(state, (points) => pool.evaluate(points), {
      steps: run.steps,
      seed: run.seed,
      firstStep: done,
      onStep: (step, s) => {
        writeSync(fd, chainRows(step, s));
        steps.push({ positions: s.positions.map((x) => Float64Array.from(x)), logProbability: [...s.logProbability] });
        line.update((step + 1) / run.steps, `posterior step ${step + 1} of ${run.steps}`);
      },
    });
    return steps.slice(0, run.steps);
  } finally {
    line.close();
    closeSync(fd);
    await pool.close();
  }
}

/** A short stable hash of the definition (FNV-1a, 64 bits as two halves) for the chain header. */
function hashText(text: string): string {
  let h1 = 0x811c9dc5;
  let h2 = 0x01000193;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    h1 = Math.imul(h1 ^ c, 0x01000193) >>> 0;
    h2 = Math.imul(h2 ^ c, 0x5bd1e995) >>> 0;
  }
  return h1.toString(16).padStart(8, "0") + h2.toString(16).padStart(8, "0");
}

/** ln p of batches of points on worker threads (each worker holds its own forward model). */
class LogPosteriorPool {
  private readonly workers: Worker[];
  private next = 0;
  private readonly pending = new Map<number, (values: number[]) => void>();
  private failure: Error | null = null;

  constructor(count: number, settings: ForwardSettings, observations: Observations, sigma: Float64Array) {
    this.workers = Array.from({ length: count }, () => {
      const w = new Worker(new URL("../fitWorker.js", import.meta.url), { workerData: { settings, observations, sigma } });
      w.on("message", (m: { id: number; values: number[] }) => {
        const done = this.pending.get(m.id);
        this.pending.delete(m.id);
        done?.(m.values);
      });
      w.on("error", (err) => {
        this.failure = err;
      });
      return w;
    });
  }

  async evaluate(points: Float64Array[]): Promise<number[]> {
    if (this.failure) throw new CalorbitError("SWEEP_WORKER_FAILED", `a posterior worker failed: ${this.failure.message}`);
    const count = this.workers.length;
    const per = Math.ceil(points.length / count);
    const parts: Promise<number[]>[] = [];
    for (let w = 0; w < count && w * per < points.length; w++) {
      const id = this.next++;
      const slice = points.slice(w * per, (w + 1) * per);
      parts.push(
        new Promise<number[]>((resolve) => {
          this.pending.set(id, resolve);
          this.workers[w]!.postMessage({ id, points: slice });
        }),
      );
    }
    return (await Promise.all(parts)).flat();
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((w) => w.terminate()));
  }
}

