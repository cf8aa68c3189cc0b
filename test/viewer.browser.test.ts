/**
 * The viewer in a real browser: Debian's chromium driven by playwright-core (never a browser that
 * a test tool downloads). Outside CI a missing chromium skips this file loudly; in CI it fails.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync } from "node:fs";
import { join } from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

const CHROMIUM = process.env.CALORBIT_CHROMIUM ?? "/usr/bin/chromium";
const CLI = join(import.meta.dirname, "..", "dist", "src", "cli", "main.js");
const OUTPUT = join(import.meta.dirname, "..", "test-output");
const haveBrowser = existsSync(CHROMIUM);
if (!haveBrowser) {
  const message = `\n*** ${CHROMIUM} not found: the browser test of the viewer is SKIPPED. Install Debian's chromium (apt-get install chromium). ***\n`;
  if (process.env.CI === "true") throw new Error(message);
  console.warn(message);
}

let server: ChildProcess;
let url: string;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  if (!haveBrowser) return;
  server = spawn(process.execPath, [CLI, "view", "--port", "0"], { stdio: ["ignore", "pipe", "pipe"] });
  url = await new Promise<string>((resolve, reject) => {
    let out = "";
    server.stdout!.on("data", (chunk: Buffer) => {
      out += chunk.toString();
      const m = /(http:\/\/127\.0\.0\.1:\d+\/)/.exec(out);
      if (m) resolve(m[1]!);
    });
    server.on("exit", (code) => reject(new Error(`calorbit view exited (${code})`)));
  });
  browser = await chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run", "--disable-quic"],
  });
  page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
}, 60_000);

afterAll(async () => {
  await browser?.close();
  if (server && server.exitCode === null) server.kill("SIGINT");
});

const text = (id: string) => page.textContent(`[data-testid="${id}"]`).then((t) => (t ?? "").trim());

describe.skipIf(!haveBrowser)("the viewer in chromium", () => {
  const requests: string[] = [];

  it("draws the demo with the same summary numbers as run --json, loading nothing from elsewhere", async () => {
    page.on("request", (r) => requests.push(r.url()));
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await page.goto(url);
    await page.waitForFunction(() => (window as unknown as { calorbitViewer?: unknown }).calorbitViewer !== undefined);
    const json = JSON.parse(spawnSync(process.execPath, [CLI, "run", "--json"], { encoding: "utf8" }).stdout);
    expect(await text("t-min")).toBe(json.summary.temperature.minK.toFixed(2));
    expect(await text("t-max")).toBe(json.summary.temperature.maxK.toFixed(2));
    expect(await text("t-mean")).toBe(json.summary.temperature.meanK.toFixed(2));
    expect(await text("teq-max")).toBe(json.summary.equilibrium.maxK.toFixed(2));
    expect(await text("damping")).toBe(json.summary.dampingRatio.toFixed(3));
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

  it("re-simulates in the page when the eccentricity moves, and keeps the state in the URL", async () => {
    const before = await text("t-max");
    const swingBefore = await page.evaluate(() => (window as unknown as { calorbitViewer: { summary: { temperature: { swingK: number } } } }).calorbitViewer.summary.temperature.swingK);
    await page.focus("#in-e");
    await page.$eval("#in-e", (el) => {
      (el as HTMLInputElement).value = "0.6";
      el.dispatchEvent(new Event("input", { bubbles: true }));
    });
    await page.waitForFunction((b) => document.querySelector('[data-testid="t-max"]')!.textContent !== b, before);
    const after = await page.evaluate(() => (window as unknown as { calorbitViewer: { summary: { temperature: { swingK: number; maxK: number } }; renderMs: number } }).calorbitViewer);
    expect(after.summary.temperature.swingK).toBeGreaterThan(swingBefore);
    expect(await text("t-max")).toBe(after.summary.temperature.maxK.toFixed(2));
    expect(new URL(page.url()).searchParams.get("e")).toBe("0.600");
    // Keyboard: the slider answers the arrow keys.
    await page.keyboard.press("ArrowRight");
    await page.waitForFunction(() => new URL(location.href).searchParams.get("e") === "0.610");
    // Overlaying the other regimes adds their curves to the legend.
    const legendBefore = await page.locator("#chart-temperature .u-legend .u-series").count();
    await page.check("#in-overlay");
    await page.waitForFunction((n) => document.querySelectorAll("#chart-temperature .u-legend .u-series").length > n, legendBefore);
    expect(await page.locator("#chart-temperature .u-legend .u-series").count()).toBeGreaterThanOrEqual(legendBefore + 4);
    await page.uncheck("#in-overlay");
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
      const other = spawn(process.execPath, [CLI, "view", target, "--port", "0"], { stdio: ["ignore", "pipe", "pipe"] });
      const otherUrl = await new Promise<string>((resolve) => other.stdout!.on("data", (c: Buffer) => {
        const m = /(http:\/\/127\.0\.0\.1:\d+\/)/.exec(c.toString());
        if (m) resolve(m[1]!);
      }));
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
