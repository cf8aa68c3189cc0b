/**
 * The fit view in a real browser (Debian's chromium via playwright-core): `calorbit fit --json --view`
 * on the shipped synthetic demo with a short posterior. The page must show the numbers of the JSON
 * document the same run printed (the fit itself is checked in test/fit.test.ts), one point per data
 * row, and the pair plot of the samples kept after the burn-in.
 * Outside CI a missing chromium skips this file loudly; in CI it fails.
 */
import type { ChildProcess } from "node:child_process";
import { mkdtempSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { browserAvailable, launchChromium, startServing } from "./browser.js";

const SCENARIOS = join(import.meta.dirname, "..", "scenarios");
const DATA = join(SCENARIOS, "tessaly-night.csv");
const haveBrowser = browserAvailable("the fit view");
const WALKERS = 8;
const STEPS = 12;
const BURN_IN = 6;

let server: ChildProcess;
let browser: Browser;
let page: Page;
let doc: { parameters: { key: string; valueInUnit: number; sigmaInUnit: number; median: number; value: number }[]; chiSquare: number };
const errors: string[] = [];

beforeAll(async () => {
  if (!haveBrowser) return;
  const chain = join(mkdtempSync(join(tmpdir(), "calorbit-fitview-")), "chain.csv");
  const started = await startServing([
    "fit", join(SCENARIOS, "tessaly-night.yaml"), "--data", DATA,
    "--free", "body.heatCapacity=0.005 MJ/m2/K..0.5 MJ/m2/K", "--free", "timeOffset=115 h..127 h",
    "--samples", "300", "--starts", "1", "--tolerance", "1e-6",
    "--posterior", String(STEPS), "--walkers", String(WALKERS), "--burn-in", String(BURN_IN), "--workers", "1", "--chain", chain,
    "--json", "--view", "--port", "0",
  ]);
  server = started.server;
  // The JSON document is written before the address; the two pipes may be read in either order.
  for (let i = 0; i < 100 && !started.stdout().trimEnd().endsWith("}"); i++) await new Promise((r) => setTimeout(r, 50));
  doc = JSON.parse(started.stdout());
  browser = await launchChromium();
  page = await browser.newPage({ viewport: { width: 1300, height: 1100 } });
  page.on("pageerror", (e) => errors.push(e.message));
  await page.goto(started.url);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  if (server && server.exitCode === null) server.kill("SIGINT");
});

/** Whether `shown` is `exact` rounded to `digits` significant figures (half a unit of the last digit shown). */
const roundsTo = (shown: number, exact: number, digits: number) => Math.abs(shown - exact) <= 0.5 * 10 ** (Math.floor(Math.log10(Math.abs(exact))) - digits + 1) * (1 + 1e-9);

const text = (id: string) => page.textContent(`[data-testid="${id}"]`).then((t) => (t ?? "").trim());

describe.skipIf(!haveBrowser)("the fit view in chromium", () => {
  it("shows the data, the residuals, the fit's parameters as the JSON gives them, and the posterior's pair plot", async () => {
    await page.waitForFunction(() => (window as unknown as { calorbitViewer?: { mode: string } }).calorbitViewer?.mode === "fit", null, { timeout: 60_000 });
    expect(errors).toEqual([]);
    const exposed = (await page.evaluate(() => (window as unknown as { calorbitViewer: unknown }).calorbitViewer)) as { points: number; pairPlot: boolean };
    const rows = readFileSync(DATA, "utf8").split("\n").filter((l) => l.trim() !== "" && !l.startsWith("#")).length - 1;
    expect(exposed.points).toBe(rows);
    expect(await page.locator("#chart-temperature canvas").count()).toBe(1);
    expect(await page.locator("#chart-orbit canvas").count()).toBe(2); // residuals, pair plot
    // Each parameter: the best fit and σ to the page's 5 and 2 significant figures, in the unit of its bounds.
    for (const [j, p] of doc.parameters.entries()) {
      const [value, sigma] = (await text(`fit-value-${j}`)).split(" ± ").map(Number);
      expect(roundsTo(value!, p.valueInUnit, 5)).toBe(true);
      expect(roundsTo(sigma!, p.sigmaInUnit, 2)).toBe(true);
      // the JSON's median is in SI, like its value: the same factor converts both
      const median = Number((await text(`fit-posterior-${j}`)).split(" ")[0]);
      expect(roundsTo(median, (p.median * p.valueInUnit) / p.value, 5)).toBe(true);
    }
    expect(await text("fit-chi-square")).toMatch(new RegExp(`^χ² = ${Number(doc.chiSquare.toPrecision(5))} for `));
    expect(exposed.pairPlot).toBe(true);
    expect(await page.textContent("#chart-orbit h3")).toContain(`(${WALKERS * (STEPS - BURN_IN)} samples after the burn-in)`);
  });
});
