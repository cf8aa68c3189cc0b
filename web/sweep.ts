/** A sweep result: a heat map of one metric over two varied inputs, or a family of curves over one. */
import uPlot from "uplot";
import { levels, type SweepTable } from "../src/view/sweepData.js";
import { SERIES_CYCLE } from "../src/view/palette.js";
import { $, expose, hideLumpedPanels } from "./dom.js";
import { drawHeatMap } from "./heatMap.js";

export function startSweep(file: string, table: SweepTable): void {
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
  const metric = select("metric", table.metrics, table.metrics.includes("temperature_swing_K") ? "temperature_swing_K" : table.metrics[0]!);
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
    expose({ mode: "sweep", metric: metric.value });
  };
  for (const sel of [metric, xSel, ySel]) sel.addEventListener("input", draw);
  draw();
}

