/**
 * A map result: the phase curve an observer records, recomputed in the page when the inclination,
 * the argument of periastron or the passband changes (no new solve), and the surface temperature
 * map at a chosen moment, animated through the orbit.
 */
import uPlot from "uplot";
import { phaseCurve, phaseCurveSummary, type MapHistory } from "../src/analysis/phaseCurve.js";
import { DAY_S } from "../src/constants.js";
import { BandRadiance, type Passband } from "../src/physics/planck.js";
import { lonLatGrid } from "../src/physics/surfaceGrid.js";
import type { MapViewDocument } from "../src/report/mapReport.js";
import { CHART_COLOURS, rampColour } from "../src/view/palette.js";
import { $, expose, hideLumpedPanels, setText } from "./dom.js";

const DEG = Math.PI / 180;

function slider(panel: HTMLElement, label: string, min: number, max: number, step: number, value: number, unit: string): { input: HTMLInputElement; out: HTMLOutputElement } {
  const l = document.createElement("label");
  const out = document.createElement("output");
  const input = document.createElement("input");
  input.type = "range";
  input.min = String(min);
  input.max = String(max);
  input.step = String(step);
  input.value = String(value);
  input.dataset.testid = `map-${label.replace(/\W+/g, "-")}`;
  l.append(`${label} `, out, input);
  panel.insertBefore(l, $("status"));
  const show = () => (out.textContent = `${Number(input.value).toFixed(step < 1 ? 2 : 0)} ${unit}`);
  input.addEventListener("input", show);
  show();
  return { input, out };
}

