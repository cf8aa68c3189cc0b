/**
 * `calorbit fit SCENARIO --data FILE --free KEY[=LOW..HIGH] ...`: fits free scenario keys (and a
 * time offset) to an observed series, optionally samples the posterior on worker threads into a
 * resumable chain file. The work is in fitAction.ts, loaded only when the command runs.
 */
import type { Command } from "commander";
import type { FitFlags } from "./fitAction.js";

export function registerFit(program: Command): void {
  program
    .command("fit")
    .description("fit scenario keys (and a time offset) to an observed temperature or flux-ratio series; --posterior samples their posterior")
    .argument("<scenario>", "scenario file (YAML or JSON): the model, with every key not set free held at its value")
    .option("--data <file>", "observed series: CSV or JSON Lines (.jsonl) with time_s / time_d …, temperature_K (optional sigma_K) or flux_ratio (optional sigma)")
    .option("--free <KEY[=LOW..HIGH]>", "a free key with its bounds (units as in sweeps; 'log' or 'lin' after them); timeOffset shifts the data's clock; repeat", (v: string, acc: string[] = []) => [...acc, v])
    .option("--time-unit <unit>", "unit of a bare 'time' column (s, min, h, d, yr)")
    .option("--model-output <what>", "model series compared with the data: surface, day, night, depth=<length> (a column), latitude=<angle> (a zonal band; surface = its global mean), or fluxRatio (a map with an observer); default: surface for temperatures, fluxRatio for flux_ratio data")
    .option("--starts <n>", "least-squares starts (the centre of the bounds, then seeded random points)", "4")
    .option("--seed <s>", "seed of the starts and the posterior", "1")
    .option("--tolerance <x>", "relative tolerance of each model run", "1e-7")
    .option("--samples <n>", "points of the model cycle the data are interpolated from (raise it for sharp features such as sunrise)", "500")
    .option("--json", "print one JSON document (parameters in SI, χ², degrees of freedom, covariance)")
    .option("--residuals <file>", "write the data with the model and the residuals beside them (CSV)")
    .option("--svg <file>", "write the figure: data with error bars, best fit, residuals (and the posterior's pair plot)")
    .option("--posterior <steps>", "sample the posterior with an ensemble sampler for this many steps")
    .option("--walkers <n>", "walkers of the ensemble (even, ≥ 4)", "32")
    .option("--chain <file>", "with --posterior: the chain CSV (rerunning the same command resumes it)")
    .option("--burn-in <steps>", "steps dropped before the posterior summary (default: half)")
    .option("--workers <n>", "worker threads for the posterior (default: the number of cores)")
    .option("--view", "then open the fit in the browser viewer (data, best fit, residuals, parameters, posterior pair plot) until Ctrl-C")
    .option("--port <n>", "with --view: the viewer's port on 127.0.0.1 (0: a free one)", "0")
    .option("--quiet", "no progress line on stderr (it is drawn only on a terminal, and only for work that lasts over a second)")
    .addHelpText(
      "after",
      `
Examples:
  calorbit fit scenarios/tessaly-night.yaml --data scenarios/tessaly-night.csv --samples 1000 \\
      --free "body.heatCapacity=0.005 MJ/m2/K..0.5 MJ/m2/K" --free body.albedo=0..0.6 --free "timeOffset=100 h..140 h"
  calorbit fit my.yaml --data night.csv --free "body.column.thermalInertia=10..1000" --json
  calorbit fit my.yaml --data night.csv --free body.albedo --posterior 2000 --chain chain.csv --svg fit.svg --view`,
    )
    .action(async (scenario: string, flags: FitFlags) => (await import("./fitAction.js")).fitCommand(scenario, flags));
}
