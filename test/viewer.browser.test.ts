/**
 * The viewer in a real browser: Debian's chromium driven by playwright-core (never a browser that
 * a test tool downloads). Outside CI a missing chromium skips this file loudly; in CI it fails.
 */
import { spawnSync, type ChildProcess } from "node:child_process";
import { mkdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { pngTextChunks } from "../src/view/exportData.js";
import { browserAvailable, CLI, launchChromium, startView } from "./browser.js";

const OUTPUT = join(import.meta.dirname, "..", "test-output");
const haveBrowser = browserAvailable("the viewer");

let server: ChildProcess;
let url: string;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  if (!haveBrowser) return;
  ({ server, url } = await startView());
  browser = await launchChromium();
  page = await browser.newPage({ viewport: { width: 1400, height: 900 }, acceptDownloads: true });
}, 60_000);

afterAll(async () => {
  await browser?.close();
  if (server && server.exitCode === null) server.kill("SIGINT");
});

const text = (id: string) => page.textContent(`[data-testid="${id}"]`).then((t) => (t ?? "").trim());

interface Exposed {
  mode: string;
  error: string | null;
  summary: { temperature: { minK: number; maxK: number; meanK: number; swingK: number }; night?: { temperature: { maxK: number } } } | null;
  axisLabels: { temperature: string; orbit: string };
  curves: { label: string; stroke: string }[];
  renders: number;
}
const exposed = () => page.evaluate(() => (window as unknown as { calorbitViewer: Exposed }).calorbitViewer);
const param = (key: string) => new URL(page.url()).searchParams.get(key);

