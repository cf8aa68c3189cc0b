/**
 * A fit (`calorbit fit --view`): the data with their 1σ error bars beside the best-fit model, the
 * residuals in units of σ, the parameter table with uncertainties (and the posterior's median and
 * 16–84 % range when it was sampled), and the posterior's pair plot: each parameter's histogram on
 * the diagonal, the 2-D density of each pair below it, shaded with the maps' colour ramp.
 */
import uPlot from "uplot";
import type { FitViewDocument } from "../src/fit/view.js";
import { sig } from "../src/report/format.js";
import { CHART_COLOURS, rampColour } from "../src/view/palette.js";
import { $, expose, hideLumpedPanels } from "./dom.js";

/** One x axis for the data and the curve: their times merged, each series null where it has no value. */
function aligned(doc: FitViewDocument, scale: number): { x: number[]; observed: (number | null)[]; model: (number | null)[] } {
  const points: { t: number; observed: number | null; model: number | null }[] = [];
  doc.data.time.forEach((t, i) => points.push({ t, observed: doc.data.observed[i]! * scale, model: null }));
  doc.curve.time.forEach((t, i) => points.push({ t, observed: null, model: doc.curve.value[i]! * scale }));
  points.sort((a, b) => a.t - b.t);
  return { x: points.map((p) => p.t), observed: points.map((p) => p.observed), model: points.map((p) => p.model) };
}

/** Vertical bars from y − e to y + e at each data point (values already scaled), drawn on a chart's canvas. */
function errorBarsPlugin(time: readonly number[], value: readonly number[], error: readonly number[]): uPlot.Plugin {
  return {
    hooks: {
      draw: [
        (u: uPlot) => {
          const ctx = u.ctx;
          ctx.save();
          ctx.beginPath();
          ctx.rect(u.bbox.left, u.bbox.top, u.bbox.width, u.bbox.height);
          ctx.clip();
          ctx.strokeStyle = CHART_COLOURS.grey;
          ctx.lineWidth = devicePixelRatio;
          const cap = 3 * devicePixelRatio;
          for (let i = 0; i < time.length; i++) {
            const x = u.valToPos(time[i]!, "x", true);
            const lo = u.valToPos(value[i]! - error[i]!, "y", true);
            const hi = u.valToPos(value[i]! + error[i]!, "y", true);
            ctx.beginPath();
            ctx.moveTo(x, lo);
            ctx.lineTo(x, hi);
            ctx.moveTo(x - cap, lo);
            ctx.lineTo(x + cap, lo);
            ctx.moveTo(x - cap, hi);
            ctx.lineTo(x + cap, hi);
            ctx.stroke();
          }
          ctx.restore();
        },
      ],
    },
  };
}

/** A y range holding every value and bar (and ±`least` when it is positive), padded by 5 %. */
function spanOf(lows: readonly number[], highs: readonly number[], least = 0): uPlot.Range.MinMax {
  let lo = Math.min(...lows, ...(least > 0 ? [-least] : []));
  let hi = Math.max(...highs, ...(least > 0 ? [least] : []));
  if (!(hi > lo)) [lo, hi] = [lo - 1, hi + 1];
  const pad = 0.05 * (hi - lo);
  return [lo - pad, hi + pad];
}

const pointsOnly = { paths: () => null, points: { show: true, size: 6, fill: CHART_COLOURS.grey, stroke: CHART_COLOURS.grey } };

/** One block per parameter (the side panel is narrow): its key and unit, the best fit ± 1σ, the posterior's median and 16–84 % range. */
function parameterTable(doc: FitViewDocument): HTMLTableElement {
  const table = document.createElement("table");
  table.dataset.testid = "fit-parameters";
  doc.parameters.forEach((p, j) => {
    const body = table.createTBody();
    const title = document.createElement("th");
    title.colSpan = 2;
    title.className = "fit-key";
    title.textContent = p.unit ? `${p.key} (${p.unit}${p.logScale ? ", log scale" : ""})` : `${p.key}${p.logScale ? " (log scale)" : ""}`;
    body.insertRow().appendChild(title);
    const line = (label: string, testId: string, text: string) => {
      const row = body.insertRow();
      const th = document.createElement("th");
      th.textContent = label;
      row.appendChild(th);
      const td = row.insertCell();
      td.dataset.testid = testId;
      td.textContent = text;
    };
    line("best fit ± 1σ", `fit-value-${j}`, `${sig(p.value, 5)} ± ${p.sigma === null ? "not constrained" : sig(p.sigma, 2)}${p.atBound ? " (at a bound)" : ""}`);
    const q = p.posterior;
    if (q) line("posterior", `fit-posterior-${j}`, `${sig(q.median, 5)} +${sig(q.p84 - q.median, 2)} −${sig(q.median - q.p16, 2)}`);
  });
  return table;
}

