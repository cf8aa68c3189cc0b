/** `calorbit run` on a map scenario: the surface map through the orbit and, with an observer, its phase curve. */
import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { CalorbitError } from "../../errors.js";
import { mapDocument, mapSeriesCsv, mapSnapshotCsv, mapSvg, sampleNearest } from "../../report/mapReport.js";
import { observeMap } from "../../run/observeMap.js";
import { MAP_DEFAULT_TOLERANCE } from "../../run/simulateMap.js";
import { parsePassbandTable } from "../../scenario/passbandFile.js";
import type { ResolvedScenario } from "../../scenario/resolve.js";
import { mapText } from "../../report/mapReport.js";
import { quantityFlag } from "../flags.js";
import { writeFilesAtomic } from "../io.js";
import { out, warn } from "../output.js";
import { withProgressLine } from "../progressLine.js";

export interface MapRunFlags {
  json?: boolean;
  series?: boolean;
  csv?: string;
  svg?: string;
  mapCsv?: string;
  mapAt?: string;
  samples: number;
  /** null when the user gave none: the map's own default applies. */
  tolerance: number | null;
  quiet?: boolean;
}

/** Reads a passband file named in the scenario (relative to the scenario's folder) into its table. */
export function readPassband(resolved: ResolvedScenario, scenarioFile: string): ResolvedScenario["thermal"] {
  const observer = resolved.thermal.observer;
  if (!observer || observer.passband.kind !== "file") return resolved.thermal;
  const path = resolve(dirname(scenarioFile), observer.passband.path);
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch {
    throw new CalorbitError("SCENARIO_INVALID", "the passband file cannot be read", [
      { path: "observer.passband.file", given: observer.passband.path, allowed: "a readable CSV of wavelength_<unit>,response (relative to the scenario)" },
    ]);
  }
  observer.passband = parsePassbandTable(text, observer.passband.path);
  return resolved.thermal;
}

export function runMap(resolved: ResolvedScenario, scenarioFile: string, flags: MapRunFlags): void {
  const thermal = readPassband(resolved, scenarioFile);
  const observed = withProgressLine("run", flags.quiet, (onProgress) =>
    observeMap(thermal, { relativeTolerance: flags.tolerance ?? MAP_DEFAULT_TOLERANCE, samples: flags.samples, ...(onProgress ? { onProgress } : {}) }),
  );
  const at = flags.mapAt !== undefined ? quantityFlag("--map-at", "time", flags.mapAt) : (observed.phase?.timeOfMaxSeconds ?? 0);
  const sample = sampleNearest(observed, at);
  // Build every output first, then write: a failure leaves nothing half written.
  const outputs: [string, string][] = [];
  if (flags.csv !== undefined) outputs.push([flags.csv, mapSeriesCsv(resolved, observed)]);
  if (flags.mapCsv !== undefined) outputs.push([flags.mapCsv, mapSnapshotCsv(resolved, observed, sample)]);
  if (flags.svg !== undefined) outputs.push([flags.svg, mapSvg(resolved, observed, sample)]);
  writeFilesAtomic(outputs);
  // Warnings (a bare-number luminosity) on stderr, never in the data; the JSON result lists them too.
  const warnings = resolved.warnings ?? [];
  for (const w of warnings) warn(w);
  if (flags.json) {
    out(JSON.stringify({ ...mapDocument(resolved, observed, flags.series === true), warnings }, null, 2) + "\n");
    return;
  }
  out(mapText(resolved, observed));
  for (const [path] of outputs) out(`written: ${path}\n`);
}
