/**
 * The zonal climate's reports: the text summary with a small latitude table, the JSON document,
 * the CSV of T(latitude, time) and the SVG of the annual-mean profile. One writer of each for
 * every climate a run found (a warm start and a cold start can give two).
 */
import type { BandSummary, ZonalSummary } from "../analysis/zonalSummary.js";
import { albedoLaw, type AlbedoSpec } from "../physics/climateAlbedo.js";
import type { HeatCapacitySpec } from "../physics/climateHeatCapacity.js";
import type { OutgoingSpec } from "../physics/climateOutgoing.js";
import { COLD_START_K, WARM_START_K, type ClimateSettings } from "../physics/climateSettings.js";
import { zonalSeries, type ZonalCase, type ZonalClimate, type ZonalSimulation } from "../run/zonal.js";
import type { ResolvedScenario } from "../scenario/resolve.js";
import { OKABE_ITO } from "../view/palette.js";
import { VERSION } from "../version.js";
import { resolvedScenarioRecord } from "./document.js";
import { au, degrees, fixed, sig } from "./format.js";
import { niceTicks } from "./svg.js";
import { CAUTION, describeScenario } from "./text.js";

const START_WORDS = { warm: `a warm start (${WARM_START_K} K everywhere)`, cold: `a cold start (${COLD_START_K} K everywhere)` } as const;

function outgoingWords(o: OutgoingSpec): string {
  switch (o.law) {
    case "blackbody":
      return `blackbody εσT⁴, ε = ${o.emissivity}`;
    case "linear":
      return `linear ${sig(o.aWPerM2, 4)} W m⁻² + ${sig(o.bWPerM2K, 3)} W m⁻² K⁻¹ × (T − 273.15 K)`;
    case "grey":
      return o.opticalDepth !== undefined ? `grey σT⁴/(1 + 0.75τ), τ = ${o.opticalDepth}` : "grey σT⁴/(1 + 0.75τ), τ = 0.79 (T/273 K)³";
  }
}

function albedoWords(a: AlbedoSpec): string {
  const p2 = (c: number | undefined) => (c ? ` ${c > 0 ? "+" : "−"} ${Math.abs(c)} P₂(sin φ)` : "");
  switch (a.law) {
    case "constant":
      return `constant ${a.value}${p2(a.p2)} (no ice)`;
    case "step":
      return `${a.warm}${p2(a.warmP2)} ice-free, ${a.ice} under ice below ${fixed(a.iceK, 2)} K (ramp ${sig(a.rampK)} K)`;
    case "smooth":
      return "0.525 − 0.245 tanh((T − 268 K)/5 K) (smooth ice)";
  }
}

function heatCapacityWords(c: HeatCapacitySpec): string {
  return c.kind === "slab"
    ? `${sig(c.heatCapacityJPerM2K)} J m⁻² K⁻¹ in every band`
    : `ocean ${sig(100 * c.oceanFraction)} % (C_o ${sig(c.oceanHeatCapacityJPerM2K)}), land C_l ${sig(c.landHeatCapacityJPerM2K)} J m⁻² K⁻¹${c.freezing ? ", water freezes below 273 K" : ""}`;
}

export function climateLines(c: ClimateSettings): string[] {
  return [
    `  regime    zonal (${c.bands} latitude bands of equal area, meridional diffusion D = ${sig(c.diffusionWPerM2K)} W m⁻² K⁻¹)`,
    `  outgoing  ${outgoingWords(c.outgoing)}`,
    `  albedo    ${albedoWords(c.albedo)}`,
    `  storage   ${heatCapacityWords(c.heatCapacity)}`,
  ];
}

/** About a dozen rows of the latitude table, south to north, evenly through the bands. */
function tableRows(bands: readonly BandSummary[]): BandSummary[] {
  const n = bands.length;
  const rows = Math.min(n, 13);
  const picked: BandSummary[] = [];
  for (let k = 0; k < rows; k++) picked.push(bands[rows === 1 ? 0 : Math.round((k * (n - 1)) / (rows - 1))]!);
  return picked;
}

