/**
 * The figure of a fit as a standalone SVG: the data with 1σ error bars and the best-fit curve, the
 * residuals below, and (after a posterior run) the pair plot: each parameter's histogram on the
 * diagonal and the 2-D density of each pair below it. Okabe–Ito colours (src/view/palette.ts).
 */
import { niceTicks } from "../report/svg.js";
import { CHART_COLOURS } from "../view/palette.js";
import type { BestFit } from "./bestFit.js";
import type { Observations } from "./observations.js";
import { secondsPerTimeUnit } from "./observations.js";
import { siUnit, type FreeParameter } from "./parameters.js";
import { chainColumns, pairDensity } from "./pairDensity.js";
import type { SavedChain } from "./posterior.js";

function escapeXml(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

export interface FitFigure {
  title: string;
  observations: Observations;
  fit: BestFit;
  parameters: readonly FreeParameter[];
  /** The best-fit model on a fine grid over the data's span (times on the data's clock). */
  curve: { timeSeconds: Float64Array; value: Float64Array };
  /** Posterior steps after the burn-in. */
  chain?: SavedChain["steps"];
}

interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

function fmt(v: number): string {
  return Math.abs(v) >= 1e5 || (Math.abs(v) < 1e-3 && v !== 0) ? v.toExponential(1) : String(Number(v.toPrecision(4)));
}

function axes(parts: string[], box: Box, xr: [number, number], yr: [number, number], xLabel: string, yLabel: string, ticks = 6): void {
  parts.push(`<rect x="${box.x}" y="${box.y}" width="${box.w}" height="${box.h}" fill="none" stroke="#333"/>`);
  const px = (x: number) => box.x + ((x - xr[0]) / (xr[1] - xr[0] || 1)) * box.w;
  const py = (y: number) => box.y + box.h - ((y - yr[0]) / (yr[1] - yr[0] || 1)) * box.h;
  for (const t of niceTicks(xr[0], xr[1], ticks)) {
    parts.push(`<line x1="${px(t).toFixed(1)}" y1="${box.y + box.h}" x2="${px(t).toFixed(1)}" y2="${box.y + box.h + 4}" stroke="#333"/><text x="${px(t).toFixed(1)}" y="${box.y + box.h + 16}" text-anchor="middle" font-size="11">${fmt(t)}</text>`);
  }
  for (const t of niceTicks(yr[0], yr[1], 5)) {
    parts.push(`<line x1="${box.x - 4}" y1="${py(t).toFixed(1)}" x2="${box.x}" y2="${py(t).toFixed(1)}" stroke="#333"/><text x="${box.x - 6}" y="${(py(t) + 4).toFixed(1)}" text-anchor="end" font-size="11">${fmt(t)}</text>`);
  }
  if (xLabel) parts.push(`<text x="${box.x + box.w / 2}" y="${box.y + box.h + 34}" text-anchor="middle">${escapeXml(xLabel)}</text>`);
  if (yLabel) parts.push(`<text transform="translate(${box.x - 52},${box.y + box.h / 2}) rotate(-90)" text-anchor="middle">${escapeXml(yLabel)}</text>`);
}

function range(values: ArrayLike<number>, extra: ArrayLike<number> = []): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const list of [values, extra]) {
    for (let i = 0; i < list.length; i++) {
      const v = list[i]!;
      if (Number.isFinite(v)) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    }
  }
  if (!(hi > lo)) {
    lo -= 1;
    hi += 1;
  }
  const pad = 0.05 * (hi - lo);
  return [lo - pad, hi + pad];
}

