/**
 * Runs the compiled calorbit CLI in-process: `main` with collectors for stdout and stderr, so a CLI
 * test costs a function call instead of a Node start-up. `npm test` builds dist/ first.
 */
import { existsSync } from "node:fs";
import { join } from "node:path";
import { main } from "../dist/src/cli/program.js";

/** The compiled executable, for the few tests that need a real process. */
export const CLI = join(import.meta.dirname, "..", "dist", "src", "cli", "main.js");

if (!existsSync(CLI)) throw new Error(`${CLI} is missing: run 'npm run build' (npm test does it)`);

export interface CliResult {
  status: number;
  stdout: string;
  stderr: string;
}

/** `calorbit ...args` in-process: its exit status and everything it wrote. */
export async function calorbit(...args: string[]): Promise<CliResult> {
  let stdout = "";
  let stderr = "";
  const status = await main(["node", "calorbit", ...args], {
    out: (text) => void (stdout += text),
    err: (text) => void (stderr += text),
  });
  return { status, stdout, stderr };
}
