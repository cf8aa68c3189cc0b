/** The heat map of the sweep and column views: cells, axes and a colour bar on one canvas. */

/** A colour ramp from deep blue through teal to light yellow (perceptually ordered, colour-blind safe). */
const RAMP = [
  [13, 42, 110],
  [0, 114, 178],
  [0, 158, 115],
  [160, 200, 80],
  [240, 228, 66],
];
export function rampColour(f: number): string {
  const x = Math.min(1, Math.max(0, f)) * (RAMP.length - 1);
  const i = Math.min(RAMP.length - 2, Math.floor(x));
  const t = x - i;
  const c = RAMP[i]!.map((v, k) => Math.round(v + t * (RAMP[i + 1]![k]! - v)));
  return `rgb(${c[0]},${c[1]},${c[2]})`;
}

export interface HeatMapSpec {
  title: string;
  xLabel: string;
  yLabel: string;
  valueLabel: string;
  xs: number[]; // cell centres
  ys: number[];
  /** value(ix, iy), NaN for none. */
  value: (ix: number, iy: number) => number;
  yDown?: boolean;
  logY?: boolean;
}

/** Draws a heat map with axes and a colour bar into a fresh canvas inside `host`. */
export function drawHeatMap(host: HTMLElement, spec: HeatMapSpec): void {
  host.innerHTML = "";
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
  const ctx = canvas.getContext("2d")!;
  ctx.scale(devicePixelRatio, devicePixelRatio);
  const m = { left: 80, right: 110, top: 10, bottom: 50 };
  const pw = width - m.left - m.right;
  const ph = height - m.top - m.bottom;
  let lo = Infinity;
  let hi = -Infinity;
  for (let ix = 0; ix < spec.xs.length; ix++) {
    for (let iy = 0; iy < spec.ys.length; iy++) {
      const v = spec.value(ix, iy);
      if (Number.isFinite(v)) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    }
  }
  const cw = pw / spec.xs.length;
  const ch = ph / spec.ys.length;
  for (let ix = 0; ix < spec.xs.length; ix++) {
    for (let iy = 0; iy < spec.ys.length; iy++) {
      const v = spec.value(ix, iy);
      ctx.fillStyle = Number.isFinite(v) ? rampColour((v - lo) / (hi - lo || 1)) : "#dddddd";
      const row = spec.yDown ? iy : spec.ys.length - 1 - iy;
      ctx.fillRect(m.left + ix * cw, m.top + row * ch, Math.ceil(cw) + 0.5, Math.ceil(ch) + 0.5);
    }
  }
  ctx.strokeStyle = "#111";
  ctx.strokeRect(m.left, m.top, pw, ph);
  ctx.fillStyle = "#111";
  ctx.font = "13px sans-serif";
  ctx.textAlign = "center";
  const xTicks = Math.min(6, spec.xs.length);
  for (let t = 0; t < xTicks; t++) {
    const ix = Math.round((t * (spec.xs.length - 1)) / Math.max(1, xTicks - 1));
    ctx.fillText(Number(spec.xs[ix]!.toPrecision(3)).toString(), m.left + (ix + 0.5) * cw, m.top + ph + 18);
  }
  ctx.fillText(spec.xLabel, m.left + pw / 2, height - 8);
  ctx.textAlign = "right";
  const yTicks = Math.min(6, spec.ys.length);
  for (let t = 0; t < yTicks; t++) {
    const iy = Math.round((t * (spec.ys.length - 1)) / Math.max(1, yTicks - 1));
    const row = spec.yDown ? iy : spec.ys.length - 1 - iy;
    ctx.fillText(Number(spec.ys[iy]!.toPrecision(3)).toString(), m.left - 6, m.top + (row + 0.5) * ch + 4);
  }
  ctx.save();
  ctx.translate(16, m.top + ph / 2);
  ctx.rotate(-Math.PI / 2);
  ctx.textAlign = "center";
  ctx.fillText(spec.yLabel, 0, 0);
  ctx.restore();
  // Colour bar.
  const bx = width - m.right + 24;
  for (let k = 0; k < ph; k++) {
    ctx.fillStyle = rampColour(1 - k / ph);
    ctx.fillRect(bx, m.top + k, 16, 1.5);
  }
  ctx.fillStyle = "#111";
  ctx.textAlign = "left";
  ctx.fillText(Number(hi.toPrecision(4)).toString(), bx + 20, m.top + 10);
  ctx.fillText(Number(lo.toPrecision(4)).toString(), bx + 20, m.top + ph);
  ctx.save();
  ctx.translate(width - 8, m.top + ph / 2);
  ctx.rotate(-Math.PI / 2);
  ctx.textAlign = "center";
  ctx.fillText(spec.valueLabel, 0, 0);
  ctx.restore();
}

