/**
 * Runs the built CLI in-process (npm test builds it first), with its output collected and, for
 * `--shard auto`, scheduler variables set for the one call: no process start-up per call.
 */
import { existsSync } from "node:fs";
import { join } from "node:path";
import { main } from "../dist/src/cli/program.js";

/** The compiled executable, for the tests that need a real process. */
export const CLI = join(import.meta.dirname, "..", "dist", "src", "cli", "main.js");
if (!existsSync(CLI)) throw new Error(`${CLI} is missing: run 'npm run build' (npm test does it)`);

export interface CliResult {
  status: number;
  stdout: string;
  stderr: string;
}

/** `calorbit ARGS…` in this process (env: variables set for the call, restored after it). */
export async function calorbit(args: string[], env: Record<string, string> = {}): Promise<CliResult> {
  let stdout = "";
  let stderr = "";
  const saved = Object.fromEntries(Object.keys(env).map((k) => [k, process.env[k]]));
  Object.assign(process.env, env);
  try {
    const status = await main(["node", "calorbit", ...args], { out: (text) => void (stdout += text), err: (text) => void (stderr += text) });
    return { status, stdout, stderr };
  } finally {
    for (const [k, v] of Object.entries(saved)) {
      if (v === undefined) delete process.env[k];
      else process.env[k] = v;
    }
  }
}
