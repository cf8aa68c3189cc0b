/**
 * The README's "Read the results into Python" lines, run as written against real calorbit output,
 * when python3 with pandas is installed; skipped with a notice otherwise (CI does not depend on it).
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { calorbit } from "./cliHarness.js";

// The python3 on PATH (a pyenv or venv one may lack pandas), else Debian's, where python3-pandas installs.
const python = ["python3", "/usr/bin/python3"].find((exe) => spawnSync(exe, ["-c", "import pandas"], { encoding: "utf8" }).status === 0);
const hasPandas = python !== undefined;
if (!hasPandas) console.warn("test/python.test.ts: skipped: no python3 with pandas (apt-get install python3-pandas to run it)");

/** The first ```python block under the README's Python heading. */
function readmePython(): string {
  const readme = readFileSync(join(import.meta.dirname, "..", "README.md"), "utf8");
  const section = readme.slice(readme.indexOf("### Read the results into Python"));
  const block = /```python\n([\s\S]*?)```/.exec(section);
  if (!block) throw new Error("README: no python block under 'Read the results into Python'");
  return block[1]!;
}

describe("the README's Python recipe", () => {
  it.skipIf(!hasPandas)("reads run --csv with comment='#' and the JSON series into DataFrames that agree with the summary", async () => {
    const dir = mkdtempSync(join(tmpdir(), "calorbit-python-"));
    expect((await calorbit("run", "--csv", join(dir, "history.csv"), "--samples", "200")).status).toBe(0);
    const json = await calorbit("run", "--json", "--series", "--samples", "200");
    expect(json.status).toBe(0);
    writeFileSync(join(dir, "result.json"), json.stdout);
    const sweep = await calorbit("sweep", join(import.meta.dirname, "..", "scenarios", "calyndra-ocean.yaml"), "--vary", "body.albedo=0.31", "--workers", "1", "--quiet", "--out", join(dir, "grid.csv"));
    expect(sweep.status).toBe(0);
    const r = spawnSync(python!, ["-c", readmePython()], { cwd: dir, encoding: "utf8" });
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    const [csvMax, summaryMax, seriesMax, sweepMax] = r.stdout.trim().split(/\s+/).map(Number);
    const doc = JSON.parse(json.stdout);
    // The sampled maximum is at most the refined one, and both files carry the same series.
    expect(summaryMax).toBe(doc.summary.temperature.maxK);
    expect(seriesMax).toBe(Math.max(...doc.series.temperatureK));
    expect(csvMax).toBeCloseTo(seriesMax!, 6);
    expect(seriesMax).toBeLessThanOrEqual(summaryMax!);
    // The sweep's one case is the demo itself (albedo 0.31 as in the file): its row carries the run's maximum.
    expect(sweepMax).toBeCloseTo(summaryMax!, 9);
  });
});