/** The pair plot on one canvas: histograms on the diagonal, 2-D densities below it. */
function pairPlot(doc: FitViewDocument, host: HTMLElement): HTMLCanvasElement | null {
  const post = doc.posterior;
  if (!post) return null;
  const { bins, ranges, histograms, pairs } = post.density;
  const p = doc.parameters.length;
  const size = Math.max(120, Math.min(220, Math.floor((host.clientWidth || 800) / p)));
  const pad = 8;
  const label = 34;
  const canvas = document.createElement("canvas");
  canvas.width = size * p;
  canvas.height = size * p + label;
  canvas.setAttribute("role", "img");
  canvas.setAttribute("aria-label", "posterior pair plot");
  canvas.dataset.testid = "fit-pairs";
  const ctx = canvas.getContext("2d")!;
  ctx.fillStyle = "#fff";
  ctx.fillRect(0, 0, canvas.width, canvas.height);
  for (let row = 0; row < p; row++) {
    for (let col = 0; col <= row; col++) {
      const x = col * size + pad;
      const y = row * size + pad;
      const w = size - 2 * pad;
      const h = size - 2 * pad;
      ctx.strokeStyle = "#999";
      ctx.strokeRect(x, y, w, h);
      if (row === col) {
        const counts = histograms[col]!;
        const max = Math.max(...counts, 1);
        ctx.fillStyle = CHART_COLOURS.temperature;
        counts.forEach((c, b) => {
          const bh = (c / max) * (h - 4);
          ctx.fillRect(x + (b * w) / bins, y + h - bh, w / bins, bh);
        });
      } else {
        const counts = pairs[row]![col]!;
        const max = Math.max(...counts, 1);
        counts.forEach((c, k) => {
          if (c === 0) return;
          ctx.fillStyle = rampColour(c / max);
          ctx.fillRect(x + ((k % bins) * w) / bins, y + h - ((Math.floor(k / bins) + 1) * h) / bins, w / bins + 0.5, h / bins + 0.5);
        });
      }
      if (row === p - 1) {
        const [lo, hi] = ranges[col]!;
        const q = doc.parameters[col]!;
        ctx.fillStyle = "#111";
        ctx.font = "11px sans-serif";
        ctx.textAlign = "left";
        ctx.fillText(sig(lo, 3), x, y + h + 14);
        ctx.textAlign = "right";
        ctx.fillText(sig(hi, 3), x + w, y + h + 14);
        ctx.textAlign = "center";
        ctx.fillText(q.unit ? `${q.key} (${q.unit})` : q.key, x + w / 2, y + h + 28, w);
      }
    }
  }
  return canvas;
}

