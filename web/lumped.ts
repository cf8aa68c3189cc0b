/**
 * The live view of a lumped result: it runs the same engine modules as the CLI in the page, so every
 * control change re-simulates and redraws locally, with no round trip to the server.
 */
import { REGIMES } from "../src/model/regimes.js";
import uPlot from "uplot";
import { ASTRONOMICAL_UNIT_M, DAY_S } from "../src/constants.js";
import type { Regime, ThermalCase } from "../src/model/thermalCase.js";
import { thermalCaseFromRecord, type ResultDocument } from "../src/report/document.js";
import { simulate, type Simulation } from "../src/run/simulate.js";
import { chartColumns, chartMarkers, type XAxis } from "../src/view/chartData.js";
import { CHART_COLOURS, REGIME_COLOURS } from "../src/view/palette.js";
import { $, download, expose, fmt, setText } from "./dom.js";
import { markersPlugin } from "./markers.js";
import { readUrl, stateFromCase, writeUrl, type ViewState } from "./urlState.js";

const SAMPLES = 2000;

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

function showSummary(sim: Simulation): void {
  const s = sim.summary;
  setText("t-min", fmt(s.temperature.minK));
  setText("t-max", fmt(s.temperature.maxK));
  setText("t-mean", fmt(s.temperature.meanK));
  setText("teq-min", fmt(s.equilibrium.minK));
  setText("teq-max", fmt(s.equilibrium.maxK));
  setText("teq-mean", fmt(s.equilibrium.meanK));
  setText("lag", s.lagSeconds === null ? "none (circular)" : `${fmt(s.lagSeconds / DAY_S, 1)} d`);
  setText("damping", fmt(s.dampingRatio, 3));
  setText("tau", s.tauOverPeriod.toPrecision(3));
  setText("in-range", s.timeInRange ? `${fmt(100 * s.timeInRange.fraction, 1)} % (${s.timeInRange.lowK}–${s.timeInRange.highK} K)` : "no window set");
  setText("residual", s.energyBalanceResidual.toExponential(1));
  setText("period", `${fmt(s.periodSeconds / DAY_S, 2)} d`);
}

/** The live view of a lumped result: sliders and menus re-simulate in the page. */
export function startLumped(doc: ResultDocument): void {
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
      for (const regime of REGIMES) {
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
    expose({ summary: sim.summary, renderMs: ms, samples: cols.x.length });
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

