/**
 * A standalone SVG of the temperature and the instantaneous equilibrium against time, for papers
 * and reports: axes with units, a legend, periastron passages and the temperature window.
 * Colours from the Okabe–Ito colour-blind-safe palette (src/view/palette.ts).
 */
import { chartColumns, chartMarkers, type SeriesLike, type SummaryLike } from "../view/chartData.js";
import { CHART_COLOURS } from "../view/palette.js";

const PALETTE = { ...CHART_COLOURS, periastron: CHART_COLOURS.grey } as const;

function escapeXml(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/** Round tick positions (1, 2, 5 × 10ⁿ) covering [lo, hi]. */
export function niceTicks(lo: number, hi: number, target = 6): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / target;
  const p = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * p).find((s) => s >= raw) ?? 10 * p;
  const ticks: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + 1e-9 * step; v += step) ticks.push(Number(v.toPrecision(12)));
  return ticks;
}

export function temperatureSvg(title: string, series: SeriesLike, summary: SummaryLike): string {
  const width = 900;
  const height = 500;
  const m = { left: 78, right: 24, top: 48, bottom: 64 };
  const cols = chartColumns(series, "time");
  const marks = chartMarkers(series, summary, "time", cols);
  const all = [...cols.temperatureK, ...cols.equilibriumK].filter(Number.isFinite);
  let yLo = Math.min(...all);
  let yHi = Math.max(...all);
  if (marks.window) {
    yLo = Math.min(yLo, marks.window.lowK);
    yHi = Math.max(yHi, Math.min(marks.window.highK, yHi + 0.25 * (yHi - yLo)));
  }
  const pad = 0.05 * (yHi - yLo || 1);
  yLo -= pad;
  yHi += pad;
  const xLo = cols.x[0] ?? 0;
  const xHi = cols.x[cols.x.length - 1] ?? 1;
  const px = (x: number) => m.left + ((x - xLo) / (xHi - xLo || 1)) * (width - m.left - m.right);
  const py = (y: number) => height - m.bottom - ((y - yLo) / (yHi - yLo)) * (height - m.top - m.bottom);
  const path = (ys: number[]) => ys.map((y, i) => `${i === 0 ? "M" : "L"}${px(cols.x[i]!).toFixed(2)},${py(y).toFixed(2)}`).join("");
  const parts: string[] = [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="DejaVu Sans, Arial, sans-serif" font-size="13">`,
    `<title>${escapeXml(title)}</title>`,
    `<rect x="0" y="0" width="${width}" height="${height}" fill="#ffffff"/>`,
    `<text x="${m.left}" y="28" font-size="16" font-weight="bold">${escapeXml(title)}</text>`,
  ];
  if (marks.window) {
    const top = py(Math.min(marks.window.highK, yHi));
    const bottom = py(Math.max(marks.window.lowK, yLo));
    if (bottom > top) {
      parts.push(`<rect class="window" x="${m.left}" y="${top.toFixed(2)}" width="${width - m.left - m.right}" height="${(bottom - top).toFixed(2)}" fill="${PALETTE.window}" fill-opacity="0.12"/>`);
    }
  }
  for (const t of niceTicks(yLo, yHi)) {
    parts.push(`<line x1="${m.left}" x2="${width - m.right}" y1="${py(t).toFixed(2)}" y2="${py(t).toFixed(2)}" stroke="#dddddd"/>`);
    parts.push(`<text x="${m.left - 8}" y="${(py(t) + 4).toFixed(2)}" text-anchor="end">${t}</text>`);
  }
  for (const t of niceTicks(xLo, xHi)) {
    parts.push(`<line x1="${px(t).toFixed(2)}" x2="${px(t).toFixed(2)}" y1="${height - m.bottom}" y2="${height - m.bottom + 5}" stroke="#000"/>`);
    parts.push(`<text x="${px(t).toFixed(2)}" y="${height - m.bottom + 20}" text-anchor="middle">${t}</text>`);
  }
  for (const p of marks.periastra) {
    parts.push(`<line class="periastron" x1="${px(p).toFixed(2)}" x2="${px(p).toFixed(2)}" y1="${m.top}" y2="${height - m.bottom}" stroke="${PALETTE.periastron}" stroke-dasharray="2 4"/>`);
  }
  parts.push(`<rect x="${m.left}" y="${m.top}" width="${width - m.left - m.right}" height="${height - m.top - m.bottom}" fill="none" stroke="#000"/>`);
  parts.push(`<path id="equilibrium" d="${path(cols.equilibriumK)}" fill="none" stroke="${PALETTE.equilibrium}" stroke-width="2" stroke-dasharray="7 4"/>`);
  parts.push(`<path id="temperature" d="${path(cols.temperatureK)}" fill="none" stroke="${PALETTE.temperature}" stroke-width="2.5"/>`);
  parts.push(`<text x="${(m.left + width - m.right) / 2}" y="${height - 18}" text-anchor="middle">${escapeXml(cols.xLabel)}</text>`);
  parts.push(`<text transform="translate(22 ${(m.top + height - m.bottom) / 2}) rotate(-90)" text-anchor="middle">temperature (K)</text>`);
  const lx = width - m.right - 262;
  const ly = m.top + 14;
  parts.push(`<rect x="${lx - 10}" y="${ly - 14}" width="262" height="${marks.window ? 70 : 50}" fill="#ffffff" fill-opacity="0.9" stroke="#999"/>`);
  parts.push(`<line x1="${lx}" x2="${lx + 28}" y1="${ly}" y2="${ly}" stroke="${PALETTE.temperature}" stroke-width="2.5"/><text x="${lx + 36}" y="${ly + 4}">T, surface temperature</text>`);
  parts.push(`<line x1="${lx}" x2="${lx + 28}" y1="${ly + 20}" y2="${ly + 20}" stroke="${PALETTE.equilibrium}" stroke-width="2" stroke-dasharray="7 4"/><text x="${lx + 36}" y="${ly + 24}">T_eq, instantaneous equilibrium</text>`);
  if (marks.window) {
    parts.push(`<rect x="${lx}" y="${ly + 33}" width="28" height="12" fill="${PALETTE.window}" fill-opacity="0.25"/><text x="${lx + 36}" y="${ly + 44}">window ${marks.window.lowK}–${marks.window.highK} K</text>`);
  }
  parts.push(`</svg>`);
  return parts.join("\n") + "\n";
}
