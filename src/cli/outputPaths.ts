/**
 * Output paths checked before anything runs: no output may overwrite an input, no two outputs
 * of one run may be the same file (one would silently replace the other), and each must be a file
 * in a folder that exists (said before a long solve, not after it).
 */
import { existsSync, realpathSync, statSync } from "node:fs";
import { basename, dirname, join, resolve } from "node:path";
import { usage } from "./flags.js";
import { DEMO_SCENARIO } from "./paths.js";

/** The file a path names once symbolic links and `..` are resolved (a file not yet written: its folder resolved). */
export function resolvedFile(path: string): string {
  const absolute = resolve(path);
  try {
    if (existsSync(absolute)) return realpathSync(absolute);
    return join(realpathSync(dirname(absolute)), basename(absolute));
  } catch {
    return absolute;
  }
}

/**
 * Throws a USAGE error (exit 2) when an output resolves to an input file or to another output.
 * `inputs` may hold undefined for "the bundled demo"; `outputs` are [flag, path or undefined].
 */
export function refuseClobber(command: string, inputs: readonly (string | undefined)[], outputs: readonly (readonly [string, string | undefined])[]): void {
  const inputFiles = new Set(inputs.map((p) => resolvedFile(p ?? DEMO_SCENARIO)));
  const seen = new Map<string, string>();
  for (const [flag, path] of outputs) {
    if (path === undefined) continue;
    const file = resolvedFile(path);
    if (inputFiles.has(file)) throw usage(flag, JSON.stringify(path), `a file other than the ${command} input (writing there would overwrite the scenario)`);
    const other = seen.get(file);
    if (other !== undefined) throw usage(flag, JSON.stringify(path), `a file other than the one given to ${other} (one output would replace the other)`);
    seen.set(file, flag);
  }
  refuseUnwritable(outputs);
}

/** Throws a USAGE error (exit 2) when an output's folder does not exist or the output names a folder. */
export function refuseUnwritable(outputs: readonly (readonly [string, string | undefined])[]): void {
  for (const [flag, path] of outputs) {
    if (path === undefined) continue;
    const absolute = resolve(path);
    const folder = dirname(absolute);
    const folderStat = statSync(folder, { throwIfNoEntry: false });
    if (!folderStat?.isDirectory()) throw usage(flag, JSON.stringify(path), `a file in an existing folder (there is no folder ${JSON.stringify(dirname(path))})`);
    if (statSync(absolute, { throwIfNoEntry: false })?.isDirectory()) throw usage(flag, JSON.stringify(path), "a file name (this is a folder)");
  }
}
