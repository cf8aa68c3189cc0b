/**
 * Nothing half written: outputs are built whole, written beside their target under a temporary name
 * and renamed into place all together; a failed write leaves no file, an output folder that does not
 * exist is refused before the solve (one line, exit 2), and a run stopped by Ctrl-C during its solve
 * leaves nothing at all.
 */
import { spawn } from "node:child_process";
import { mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { writeFilesAtomic } from "../src/cli/io.js";
import { CalorbitError } from "../src/errors.js";
import { calorbit, CLI } from "./cliHarness.js";

const dir = mkdtempSync(join(tmpdir(), "calorbit-outputs-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A fresh empty folder inside the test's own. */
function folder(name: string): string {
  const path = join(dir, name);
  mkdirSync(path);
  return path;
}

describe("outputs are written all or none", () => {
  it("a failed write (the second file's folder is missing) leaves neither file and no temporary", () => {
    const here = folder("failed");
    let caught: unknown;
    try {
      writeFilesAtomic([
        [join(here, "series.csv"), "time_s,temperature_K\n0,300\n"],
        [join(here, "missing", "chart.svg"), "<svg/>"],
      ]);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(CalorbitError);
    expect((caught as CalorbitError).message).toMatch(/^cannot write .*chart\.svg: ENOENT/);
    expect(readdirSync(here)).toEqual([]);
  });

  it("a target that cannot be replaced (a folder of that name) leaves nothing, and a good pair is written whole", () => {
    const here = folder("blocked");
    mkdirSync(join(here, "chart.svg"));
    expect(() => writeFilesAtomic([[join(here, "series.csv"), "a\n"], [join(here, "chart.svg"), "<svg/>"]])).toThrow(CalorbitError);
    expect(readdirSync(here)).toEqual(["chart.svg"]);
    writeFilesAtomic([
      [join(here, "series.csv"), "a\n"],
      [join(here, "other.svg"), "<svg/>"],
    ]);
    expect(readdirSync(here).sort()).toEqual(["chart.svg", "other.svg", "series.csv"]);
  });

  it("run refuses an output in a folder that does not exist before solving: one line, exit 2, no file written", async () => {
    const here = folder("refused");
    const r = await calorbit("run", "--csv", join(here, "series.csv"), "--svg", join(here, "nowhere", "chart.svg"));
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toBe(`calorbit: --svg: given ${JSON.stringify(join(here, "nowhere", "chart.svg"))}; allowed: a file in an existing folder (there is no folder ${JSON.stringify(join(here, "nowhere"))})\n`);
    expect(readdirSync(here)).toEqual([]);
    const asFolder = await calorbit("compare", "--csv", here);
    expect(asFolder.status).toBe(2);
    expect(asFolder.stderr).toBe(`calorbit: --csv: given ${JSON.stringify(here)}; allowed: a file name (this is a folder)\n`);
  });

  it("run stopped by Ctrl-C (SIGINT) during its solve leaves no output file and no temporary", async () => {
    const here = folder("interrupted");
    // A 1:1000 spin-orbit cycle: 1000 orbits to step through, seconds of solving; run prints its
    // note on stderr before the solve starts, so the signal is sent once the solve is under way.
    const scenario = join(here, "long.json");
    writeFileSync(
      scenario,
      JSON.stringify({
        name: "Interrupted (invented)",
        star: { luminosity: "1 Lsun", mass: "1 Msun" },
        orbit: { semiMajorAxis: "1 au", eccentricity: 0.2 },
        body: { albedo: 0.3, emissivity: 0.9, heatCapacity: 1e6 },
        regime: "point",
        surface: { latitude: 20 },
        spin: { orbitRatio: "1:1000" },
      }),
    );
    const child = spawn(process.execPath, [CLI, "run", scenario, "--csv", join(here, "series.csv"), "--svg", join(here, "chart.svg")], { stdio: ["ignore", "ignore", "pipe"] });
    let stderr = "";
    const ended = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.on("exit", (code, signal) => resolve({ code, signal })));
    child.stderr.on("data", (chunk: Buffer) => {
      stderr += chunk.toString();
      if (stderr.includes("calorbit: note: ")) child.kill("SIGINT");
    });
    const { code, signal } = await ended;
    expect(stderr).toMatch(/^calorbit: note: spin\.orbitRatio "1:1000" repeats only after 1000 orbits/);
    expect({ code, signal }).toEqual({ code: null, signal: "SIGINT" });
    expect(readdirSync(here)).toEqual(["long.json"]);
  }, 30_000);
});
