/** File input and output for the CLI: scenario reading and all-or-nothing writes. */
import { existsSync, readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { basename, dirname, extname, join } from "node:path";
import { CalorbitError } from "../errors.js";
import { resolveScenario, type ResolvedScenario } from "../scenario/resolve.js";
import { parseScenarioText } from "../scenario/text.js";

import { DEMO_SCENARIO } from "./paths.js";

export { DEMO_SCENARIO };

export function loadScenario(path: string | undefined): { resolved: ResolvedScenario; file: string } {
  const { document, file } = loadScenarioDocument(path);
  return { resolved: resolveScenario(document), file };
}

/** The scenario file parsed but not yet validated (a sweep sets values before validating each case). */
export function loadScenarioDocument(path: string | undefined): { document: unknown; file: string } {
  const file = path ?? DEMO_SCENARIO;
  if (!existsSync(file)) {
    throw new CalorbitError("SCENARIO_UNREADABLE", `${file}: no such file`);
  }
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (err) {
    throw new CalorbitError("SCENARIO_UNREADABLE", `${file}: cannot be read (${(err as Error).message})`);
  }
  const ext = extname(file).toLowerCase();
  const format = ext === ".json" ? "json" : "yaml";
  return { document: parseScenarioText(text, format, file), file };
}

/**
 * Writes a file all at once: to a temporary name beside it, then renamed into place, so a crash
 * or an error never leaves a half-written result under the requested name.
 */
export function writeFileAtomic(path: string, content: string): void {
  const temporary = join(dirname(path), `.${basename(path)}.${process.pid}.partial`);
  try {
    writeFileSync(temporary, content);
    renameSync(temporary, path);
  } catch (err) {
    rmSync(temporary, { force: true });
    throw new CalorbitError("USAGE", `cannot write ${path}: ${(err as Error).message}`);
  }
}
