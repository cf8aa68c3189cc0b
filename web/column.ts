/** A conduction-column result (computed by the CLI): the surface against equilibrium, temperature over depth and time. */
import uPlot from "uplot";
import { DAY_S } from "../src/constants.js";
import { CHART_COLOURS } from "../src/view/palette.js";
import { $, expose, fmt, hideLumpedPanels, setText } from "./dom.js";
import { drawHeatMap } from "./heatMap.js";

export interface ColumnDoc {
  scenario: { name: string };
  summary: { temperature: { minK: number; maxK: number; meanK: number }; equilibrium: { minK: number; maxK: number; meanK: number }; skinDepths: { diurnalM: number | null; orbitalM: number }; lagSeconds: number | null; energyBalanceResidual: number; periodSeconds: number };
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
  setText("t-min", fmt(doc.summary.temperature.minK));
  setText("t-max", fmt(doc.summary.temperature.maxK));
  setText("t-mean", fmt(doc.summary.temperature.meanK));
  setText("teq-min", fmt(doc.summary.equilibrium.minK));
  setText("teq-max", fmt(doc.summary.equilibrium.maxK));
  setText("teq-mean", fmt(doc.summary.equilibrium.meanK));
  setText("lag", doc.summary.lagSeconds === null ? "none (circular)" : `${fmt(doc.summary.lagSeconds / DAY_S, 1)} d`);
  setText("damping", "—");
  setText("tau", `skin depths ${doc.summary.skinDepths.diurnalM !== null ? `${doc.summary.skinDepths.diurnalM.toPrecision(2)} m / ` : ""}${doc.summary.skinDepths.orbitalM.toPrecision(2)} m`);
  setText("in-range", "—");
  setText("residual", doc.summary.energyBalanceResidual.toExponential(1));
  setText("period", `${fmt(doc.summary.periodSeconds / DAY_S, 2)} d`);
  expose({ mode: "column", summary: doc.summary });
}

