/** File input and output for the CLI: scenario reading and all-or-nothing writes. */
import { existsSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
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
  writeFilesAtomic([[path, content]]);
}

/**
 * Writes several files all or none: each to a temporary name beside it (same folder, so the rename
 * cannot cross file systems), and only when every one is written are they renamed into place; a
 * failure removes the temporaries and leaves no output, new or half written. Commands build all
 * their outputs before calling it, so an interrupted run (Ctrl-C during the solve) writes nothing.
 */
export function writeFilesAtomic(files: readonly (readonly [string, string])[]): void {
  const temporaries = files.map(([path]) => join(dirname(path), `.${basename(path)}.${process.pid}.partial`));
  let current = "";
  try {
    files.forEach(([path, content], i) => {
      current = path;
      writeFileSync(temporaries[i]!, content);
    });
    // A target that cannot be replaced (a folder of that name) is found before any rename.
    for (const [path] of files) {
      current = path;
      if (statSync(path, { throwIfNoEntry: false })?.isDirectory()) throw new Error("it is a folder");
    }
    files.forEach(([path], i) => {
      current = path;
      renameSync(temporaries[i]!, path);
    });
  } catch (err) {
    for (const temporary of temporaries) rmSync(temporary, { force: true });
    throw new CalorbitError("USAGE", `cannot write ${current}: ${(err as Error).message}`);
  }
}
