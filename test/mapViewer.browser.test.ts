/**
 * The map view in a real browser (Debian's chromium via playwright-core): the phase curve and the
 * surface map of the invented demo, and a live recomputation when the observer moves.
 * Outside CI a missing chromium skips this file loudly; in CI it fails.
 */
import type { ChildProcess } from "node:child_process";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { observeMap } from "../src/run/observeMap.js";
import { resolveScenario } from "../src/scenario/resolve.js";
import { parseScenarioText } from "../src/scenario/text.js";
import { browserAvailable, launchChromium, startView } from "./browser.js";

const DEMO = join(import.meta.dirname, "..", "scenarios", "oruvane-eccentric.yaml");
const haveBrowser = browserAvailable("the map view");

let server: ChildProcess;
let browser: Browser;
let page: Page;
const errors: string[] = [];

beforeAll(async () => {
  if (!haveBrowser) return;
  let url: string;
  ({ server, url } = await startView(DEMO));
  browser = await launchChromium();
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
