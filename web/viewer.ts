/**
 * calorbit's browser viewer. It runs the same engine modules as the CLI in the page: every
 * control change re-simulates and redraws locally, with no round trip to the server. The view
 * state lives in the URL (share the address to share the view).
 */
import uPlot from "uplot";
import { DAY_S, ASTRONOMICAL_UNIT_M } from "../src/constants.js";
import type { Regime, ThermalCase } from "../src/model.js";
import { thermalCaseFromRecord, type ResultDocument } from "../src/report/document.js";
import { simulate, type Simulation } from "../src/simulate.js";
import { chartColumns, chartMarkers, type XAxis } from "../src/view/chartData.js";
import { levels, type SweepTable } from "../src/view/sweepData.js";
import { CHART_COLOURS, REGIME_COLOURS, SERIES_CYCLE } from "../src/view/palette.js";

const SAMPLES = 2000;

interface ViewState {
  e: number;
  albedo: number;
  emissivity: number;
  log10C: number;
  log10A: number; // semi-major axis, log10 au
  regime: Regime;
  x: XAxis;
  overlay: boolean;
}

const $ = <T extends HTMLElement>(id: string) => document.getElementById(id) as T;

function stateFromCase(c: ThermalCase): ViewState {
  return {
    e: c.orbit.eccentricity,
    albedo: c.surface.albedo,
    emissivity: c.surface.emissivity,
    log10C: Math.log10(c.surface.heatCapacityJPerM2K),
    log10A: Math.log10(c.orbit.semiMajorAxisM / ASTRONOMICAL_UNIT_M),
    regime: c.regime,
    x: "time",
    overlay: false,
  };
}

function readUrl(base: ViewState): ViewState {
  const q = new URLSearchParams(location.search);
  const num = (k: string, d: number) => (q.has(k) && Number.isFinite(Number(q.get(k))) ? Number(q.get(k)) : d);
  return {
    e: num("e", base.e),
    albedo: num("albedo", base.albedo),
    emissivity: num("emissivity", base.emissivity),
    log10C: num("logC", base.log10C),
    log10A: num("logA", base.log10A),
    regime: (q.get("regime") as Regime | null) ?? base.regime,
    x: (q.get("x") as XAxis | null) ?? base.x,
    overlay: q.get("overlay") === "1" || (q.get("overlay") === null && base.overlay),
  };
}

function writeUrl(s: ViewState): void {
  const q = new URLSearchParams({
    e: s.e.toFixed(3),
    albedo: s.albedo.toFixed(3),
    emissivity: s.emissivity.toFixed(3),
    logC: s.log10C.toFixed(3),
    logA: s.log10A.toFixed(4),
    regime: s.regime,
    x: s.x,
    overlay: s.overlay ? "1" : "0",
  });
  history.replaceState(null, "", `${location.pathname}?${q.toString()}`);
}

/** The base case with the view's parameters; the period follows Kepler's third law when a changes. */
function caseFor(base: ThermalCase, s: ViewState): ThermalCase {
  const a = 10 ** s.log10A * ASTRONOMICAL_UNIT_M;
  const period = base.orbit.periodSeconds * (a / base.orbit.semiMajorAxisM) ** 1.5;
  return {
    ...base,
    regime: s.regime,
    orbit: { ...base.orbit, eccentricity: s.e, semiMajorAxisM: a, periodSeconds: period },
    surface: { ...base.surface, albedo: s.albedo, emissivity: s.emissivity, heatCapacityJPerM2K: 10 ** s.log10C },
  };
}

const fmt = (v: number, d = 2) => (Number.isFinite(v) ? v.toFixed(d) : "—");

function showSummary(sim: Simulation): void {
  const s = sim.summary;
  const set = (id: string, text: string) => (document.querySelector(`[data-testid="${id}"]`)!.textContent = text);
  set("t-min", fmt(s.temperature.minK));
  set("t-max", fmt(s.temperature.maxK));
  set("t-mean", fmt(s.temperature.meanK));
  set("teq-min", fmt(s.equilibrium.minK));
  set("teq-max", fmt(s.equilibrium.maxK));
  set("teq-mean", fmt(s.equilibrium.meanK));
  set("lag", s.lagSeconds === null ? "none (circular)" : `${fmt(s.lagSeconds / DAY_S, 1)} d`);
  set("damping", fmt(s.dampingRatio, 3));
  set("tau", s.tauOverPeriod.toPrecision(3));
  set("in-range", s.timeInRange ? `${fmt(100 * s.timeInRange.fraction, 1)} % (${s.timeInRange.lowK}–${s.timeInRange.highK} K)` : "no window set");
  set("residual", s.energyBalanceResidual.toExponential(1));
  set("period", `${fmt(s.periodSeconds / DAY_S, 2)} d`);
}

