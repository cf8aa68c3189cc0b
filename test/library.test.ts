import { readdirSync, readFileSync } from "node:fs";
import { builtinModules } from "node:module";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import * as calorbit from "../src/index.js";

describe("library entry point", () => {
  it("runs a scenario document without the CLI, as in the README", () => {
    const { thermal } = calorbit.resolveScenario({
      name: "x",
      star: { luminosity: "1 Lsun", mass: "1 Msun" },
      orbit: { semiMajorAxis: "1 au", eccentricity: 0.3 },
      body: { albedo: 0.3, heatCapacity: 1e8 },
    });
    const { summary, series } = calorbit.simulate(thermal, { samples: 500 });
    expect(series.temperatureK).toHaveLength(500);
    expect(summary.temperature.minK).toBeLessThan(summary.temperature.maxK);
  });

  it("keeps VERSION equal to package.json's version", () => {
    const pkg = JSON.parse(readFileSync(join(import.meta.dirname, "..", "package.json"), "utf8"));
    expect(calorbit.VERSION).toBe(pkg.version);
  });

  // Node's own module list (node:module builtinModules), so bare names such as "fs", "path" or
  // "worker_threads" count as well as the "node:" prefix; a subpath ("fs/promises") counts too.
  const nodeImport = (source: string): boolean => {
    if (/\brequire\(/.test(source)) return true;
    for (const match of source.matchAll(/(?:\bfrom\s*|\bimport\s*\(?\s*)["']([^"']+)["']/g)) {
      const specifier = match[1]!;
      if (specifier.startsWith("node:") || builtinModules.includes(specifier.split("/")[0]!)) return true;
    }
    return false;
  };

  it("recognises every form of Node import it must refuse, and none of the engine's own", () => {
    for (const line of [
      'import { readFileSync } from "node:fs";',
      'import { readFileSync } from "fs";',
      "import { join } from 'path';",
      'import { readFile } from "fs/promises";',
      'import { Worker } from "worker_threads";',
      'import "os";',
      'const fs = await import("fs");',
      'const fs = require("fs");',
    ]) {
      expect(nodeImport(line), line).toBe(true);
    }
    for (const line of [
      'import { z } from "zod";',
      'import { orbit } from "./physics/orbit.js";',
      'import { pathOf } from "../scenario/path.js";',
      'import type { Options } from "odex";',
    ]) {
      expect(nodeImport(line), line).toBe(false);
    }
  });

  it("keeps the engine free of Node imports (it must run in a browser)", () => {
    const root = join(import.meta.dirname, "..", "src");
    const offenders: string[] = [];
    const walk = (dir: string): void => {
      for (const entry of readdirSync(dir, { withFileTypes: true })) {
        const path = join(dir, entry.name);
        if (entry.isDirectory()) {
          if (entry.name !== "cli") walk(path);
        } else if (entry.name.endsWith(".ts") && nodeImport(readFileSync(path, "utf8"))) {
          offenders.push(path);
        }
      }
    };
    walk(root);
    expect(offenders).toEqual([]);
  });
});
