/**
 * The live view of a lumped result: it runs the same engine modules as the CLI in the page, so every
 * control change re-simulates and redraws locally, with no round trip to the server. The charts are
 * built once and then given new data in place; they are rebuilt only when the set of curves or the
 * x axis changes.
 */
import uPlot from "uplot";
import { CalorbitError } from "../src/errors.js";
import { REGIME_TABLE, SURFACE_REGIMES, type Regime } from "../src/model/regimes.js";
import type { ThermalCase } from "../src/model/thermalCase.js";
import { thermalCaseFromRecord, type ResultDocument } from "../src/report/document.js";
import { duration, sig } from "../src/report/format.js";
import { lagWords, windowWords } from "../src/report/wording.js";
import { simulate, type Simulation } from "../src/run/simulate.js";
import { VERSION } from "../src/version.js";
import { chartColumns, chartMarkers, periodicResample, type ChartColumns, type Markers } from "../src/view/chartData.js";
import { exportHeaderLines, pngWithText, viewerCsv, type ExportColumn } from "../src/view/exportData.js";
import { CHART_COLOURS, overlayColours } from "../src/view/palette.js";
import { caseFor, PARAMETERS, parseSpin, SPIN_REGIMES, usesParameter, valuesOf, type ParameterValues } from "../src/view/parameters.js";
import { decodeViewState, encodeViewState, type ViewState } from "../src/view/viewState.js";
import { ParameterControl, TextControl } from "./controls.js";
import { $, download, expose, fmt, setText } from "./dom.js";
import { markersPlugin } from "./markers.js";
import { showCycleRows, showStatsRow } from "./summaryRows.js";

const SAMPLES = 2000;
/** The regimes the live view computes (those that sit on a slab), in the table's menu order. */
const LIVE_REGIMES: readonly Regime[] = SURFACE_REGIMES.filter((r) => REGIME_TABLE[r].heatStores.includes("slab"));

/** One curve of the temperature chart. */
interface Curve {
  label: string;
  values: ArrayLike<number>;
  /** Column name in the CSV export. */
  csv: string;
  stroke: string;
  width: number;
  dash?: number[];
}

/** The words a regime goes by in the page (its menu label). */
const regimeWords = (regime: Regime): string => REGIME_TABLE[regime].menuLabel;

