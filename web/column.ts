/** A conduction-column result (computed by the CLI): the surface against equilibrium, temperature over depth and time. */
import uPlot from "uplot";
import { DAY_S } from "../src/constants.js";
import { CHART_COLOURS } from "../src/view/palette.js";
import { sig } from "../src/report/format.js";
import { columnStepSeconds, lagWords, windowWords } from "../src/report/wording.js";
import { edgesFromCentres, layerEdges } from "../src/view/heatMapLayout.js";
import { $, expose, fmt, hideLumpedPanels, setText } from "./dom.js";
import { drawHeatMap } from "./heatMap.js";
import { showCycleRows, showStatsRow } from "./summaryRows.js";

export interface ColumnDoc {
  scenario: { name: string; orbit: { eccentricity: number } };
  summary: {
    temperature: { minK: number; maxK: number; meanK: number; swingK: number };
    equilibrium: { minK: number; maxK: number; meanK: number; swingK: number };
    skinDepths: { diurnalM: number | null; orbitalM: number };
    thermalInertiaSurface?: number;
    lagSeconds: number | null;
    dampingRatio: number | null;
    energyBalanceResidual: number | null;
    periodSeconds: number;
    cycleSeconds: number;
    solarDaySeconds?: number | null;
    timeInRange?: { lowK: number; highK: number; fraction: number; seconds: number };
  };
  solver: { stepsPerCycle?: number };
  series: { timeSeconds: number[]; temperatureK: number[]; equilibriumK: number[] };
  heatMap: { depthsM: number[]; timesSeconds: number[]; temperatureK: number[][] };
}

/** A conduction-column result: the surface against equilibrium, and temperature over depth and time. */
export function startColumn(doc: ColumnDoc): void {
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
      series: [{ label: "time since start (d)" }, { label: "T surface (K)", stroke: CHART_COLOURS.temperature, width: 2.5 }, { label: "T_eq (K)", stroke: CHART_COLOURS.equilibrium, width: 2, dash: [8, 5] }],
    },
    [days, s.temperatureK, s.equilibriumK] as uPlot.AlignedData,
    $("chart-orbit"),
  );
  const hm = doc.heatMap;
  const times = hm.timesSeconds.map((t) => t / DAY_S);
  drawHeatMap($("chart-temperature"), {
    title: "Temperature against depth and time",
    xLabel: "time since start (d)",
    yLabel: "depth (m)",
    valueLabel: "temperature (K)",
    xs: times,
    ys: hm.depthsM,
    value: (ix, iy) => hm.temperatureK[ix]![iy]!,
    yDown: true,
    // Rows at their depths in metres (the layers thicken downwards), columns at their times.
    xEdges: edgesFromCentres(times),
    yEdges: layerEdges(hm.depthsM),
  });
  const sum = doc.summary;
  setText("t-label", "T surface (K)");
  showStatsRow("t", sum.temperature);
  showStatsRow("teq", sum.equilibrium);
  setText("lag", lagWords(sum, doc.scenario.orbit.eccentricity, columnStepSeconds(sum, doc.solver)));
  setText("damping", sum.dampingRatio === null ? "—" : fmt(sum.dampingRatio, 3));
  const d = sum.skinDepths;
  setText("tau-label", d.diurnalM !== null ? "skin depths (solar day, orbit)" : "skin depth (orbit)");
  setText("tau", `${d.diurnalM !== null ? `${sig(d.diurnalM, 2)} m, ` : ""}${sig(d.orbitalM, 2)} m`);
  setText("in-range", windowWords(sum) ?? "no window set");
  setText("residual", sum.energyBalanceResidual === null ? "—" : sum.energyBalanceResidual.toExponential(1));
  showCycleRows(sum);
  expose({ mode: "column", summary: sum });
}
