/** Files the CLI ships with (light: no parsers, so commands can name them at start-up). */
import { fileURLToPath } from "node:url";

/** The bundled demo scenario, used when no file is given. */
export const DEMO_SCENARIO = fileURLToPath(new URL("../../../scenarios/calyndra-ocean.yaml", import.meta.url));
