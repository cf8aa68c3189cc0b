/**
 * A zonal climate (computed by the CLI): temperature against latitude and time for each climate
 * the starts found, the ice edge in each hemisphere through the orbit, and the annual-mean profile.
 */
import uPlot from "uplot";
import { DAY_S } from "../src/constants.js";
import type { ZonalViewDocument } from "../src/report/zonalReport.js";
import { CHART_COLOURS, OKABE_ITO } from "../src/view/palette.js";
import { $, expose, hideLumpedPanels, setText } from "./dom.js";
import { drawHeatMap } from "./heatMap.js";

export function startZonal(doc: ZonalViewDocument): void {
  $("scenario-name").textContent = `— ${doc.scenario.name} (zonal climate)`;
  hideLumpedPanels();
  $("status").textContent = "zonal climate: computed by the server (run the CLI to change it)";
  const panel = document.querySelector<HTMLElement>(".controls")!;
  const label = document.createElement("label");
  label.textContent = "climate ";
  const choice = document.createElement("select");
  choice.dataset.testid = "zonal-climate";
  doc.views.forEach((v, i) => choice.add(new Option(`${v.start} start`, String(i))));
  label.appendChild(choice);
  panel.insertBefore(label, $("status"));
  const charts = $("chart-orbit");
  let edgeChart: uPlot | null = null;
  let profileChart: uPlot | null = null;
  const draw = (): void => {
    const v = doc.views[Number(choice.value)]!;
    const days = v.timeSeconds.map((t) => t / DAY_S);
    drawHeatMap($("chart-temperature"), {
      title: `Temperature against latitude and time (${v.start} start)`,
      xLabel: "time since start (d)",
      yLabel: "latitude (deg)",
      valueLabel: "temperature (K)",
      xs: days,
      ys: doc.latitudeDeg,
      value: (ix, iy) => v.temperatureK[ix]![iy]!,
    });
    edgeChart?.destroy();
    profileChart?.destroy();
    charts.innerHTML = "";
    const edgeHost = document.createElement("div");
    const profileHost = document.createElement("div");
    charts.append(edgeHost, profileHost);
    const width = Math.max(480, charts.clientWidth || 800);
    const anyIce = v.northEdgeDeg.some((e) => e !== null) || v.southEdgeDeg.some((e) => e !== null);
    if (doc.iceEdgeK !== null && anyIce) {
      edgeChart = new uPlot(
        {
          width,
          height: 220,
          title: `Ice edge through the orbit (equatormost band below ${doc.iceEdgeK.toFixed(2)} K)`,
          scales: { x: { time: false }, y: { range: [-90, 90] } },
          axes: [{ label: "time since start (d)" }, { label: "latitude (deg)" }],
          series: [
            { label: "time (d)" },
            { label: "north ice edge (deg)", stroke: CHART_COLOURS.temperature, width: 2 },
            { label: "south ice edge (deg)", stroke: OKABE_ITO.orange, width: 2 },
          ],
        },
        [days, v.northEdgeDeg, v.southEdgeDeg] as uPlot.AlignedData,
        edgeHost,
      );
    } else {
      edgeHost.textContent = doc.iceEdgeK === null ? "No ice in this climate's albedo law: no ice edge." : "No band falls below the ice-edge temperature at any time of the orbit: no ice edge.";
    }
    profileChart = new uPlot(
      {
        width,
        height: 240,
        title: "Annual-mean temperature against latitude",
        scales: { x: { time: false } },
        axes: [{ label: "latitude (deg)" }, { label: "temperature (K)" }],
        series: [{ label: "latitude (deg)" }, { label: "mean T (K)", stroke: CHART_COLOURS.temperature, width: 2 }],
      },
      [doc.latitudeDeg, v.meanProfileK] as uPlot.AlignedData,
      profileHost,
    );
    const s = doc.summary.climates[Number(choice.value)]!;
    setText("t-min", s.temperature.minK.toFixed(2));
    setText("t-max", s.temperature.maxK.toFixed(2));
    setText("t-mean", s.temperature.meanK.toFixed(2));
    expose({ mode: "zonal", climate: v.start, summary: s });
  };
  choice.addEventListener("change", draw);
  // The lumped rows that do not apply to a globe of bands.
  const rowHeader = (cell: string) => document.querySelector(`[data-testid="${cell}"]`)!.parentElement!.querySelector("th")!;
  rowHeader("t-min").textContent = "global mean T (K)";
  rowHeader("teq-min").parentElement!.style.display = "none";
  for (const id of ["lag", "damping", "tau", "in-range"]) setText(id, "—");
  setText("residual", doc.summary.energyBalanceResidual.toExponential(1));
  setText("period", `${(doc.summary.periodSeconds / DAY_S).toFixed(2)} d`);
  draw();
}