describe.skipIf(!haveBrowser)("the viewer in chromium", () => {
  const requests: string[] = [];
  // The demo as `calorbit run --json` computes it; the page must show these numbers as run prints them (2 decimals).
  let run: { summary: { temperature: Record<string, number>; equilibrium: Record<string, number>; dampingRatio: number } };
  const expectRunNumbers = async () => {
    for (const k of ["min", "max", "mean", "swing"]) {
      expect(await text(`t-${k}`)).toBe(run.summary.temperature[`${k}K`]!.toFixed(2));
      expect(await text(`teq-${k}`)).toBe(run.summary.equilibrium[`${k}K`]!.toFixed(2));
    }
    expect(await text("damping")).toBe(run.summary.dampingRatio.toFixed(3));
  };

  it("draws the demo with the numbers of run --json and the scenario's exact values, loading nothing from elsewhere", async () => {
    page.on("request", (r) => requests.push(r.url()));
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await page.goto(url);
    await page.waitForFunction(() => (window as unknown as { calorbitViewer?: unknown }).calorbitViewer !== undefined);
    run = JSON.parse(spawnSync(process.execPath, [CLI, "run", "--json"], { encoding: "utf8" }).stdout);
    await expectRunNumbers();
    // The number boxes hold the scenario's values (0.79 au; 30 m of seawater, 1025 × 3990 × 30 J m⁻² K⁻¹).
    expect(await page.inputValue("#num-a")).toBe("0.79");
    expect(await page.inputValue("#num-C")).toBe("122692500");
    // The chart is drawn: its canvas holds the temperature curve's blue.
    const blue = await page.evaluate(() => {
      const c = document.querySelector<HTMLCanvasElement>("#chart-temperature canvas")!;
      const d = c.getContext("2d")!.getImageData(0, 0, c.width, c.height).data;
      let n = 0;
      for (let i = 0; i < d.length; i += 4) if (d[i]! < 40 && d[i + 1]! > 90 && d[i + 1]! < 140 && d[i + 2]! > 150) n++;
      return n;
    });
    expect(blue).toBeGreaterThan(200);
    expect(errors).toEqual([]);
    expect(requests.every((r) => r.startsWith(url) || r.startsWith("data:"))).toBe(true);
  });

  it("moves each slider away and back and shows run's numbers again, keeping the exact values in the URL", async () => {
    for (const key of ["e", "albedo", "emissivity", "C", "a"]) {
      const exact = await page.inputValue(`#num-${key}`);
      await page.focus(`#in-${key}`);
      await page.keyboard.press("ArrowRight");
      await page.keyboard.press("ArrowRight");
      await page.waitForFunction(([k, v]) => new URL(location.href).searchParams.get(k!) !== v, [key, exact]);
      expect(await text("t-max")).not.toBe(run.summary.temperature.maxK!.toFixed(2));
      expect(await page.inputValue(`#num-${key}`)).toBe(param(key));
      await page.keyboard.press("ArrowLeft");
      await page.keyboard.press("ArrowLeft");
      await page.waitForFunction(([k, v]) => new URL(location.href).searchParams.get(k!) === v, [key, exact]);
      expect(await page.inputValue(`#num-${key}`)).toBe(exact);
      await expectRunNumbers();
    }
    expect(param("C")).toBe("122692500");
    expect(param("a")).toBe("0.79");
    // An exact value typed in the box is the value computed with; a value that is not allowed is refused in one line.
    await page.fill("#num-e", "0.6");
    await page.press("#num-e", "Enter");
    await page.waitForFunction(() => new URL(location.href).searchParams.get("e") === "0.6");
    const swing = (await exposed()).summary!.temperature.swingK;
    expect(swing).toBeGreaterThan(run.summary.temperature.swingK!);
    await page.fill("#num-e", "1.2");
    await page.press("#num-e", "Enter");
    await page.waitForSelector('[data-testid="problem"]:not([hidden])');
    expect(await text("problem")).toBe("eccentricity: given \"1.2\"; allowed: 0 ≤ e < 1");
    // The last case's charts stay, greyed, and its numbers are withdrawn.
    expect(await page.getAttribute(".charts", "class")).toContain("stale");
    expect(await text("t-max")).toBe("—");
    await page.click("#reset");
    await page.waitForFunction(() => new URL(location.href).search === "");
    await expectRunNumbers();
    expect(await page.isHidden('[data-testid="problem"]')).toBe(true);
  });

  it("runs day/night at recirculation 0 (the night side at 0 K), and warms the night once heat is carried", async () => {
    await page.selectOption("#in-regime", "daynight");
    await page.waitForFunction(() => new URL(location.href).searchParams.get("regime") === "daynight");
    await page.waitForFunction(() => (window as unknown as { calorbitViewer?: { summary?: { night?: unknown } | null } }).calorbitViewer?.summary?.night !== undefined);
    expect(await page.isHidden('[data-testid="problem"]')).toBe(true);
    // Cowan & Agol 2011, eq. 5 at ε = 0: no heat reaches the night side, T_night = 0.
    expect((await exposed()).summary!.night!.temperature.maxK).toBe(0);
    expect(Number(await text("night-mean"))).toBe(0);
    await page.fill("#num-recirculation", "0.3");
    await page.press("#num-recirculation", "Enter");
    await page.waitForSelector('[data-testid="problem"]', { state: "hidden" });
    expect(await page.getAttribute(".charts", "class")).not.toContain("stale");
    expect((await exposed()).summary!.night).toBeDefined();
    expect(Number(await text("night-mean"))).toBeLessThan(Number(await text("t-mean")));
    // Each regime shows the settings it reads.
    const visible = async () => page.$$eval("#regime-params .param:not([hidden])", (rows) => rows.map((r) => (r as HTMLElement).dataset.key));
    expect(await visible()).toEqual(["recirculation"]);
    await page.selectOption("#in-regime", "band");
    await page.waitForFunction(() => new URL(location.href).searchParams.get("regime") === "band");
    expect(await visible()).toEqual(["latitude", "obliquity"]);
    await page.selectOption("#in-regime", "point");
    await page.waitForFunction(() => new URL(location.href).searchParams.get("regime") === "point");
    expect(await visible()).toEqual(["latitude", "longitude", "obliquity", "spin"]);
    expect((await exposed()).error).toBeNull();
    await page.selectOption("#in-regime", "global");
    await page.waitForFunction(() => new URL(location.href).searchParams.get("regime") === "global");
  });

  it("labels both charts by the chosen x axis, overlays in distinct colours, and exports the parameters and version", async () => {
    await page.selectOption("#in-x", "trueAnomaly");
    await page.waitForFunction(() => new URL(location.href).searchParams.get("x") === "trueAnomaly");
    expect((await exposed()).axisLabels).toEqual({ temperature: "true anomaly (deg, 0 at periastron)", orbit: "true anomaly (deg, 0 at periastron)" });
    await page.check("#in-overlay");
    await page.waitForFunction(() => document.querySelectorAll("#chart-temperature .u-legend .u-series").length >= 7);
    const strokes = (await exposed()).curves.map((c) => c.stroke.toUpperCase());
    expect(strokes.length).toBeGreaterThanOrEqual(6);
    expect(new Set(strokes).size).toBe(strokes.length);
    const [csv] = await Promise.all([page.waitForEvent("download"), page.click("#export-csv")]);
    const csvText = readFileSync((await csv.path())!, "utf8");
    const version = JSON.parse(readFileSync(join(import.meta.dirname, "..", "package.json"), "utf8")).version as string;
    expect(csvText.split("\n")[0]).toBe(`# calorbit ${version} viewer export — Calyndra b (ocean slab)`);
    expect(csvText).toContain("# regime: global; eccentricity = 0.32, Bond albedo = 0.31, emissivity = 0.96, heat capacity = 122692500 J m⁻² K⁻¹, semi-major axis = 0.79 au");
    expect(csvText.split("\n").find((l) => !l.startsWith("#"))).toMatch(/^true_anomaly_deg,temperature_K,equilibrium_K,temperature_dayside_K,/);
    const [png] = await Promise.all([page.waitForEvent("download"), page.click("#export-png")]);
    const chunks = pngTextChunks(new Uint8Array(readFileSync((await png.path())!)));
    expect(chunks.Software).toBe(`calorbit ${version}`);
    expect(chunks.Description).toContain("semi-major axis = 0.79 au");
    await page.uncheck("#in-overlay");
    await page.selectOption("#in-x", "time");
    await page.waitForFunction(() => new URL(location.href).searchParams.get("x") === "time");
    mkdirSync(OUTPUT, { recursive: true });
    await page.screenshot({ path: join(OUTPUT, "viewer.png") });
    expect(requests.every((r) => r.startsWith(url) || r.startsWith("data:") || r.startsWith("blob:"))).toBe(true);
  });

  it("opens a sweep result as a heat map and a conduction column as a depth × time map", async () => {
    const { mkdtempSync } = await import("node:fs");
    const { tmpdir } = await import("node:os");
    const sweepFile = join(mkdtempSync(join(tmpdir(), "calorbit-view-")), "sweep.csv");
    const r = spawnSync(process.execPath, [CLI, "sweep", "--vary", "orbit.eccentricity=0:0.8:5", "--vary", "body.layer.thickness=1 m..100 m:4 log", "--quiet", "--out", sweepFile], { encoding: "utf8" });
    expect(r.status).toBe(0);
    for (const [target, mode] of [[sweepFile, "sweep"], [join(import.meta.dirname, "..", "scenarios", "sarvek-regolith.yaml"), "column"]] as const) {
      const { server: other, url: otherUrl } = await startView(target);
      const p = await browser.newPage({ viewport: { width: 1400, height: 900 } });
      await p.goto(otherUrl);
      await p.waitForFunction(() => (window as unknown as { calorbitViewer?: unknown }).calorbitViewer !== undefined);
      expect(await p.evaluate(() => (window as unknown as { calorbitViewer: { mode: string } }).calorbitViewer.mode)).toBe(mode);
      // The heat map is drawn: a canvas with many distinct colours.
      const colours = await p.evaluate(() => {
        const c = document.querySelector<HTMLCanvasElement>("#chart-temperature canvas")!;
        const d = c.getContext("2d")!.getImageData(0, 0, c.width, c.height).data;
        const seen = new Set<number>();
        for (let i = 0; i < d.length; i += 16) seen.add((d[i]! << 16) | (d[i + 1]! << 8) | d[i + 2]!);
        return seen.size;
      });
      expect(colours).toBeGreaterThan(10);
      // Hovering a cell shows its axis values and its value.
      const box = (await p.locator("#chart-temperature canvas").boundingBox())!;
      await p.mouse.move(box.x + box.width * 0.4, box.y + box.height * 0.5);
      const tip = (await p.textContent('[data-testid="heat-tip"]')) ?? "";
      expect(tip).toMatch(mode === "sweep" ? /^orbit\.eccentricity = [\d.]+, body\.layer\.thickness_m = [\d.]+: temperature_swing_K = [\d.]+$/ : /^time since start \(d\) = [\d.]+, depth \(m\) = [\d.e-]+: temperature \(K\) = [\d.]+$/);
      if (mode === "column") {
        // The column's summary names its rows: skin depths where a slab has τ / P.
        expect(await p.textContent('[data-testid="tau-label"]')).toBe("skin depths (solar day, orbit)");
        expect(await p.textContent('[data-testid="tau"]')).toMatch(/^[\d.]+ m, [\d.]+ m$/);
      }
      await p.screenshot({ path: join(OUTPUT, `viewer-${mode}.png`) });
      await p.close();
      other.kill("SIGINT");
    }
  }, 60_000);

  it("stops cleanly on Ctrl-C", async () => {
    const exited = new Promise<number | null>((resolve) => server.on("exit", (code) => resolve(code)));
    server.kill("SIGINT");
    expect(await exited).toBe(0);
  });
});
