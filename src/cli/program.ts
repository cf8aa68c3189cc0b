/**
 * The calorbit command line: wiring only. Each command lives in its own file under commands/ and is
 * registered with one line below; shared flag parsing is in flags.ts. Bad input: one line per problem
 * on stderr, exit status 2, no stack trace.
 */
import { Command, CommanderError } from "commander";
import { CalorbitError, formatProblem } from "../errors.js";
import { VERSION } from "../version.js";
import { registerCheck } from "./commands/check.js";
import { registerCompare } from "./commands/compare.js";
import { registerEquilibrium } from "./commands/equilibrium.js";
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
];

export function buildProgram(): Command {
  const program = new Command();
  program
    .name("calorbit")
    .description("Temperature histories of bodies on eccentric orbits, against the instantaneous equilibrium.")
    .version(VERSION)
    .showHelpAfterError("(run with --help for usage)")
    .configureOutput({ writeErr: (s) => void process.stderr.write(s) })
    .exitOverride();
  for (const register of COMMANDS) register(program);
  return program;
}

/** Runs the CLI on an argv (node, script, ...args); resolves to the exit status. */
export async function main(argv: string[]): Promise<number> {
  const program = buildProgram();
  try {
    await program.parseAsync(argv);
    return 0;
  } catch (err) {
    return reportError(err);
  }
}

function reportError(err: unknown): number {
  if (err instanceof CommanderError) {
    // Help and version are not errors; commander has already printed its message otherwise.
    return err.code === "commander.helpDisplayed" || err.code === "commander.version" || err.exitCode === 0 ? 0 : EXIT_BAD_INPUT;
  }
  if (err instanceof CalorbitError) {
    if (err.problems.length > 0) {
      for (const p of err.problems) process.stderr.write(`calorbit: ${formatProblem(p)}\n`);
    } else {
      process.stderr.write(`calorbit: ${err.message}\n`);
    }
    const badInput = err.code === "SCENARIO_INVALID" || err.code === "SCENARIO_UNREADABLE" || err.code === "USAGE" || err.code === "INVALID_ARGUMENT";
    return badInput ? EXIT_BAD_INPUT : EXIT_FAILURE;
  }
  process.stderr.write(`calorbit: internal error: ${err instanceof Error ? err.message : String(err)}\n`);
  return EXIT_FAILURE;
}
