/**
 * The heat map of the sweep and column views: cells, axes and one colour bar with ticks on a canvas,
 * and the values under the pointer in a tooltip.
 */
import { niceTicks } from "../src/report/svg.js";
import { cellAt, indexEdges, valueRange } from "../src/view/heatMapLayout.js";
import { rampColour } from "../src/view/palette.js";


export interface HeatMapSpec {
  title: string;
  xLabel: string;
  yLabel: string;
  valueLabel: string;
  xs: number[]; // cell centres
  ys: number[];
  /** value(ix, iy), NaN for none. */
  value: (ix: number, iy: number) => number;
  /** y grows downwards (depth). */
  yDown?: boolean;
  /** Cell edges on a linear value axis (a column's times and layer depths); absent: one slot per level. */
  xEdges?: number[];
  yEdges?: number[];
}

const short = (v: number) => String(Number(v.toPrecision(4)));

/** Draws a heat map with axes, a colour bar and hover values into `host` (replacing its content). */
export function drawHeatMap(host: HTMLElement, spec: HeatMapSpec): void {
  host.innerHTML = "";
  host.style.position = "relative";
  const title = document.createElement("h3");
  title.textContent = spec.title;
  host.appendChild(title);
  const canvas = document.createElement("canvas");
  const width = Math.max(480, host.clientWidth || 800);
  const height = 380;
  canvas.width = width * devicePixelRatio;
  canvas.height = height * devicePixelRatio;
  canvas.style.width = `${width}px`;
  canvas.style.height = `${height}px`;
  canvas.setAttribute("role", "img");
  canvas.setAttribute("aria-label", spec.title);
  host.appendChild(canvas);
  const tip = document.createElement("div");
  tip.className = "heat-tip";
  tip.dataset.testid = "heat-tip";
  tip.hidden = true;
  host.appendChild(tip);
  const ctx = canvas.getContext("2d")!;
  ctx.scale(devicePixelRatio, devicePixelRatio);
  const m = { left: 80, right: 120, top: 10, bottom: 50 };
  const pw = width - m.left - m.right;
  const ph = height - m.top - m.bottom;
  const values: number[] = [];
  for (let ix = 0; ix < spec.xs.length; ix++) for (let iy = 0; iy < spec.ys.length; iy++) values.push(spec.value(ix, iy));
  const range = valueRange(values) ?? { lo: 0, hi: 1 };
  const { lo, hi } = range;
  // Cell edges in axis units: by value (linear axis) or one slot per level.
  const xEdges = spec.xEdges ?? indexEdges(spec.xs.length);
  const yEdges = spec.yEdges ?? indexEdges(spec.ys.length);
  const x0 = xEdges[0]!;
  const x1 = xEdges[xEdges.length - 1]!;
  const y0 = yEdges[0]!;
  const y1 = yEdges[yEdges.length - 1]!;
  const px = (v: number) => m.left + ((v - x0) / (x1 - x0)) * pw;
  // y: downwards from the top edge when yDown, else upwards from the bottom.
  const py = (v: number) => (spec.yDown ? m.top + ((v - y0) / (y1 - y0)) * ph : m.top + ph - ((v - y0) / (y1 - y0)) * ph);
  for (let ix = 0; ix < spec.xs.length; ix++) {
    const left = px(xEdges[ix]!);
    const right = px(xEdges[ix + 1]!);
    for (let iy = 0; iy < spec.ys.length; iy++) {
      const v = spec.value(ix, iy);
      ctx.fillStyle = Number.isFinite(v) ? rampColour((v - lo) / (hi - lo || 1)) : "#dddddd";
      const a = py(yEdges[iy]!);
      const b = py(yEdges[iy + 1]!);
      ctx.fillRect(left, Math.min(a, b), right - left + 0.5, Math.abs(b - a) + 0.5);
    }
  }
  ctx.strokeStyle = "#111";
  ctx.strokeRect(m.left, m.top, pw, ph);
  ctx.fillStyle = "#111";
  ctx.font = "13px sans-serif";
  // x ticks: nice values on a value axis, else a spread of the levels at their slots.
  ctx.textAlign = "center";
  const xTicks = spec.xEdges
    ? niceTicks(x0, x1).map((v) => ({ at: px(v), text: short(v) }))
    : spreadIndices(spec.xs.length).map((ix) => ({ at: px(ix + 0.5), text: short(spec.xs[ix]!) }));
  for (const t of xTicks) {
    ctx.fillRect(t.at - 0.5, m.top + ph, 1, 5);
    ctx.fillText(t.text, t.at, m.top + ph + 18);
  }
  ctx.fillText(spec.xLabel, m.left + pw / 2, height - 8);
  ctx.textAlign = "right";
  const yTicks = spec.yEdges
    ? niceTicks(y0, y1).map((v) => ({ at: py(v), text: short(v) }))
    : spreadIndices(spec.ys.length).map((iy) => ({ at: py(iy + 0.5), text: short(spec.ys[iy]!) }));
  for (const t of yTicks) {
    ctx.fillRect(m.left - 5, t.at - 0.5, 5, 1);
    ctx.fillText(t.text, m.left - 8, t.at + 4);
  }
  ctx.save();
  ctx.translate(16, m.top + ph / 2);
  ctx.rotate(-Math.PI / 2);
  ctx.textAlign = "center";
  ctx.fillText(spec.yLabel, 0, 0);
  ctx.restore();
  // One colour bar: the ramp from lo (bottom) to hi (top), with ticks at round values and one label.
  const bx = width - m.right + 20;
  for (let k = 0; k < ph; k++) {
    ctx.fillStyle = rampColour(1 - k / ph);
    ctx.fillRect(bx, m.top + k, 16, 1.5);
  }
  ctx.strokeStyle = "#111";
  ctx.strokeRect(bx, m.top, 16, ph);
  ctx.fillStyle = "#111";
  ctx.textAlign = "left";
  const barY = (v: number) => m.top + ph - ((v - lo) / (hi - lo || 1)) * ph;
  const barTicks = hi > lo ? niceTicks(lo, hi, 5) : [lo];
  for (const v of barTicks) {
    ctx.fillRect(bx + 16, barY(v) - 0.5, 4, 1);
    ctx.fillText(short(v), bx + 22, barY(v) + 4);
  }
  ctx.save();
  ctx.translate(width - 6, m.top + ph / 2);
  ctx.rotate(-Math.PI / 2);
  ctx.textAlign = "center";
  ctx.fillText(spec.valueLabel, 0, 0);
  ctx.restore();

  // Hover: the cell under the pointer, its axis values and its value.
  const axisX = (cssX: number) => x0 + ((cssX - m.left) / pw) * (x1 - x0);
  const axisY = (cssY: number) => (spec.yDown ? y0 + ((cssY - m.top) / ph) * (y1 - y0) : y0 + ((m.top + ph - cssY) / ph) * (y1 - y0));
  canvas.addEventListener("mousemove", (ev) => {
    const r = canvas.getBoundingClientRect();
    const cx = ev.clientX - r.left;
    const cy = ev.clientY - r.top;
    const ix = cellAt(xEdges, axisX(cx));
    const iy = cellAt(yEdges, axisY(cy));
    if (ix < 0 || iy < 0 || ix >= spec.xs.length || iy >= spec.ys.length) {
      tip.hidden = true;
      return;
    }
    const v = spec.value(ix, iy);
    tip.textContent = `${spec.xLabel} = ${short(spec.xs[ix]!)}, ${spec.yLabel} = ${short(spec.ys[iy]!)}: ${spec.valueLabel} = ${Number.isFinite(v) ? short(v) : "no case"}`;
    tip.style.left = `${Math.min(cx + 14, width - 260)}px`;
    tip.style.top = `${cy + title.offsetHeight + 14}px`;
    tip.hidden = false;
  });
  canvas.addEventListener("mouseleave", () => (tip.hidden = true));
}

/** Up to six indices spread over 0 … n − 1, both ends included. */
function spreadIndices(n: number): number[] {
  const count = Math.min(6, n);
  return [...new Set(Array.from({ length: count }, (_, t) => Math.round((t * (n - 1)) / Math.max(1, count - 1))))];
}