export function fitSvg(figure: FitFigure): string {
  const { observations: obs, fit, parameters } = figure;
  const perUnit = secondsPerTimeUnit(obs.timeUnit) ?? 1;
  const isT = obs.quantity === "temperature";
  const unitY = isT ? "K" : "";
  const width = 900;
  const p = parameters.length;
  const pairSize = figure.chain ? Math.min(200, Math.floor(760 / p)) : 0;
  const pairTop = 650;
  const height = figure.chain ? pairTop + pairSize * p + 60 : 600;
  const parts: string[] = [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="DejaVu Sans, Arial, sans-serif" font-size="13">`,
    `<title>${escapeXml(`${figure.title}: fit`)}</title>`,
    `<rect x="0" y="0" width="${width}" height="${height}" fill="#ffffff"/>`,
    `<text x="80" y="28" font-size="16" font-weight="bold">${escapeXml(figure.title)}: data and best fit</text>`,
  ];
  const times = Float64Array.from(obs.timeSeconds, (t) => t / perUnit);
  const curveT = Float64Array.from(figure.curve.timeSeconds, (t) => t / perUnit);
  const xr = range(times);
  const lows = Float64Array.from(obs.value, (v, i) => v - fit.sigmaUsed[i]!);
  const highs = Float64Array.from(obs.value, (v, i) => v + fit.sigmaUsed[i]!);
  const yr = range(lows, [...highs, ...figure.curve.value]);
  const main: Box = { x: 80, y: 48, w: width - 110, h: 340 };
  axes(parts, main, xr, yr, "", isT ? "temperature (K)" : "flux ratio");
  const px = (x: number) => main.x + ((x - xr[0]) / (xr[1] - xr[0])) * main.w;
  const py = (y: number) => main.y + main.h - ((y - yr[0]) / (yr[1] - yr[0])) * main.h;
  parts.push(`<g class="data" stroke="${CHART_COLOURS.grey}" fill="${CHART_COLOURS.grey}">`);
  for (let i = 0; i < times.length; i++) {
    const x = px(times[i]!).toFixed(1);
    parts.push(`<line x1="${x}" y1="${py(lows[i]!).toFixed(1)}" x2="${x}" y2="${py(highs[i]!).toFixed(1)}"/><circle cx="${x}" cy="${py(obs.value[i]!).toFixed(1)}" r="2.2"/>`);
  }
  parts.push(`</g>`);
  const path = Array.from(curveT, (t, i) => `${i === 0 ? "M" : "L"}${px(t).toFixed(1)},${py(figure.curve.value[i]!).toFixed(1)}`).join("");
  parts.push(`<path class="model" d="${path}" fill="none" stroke="${CHART_COLOURS.temperature}" stroke-width="2"/>`);
  parts.push(
    `<g font-size="12"><circle cx="${main.x + main.w - 170}" cy="${main.y + 16}" r="3" fill="${CHART_COLOURS.grey}"/><text x="${main.x + main.w - 160}" y="${main.y + 20}">data ± 1σ${fit.sigmaEstimated ? " (σ from the scatter)" : ""}</text>` +
      `<line x1="${main.x + main.w - 178}" y1="${main.y + 34}" x2="${main.x + main.w - 162}" y2="${main.y + 34}" stroke="${CHART_COLOURS.temperature}" stroke-width="2"/><text x="${main.x + main.w - 160}" y="${main.y + 38}">best fit</text></g>`,
  );

  // Residuals (normalised by σ) below.
  const res: Box = { x: 80, y: main.y + main.h + 24, w: main.w, h: 130 };
  const norm = Float64Array.from(fit.residual, (r, i) => r / fit.sigmaUsed[i]!);
  const rr = range(norm, [-3, 3]);
  axes(parts, res, xr, rr, `time (${obs.timeUnit}, the data's clock)`, "residual / σ");
  const ry = (y: number) => res.y + res.h - ((y - rr[0]) / (rr[1] - rr[0])) * res.h;
  parts.push(`<line x1="${res.x}" y1="${ry(0).toFixed(1)}" x2="${res.x + res.w}" y2="${ry(0).toFixed(1)}" stroke="${CHART_COLOURS.temperature}"/>`);
  parts.push(`<g class="residuals" fill="${CHART_COLOURS.grey}">`);
  for (let i = 0; i < times.length; i++) parts.push(`<circle cx="${px(times[i]!).toFixed(1)}" cy="${ry(norm[i]!).toFixed(1)}" r="2.2"/>`);
  parts.push(`</g>`);
  parts.push(`<text x="${res.x}" y="${res.y + res.h + 52}" font-size="12">χ² = ${fmt(fit.chiSquare)} for ${fit.degreesOfFreedom} degrees of freedom${unitY ? "" : ""}</text>`);

  if (figure.chain && figure.chain.length > 0) {
    pairPlot(parts, figure.chain, parameters, { x: 80, y: pairTop, w: pairSize * p, h: pairSize * p }, pairSize);
  }
  parts.push(`</svg>`);
  return parts.join("\n") + "\n";
}

/** Histograms on the diagonal, 2-D densities (binned, shaded by count) below it. */
function pairPlot(parts: string[], chain: SavedChain["steps"], parameters: readonly FreeParameter[], box: Box, size: number): void {
  const p = parameters.length;
  const { bins, ranges, histograms, pairs } = pairDensity(chainColumns(chain, p));
  parts.push(`<text x="${box.x}" y="${box.y - 12}" font-size="14" font-weight="bold">posterior: histograms and pairwise densities</text>`);
  parts.push(`<g class="pairs">`);
  for (let row = 0; row < p; row++) {
    for (let col = 0; col <= row; col++) {
      const cell: Box = { x: box.x + col * size + 6, y: box.y + row * size + 6, w: size - 12, h: size - 12 };
      parts.push(`<rect x="${cell.x}" y="${cell.y}" width="${cell.w}" height="${cell.h}" fill="none" stroke="#999"/>`);
      const [x0, x1] = ranges[col]!;
      if (row === col) {
        const counts = histograms[col]!;
        const max = Math.max(...counts, 1);
        counts.forEach((c, b) => {
          const h = (c / max) * (cell.h - 4);
          parts.push(`<rect x="${(cell.x + (b * cell.w) / bins).toFixed(1)}" y="${(cell.y + cell.h - h).toFixed(1)}" width="${(cell.w / bins).toFixed(1)}" height="${h.toFixed(1)}" fill="${CHART_COLOURS.temperature}" fill-opacity="0.7"/>`);
        });
      } else {
        const counts = pairs[row]![col]!;
        const max = Math.max(...counts, 1);
        counts.forEach((c, k) => {
          if (c === 0) return;
          const bx = k % bins;
          const by = Math.floor(k / bins);
          parts.push(
            `<rect x="${(cell.x + (bx * cell.w) / bins).toFixed(1)}" y="${(cell.y + cell.h - ((by + 1) * cell.h) / bins).toFixed(1)}" width="${(cell.w / bins).toFixed(1)}" height="${(cell.h / bins).toFixed(1)}" fill="${CHART_COLOURS.temperature}" fill-opacity="${(0.1 + (0.9 * c) / max).toFixed(2)}"/>`,
          );
        });
      }
      if (row === p - 1) {
        const q = parameters[col]!;
        parts.push(`<text x="${cell.x + cell.w / 2}" y="${cell.y + cell.h + 16}" text-anchor="middle" font-size="11">${escapeXml(`${q.key} (${q.unit || siUnit(q) || "–"})`)}</text>`);
        parts.push(`<text x="${cell.x}" y="${cell.y + cell.h + 30}" font-size="10">${fmt(x0)}</text><text x="${cell.x + cell.w}" y="${cell.y + cell.h + 30}" text-anchor="end" font-size="10">${fmt(x1)}</text>`);
      }
    }
  }
  parts.push(`</g>`);
}