/** Periastron lines, the maximum and the window, drawn on the temperature chart's canvas. */
function markersPlugin(getMarkers: () => ReturnType<typeof chartMarkers> | null): uPlot.Plugin {
  return {
    hooks: {
      drawClear: [
        (u: uPlot) => {
          const m = getMarkers();
          if (!m?.window) return;
          const ctx = u.ctx;
          const top = u.valToPos(m.window.highK, "y", true);
          const bottom = u.valToPos(m.window.lowK, "y", true);
          const y0 = Math.max(u.bbox.top, Math.min(top, bottom));
          const y1 = Math.min(u.bbox.top + u.bbox.height, Math.max(top, bottom));
          if (y1 <= y0) return;
          ctx.save();
          ctx.fillStyle = "rgba(0, 158, 115, 0.13)";
          ctx.fillRect(u.bbox.left, y0, u.bbox.width, y1 - y0);
          ctx.restore();
        },
      ],
      draw: [
        (u: uPlot) => {
          const m = getMarkers();
          if (!m) return;
          const ctx = u.ctx;
          ctx.save();
          ctx.setLineDash([3 * devicePixelRatio, 5 * devicePixelRatio]);
          ctx.strokeStyle = CHART_COLOURS.grey;
          ctx.lineWidth = devicePixelRatio;
          for (const p of m.periastra) {
            const x = u.valToPos(p, "x", true);
            ctx.beginPath();
            ctx.moveTo(x, u.bbox.top);
            ctx.lineTo(x, u.bbox.top + u.bbox.height);
            ctx.stroke();
          }
          if (m.maximum) {
            const x = u.valToPos(m.maximum.x, "x", true);
            const y = u.valToPos(m.maximum.valueK, "y", true);
            ctx.setLineDash([]);
            ctx.fillStyle = CHART_COLOURS.marker;
            ctx.beginPath();
            ctx.arc(x, y, 5 * devicePixelRatio, 0, 2 * Math.PI);
            ctx.fill();
            ctx.font = `${12 * devicePixelRatio}px sans-serif`;
            ctx.fillText("max", x + 8 * devicePixelRatio, y - 6 * devicePixelRatio);
          }
          ctx.restore();
        },
      ],
    },
  };
}

/** A colour ramp from deep blue through teal to light yellow (perceptually ordered, colour-blind safe). */
const RAMP = [
  [13, 42, 110],
  [0, 114, 178],
  [0, 158, 115],
  [160, 200, 80],
  [240, 228, 66],
];
function rampColour(f: number): string {
  const x = Math.min(1, Math.max(0, f)) * (RAMP.length - 1);
  const i = Math.min(RAMP.length - 2, Math.floor(x));
  const t = x - i;
  const c = RAMP[i]!.map((v, k) => Math.round(v + t * (RAMP[i + 1]![k]! - v)));
  return `rgb(${c[0]},${c[1]},${c[2]})`;
}

