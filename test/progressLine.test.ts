/**
 * The progress line on stderr: drawn only on a terminal, only after about a second, throttled,
 * erased at the end; never on stdout, never into a log or a pipe, and not with --quiet. The clock is
 * the test's own (no test here depends on the machine's speed).
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, describe, expect, it, vi } from "vitest";
import { withStreams, type OutputStreams } from "../src/cli/output.js";
import { progressLine, SHOW_AFTER_MS } from "../src/cli/progressLine.js";
import { main } from "../dist/src/cli/program.js";

/** Captured streams; `terminal` says whether stderr claims to be a TTY. */
let width: number | undefined;

function streams(terminal: boolean): OutputStreams & { stdout: string; stderr: string } {
  const s = {
    stdout: "",
    stderr: "",
    out: (text: string) => void (s.stdout += text),
    err: (text: string) => void (s.stderr += text),
    errIsTerminal: () => terminal,
    errColumns: () => width,
  };
  return s;
}

/** ECMA-48: carriage return, then erase to the end of the line (EL, CSI K). */
const ERASE = "\r\u001b[K";

afterEach(() => {
  vi.restoreAllMocks();
  width = undefined;
});

describe("the progress line", () => {
  it("on a terminal: silent for the first second, then drawn, throttled, and erased at the end", async () => {
    const s = streams(true);
    let clock = 0;
    await withStreams(s, async () => {
      const line = progressLine("run", { now: () => clock });
      expect(line.hook).toBeTypeOf("function");
      clock = SHOW_AFTER_MS - 1;
      line.hook!(0.3, "periodic"); // under a second: a short run stays silent
      expect(s.stderr).toBe("");
      clock = SHOW_AFTER_MS + 200;
      line.hook!(0.6, "periodic");
      expect(s.stderr).toBe(`${ERASE}calorbit run: toward the periodic state  60 %  1.2 s`);
      clock += 50; // within the redraw interval: not drawn
      line.hook!(0.7, "periodic");
      expect(s.stderr.split(ERASE)).toHaveLength(2);
      clock += 100;
      line.hook!(0.9, "column");
      expect(s.stderr.endsWith(`${ERASE}calorbit run: conduction column cycles  90 %  1.4 s`)).toBe(true);
      clock += 100;
      width = 30; // a narrow terminal: the line is cut to 29 characters, so it never wraps
      line.hook!(0.95, "column");
      expect(s.stderr.endsWith(`${ERASE}calorbit run: conduction colu`)).toBe(true);
      line.hook!(1, "column"); // the end is not drawn: the line is erased
      line.close();
      line.close();
      expect(s.stderr.endsWith(`calorbit run: conduction colu${ERASE}`)).toBe(true);
      expect(s.stderr.split(ERASE)).toHaveLength(5);
    });
    expect(s.stdout).toBe("");
  });

  it("gives the engine no hook and draws nothing when stderr is not a terminal (a log, a pipe, CI) or with --quiet", async () => {
    for (const [terminal, quiet] of [
      [false, false],
      [true, true],
    ] as const) {
      const s = streams(terminal);
      let clock = 0;
      await withStreams(s, async () => {
        const line = progressLine("fit", { quiet, now: () => clock });
        expect(line.hook).toBeUndefined();
        clock = 10 * SHOW_AFTER_MS;
        line.update(0.5, "posterior step 5 of 10");
        line.close();
      });
      expect({ terminal, quiet, stderr: s.stderr, stdout: s.stdout }).toEqual({ terminal, quiet, stderr: "", stdout: "" });
    }
  });

  it("calorbit run --json on a terminal: the line goes to stderr and is erased; stdout holds the JSON alone; --quiet and a non-terminal stderr get none", async () => {
    // A clock that runs a second per reading, so the bundled demo's short run counts as long.
    let clock = 0;
    vi.spyOn(performance, "now").mockImplementation(() => (clock += 1000));
    const shown = streams(true);
    expect(await main(["node", "calorbit", "run", "--json"], shown)).toBe(0);
    expect(shown.stderr).toMatch(/^\r\u001b\[Kcalorbit run: toward the periodic state +\d+ % +\d+\.\d s/);
    expect(shown.stderr.endsWith(ERASE)).toBe(true);
    const document = JSON.parse(shown.stdout) as { summary: { temperature: { maxK: number } } };
    expect(document.summary.temperature.maxK).toBeGreaterThan(0);
    expect(shown.stdout).not.toContain("\r");

    const quiet = streams(true);
    expect(await main(["node", "calorbit", "run", "--json", "--quiet"], quiet)).toBe(0);
    const logged = streams(false);
    expect(await main(["node", "calorbit", "run", "--json"], logged)).toBe(0);
    expect({ quiet: quiet.stderr, logged: logged.stderr }).toEqual({ quiet: "", logged: "" });
    expect(quiet.stdout).toBe(logged.stdout);
    expect(JSON.parse(shown.stdout)).toEqual(JSON.parse(logged.stdout));
  });

  it("calorbit fit on a terminal: the least squares show their model runs on stderr, erased at the end; stdout holds the JSON alone", async () => {
    const dir = mkdtempSync(join(tmpdir(), "calorbit-fitline-"));
    try {
      // An invented slab; its data are the model's own series at A = 0.25 (a fit with a known answer).
      const scenario = join(dir, "world.yaml");
      writeFileSync(scenario, "name: Fit line world (invented)\nstar: { luminosity: 0.8 Lsun }\norbit: { semiMajorAxis: 0.15 au, eccentricity: 0.3, period: 20 d }\nbody: { albedo: 0.25, emissivity: 0.95, heatCapacity: 1 MJ/m2/K }\n");
      const series = join(dir, "series.csv");
      expect(await main(["node", "calorbit", "run", scenario, "--csv", series, "--samples", "40"], streams(false))).toBe(0);
      const lines = readFileSync(series, "utf8").split("\n").filter((l) => l.length > 0 && !l.startsWith("#"));
      const header = lines[0]!.split(",");
      const [t, T] = [header.indexOf("time_s"), header.indexOf("temperature_K")];
      const data = join(dir, "data.csv");
      writeFileSync(data, ["time_s,temperature_K,sigma_K", ...lines.slice(1, -1).map((l) => `${l.split(",")[t]},${l.split(",")[T]},0.5`)].join("\n") + "\n");
      let clock = 0;
      vi.spyOn(performance, "now").mockImplementation(() => (clock += 1000));
      const shown = streams(true);
      const args = ["node", "calorbit", "fit", scenario, "--data", data, "--free", "body.albedo=0..0.6", "--starts", "1", "--tolerance", "1e-5", "--samples", "200", "--json"];
      expect(await main(args, shown)).toBe(0);
      expect(shown.stderr).toMatch(/^\r\u001b\[Kcalorbit fit: least squares: \d+ model runs from 1 starts +\d+ % +\d+\.\d s/);
      expect(shown.stderr.endsWith(ERASE)).toBe(true);
      expect(JSON.parse(shown.stdout).parameters[0].key).toBe("body.albedo");
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
