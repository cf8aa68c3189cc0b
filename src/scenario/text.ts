/**
 * Scenario files as text: JSON or YAML to a plain document, with the parser's position in the
 * message. Kept apart from validation so that sweep workers, which receive documents already
 * parsed, never load the YAML parser.
 */
import { parse as parseYaml, YAMLParseError } from "yaml";
import { CalorbitError, clip } from "../errors.js";

/** Parses scenario text; `format` follows the file extension ("json" or "yaml"). */
export function parseScenarioText(text: string, format: "json" | "yaml", sourceName: string): unknown {
  // A UTF-8 byte-order mark (some Windows editors write one) is not part of the document.
  if (text.startsWith("\uFEFF")) text = text.slice(1);
  try {
    return format === "json" ? JSON.parse(text) : parseYaml(text, { prettyErrors: true });
  } catch (err) {
    const where = err instanceof YAMLParseError && err.linePos ? ` at line ${err.linePos[0].line}, column ${err.linePos[0].col}` : "";
    const reason = err instanceof Error ? (err.message.split("\n")[0] ?? "").replace(/ at line \d+, column \d+:?$/, "") : String(err);
    throw new CalorbitError("SCENARIO_UNREADABLE", `${sourceName}: not valid ${format.toUpperCase()}${where}: ${clip(reason)}`);
  }
}