interface HeatMapSpec {
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
function drawHeatMap(host: HTMLElement, spec: HeatMapSpec): void {
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

function hideLumpedPanels(): void {
  document.querySelector<HTMLElement>(".controls")!.querySelectorAll("label, .buttons").forEach((el) => ((el as HTMLElement).style.display = "none"));
}

/** A sweep result: a heat map of one metric over two varied inputs, or a family of curves over one. */
function startSweep(file: string, table: SweepTable): void {
  $("scenario-name").textContent = `— sweep ${file} (${table.rows} cases)`;
  hideLumpedPanels();
  document.querySelector<HTMLElement>(".summary")!.style.display = "none";
  const panel = document.querySelector<HTMLElement>(".controls")!;
  const select = (label: string, options: string[], initial: string) => {
    const l = document.createElement("label");
    l.textContent = label;
    const sel = document.createElement("select");
    for (const o of options) sel.add(new Option(o, o, o === initial, o === initial));
    l.appendChild(sel);
    panel.insertBefore(l, $("status"));
    return sel;
  };
  const metric = select("metric", table.metrics, table.metrics.includes("T_swing_K") ? "T_swing_K" : table.metrics[0]!);
  const xSel = select("x axis", table.inputs, table.inputs[0]!);
  const ySel = select("y axis (heat map)", ["none (curves)", ...table.inputs], table.inputs[1] ?? "none (curves)");
  const draw = () => {
    const values = table.columns[metric.value]!;
    const xCol = table.columns[xSel.value]!;
    const xs = levels(xCol);
    const y = ySel.value;
    if (y !== "none (curves)" && y !== xSel.value) {
      const yCol = table.columns[y]!;
      const ys = levels(yCol);
      // Mean over any other inputs that fall in the same cell.
      const sum = new Float64Array(xs.length * ys.length);
      const count = new Float64Array(xs.length * ys.length);
      const xIndex = new Map(xs.map((v, i) => [v, i]));
      const yIndex = new Map(ys.map((v, i) => [v, i]));
      for (let r = 0; r < table.rows; r++) {
        const v = values[r]!;
        if (!table.ok[r] || !Number.isFinite(v)) continue;
        const cell = xIndex.get(xCol[r]!)! + xs.length * yIndex.get(yCol[r]!)!;
        sum[cell]! += v;
        count[cell]! += 1;
      }
      drawHeatMap($("chart-temperature"), {
        title: `${metric.value} over ${xSel.value} and ${y}`,
        xLabel: xSel.value,
        yLabel: y,
        valueLabel: metric.value,
        xs,
        ys,
        value: (ix, iy) => (count[ix + xs.length * iy]! > 0 ? sum[ix + xs.length * iy]! / count[ix + xs.length * iy]! : NaN),
      });
      $("status").textContent = xs.length * ys.length > table.rows ? "cells without a case are grey" : "";
    } else {
      // A family of curves: metric against x, one curve per level of the first other input.
      const other = table.inputs.find((i) => i !== xSel.value);
      const groups = other ? levels(table.columns[other]!).slice(0, 12) : [NaN];
      const data: number[][] = [xs];
      const series: uPlot.Series[] = [{ label: xSel.value }];
      groups.forEach((g, gi) => {
        const ys = xs.map((xv) => {
          for (let r = 0; r < table.rows; r++) {
            if (table.ok[r] && xCol[r] === xv && (!other || table.columns[other]![r] === g)) return values[r]!;
          }
          return NaN;
        });
        data.push(ys);
        series.push({ label: other ? `${other} = ${Number(g.toPrecision(4))}` : metric.value, stroke: SERIES_CYCLE[gi % SERIES_CYCLE.length]!, width: 2 });
      });
      $("chart-temperature").innerHTML = "";
      new uPlot(
        { width: Math.max(480, $("chart-temperature").clientWidth || 800), height: 380, title: `${metric.value} against ${xSel.value}`, scales: { x: { time: false } }, axes: [{ label: xSel.value }, { label: metric.value }], series },
        data as uPlot.AlignedData,
        $("chart-temperature"),
      );
      $("status").textContent = groups.length === 12 ? "first 12 levels shown" : "";
    }
    (window as unknown as { calorbitViewer: unknown }).calorbitViewer = { mode: "sweep", metric: metric.value };
  };
  for (const sel of [metric, xSel, ySel]) sel.addEventListener("input", draw);
  draw();
}

interface ColumnDoc {
  scenario: { name: string };
  summary: { temperature: { minK: number; maxK: number; meanK: number }; equilibrium: { minK: number; maxK: number; meanK: number }; skinDepths: { diurnalM: number | null; orbitalM: number }; lagSeconds: number | null; energyBalanceResidual: number; periodSeconds: number };
  series: { timeSeconds: number[]; temperatureK: number[]; equilibriumK: number[] };
  heatMap: { depthsM: number[]; timesSeconds: number[]; temperatureK: number[][] };
}

/** A conduction-column result: the surface against equilibrium, and temperature over depth and time. */
function startColumn(doc: ColumnDoc): void {
  $("scenario-name").textContent = `— ${doc.scenario.name} (conduction column)`;
  hideLumpedPanels();
  $("status").textContent = "conduction column: computed by the server (run the CLI to change it)";
  const s = doc.series;
  const days = s.timeSeconds.map((t) => t / DAY_S);
  new uPlot(
    {
      width: Math.max(480, $("chart-orbit").clientWidth || 800),
      height: 260,
      title: "Surface temperature and instantaneous equilibrium",
      scales: { x: { time: false } },
      axes: [{ label: "time since start (d)" }, { label: "temperature (K)" }],
      series: [{ label: "time (d)" }, { label: "T surface (K)", stroke: CHART_COLOURS.temperature, width: 2.5 }, { label: "T_eq (K)", stroke: CHART_COLOURS.equilibrium, width: 2, dash: [8, 5] }],
    },
    [days, s.temperatureK, s.equilibriumK] as uPlot.AlignedData,
    $("chart-orbit"),
  );
  const hm = doc.heatMap;
  drawHeatMap($("chart-temperature"), {
    title: "Temperature against depth and time",
    xLabel: "time since start (d)",
    yLabel: "depth (m)",
    valueLabel: "temperature (K)",
    xs: hm.timesSeconds.map((t) => t / DAY_S),
    ys: hm.depthsM,
    value: (ix, iy) => hm.temperatureK[ix]![iy]!,
    yDown: true,
  });
  const set = (id: string, text: string) => (document.querySelector(`[data-testid="${id}"]`)!.textContent = text);
  set("t-min", fmt(doc.summary.temperature.minK));
  set("t-max", fmt(doc.summary.temperature.maxK));
  set("t-mean", fmt(doc.summary.temperature.meanK));
  set("teq-min", fmt(doc.summary.equilibrium.minK));
  set("teq-max", fmt(doc.summary.equilibrium.maxK));
  set("teq-mean", fmt(doc.summary.equilibrium.meanK));
  set("lag", doc.summary.lagSeconds === null ? "none (circular)" : `${fmt(doc.summary.lagSeconds / DAY_S, 1)} d`);
  set("damping", "—");
  set("tau", `skin depths ${doc.summary.skinDepths.diurnalM !== null ? `${doc.summary.skinDepths.diurnalM.toPrecision(2)} m / ` : ""}${doc.summary.skinDepths.orbitalM.toPrecision(2)} m`);
  set("in-range", "—");
  set("residual", doc.summary.energyBalanceResidual.toExponential(1));
  set("period", `${fmt(doc.summary.periodSeconds / DAY_S, 2)} d`);
  (window as unknown as { calorbitViewer: unknown }).calorbitViewer = { mode: "column", summary: doc.summary };
}

async function start(): Promise<void> {
  const response = await fetch("result.json");
  const raw = (await response.json()) as { kind?: string };
  if (raw.kind === "sweep") return startSweep((raw as { file: string }).file, (raw as unknown as { table: SweepTable }).table);
  if (raw.kind === "column") return startColumn(raw as unknown as ColumnDoc);
  const doc = raw as ResultDocument;
  const base = thermalCaseFromRecord(doc.scenario);
  $("scenario-name").textContent = `— ${base.name}`;
  const initial = stateFromCase(base);
  let state = readUrl(initial);
  let markers: ReturnType<typeof chartMarkers> | null = null;
  let lastSim: Simulation | null = null;
  let lastColumns: ReturnType<typeof chartColumns> | null = null;

  const width = () => Math.max(480, $("chart-temperature").clientWidth || 800);
  let tempChart: uPlot | null = null;
  let orbitChart: uPlot | null = null;

  const inputs = {
    e: $<HTMLInputElement>("in-e"),
    albedo: $<HTMLInputElement>("in-albedo"),
    emissivity: $<HTMLInputElement>("in-emissivity"),
    c: $<HTMLInputElement>("in-c"),
    a: $<HTMLInputElement>("in-a"),
    regime: $<HTMLSelectElement>("in-regime"),
    x: $<HTMLSelectElement>("in-x"),
    overlay: $<HTMLInputElement>("in-overlay"),
  };
  const syncInputs = () => {
    inputs.e.value = String(state.e);
    inputs.albedo.value = String(state.albedo);
    inputs.emissivity.value = String(state.emissivity);
    inputs.c.value = String(state.log10C);
    inputs.a.value = String(state.log10A);
    inputs.regime.value = state.regime;
    inputs.x.value = state.x;
    inputs.overlay.checked = state.overlay;
    $("out-e").textContent = state.e.toFixed(2);
    $("out-albedo").textContent = state.albedo.toFixed(2);
    $("out-emissivity").textContent = state.emissivity.toFixed(2);
    $("out-c").textContent = (10 ** state.log10C).toExponential(1);
    $("out-a").textContent = (10 ** state.log10A).toPrecision(3);
  };

  const render = () => {
    const t0 = performance.now();
    const thermal = caseFor(base, state);
    let sim: Simulation;
    try {
      sim = simulate(thermal, { samples: SAMPLES });
    } catch (err) {
      $("status").textContent = `cannot compute: ${(err as Error).message}`;
      return;
    }
    lastSim = sim;
    const cols = chartColumns(sim.series, state.x);
    lastColumns = cols;
    markers = chartMarkers(sim.series, sim.summary, state.x, cols);
    const data: number[][] = [cols.x, cols.temperatureK, cols.equilibriumK];
    const series: uPlot.Series[] = [
      { label: cols.xLabel },
      { label: sim.series.states.length > 1 ? "T day (K)" : "T (K)", stroke: CHART_COLOURS.temperature, width: 2.5 },
      { label: sim.series.states.length > 1 ? "T_eq day (K)" : "T_eq (K)", stroke: CHART_COLOURS.equilibrium, width: 2, dash: [8, 5] },
    ];
    if (sim.series.states.length > 1) {
      data.push(Array.from(sim.series.states[1]!.temperatureK));
      series.push({ label: "T night (K)", stroke: CHART_COLOURS.night, width: 2.5 });
    }
    if (state.overlay) {
      for (const regime of ["global", "dayside", "substellar", "daynight", "band", "point"] as const) {
        if (regime === state.regime) continue;
        try {
          const other = simulate({ ...thermal, regime }, { samples: SAMPLES });
          data.push(Array.from(other.series.temperatureK));
          series.push({ label: `T ${regime}${regime === "daynight" ? " day" : ""} (K)`, stroke: REGIME_COLOURS[regime]!, width: 1.5, dash: [2, 3] });
        } catch {
          /* a regime that cannot run here is simply not overlaid */
        }
      }
    }
    tempChart?.destroy();
    tempChart = new uPlot(
      {
        width: width(),
        height: 380,
        title: "Temperature and instantaneous equilibrium",
        scales: { x: { time: false } },
        axes: [{ label: cols.xLabel }, { label: "temperature (K)" }],
        series,
        plugins: [markersPlugin(() => markers)],
      },
      data as uPlot.AlignedData,
      $("chart-temperature"),
    );
    const orbitData = [cols.x, cols.distanceAu, cols.absorbedWPerM2];
    if (!orbitChart) {
      orbitChart = new uPlot(
        {
          width: width(),
          height: 220,
          title: "Distance and absorbed flux",
          scales: { x: { time: false }, au: {}, flux: {} },
          axes: [{ label: cols.xLabel }, { scale: "au", label: "distance (au)" }, { scale: "flux", side: 1, label: "absorbed flux (W m⁻²)", grid: { show: false } }],
          series: [
            { label: cols.xLabel },
            { label: "distance (au)", stroke: CHART_COLOURS.grey, width: 2, scale: "au" },
            { label: "absorbed (W m⁻²)", stroke: CHART_COLOURS.window, width: 2, scale: "flux" },
          ],
        },
        orbitData as uPlot.AlignedData,
        $("chart-orbit"),
      );
    } else {
      orbitChart.setData(orbitData as uPlot.AlignedData);
    }
    showSummary(sim);
    const ms = performance.now() - t0;
    $("status").textContent = `recomputed and drawn in ${ms.toFixed(0)} ms (${SAMPLES} samples, ${sim.solver.integrator})`;
    (window as unknown as { calorbitViewer: unknown }).calorbitViewer = { summary: sim.summary, renderMs: ms, samples: cols.x.length };
  };

  const onChange = () => {
    state = {
      e: Number(inputs.e.value),
      albedo: Number(inputs.albedo.value),
      emissivity: Number(inputs.emissivity.value),
      log10C: Number(inputs.c.value),
      log10A: Number(inputs.a.value),
      regime: inputs.regime.value as Regime,
      x: inputs.x.value as XAxis,
      overlay: inputs.overlay.checked,
    };
    syncInputs();
    writeUrl(state);
    render();
  };
  for (const el of Object.values(inputs)) el.addEventListener("input", onChange);
  $("reset").addEventListener("click", () => {
    state = initial;
    syncInputs();
    writeUrl(state);
    render();
  });
  $("export-csv").addEventListener("click", () => {
    if (!lastSim || !lastColumns) return;
    const header = `# calorbit viewer export: ${base.name}\nx (${lastColumns.xLabel}),temperature_K,equilibrium_K,distance_au,absorbed_flux_W_m2\n`;
    const rows = lastColumns.x.map((x, i) => [x, lastColumns!.temperatureK[i], lastColumns!.equilibriumK[i], lastColumns!.distanceAu[i], lastColumns!.absorbedWPerM2[i]].join(","));
    download(new Blob([header + rows.join("\n") + "\n"], { type: "text/csv" }), "calorbit-series.csv");
  });
  $("export-png").addEventListener("click", () => {
    const canvas = document.querySelector<HTMLCanvasElement>("#chart-temperature canvas");
    canvas?.toBlob((blob) => blob && download(blob, "calorbit-chart.png"));
  });
  syncInputs();
  render();
}

function download(blob: Blob, name: string): void {
  const a = document.createElement("a");
  a.href = URL.createObjectURL(blob);
  a.download = name;
  a.click();
  setTimeout(() => URL.revokeObjectURL(a.href), 1000);
}

start().catch((err: unknown) => {
  $("status").textContent = `could not load the result: ${(err as Error).message}`;
});
