/** Runs the built CLI in-process (npm test builds it first): no process start-up per call. */
import { existsSync } from "node:fs";
import { join } from "node:path";
import { vi } from "vitest";

const PROGRAM = join(import.meta.dirname, "..", "dist", "src", "cli", "program.js");

export interface CliResult {
  status: number;
  stdout: string;
  stderr: string;
}

/** `calorbit ARGS…` in this process, with stdout and stderr captured (env: extra variables for the run). */
export async function calorbit(args: string[], env: Record<string, string> = {}): Promise<CliResult> {
  if (!existsSync(PROGRAM)) throw new Error(`${PROGRAM} is missing: run 'npm run build' (npm test does it)`);
  const { main } = (await import(PROGRAM)) as { main: (argv: string[]) => Promise<number> };
  let stdout = "";
  let stderr = "";
  const out = vi.spyOn(process.stdout, "write").mockImplementation((chunk: string | Uint8Array) => {
    stdout += String(chunk);
    return true;
  });
  const err = vi.spyOn(process.stderr, "write").mockImplementation((chunk: string | Uint8Array) => {
    stderr += String(chunk);
    return true;
  });
  const saved = Object.fromEntries(Object.keys(env).map((k) => [k, process.env[k]]));
  Object.assign(process.env, env);
  try {
    const status = await main(["node", "calorbit", ...args]);
    return { status, stdout, stderr };
  } finally {
    out.mockRestore();
    err.mockRestore();
    for (const [k, v] of Object.entries(saved)) {
      if (v === undefined) delete process.env[k];
      else process.env[k] = v;
    }
  }
}
