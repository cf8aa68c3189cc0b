/** `calorbit view`: serve the interactive viewer on 127.0.0.1 for a scenario, a result or a sweep file. */
import type { Command } from "commander";
import { readFileSync } from "node:fs";
import { CalorbitError } from "../../errors.js";
import { integerFlag, usage } from "../flags.js";
import { out } from "../output.js";
import { withProgressLine } from "../progressLine.js";

interface ViewFlags {
  port: string;
  quiet?: boolean;
}

async function viewCommand(path: string | undefined, flags: ViewFlags): Promise<void> {
  const port = integerFlag("--port", flags.port, 0, 65535);
  // The engine, the writers and the HTTP server load only when the viewer starts.
  const [{ heatStoreOf }, { REGIME_TABLE }, { resultDocument }, { simulate }, { parseSweepText, sweepTableFromRecords }, { loadScenarioDocument }, { startViewServer }, { resolveScenario }] = await Promise.all([
    import("../../model/heatStore.js"),
    import("../../model/regimes.js"),
    import("../../report/document.js"),
    import("../../run/simulate.js"),
    import("../../view/sweepData.js"),
    import("../io.js"),
    import("../viewServer.js"),
    import("../../scenario/resolve.js"),
  ]);
  let resultJson: string;
  const parquet = path !== undefined && path.toLowerCase().endsWith(".parquet") ? await import("../sweepParquet.js") : null;
  if (path !== undefined && parquet?.isParquetFile(path)) {
    const { header, records } = await parquet.readParquetSweep(path);
    resultJson = JSON.stringify({ kind: "sweep", file: path, table: sweepTableFromRecords(header, records) });
  } else if (path !== undefined && isSweepFile(path)) {
    resultJson = JSON.stringify({ kind: "sweep", file: path, table: parseSweepText(readFileSync(path, "utf8")) });
  } else if (path !== undefined && path.toLowerCase().endsWith(".json") && looksLikeResult(path)) {
    resultJson = readFileSync(path, "utf8");
  } else {
    const { document, file } = loadScenarioDocument(path);
    if (document === null || typeof document !== "object" || Array.isArray(document)) {
      // A CSV series, a text report…: say what view takes instead of echoing the file.
      throw usage("view", JSON.stringify(path ?? ""), "a scenario, a result written with run --json --series, or a sweep file");
    }
    const resolved = resolveScenario(document);
    switch (REGIME_TABLE[resolved.thermal.regime].pipeline) {
      case "zonal": {
        const [{ zonalViewDocument }, { simulateZonal, zonalCaseOf }] = await Promise.all([import("../../report/zonalReport.js"), import("../../run/zonal.js")]);
        const zonal = zonalCaseOf(resolved.thermal);
        const sim = withProgressLine("view", flags.quiet, (onProgress) => simulateZonal(zonal, onProgress ? { onProgress } : {}));
        resultJson = JSON.stringify(zonalViewDocument(resolved, zonal, sim, zonal.climate, 200));
        break;
      }
      case "map": {
        const [{ mapViewDocument }, { observeMap }, { readPassband }] = await Promise.all([import("../../report/mapReport.js"), import("../../run/observeMap.js"), import("./runMap.js")]);
        const thermal = readPassband(resolved, file);
        const observed = withProgressLine("view", flags.quiet, (onProgress) => observeMap(thermal, { samples: 400, ...(onProgress ? { onProgress } : {}) }));
        resultJson = JSON.stringify(mapViewDocument(resolved, observed));
        break;
      }
      case "surface": {
        // One result for every heat store; a column's also carries its depth × time map (its series is
        // interpolated from the column's steps: 400 points are plenty).
        const samples = heatStoreOf(resolved.thermal).kind === "column" ? 400 : 2000;
        const sim = withProgressLine("view", flags.quiet, (onProgress) => simulate(resolved.thermal, { samples, ...(onProgress ? { onProgress } : {}) }));
        resultJson = JSON.stringify(sim.heatMap ? { kind: "column", ...resultDocument(resolved, sim, true), heatMap: sim.heatMap } : resultDocument(resolved, sim, true));
        break;
      }
    }
  }
  const viewer = await startViewServer(resultJson, port);
  out(`calorbit viewer at ${viewer.url}  (Ctrl-C stops it)\n`);
  await new Promise<void>((resolve) => {
    const stop = () => {
      out("stopping the viewer\n");
      void viewer.close().then(resolve);
      // Keep-alive connections from a browser would hold close() open; do not wait for them.
      viewer.server.closeAllConnections();
    };
    process.once("SIGINT", stop);
    process.once("SIGTERM", stop);
  });
}

/** A file written by `calorbit sweep` (its first line says so). */
function isSweepFile(path: string): boolean {
  try {
    const head = readFileSync(path, "utf8").slice(0, 200);
    return /^# calorbit [^\n]* sweep\n/.test(head) || head.startsWith('{"calorbitSweep":');
  } catch {
    return false;
  }
}

/** A result file from `run --json --series` (not a scenario written as JSON). */
function looksLikeResult(path: string): boolean {
  try {
    const doc = JSON.parse(readFileSync(path, "utf8")) as Record<string, unknown>;
    if ("summary" in doc && "scenario" in doc) {
      if (!("series" in doc)) throw usage("view", JSON.stringify(path), "a result written with run --json --series (this one has no series)");
      return true;
    }
    return false;
  } catch (err) {
    if (err instanceof CalorbitError) throw err;
    return false;
  }
}

export function registerView(program: Command): void {
  program
    .command("view")
    .description("open the interactive viewer in a browser (a local server on 127.0.0.1)")
    .argument("[file]", "a scenario, a result from run --json --series, or a sweep file; the bundled demo when omitted")
    .option("--port <n>", "port to listen on (0: a free one)", "0")
    .option("--quiet", "no progress line on stderr while the scenario is first solved (drawn only on a terminal, after a second)")
    .addHelpText("after", `\nExamples:\n  calorbit view\n  calorbit view scenarios/korvath-locked.yaml --port 8765`)
    .action((file: string | undefined, flags: ViewFlags) => viewCommand(file, flags));
}
