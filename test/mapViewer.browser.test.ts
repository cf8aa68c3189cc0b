/**
 * The map view in a real browser (Debian's chromium via playwright-core): the phase curve and the
 * surface map of the invented demo, and a live recomputation when the observer moves.
 * Outside CI a missing chromium skips this file loudly; in CI it fails.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { observeMap } from "../src/run/observeMap.js";
import { resolveScenario } from "../src/scenario/resolve.js";
import { parseScenarioText } from "../src/scenario/text.js";

const CHROMIUM = process.env.CALORBIT_CHROMIUM ?? "/usr/bin/chromium";
const CLI = join(import.meta.dirname, "..", "dist", "src", "cli", "main.js");
const DEMO = join(import.meta.dirname, "..", "scenarios", "oruvane-eccentric.yaml");
const haveBrowser = existsSync(CHROMIUM);
if (!haveBrowser) {
  const message = `\n*** ${CHROMIUM} not found: the browser test of the map view is SKIPPED. Install Debian's chromium (apt-get install chromium). ***\n`;
  if (process.env.CI === "true") throw new Error(message);
  console.warn(message);
}

let server: ChildProcess;
let browser: Browser;
let page: Page;
const errors: string[] = [];

beforeAll(async () => {
  if (!haveBrowser) return;
  server = spawn(process.execPath, [CLI, "view", DEMO, "--port", "0"], { stdio: ["ignore", "pipe", "pipe"] });
  const url = await new Promise<string>((resolve, reject) => {
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
  page = await browser.newPage({ viewport: { width: 1300, height: 900 } });
  page.on("pageerror", (e) => errors.push(e.message));
  await page.goto(url);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  if (server && server.exitCode === null) server.kill("SIGINT");
});

const text = (id: string) => page.textContent(`[data-testid="${id}"]`).then((t) => (t ?? "").trim());

describe.skipIf(!haveBrowser)("the map view in chromium", () => {
  it("draws the phase curve and the surface map, with the maximum the library computes for the same samples", async () => {
    await page.waitForFunction(() => (window as unknown as { calorbitViewer?: { mode: string } }).calorbitViewer?.mode === "map", null, { timeout: 60_000 });
    expect(errors).toEqual([]);
    expect(await page.locator('canvas[aria-label="surface temperature map"]').count()).toBe(1);
    const { thermal } = resolveScenario(parseScenarioText(readFileSync(DEMO, "utf8"), "yaml", DEMO));
    const expected = observeMap(thermal, { samples: 400 }).phase!;
    const shown = Number((await text("t-max")).replace(" ppm", ""));
    // the page rounds to 0.1 ppm; its temperatures travel with five significant figures
    expect(Math.abs(shown - expected.maxFluxRatio * 1e6)).toBeLessThan(0.1 + 1e-3 * expected.maxFluxRatio * 1e6);
  });

  it("recomputes the phase curve in the page when the inclination moves (a face-on orbit has no transit and a lower maximum)", async () => {
    const before = Number((await text("t-max")).replace(" ppm", ""));
    await page.locator('[data-testid="map-inclination"]').fill("10");
    await page.waitForFunction(() => document.querySelector('[data-testid="t-max"]')!.textContent !== "", null, { timeout: 10_000 });
    const after = Number((await text("t-max")).replace(" ppm", ""));
    expect(after).toBeLessThan(before);
    expect(errors).toEqual([]);
  });
});