function climateText(c: ZonalClimate, window: ZonalSummary["habitableWindow"]): string[] {
  const s = c.summary;
  const lines = [
    `Periodic climate from ${START_WORDS[c.start]}`,
    `  global mean        ${fixed(s.globalMeanK, 2)} K (through the orbit ${fixed(s.temperature.minK, 2)} to ${fixed(s.temperature.maxK, 2)} K)`,
    `  equator − pole     ${fixed(s.equatorPoleContrastK, 2)} K (time means)`,
    s.iceEdge
      ? `  ice edge           ${fixed(s.iceEdge.minDeg, 1)}° to ${fixed(s.iceEdge.maxDeg, 1)}° latitude, mean ${fixed(s.iceEdge.meanDeg, 1)}° (90° = no ice); ice covers ${fixed(100 * s.iceFraction, 1)} % of area × time${s.snowball ? "; a snowball" : ""}`
      : "  ice edge           none (the albedo has no ice)",
    `  habitable          ${fixed(100 * s.habitableFraction, 2)} % of area × time within ${fixed(window.lowK, 2)}–${fixed(window.highK, 2)} K`,
    `  energy   absorbed ${fixed(s.meanAbsorbedWPerM2, 3)} W m⁻², emitted ${fixed(s.meanEmittedWPerM2, 3)} W m⁻², residual ${s.energyBalanceResidual.toExponential(1)}`,
    `  solver   ${c.solver.method}, ${c.solver.stepsPerOrbit} steps per orbit, ${c.solver.newtonIterations} Newton ${c.solver.newtonIterations === 1 ? "iteration" : "iterations"}, ${c.solver.orbitsIntegrated} orbits + ${c.solver.spinUpOrbits} coarse orbits + ${c.solver.linearisedOrbits} linearised, periodicity ${c.solver.periodicityResidualK.toExponential(1)} K, orbit-map radius ${fixed(c.solver.monodromyRadius, 3)}`,
    `  ${"latitude".padStart(9)}${"mean".padStart(10)}${"min".padStart(10)}${"max".padStart(10)}`,
  ];
  for (const b of tableRows(s.bands)) {
    const t = b.temperature;
    lines.push(`  ${(fixed(b.latitudeDeg, 1) + "°").padStart(9)}${fixed(t.meanK, 1).padStart(8)} K${fixed(t.minK, 1).padStart(8)} K${fixed(t.maxK, 1).padStart(8)} K`);
  }
  return lines;
}

export function zonalText(resolved: ResolvedScenario, sim: ZonalSimulation, climate: ClimateSettings): string {
  const described = describeScenario(resolved).filter((l) => !l.startsWith("  regime"));
  // The axis line comes with the described scenario: the zonal row of the regimes table reads spin.axis.
  const lines: string[] = [`calorbit ${VERSION} — ${resolved.thermal.name}`, ...described, ...climateLines(climate), ""];
  for (const c of sim.climates) lines.push(...climateText(c, c.summary.habitableWindow), "");
  if (sim.startsAgree === true) lines.push("The warm and the cold start reach the same climate.", "");
  if (sim.startsAgree === false) lines.push("The warm and the cold start keep different climates: the planet has two.", "");
  lines.push(CAUTION);
  return lines.join("\n") + "\n";
}

/** The JSON summary: the first climate's fields at the top (warm start with "both"), every climate under `climates`. */
export function zonalDocument(resolved: ResolvedScenario, sim: ZonalSimulation, climate: ClimateSettings) {
  const first = sim.climates[0]!;
  return {
    calorbit: { version: VERSION },
    scenario: { ...resolvedScenarioRecord(resolved), regime: "zonal", climate },
    summary: {
      start: first.start,
      ...first.summary,
      startsAgree: sim.startsAgree,
      climates: sim.climates.map((c) => ({ start: c.start, ...c.summary })),
    },
    solver: { ...first.solver, climates: sim.climates.map((c) => ({ start: c.start, ...c.solver })) },
  };
}

export const ZONAL_CSV_COLUMNS = ["climate", "time_s", "orbit_phase", "true_anomaly_deg", "distance_au", "latitude_deg", "temperature_K"] as const;