/** The live view of a lumped result: sliders and menus re-simulate in the page. */
export function startLumped(doc: ResultDocument): void {
  const base: ThermalCase = thermalCaseFromRecord(doc.scenario);
  $("scenario-name").textContent = `— ${base.name}`;
  const initial: ViewState = { values: valuesOf(base), x: "time", overlay: false };
  let state = decodeViewState(location.search, initial);

  const problems = new Map<string, string>();
  const events = {
    changed: () => onChange(performance.now()),
    problem: (key: string, message: string | null) => {
      if (message === null) problems.delete(key);
      else problems.set(key, message);
      if (message !== null) showProblem();
    },
  };
  const general = $("params");
  const regimeSpecific = $("regime-params");
  const controls = PARAMETERS.map((spec) => {
    const c = new ParameterControl(spec, state.values[spec.key], events);
    (spec.regimes === undefined ? general : regimeSpecific).appendChild(c.row);
    return c;
  });
  const spin = new TextControl("spin", "spin (spin:orbit, or period in d)", state.values.spin, parseSpin, events);
  regimeSpecific.appendChild(spin.row);
  const regimeSelect = $<HTMLSelectElement>("in-regime");
  // The regime menu comes from the regimes table (src/model/regimes.ts).
  for (const r of LIVE_REGIMES) regimeSelect.add(new Option(REGIME_TABLE[r].menuLabel, r));
  const xSelect = $<HTMLSelectElement>("in-x");
  const overlayBox = $<HTMLInputElement>("in-overlay");

  const showFor = (regime: Regime) => {
    for (const c of controls) c.show(usesParameter(c.spec, regime));
    spin.show(SPIN_REGIMES.includes(regime));
    $("regime-params-title").hidden = !controls.some((c) => c.spec.regimes !== undefined && usesParameter(c.spec, regime));
  };
  const syncInputs = () => {
    for (const c of controls) c.set(state.values[c.spec.key]);
    spin.set(state.values.spin);
    regimeSelect.value = state.values.regime;
    xSelect.value = state.x;
    overlayBox.checked = state.overlay;
    showFor(state.values.regime);
  };

  const readInputs = (): ViewState => {
    const values = { ...state.values, spin: spin.value, regime: regimeSelect.value as Regime } as ParameterValues;
    for (const c of controls) values[c.spec.key] = c.value;
    return { values, x: xSelect.value as ViewState["x"], overlay: overlayBox.checked };
  };

  // Charts: built on first use, rebuilt only when their curves or axes change.
  let tempChart: uPlot | null = null;
  let tempSignature = "";
  let orbitChart: uPlot | null = null;
  let orbitSignature = "";
  let markers: Markers | null = null;
  let last: { sim: Simulation; thermal: ThermalCase; cols: ChartColumns; curves: Curve[] } | null = null;
  let renders = 0;
  const width = () => Math.max(480, $("chart-temperature").clientWidth || 800);

  const drawTemperature = (cols: ChartColumns, curves: Curve[]) => {
    const data = [cols.x, ...curves.map((c) => c.values)] as uPlot.AlignedData;
    const signature = JSON.stringify([cols.xLabel, curves.map((c) => [c.label, c.stroke])]);
    if (tempChart && signature === tempSignature) {
      tempChart.batch(() => tempChart!.setData(data));
      return;
    }
    tempChart?.destroy();
    tempSignature = signature;
    const series: uPlot.Series[] = [{ label: cols.xLabel }, ...curves.map((c) => ({ label: c.label, stroke: c.stroke, width: c.width, ...(c.dash ? { dash: c.dash } : {}) }))];
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
      data,
      $("chart-temperature"),
    );
  };

  const drawOrbit = (cols: ChartColumns) => {
    const data = [cols.x, cols.distanceAu, cols.absorbedWPerM2] as uPlot.AlignedData;
    if (orbitChart && orbitSignature === cols.xLabel) {
      orbitChart.batch(() => orbitChart!.setData(data));
      return;
    }
    orbitChart?.destroy();
    orbitSignature = cols.xLabel;
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
      data,
      $("chart-orbit"),
    );
  };

  const curvesFor = (sim: Simulation, thermal: ThermalCase, cols: ChartColumns): Curve[] => {
    const twoStates = sim.series.states.length > 1;
    const curves: Curve[] = [
      { label: twoStates ? "T day (K)" : "T (K)", csv: twoStates ? "temperature_day_K" : "temperature_K", values: cols.temperatureK, stroke: CHART_COLOURS.temperature, width: 2.5 },
      { label: twoStates ? "T_eq day (K)" : "T_eq (K)", csv: twoStates ? "equilibrium_day_K" : "equilibrium_K", values: cols.equilibriumK, stroke: CHART_COLOURS.equilibrium, width: 2, dash: [8, 5] },
    ];
    if (twoStates) {
      curves.push({ label: "T night (K)", csv: "temperature_night_K", values: sim.series.states[1]!.temperatureK, stroke: CHART_COLOURS.night, width: 2.5 });
    }
    if (state.overlay) {
      const others: { regime: Regime; sim: Simulation }[] = [];
      for (const regime of LIVE_REGIMES) {
        if (regime === thermal.regime) continue;
        try {
          others.push({ regime, sim: simulate({ ...thermal, regime }, { samples: SAMPLES }) });
        } catch {
          /* a regime that cannot run here is not overlaid; the legend lists those that are */
        }
      }
      const colours = overlayColours(
        others.map((o) => o.regime),
        curves.map((c) => c.stroke),
      );
      others.forEach((o, i) => {
        const day = o.regime === "daynight" ? " day" : "";
        curves.push({ label: `T ${o.regime}${day} (K)`, csv: `temperature_${o.regime}${day ? "_day" : ""}_K`, values: periodicResample(sim.series.timeSeconds, o.sim.series.timeSeconds, o.sim.series.temperatureK), stroke: colours[i]!, width: 1.5, dash: [2, 3] });
      });
    }
    return curves;
  };

  const greyCharts = (grey: boolean) => {
    document.querySelector(".charts")!.classList.toggle("stale", grey);
    document.querySelector(".summary")!.classList.toggle("stale", grey);
  };

  /** Says in the panel why nothing could be computed, and greys the charts of the last case. */
  const showProblem = (err?: unknown) => {
    const lines = [...problems.values()];
    const needed = new Set<string>(problems.keys());
    if (err !== undefined) {
      const regime = state.values.regime;
      // The engine's message may start with the regime's own name ("daynight: …"); the page names it in words.
      const what = (err as Error).message.replace(new RegExp(`^${regime}: `), "");
      lines.push(`Cannot compute ${regimeWords(regime)}: ${what}.`);
      if (err instanceof CalorbitError) {
        for (const p of err.problems) {
          const named = PARAMETERS.filter((s) => usesParameter(s, regime) && (p.path === s.field || p.allowed.includes(s.field) || p.path.startsWith(`${s.field}.`)));
          for (const s of named) needed.add(s.key);
          lines.push(
            named.length > 0
              ? `Set ${named.map((s) => s.label.replace(/ \(.*\)$/, "")).join(" or ")} above (needs ${p.allowed}).`
              : `${p.path}: given ${p.given}; needs ${p.allowed}.`,
          );
        }
      }
    }
    for (const c of controls) c.mark(needed.has(c.spec.key));
    spin.mark(needed.has("spin"));
    const box = $("problem");
    box.textContent = "";
    for (const l of lines) {
      const p = document.createElement("p");
      p.textContent = l;
      box.appendChild(p);
    }
    box.hidden = lines.length === 0;
    greyCharts(lines.length > 0);
    if (lines.length > 0) {
      for (const id of ["t-min", "t-max", "t-mean", "t-swing", "teq-min", "teq-max", "teq-mean", "teq-swing", "lag", "damping", "tau", "in-range", "residual", "period", "cycle"]) setText(id, "—");
      $("night-rows").hidden = true;
      $("status").textContent = "";
      expose({ mode: "lumped", error: lines.join(" "), summary: null, state });
    }
  };

  const render = (t0: number) => {
    const thermal = caseFor(base, state.values);
    let sim: Simulation;
    try {
      sim = simulate(thermal, { samples: SAMPLES });
    } catch (err) {
      showProblem(err);
      return;
    }
    if (problems.size > 0) {
      showProblem();
      return;
    }
    for (const c of controls) c.mark(false);
    spin.mark(false);
    $("problem").hidden = true;
    greyCharts(false);
    const cols = chartColumns(sim.series, state.x);
    markers = chartMarkers(sim.series, sim.summary, state.x, cols);
    const curves = curvesFor(sim, thermal, cols);
    drawTemperature(cols, curves);
    drawOrbit(cols);
    last = { sim, thermal, cols, curves };
    showSummary(sim, thermal);
    const ms = performance.now() - t0;
    $("status").textContent = `recomputed and drawn in ${ms.toFixed(0)} ms (${SAMPLES} samples, ${sim.solver.integrator})`;
    expose({
      mode: "lumped",
      summary: sim.summary,
      renderMs: ms,
      renders: ++renders,
      samples: cols.x.length,
      // What the charts themselves hold (read back from uPlot), for tests and the benchmark.
      axisLabels: { temperature: tempChart!.axes[0]!.label, orbit: orbitChart!.axes[0]!.label },
      curves: curves.map((c) => ({ label: c.label, stroke: c.stroke })),
      state,
      error: null,
    });
  };

  const onChange = (t0: number) => {
    state = readInputs();
    showFor(state.values.regime);
    history.replaceState(null, "", `${location.pathname}?${encodeViewState(state)}`);
    render(t0);
  };
  for (const el of [regimeSelect, xSelect, overlayBox]) el.addEventListener("input", () => onChange(performance.now()));
  $("reset").addEventListener("click", () => {
    problems.clear();
    state = initial;
    syncInputs();
    history.replaceState(null, "", location.pathname);
    render(performance.now());
  });

  const header = () => ({ version: VERSION, name: base.name, values: state.values, thermal: last!.thermal, link: encodeViewState(state) });
  $("export-csv").addEventListener("click", () => {
    if (!last) return;
    const { cols, curves } = last;
    const xName = state.x === "time" ? "time_d" : state.x === "meanAnomaly" ? "mean_anomaly_deg" : "true_anomaly_deg";
    const columns: ExportColumn[] = [
      { name: xName, values: cols.x },
      ...curves.map((c) => ({ name: c.csv, values: c.values })),
      { name: "distance_au", values: cols.distanceAu },
      { name: "absorbed_flux_W_m2", values: cols.absorbedWPerM2 },
    ];
    download(new Blob([viewerCsv(header(), columns)], { type: "text/csv" }), "calorbit-series.csv");
  });
  $("export-png").addEventListener("click", () => {
    if (!last || !tempChart) return;
    const h = header();
    const lines = exportHeaderLines(h);
    captionedPng(tempChart, lines, last.curves).toBlob((blob) => {
      if (!blob) return;
      void blob.arrayBuffer().then((bytes) => {
        const png = pngWithText(new Uint8Array(bytes), { Software: `calorbit ${VERSION}`, Title: h.name, Description: `${lines.join("\n")}\nview: ?${h.link}` });
        download(new Blob([png as Uint8Array<ArrayBuffer>], { type: "image/png" }), "calorbit-chart.png");
      });
    });
  });

  syncInputs();
  render(performance.now());
}