export function startFit(doc: FitViewDocument): void {
  $("scenario-name").textContent = `— ${doc.title} (fit)`;
  document.querySelector(".tagline")!.textContent = "Observed series against the best-fit model, with the fitted parameters and their uncertainties";
  hideLumpedPanels();
  document.querySelector(".controls h2")!.textContent = "Data";
  const flux = doc.quantity === "fluxRatio";
  // Flux ratios are shown in ppm (as the map view does); temperatures in K.
  const scale = flux ? 1e6 : 1;
  const unit = flux ? "ppm" : "K";
  const n = doc.data.time.length;
  $("status").textContent = `${doc.dataFile}: ${n} points (${flux ? "flux_ratio" : "temperature"}) against the model's ${doc.outputSpec}; computed by calorbit fit`;

  const chartHost = $("chart-temperature");
  chartHost.innerHTML = "";
  const width = Math.max(480, chartHost.clientWidth || 800);
  const series = aligned(doc, scale);
  const observed = doc.data.observed.map((v) => v * scale);
  const sigma = doc.data.sigma.map((s) => s * scale);
  const curveValues = doc.curve.value.map((v) => v * scale);
  new uPlot(
    {
      width,
      height: 340,
      title: `Data ± 1σ${doc.sigmaEstimated ? " (σ from the residual scatter)" : ""} and the best fit`,
      scales: { x: { time: false }, y: { range: () => spanOf([...observed.map((v, i) => v - sigma[i]!), ...curveValues], [...observed.map((v, i) => v + sigma[i]!), ...curveValues]) } },
      axes: [{ label: `time (${doc.timeUnit}, the data's clock)` }, { label: flux ? "flux ratio (ppm)" : "temperature (K)" }],
      series: [
        { label: `time (${doc.timeUnit})` },
        { label: `data (${unit})`, stroke: CHART_COLOURS.grey, ...pointsOnly },
        { label: `best fit (${unit})`, stroke: CHART_COLOURS.temperature, width: 2, spanGaps: true, points: { show: false } },
      ],
      plugins: [errorBarsPlugin(doc.data.time, observed, sigma)],
    },
    [series.x, series.observed, series.model] as uPlot.AlignedData,
    chartHost,
  );

  const lowerHost = $("chart-orbit");
  lowerHost.innerHTML = "";
  const normalised = doc.data.residual.map((r, i) => r / doc.data.sigma[i]!);
  new uPlot(
    {
      width,
      height: 200,
      title: "Residuals (data − model) / σ",
      scales: { x: { time: false }, y: { range: () => spanOf(normalised.map((r) => r - 1), normalised.map((r) => r + 1), 3) } },
      axes: [{ label: `time (${doc.timeUnit})` }, { label: "residual / σ" }],
      series: [{ label: `time (${doc.timeUnit})` }, { label: "residual / σ", stroke: CHART_COLOURS.grey, ...pointsOnly }],
      plugins: [
        errorBarsPlugin(doc.data.time, normalised, new Array<number>(n).fill(1)),
        {
          hooks: {
            drawClear: [
              (u: uPlot) => {
                const y = u.valToPos(0, "y", true);
                u.ctx.save();
                u.ctx.strokeStyle = CHART_COLOURS.temperature;
                u.ctx.lineWidth = devicePixelRatio;
                u.ctx.beginPath();
                u.ctx.moveTo(u.bbox.left, y);
                u.ctx.lineTo(u.bbox.left + u.bbox.width, y);
                u.ctx.stroke();
                u.ctx.restore();
              },
            ],
          },
        },
      ],
    },
    [doc.data.time, normalised] as uPlot.AlignedData,
    lowerHost,
  );
  const pairs = pairPlot(doc, lowerHost);
  if (pairs) {
    const heading = document.createElement("h3");
    heading.textContent = `Posterior: histograms and pairwise densities (${doc.posterior!.samples} samples after the burn-in)`;
    lowerHost.append(heading, pairs);
  }

  // The summary panel: the parameter table, χ², the warnings and the caution, in place of the run's rows.
  const summary = document.querySelector<HTMLElement>(".summary")!;
  summary.innerHTML = "";
  const h2 = document.createElement("h2");
  h2.textContent = "Fitted parameters";
  const chi = document.createElement("p");
  chi.dataset.testid = "fit-chi-square";
  chi.textContent = `χ² = ${sig(doc.chiSquare, 5)} for ${doc.degreesOfFreedom} degrees of freedom (reduced χ² = ${sig(doc.reducedChiSquare, 4)})`;
  summary.append(h2, parameterTable(doc));
  if (doc.parameters.some((p) => p.posterior !== null)) {
    const note = document.createElement("p");
    note.className = "status";
    note.textContent = "posterior: the median, + to the 84th and − to the 16th percentile, after the burn-in";
    summary.appendChild(note);
  }
  summary.appendChild(chi);
  for (const w of doc.warnings) {
    const p = document.createElement("p");
    p.className = "problem";
    p.textContent = `warning: ${w}`;
    summary.appendChild(p);
  }
  const caution = document.createElement("p");
  caution.className = "status";
  caution.textContent = doc.caution;
  summary.appendChild(caution);
  expose({ mode: "fit", points: n, parameters: doc.parameters.map((p) => ({ key: p.key, value: p.value, sigma: p.sigma })), pairPlot: pairs !== null });
}