/** T(latitude, time) in long form: one row per climate, time and band. */
export function zonalCsv(resolved: ResolvedScenario, zonal: ZonalCase, sim: ZonalSimulation, samples: number): string {
  const lines: string[] = [
    `# calorbit ${VERSION}`,
    `# scenario (SI units): ${JSON.stringify({ ...resolvedScenarioRecord(resolved), regime: "zonal", climate: zonal.climate })}`,
    `# zonal climate: one row per climate, time and latitude band (band centres); orbit_phase = mean anomaly / 360 deg (0 at periastron); between step ends T is linear in the eccentric anomaly`,
    ZONAL_CSV_COLUMNS.join(","),
  ];
  const n = sim.grid.count;
  const latitudes = Array.from(sim.grid.latitudeRad, (l) => degrees(l).toPrecision(8));
  for (const c of sim.climates) {
    const series = zonalSeries(zonal, sim, c, samples);
    for (let k = 0; k < samples; k++) {
      const head = `${c.start},${series.timeSeconds[k]!.toPrecision(10)},${(series.meanAnomalyRad[k]! / (2 * Math.PI)).toPrecision(8)},${degrees(series.trueAnomalyRad[k]!).toPrecision(8)},${au(series.distanceM[k]!).toPrecision(10)}`;
      for (let j = 0; j < n; j++) lines.push(`${head},${latitudes[j]},${series.temperatureK[k * n + j]!.toPrecision(10)}`);
    }
  }
  return lines.join("\n") + "\n";
}