/** The temperature chart with a caption strip below: the legend, the version and the parameters. */
function captionedPng(chart: uPlot, lines: string[], curves: Curve[]): HTMLCanvasElement {
  const source = chart.ctx.canvas;
  const ratio = devicePixelRatio;
  const lineHeight = 18 * ratio;
  const strip = (lines.length + 1) * lineHeight + 12 * ratio;
  const out = document.createElement("canvas");
  out.width = source.width;
  out.height = source.height + strip;
  const ctx = out.getContext("2d")!;
  ctx.fillStyle = "#ffffff";
  ctx.fillRect(0, 0, out.width, out.height);
  ctx.drawImage(source, 0, 0);
  ctx.font = `${12 * ratio}px sans-serif`;
  ctx.textBaseline = "middle";
  let x = 10 * ratio;
  const legendY = source.height + lineHeight / 2 + 4 * ratio;
  for (const c of curves) {
    ctx.strokeStyle = c.stroke;
    ctx.lineWidth = 2 * ratio;
    ctx.setLineDash((c.dash ?? []).map((d) => d * ratio));
    ctx.beginPath();
    ctx.moveTo(x, legendY);
    ctx.lineTo(x + 22 * ratio, legendY);
    ctx.stroke();
    ctx.fillStyle = "#111111";
    ctx.fillText(c.label, x + 26 * ratio, legendY);
    x += 26 * ratio + ctx.measureText(c.label).width + 14 * ratio;
  }
  ctx.setLineDash([]);
  lines.forEach((l, i) => ctx.fillText(l, 10 * ratio, legendY + (i + 1) * lineHeight));
  return out;
}

