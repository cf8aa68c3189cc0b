/**
 * The in-process CLI of `cliHarness.ts`, called with an argument list and, for `--shard auto`,
 * scheduler variables set for the one call.
 */
import { calorbit as calorbitInProcess, type CliResult } from "./cliHarness.js";

export { CLI, type CliResult } from "./cliHarness.js";

/** `calorbit ARGS…` in this process (env: variables set for the call, restored after it). */
export async function calorbit(args: string[], env: Record<string, string> = {}): Promise<CliResult> {
  const saved = Object.fromEntries(Object.keys(env).map((k) => [k, process.env[k]]));
  Object.assign(process.env, env);
  try {
    return await calorbitInProcess(...args);
  } finally {
    for (const [k, v] of Object.entries(saved)) {
      if (v === undefined) delete process.env[k];
      else process.env[k] = v;
    }
  }
}