function escapeXml(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

const CLIMATE_COLOURS = { warm: OKABE_ITO.vermillion, cold: OKABE_ITO.blue } as const;

/** The annual-mean temperature against latitude, each climate with its min–max band, the habitable window and ice edges. */
export function zonalProfileSvg(title: string, sim: ZonalSimulation): string {
  const width = 900;
  const height = 500;
  const m = { left: 78, right: 24, top: 48, bottom: 64 };
  const all = sim.climates.flatMap((c) => c.summary.bands.flatMap((b) => [b.temperature.minK, b.temperature.maxK]));
  const window = sim.climates[0]!.summary.habitableWindow;
  let yLo = Math.min(...all);
  let yHi = Math.max(...all);
  const pad = 0.05 * (yHi - yLo || 1);
  yLo -= pad;
  yHi += pad;
  const px = (lat: number) => m.left + ((lat + 90) / 180) * (width - m.left - m.right);
  const py = (t: number) => height - m.bottom - ((t - yLo) / (yHi - yLo)) * (height - m.top - m.bottom);
  const parts: string[] = [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="DejaVu Sans, Arial, sans-serif" font-size="13">`,
    `<title>${escapeXml(title)}</title>`,
    `<rect x="0" y="0" width="${width}" height="${height}" fill="#ffffff"/>`,
    `<text x="${m.left}" y="28" font-size="16" font-weight="bold">${escapeXml(title)}: annual-mean temperature by latitude</text>`,
  ];
  const top = py(Math.min(window.highK, yHi));
  const bottom = py(Math.max(window.lowK, yLo));
  if (bottom > top) parts.push(`<rect class="window" x="${m.left}" y="${top.toFixed(2)}" width="${width - m.left - m.right}" height="${(bottom - top).toFixed(2)}" fill="${OKABE_ITO.bluishGreen}" fill-opacity="0.12"/>`);
  for (const t of niceTicks(yLo, yHi)) {
    parts.push(`<line x1="${m.left}" x2="${width - m.right}" y1="${py(t).toFixed(2)}" y2="${py(t).toFixed(2)}" stroke="#dddddd"/>`);
    parts.push(`<text x="${m.left - 8}" y="${(py(t) + 4).toFixed(2)}" text-anchor="end">${t}</text>`);
  }
  for (const lat of [-90, -60, -30, 0, 30, 60, 90]) {
    parts.push(`<line x1="${px(lat).toFixed(2)}" x2="${px(lat).toFixed(2)}" y1="${height - m.bottom}" y2="${height - m.bottom + 5}" stroke="#000"/>`);
    parts.push(`<text x="${px(lat).toFixed(2)}" y="${height - m.bottom + 20}" text-anchor="middle">${lat}°</text>`);
  }
  parts.push(`<rect x="${m.left}" y="${m.top}" width="${width - m.left - m.right}" height="${height - m.top - m.bottom}" fill="none" stroke="#000"/>`);
  for (const c of sim.climates) {
    const colour = CLIMATE_COLOURS[c.start];
    const bands = c.summary.bands;
    const upper = bands.map((b, i) => `${i === 0 ? "M" : "L"}${px(b.latitudeDeg).toFixed(2)},${py(b.temperature.maxK).toFixed(2)}`).join("");
    const lower = [...bands].reverse().map((b) => `L${px(b.latitudeDeg).toFixed(2)},${py(b.temperature.minK).toFixed(2)}`).join("");
    parts.push(`<path class="range-${c.start}" d="${upper}${lower}Z" fill="${colour}" fill-opacity="0.15" stroke="none"/>`);
    parts.push(`<path id="mean-${c.start}" d="${bands.map((b, i) => `${i === 0 ? "M" : "L"}${px(b.latitudeDeg).toFixed(2)},${py(b.temperature.meanK).toFixed(2)}`).join("")}" fill="none" stroke="${colour}" stroke-width="2.5"/>`);
    const edge = c.summary.iceEdge;
    if (edge && edge.meanDeg < 89.95 && edge.meanDeg > 0.05) {
      for (const lat of [-edge.meanDeg, edge.meanDeg]) {
        parts.push(`<line class="ice-edge-${c.start}" x1="${px(lat).toFixed(2)}" x2="${px(lat).toFixed(2)}" y1="${m.top}" y2="${height - m.bottom}" stroke="${colour}" stroke-dasharray="3 4"/>`);
      }
    }
  }
  parts.push(`<text x="${(m.left + width - m.right) / 2}" y="${height - 18}" text-anchor="middle">latitude</text>`);
  parts.push(`<text transform="translate(22 ${(m.top + height - m.bottom) / 2}) rotate(-90)" text-anchor="middle">temperature (K)</text>`);
  const lx = width - m.right - 300;
  let ly = m.top + 14;
  parts.push(`<rect x="${lx - 10}" y="${ly - 14}" width="300" height="${20 * sim.climates.length + 30}" fill="#ffffff" fill-opacity="0.9" stroke="#999"/>`);
  for (const c of sim.climates) {
    parts.push(`<line x1="${lx}" x2="${lx + 28}" y1="${ly}" y2="${ly}" stroke="${CLIMATE_COLOURS[c.start]}" stroke-width="2.5"/><text x="${lx + 36}" y="${ly + 4}">${c.start} start: mean, min–max, ice edge</text>`);
    ly += 20;
  }
  parts.push(`<rect x="${lx}" y="${ly - 7}" width="28" height="12" fill="${OKABE_ITO.bluishGreen}" fill-opacity="0.25"/><text x="${lx + 36}" y="${ly + 4}">habitable ${fixed(window.lowK, 2)}–${fixed(window.highK, 2)} K</text>`);
  parts.push(`</svg>`);
  return parts.join("\n") + "\n";
}

/**
 * What the viewer draws for a zonal climate: for each climate, temperature against latitude and
 * time (uniform in time over the orbit), the ice edge in each hemisphere at each time (the
 * equatormost band colder than the ice-edge temperature; none without ice), and the annual-mean profile.
 */
export function zonalViewDocument(resolved: ResolvedScenario, zonal: ZonalCase, sim: ZonalSimulation, climate: ClimateSettings, samples: number) {
  const iceEdgeK = albedoLaw(climate.albedo).iceEdgeK;
  const latitudeDeg = Array.from(sim.grid.latitudeRad, (r) => (r * 180) / Math.PI);
  const n = sim.grid.count;
  return {
    kind: "zonal" as const,
    ...zonalDocument(resolved, sim, climate),
    iceEdgeK,
    latitudeDeg,
    views: sim.climates.map((c) => {
      const series = zonalSeries(zonal, sim, c, samples);
      const temperatureK: number[][] = [];
      const northEdgeDeg: (number | null)[] = [];
      const southEdgeDeg: (number | null)[] = [];
      for (let s = 0; s < samples; s++) {
        const row = Array.from(series.temperatureK.subarray(s * n, (s + 1) * n), (t) => Number(t.toPrecision(5)));
        temperatureK.push(row);
        let north: number | null = null;
        let south: number | null = null;
        if (iceEdgeK !== null) {
          for (let j = 0; j < n; j++) {
            if (row[j]! >= iceEdgeK) continue;
            const lat = latitudeDeg[j]!;
            if (lat >= 0 && (north === null || lat < north)) north = lat;
            if (lat < 0 && (south === null || lat > south)) south = lat;
          }
        }
        northEdgeDeg.push(north);
        southEdgeDeg.push(south);
      }
      return {
        start: c.start,
        timeSeconds: Array.from(series.timeSeconds),
        temperatureK,
        northEdgeDeg,
        southEdgeDeg,
        meanProfileK: c.summary.bands.map((b) => b.temperature.meanK),
      };
    }),
  };
}

export type ZonalViewDocument = ReturnType<typeof zonalViewDocument>;