function showSummary(sim: Simulation, thermal: ThermalCase): void {
  const s = sim.summary;
  const twoStates = s.day !== undefined && s.night !== undefined;
  const first = twoStates ? s.day! : s;
  setText("t-label", twoStates ? "T day (K)" : "T (K)");
  setText("teq-label", twoStates ? "T_eq day (K)" : "T_eq (K)");
  showStatsRow("t", first.temperature);
  showStatsRow("teq", first.equilibrium);
  $("night-rows").hidden = !twoStates;
  if (twoStates) showStatsRow("night", s.night!.temperature);
  setText("lag", lagWords(s, thermal.orbit.eccentricity));
  setText("damping-label", twoStates ? "damping ratio (day side)" : "damping ratio");
  setText("damping", s.dampingRatio === null ? "—" : fmt(s.dampingRatio, 3));
  setText("tau-label", "τ / P (radiative time)");
  setText("tau", s.tauOverPeriod === null || s.radiativeTimeSeconds === null ? "—" : `${sig(s.tauOverPeriod)} (τ = ${duration(s.radiativeTimeSeconds)})`);
  setText("in-range", windowWords(s) ?? "no window set");
  setText("residual", s.energyBalanceResidual === null ? "—" : s.energyBalanceResidual.toExponential(1));
  showCycleRows(s);
}
