import { readdirSync, readFileSync } from "node:fs";
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

  it("keeps the engine free of Node imports (it must run in a browser)", () => {
    const root = join(import.meta.dirname, "..", "src");
    const offenders: string[] = [];
    const walk = (dir: string): void => {
      for (const entry of readdirSync(dir, { withFileTypes: true })) {
        const path = join(dir, entry.name);
        if (entry.isDirectory()) {
          if (entry.name !== "cli") walk(path);
        } else if (entry.name.endsWith(".ts") && /from "node:|require\(/.test(readFileSync(path, "utf8"))) {
          offenders.push(path);
        }
      }
    };
    walk(root);
    expect(offenders).toEqual([]);
  });
});