export function startMap(doc: MapViewDocument): void {
  $("scenario-name").textContent = `— ${doc.scenario.name} (surface map)`;
  hideLumpedPanels();
  const h = doc.history;
  const history: MapHistory = {
    grid: lonLatGrid(h.longitudes, h.latitudes),
    orbit: h.orbit,
    frame: h.frame,
    timeSeconds: Float64Array.from(h.timeSeconds),
    meanAnomalyRad: Float64Array.from(h.meanAnomalyRad),
    trueAnomalyRad: Float64Array.from(h.trueAnomalyRad),
    distanceM: Float64Array.from(h.distanceM),
    temperatureK: Float64Array.from(h.temperatureK),
    substellarLongitudeRad: Float64Array.from(h.substellarLongitudeRad),
  };
  const cells = h.longitudes * h.latitudes;
  const days = h.timeSeconds.map((t) => t / DAY_S);
  const panel = document.querySelector<HTMLElement>(".controls")!;
  const t = doc.telescope;
  const status = $("status");
  status.textContent = "surface computed by the server; the phase curve is recomputed here for the observer and passband below";

  // The surface at one moment, animated through the orbit.
  const time = slider(panel, "moment", 0, h.timeSeconds.length - 1, 1, 0, "");
  const play = document.createElement("button");
  play.type = "button";
  play.textContent = "Play";
  panel.insertBefore(play, $("status"));
  const mapHost = $("chart-orbit");
  mapHost.innerHTML = "";
  const heading = document.createElement("h3");
  mapHost.appendChild(heading);
  const canvas = document.createElement("canvas");
  const width = Math.max(480, mapHost.clientWidth || 800);
  const height = Math.round(width / 2);
  canvas.width = width;
  canvas.height = height + 40;
  canvas.setAttribute("role", "img");
  canvas.setAttribute("aria-label", "surface temperature map");
  mapHost.appendChild(canvas);
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of h.temperatureK) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  const drawMap = (s: number): void => {
    const ctx = canvas.getContext("2d")!;
    const cw = width / h.longitudes;
    const ch = height / h.latitudes;
    for (let j = 0; j < h.latitudes; j++) {
      for (let i = 0; i < h.longitudes; i++) {
        const v = history.temperatureK[s * cells + j * h.longitudes + i]!;
        ctx.fillStyle = rampColour((v - lo) / (hi - lo || 1));
        ctx.fillRect(i * cw, height - (j + 1) * ch, cw + 0.5, ch + 0.5);
      }
    }
    for (let b = 0; b < 100; b++) {
      ctx.fillStyle = rampColour(b / 99);
      ctx.fillRect((b * width) / 100, height + 8, width / 100 + 0.5, 12);
    }
    ctx.clearRect(0, height + 22, width, 18);
    ctx.fillStyle = "#111";
    ctx.font = "12px sans-serif";
    ctx.textAlign = "left";
    ctx.fillText(`${lo.toFixed(0)} K`, 2, height + 36);
    ctx.textAlign = "right";
    ctx.fillText(`${hi.toFixed(0)} K`, width - 2, height + 36);
    heading.textContent = `Surface temperature at ${days[s]!.toFixed(3)} d (longitude −180° to 180°, latitude −90° to 90°)`;
  };
  time.input.addEventListener("input", () => drawMap(Number(time.input.value)));
  let timer: number | undefined;
  play.addEventListener("click", () => {
    if (timer !== undefined) {
      clearInterval(timer);
      timer = undefined;
      play.textContent = "Play";
      return;
    }
    play.textContent = "Pause";
    timer = window.setInterval(() => {
      time.input.value = String((Number(time.input.value) + 2) % h.timeSeconds.length);
      time.input.dispatchEvent(new Event("input"));
    }, 60);
  });
  drawMap(0);

  if (!t) {
    $("chart-temperature").textContent = "No observer in this scenario: add observer and body.radius for the phase curve.";
    expose({ mode: "map" });
    return;
  }
  const inclination = slider(panel, "inclination", 0, 90, 0.5, t.observer.inclinationRad / DEG, "deg");
  const omega = slider(panel, "argument of periastron", 0, 360, 1, ((t.observer.argumentOfPeriastronRad / DEG) % 360 + 360) % 360, "deg");
  const initialBand: Passband = t.passband;
  const from = slider(panel, "band from", 0.5, 30, 0.1, initialBand.kind === "tophat" ? initialBand.fromM * 1e6 : 4, "µm");
  const to = slider(panel, "band to", 0.6, 40, 0.1, initialBand.kind === "tophat" ? initialBand.toM * 1e6 : 5, "µm");
  let band = new BandRadiance(initialBand);
  let bandKey = "initial";
  const chartHost = $("chart-temperature");
  chartHost.innerHTML = "";
  let chart: uPlot | null = null;
  const compute = (): { ms: number } => {
    const started = performance.now();
    const key = `${from.input.value}-${to.input.value}`;
    if (key !== bandKey && bandKey !== "initial-kept") {
      const lo = Number(from.input.value) * 1e-6;
      const hi = Number(to.input.value) * 1e-6;
      if (!(hi > lo)) {
        status.textContent = "the passband's long end must be beyond its short end";
        chartHost.style.opacity = "0.35";
        return { ms: 0 };
      }
      band = new BandRadiance({ kind: "tophat", fromM: lo, toM: hi });
      bandKey = key;
    }
    chartHost.style.opacity = "1";
    const observer = { inclinationRad: Number(inclination.input.value) * DEG, argumentOfPeriastronRad: Number(omega.input.value) * DEG, longitudeOfNodeRad: 0 };
    const telescope = { observer, band, planetRadiusM: t.planetRadiusM, starRadiusM: t.starRadiusM, starTemperatureK: t.starTemperatureK };
    const curve = phaseCurve(history, telescope);
    const summary = phaseCurveSummary(history, curve);
    const ppm = Array.from(curve.fluxRatio, (f) => f * 1e6);
    const transit = Array.from(curve.transitCoveredFraction, (c, i) => (c > 0 ? ppm[i]! : null));
    const data = [days, ppm, transit] as uPlot.AlignedData;
    if (chart) chart.setData(data);
    else {
      chart = new uPlot(
        {
          width: Math.max(480, chartHost.clientWidth || 800),
          height: 320,
          title: "Planet / star flux in the passband (thermal phase curve)",
          scales: { x: { time: false } },
          axes: [{ label: "time since start (d)" }, { label: "flux ratio (ppm)" }],
          series: [
            { label: "time (d)" },
            { label: "planet / star (ppm)", stroke: CHART_COLOURS.temperature, width: 2 },
            { label: "during transit", stroke: CHART_COLOURS.marker, width: 3 },
          ],
        },
        data,
        chartHost,
      );
    }
    setText("t-max", `${(summary.maxFluxRatio * 1e6).toFixed(1)} ppm`);
    setText("t-min", `${(summary.minFluxRatio * 1e6).toFixed(1)} ppm`);
    setText("lag", `${(summary.timeOfMaxAfterPeriastronSeconds / 3600).toFixed(2)} h`);
    const ms = performance.now() - started;
    expose({ mode: "map", summary, lastRecomputeMs: ms });
    return { ms };
  };
  // The first curve uses the scenario's own passband (a table stays a table until the band sliders move).
  bandKey = "initial-kept";
  compute();
  bandKey = `${from.input.value}-${to.input.value}`;
  for (const s of [inclination, omega]) s.input.addEventListener("input", () => compute());
  for (const s of [from, to]) s.input.addEventListener("input", () => compute());
  const summaryRows = document.querySelector<HTMLElement>(".summary")!;
  summaryRows.querySelector("h2")!.textContent = "Phase curve";
  // The lumped view's rows say T and T_eq; here the first row is the flux ratio and the second does not apply.
  const rowHeader = (cell: string) => document.querySelector(`[data-testid="${cell}"]`)!.parentElement!.querySelector("th")!;
  rowHeader("t-min").textContent = "planet / star";
  rowHeader("teq-min").parentElement!.style.display = "none";
  const label = (cell: string, text: string) => {
    const dd = document.querySelector(`[data-testid="${cell}"]`)!;
    (dd.previousElementSibling as HTMLElement).textContent = text;
  };
  label("lag", "flux maximum after periastron");
  label("tau", "radiative time");
  label("damping", "damping ratio");
  setText("t-mean", "—");
  for (const id of ["teq-min", "teq-max", "teq-mean", "damping", "in-range"]) setText(id, "—");
  setText("tau", `${(doc.summary.radiativeTimeSeconds / 3600).toFixed(2)} h`);
  setText("residual", doc.summary.energyBalanceResidual.toExponential(1));
  setText("period", `${(doc.summary.periodSeconds / DAY_S).toFixed(3)} d`);
}
