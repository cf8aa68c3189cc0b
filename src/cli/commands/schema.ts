/** `calorbit schema`: the scenario format as JSON Schema, for editors. */
import type { Command } from "commander";
import { scenarioJsonSchema } from "../../scenario/schema.js";

export function registerSchema(program: Command): void {
  program
    .command("schema")
    .description("print the scenario format as JSON Schema (for editor validation and completion)")
    .action(() => {
      process.stdout.write(JSON.stringify(scenarioJsonSchema(), null, 2) + "\n");
    });
}
