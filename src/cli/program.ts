/**
 * The calorbit command line: wiring only. Each command lives in its own file under commands/ and is
 * registered with one line below; shared flag parsing is in flags.ts. Bad input: one line per problem
 * on stderr, exit status 2, no stack trace.
 */
import { Command, CommanderError } from "commander";
import { CalorbitError, formatProblem } from "../errors.js";
import { err, out, processStreams, withStreams, type OutputStreams } from "./output.js";
import { VERSION } from "../version.js";
import { registerCheck } from "./commands/check.js";
import { registerCompare } from "./commands/compare.js";
import { registerEquilibrium } from "./commands/equilibrium.js";
import { registerFit } from "./commands/fit.js";
import { registerInsolation } from "./commands/insolation.js";
import { registerRun } from "./commands/run.js";
import { registerSchema } from "./commands/schema.js";
import { registerSweep } from "./commands/sweep.js";
import { registerView } from "./commands/view.js";

const EXIT_BAD_INPUT = 2;
const EXIT_FAILURE = 1;

/** The commands in the order `--help` lists them. */
const COMMANDS: readonly ((program: Command) => void)[] = [
  registerRun,
  registerCompare,
  registerInsolation,
  registerSweep,
  registerView,
  registerCheck,
  registerSchema,
  registerEquilibrium,
  registerFit,
];

export function buildProgram(): Command {
  const program = new Command();
  program
    .name("calorbit")
    .description("Temperature histories of bodies on eccentric orbits, against the instantaneous equilibrium.")
    .version(VERSION)
    .showHelpAfterError("(run with --help for usage)")
    .configureOutput({ writeOut: (s) => out(s), writeErr: (s) => err(s) })
    .exitOverride();
  for (const register of COMMANDS) register(program);
  return program;
}

/**
 * Runs the CLI on an argv (node, script, ...args); resolves to the exit status. `streams` receive
 * what would go to stdout and stderr (the process's own by default; tests pass collectors).
 */
export async function main(argv: string[], streams: OutputStreams = processStreams): Promise<number> {
  return withStreams(streams, async () => {
    const program = buildProgram();
    try {
      await program.parseAsync(argv);
      return 0;
    } catch (error) {
      return reportError(error);
    }
  });
}

function reportError(error: unknown): number {
  if (error instanceof CommanderError) {
    // Help and version are not errors; commander has already printed its message otherwise.
    return error.code === "commander.helpDisplayed" || error.code === "commander.version" || error.exitCode === 0 ? 0 : EXIT_BAD_INPUT;
  }
  if (error instanceof CalorbitError) {
    if (error.problems.length > 0) {
      for (const p of error.problems) err(`calorbit: ${formatProblem(p)}\n`);
    } else {
      err(`calorbit: ${error.message}\n`);
    }
    const badInput = error.code === "SCENARIO_INVALID" || error.code === "SCENARIO_UNREADABLE" || error.code === "USAGE" || error.code === "INVALID_ARGUMENT";
    return badInput ? EXIT_BAD_INPUT : EXIT_FAILURE;
  }
  // A reader that stopped reading (`| head`) is not a failure: end quietly, as other Unix tools do.
  if (isBrokenPipe(error)) return 0;
  err(`calorbit: internal error: ${error instanceof Error ? error.message : String(error)}\n`);
  return EXIT_FAILURE;
}

/** A write to a pipe whose reader has gone (EPIPE). */
export function isBrokenPipe(error: unknown): boolean {
  return typeof error === "object" && error !== null && (error as { code?: unknown }).code === "EPIPE";
}
