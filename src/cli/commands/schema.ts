/** `calorbit schema`: the scenario format as JSON Schema, for editors. */
import type { Command } from "commander";
import { out } from "../output.js";

export function registerSchema(program: Command): void {
  program
    .command("schema")
    .description("print the scenario format as JSON Schema (for editor validation and completion)")
    .action(async () => {
      const { scenarioJsonSchema } = await import("../../scenario/schema.js");
      out(JSON.stringify(scenarioJsonSchema(), null, 2) + "\n");
    });
}
