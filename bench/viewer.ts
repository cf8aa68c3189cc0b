/**
 * The live viewer's speed in a real browser (Debian's chromium through playwright-core): the time from
 * a slider's input event to the charts drawn with the new case, for every regime and for the overlay of
 * all regimes. The page recomputes and redraws inside the input handler (uPlot draws synchronously in
 * `batch`), so the time around `dispatchEvent` is input → drawn chart; the time to the next animation
 * frame (the browser has painted) is printed beside it.
 *
 * Run alone: `node dist/bench/viewer.js [--quick]` after `npm run build`; or from bench.ts:
 * `import { benchViewer } from "./viewer.js"; for (const line of await benchViewer({ quick })) console.log(line);`
 * Targets (issue 16): median < 50 ms and 95th percentile < 100 ms. A missed target is printed as
 * MISSED, not turned into a failure; a wrong answer (the page's demo summary against `run --json`)
 * prints a WRONG line and exits 1. Without chromium it prints one "skipped" line and exits 0.
 */
import { spawn } from "node:child_process";
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { chromium } from "playwright-core";

const CHROMIUM = process.env.CALORBIT_CHROMIUM ?? "/usr/bin/chromium";
const CLI = fileURLToPath(new URL("../src/cli/main.js", import.meta.url));

interface Config {
  name: string;
  query: string;
}

const CONFIGS: readonly Config[] = [
  { name: "global", query: "regime=global" },
  { name: "dayside", query: "regime=dayside" },
  { name: "substellar", query: "regime=substellar" },
  { name: "daynight", query: "regime=daynight&recirculation=0.3" },
  { name: "band", query: "regime=band&latitude=30&obliquity=23.5" },
  { name: "point", query: "regime=point&latitude=20&longitude=30" },
  { name: "overlay (all regimes)", query: "regime=global&overlay=1" },
];

class WrongAnswer extends Error {}

function percentile(sorted: number[], p: number): number {
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil(p * sorted.length) - 1));
  return sorted[i]!;
}

export async function benchViewer(options: { quick: boolean }): Promise<string[]> {
  if (!existsSync(CHROMIUM)) return [`viewer: skipped (${CHROMIUM} not found; apt-get install chromium)`];
  const warm = options.quick ? 5 : 15;
  const measured = options.quick ? 21 : 101;
  const server = spawn(process.execPath, [CLI, "view", "--port", "0"], { stdio: ["ignore", "pipe", "inherit"] });
  const lines: string[] = [];
  try {
    const url = await new Promise<string>((resolve, reject) => {
      server.stdout!.on("data", (chunk: Buffer) => {
        const m = /(http:\/\/127\.0\.0\.1:\d+\/)/.exec(chunk.toString());
        if (m) resolve(m[1]!);
      });
      server.on("exit", (code) => reject(new Error(`calorbit view exited (${code})`)));
    });
    const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ["--no-sandbox", "--disable-gpu", "--no-first-run"] });
    try {
      const page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
      await page.goto(url);
      await page.waitForFunction(() => (window as unknown as { calorbitViewer?: unknown }).calorbitViewer !== undefined);
      // The answer first: the page's demo summary against `calorbit run --json` (the same engine, the same case).
      const { spawnSync } = await import("node:child_process");
      const run = JSON.parse(spawnSync(process.execPath, [CLI, "run", "--json"], { encoding: "utf8" }).stdout) as { summary: { temperature: { maxK: number; minK: number } } };
      const pageSummary = await page.evaluate(() => (window as unknown as { calorbitViewer: { summary: { temperature: { maxK: number; minK: number } } } }).calorbitViewer.summary);
      for (const k of ["minK", "maxK"] as const) {
        if (Math.abs(pageSummary.temperature[k] - run.summary.temperature[k]) > 1e-6) {
          throw new WrongAnswer(`WRONG viewer demo T ${k}: the page's ${pageSummary.temperature[k]} against run --json's ${run.summary.temperature[k]}`);
        }
      }
      for (const config of CONFIGS) {
        await page.goto(`${url}?${config.query}`);
        await page.waitForFunction(() => (window as unknown as { calorbitViewer?: { summary?: unknown } }).calorbitViewer?.summary != null);
        const times = await page.evaluate(
          async ({ warm, measured }) => {
            const slider = document.getElementById("in-e") as HTMLInputElement;
            const viewer = () => (window as unknown as { calorbitViewer: { renders: number; error: string | null } }).calorbitViewer;
            const frame = () => new Promise<number>((r) => requestAnimationFrame(() => r(performance.now())));
            const drawn: number[] = [];
            const painted: number[] = [];
            for (let i = 0; i < warm + measured; i++) {
              await frame();
              slider.value = String(0.2 + 0.002 * (i % 50));
              const before = viewer().renders;
              const t0 = performance.now();
              slider.dispatchEvent(new Event("input", { bubbles: true }));
              const t1 = performance.now();
              const t2 = await frame();
              if (viewer().error !== null || viewer().renders !== before + 1) throw new Error(`no chart drawn: ${viewer().error}`);
              if (i >= warm) {
                drawn.push(t1 - t0);
                painted.push(t2 - t0);
              }
            }
            return { drawn, painted };
          },
          { warm, measured },
        );
        const drawn = [...times.drawn].sort((a, b) => a - b);
        const painted = [...times.painted].sort((a, b) => a - b);
        const median = percentile(drawn, 0.5);
        const p95 = percentile(drawn, 0.95);
        const met = median < 50 && p95 < 100 ? "met" : "MISSED";
        lines.push(
          `viewer ${config.name}: ${median.toFixed(1)} ms median input to drawn chart ` +
            `(target < 50 ms median and < 100 ms p95: ${met}; p95 ${p95.toFixed(1)} ms; ${measured} inputs after ${warm} warm-up; ` +
            `to the next frame ${percentile(painted, 0.5).toFixed(1)} ms median, ${percentile(painted, 0.95).toFixed(1)} ms p95)`,
        );
      }
    } finally {
      await browser.close();
    }
  } finally {
    if (server.exitCode === null) server.kill("SIGINT");
  }
  return lines;
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const quick = process.argv.includes("--quick");
  try {
    for (const line of await benchViewer({ quick })) console.log(line);
  } catch (err) {
    console.log(err instanceof WrongAnswer ? err.message : `WRONG viewer: the benchmark could not run: ${(err as Error).message}`);
    process.exitCode = 1;
  }
}
