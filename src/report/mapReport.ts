/**
 * The map regime's reports: the text summary, the JSON document, the phase-curve CSV, the surface
 * map at one moment as CSV, and a standalone SVG of the phase curve beside that map.
 */
import type { ObservedMap } from "../run/observeMap.js";
import type { ResolvedScenario } from "../scenario/resolve.js";
import { CHART_COLOURS, rampColour } from "../view/palette.js";
import { VERSION } from "../version.js";
import { resolvedScenarioRecord } from "./document.js";
import { niceTicks } from "./svg.js";
import { CAUTION, describeScenario } from "./text.js";
import { au, days, degrees, duration, fixed, sig } from "./format.js";

const TWO_PI = 2 * Math.PI;

/** Area-weighted mean, and extremes, of the whole grid over the reported span. */
function gridStatistics(o: ObservedMap): { minK: number; maxK: number; meanK: number } {
  const { cellMinK, cellMaxK, cellMeanK, history } = o.sim;
  let minK = Infinity;
  let maxK = -Infinity;
  let meanK = 0;
  for (let k = 0; k < cellMeanK.length; k++) {
    minK = Math.min(minK, cellMinK[k]!);
    maxK = Math.max(maxK, cellMaxK[k]!);
    meanK += history.grid.areaFraction[k]! * cellMeanK[k]!;
  }
  return { minK, maxK, meanK };
}

/** Index of the sample nearest to time t (s), folded into the sampled span by whole orbits. */
export function sampleNearest(o: ObservedMap, timeSeconds: number): number {
  const times = o.sim.history.timeSeconds;
  const period = o.sim.history.orbit.periodSeconds;
  let t = timeSeconds;
  while (t < times[0]!) t += period;
  while (t > times[times.length - 1]!) t -= period;
  let best = 0;
  for (let s = 1; s < times.length; s++) if (Math.abs(times[s]! - t) < Math.abs(times[best]! - t)) best = s;
  return best;
}

export function mapText(resolved: ResolvedScenario, o: ObservedMap): string {
  const { sim } = o;
  const g = sim.history.grid;
  const stats = gridStatistics(o);
  const lines = [`calorbit ${VERSION} — ${resolved.thermal.name}`, ...describeScenario(resolved)];
  const wind = resolved.thermal.map?.windRadPerSecond ?? 0;
  lines.push(
    `  map       ${g.longitudes} × ${g.latitudes} cells (equal steps of ${sig(360 / g.longitudes)}° in longitude and ${sig(180 / g.latitudes)}° in latitude)${wind !== 0 ? `, wind ${sig(degrees(wind) * 86400)}° per day eastward` : ""}`,
  );
  lines.push("");
  lines.push(
    sim.mode === "periodic"
      ? `Periodic steady state over ${sim.cycleOrbits === 1 ? "one orbit" : `a cycle of ${sim.cycleOrbits} orbits`}`
      : `Forward integration: the spin shares no cycle with the orbit, so orbit ${sim.orbitsIntegrated} after ${sim.orbitsIntegrated - 1} to forget the start is shown`,
  );
  lines.push(`  surface temperature   min ${fixed(stats.minK, 2)} K, max ${fixed(stats.maxK, 2)} K, area-weighted mean ${fixed(stats.meanK, 2)} K`);
  lines.push(`  radiative time τ = C/(4εσT³)   ${duration(sim.radiativeTimeSeconds)}, τ/P = ${sig(sim.radiativeTimeSeconds / resolved.thermal.orbit.periodSeconds)}`);
  lines.push(
    `  energy   absorbed ${sig(sim.energy.absorbedWPerM2, 6)} W m⁻², emitted ${sig(sim.energy.emittedWPerM2, 6)} W m⁻² (whole sphere), residual ${sig(sim.energy.residual, 2)}`,
  );
  if (o.phase && o.telescope && o.transit && o.occultation) {
    const obs = o.telescope.observer;
    const band = o.telescope.band.band;
    const bandText = band.kind === "bolometric" ? "bolometric" : band.kind === "tophat" ? `${sig(band.fromM * 1e6)}–${sig(band.toM * 1e6)} µm (top-hat)` : `a response table (${band.wavelengthM.length} rows)`;
    lines.push("");
    lines.push(`Seen from i = ${sig(degrees(obs.inclinationRad))}°, ω = ${sig(degrees(obs.argumentOfPeriastronRad))}°, passband ${bandText}`);
    lines.push(`  flux ratio (planet/star)   max ${sig(o.phase.maxFluxRatio * 1e6, 4)} ppm, min ${sig(o.phase.minFluxRatio * 1e6, 4)} ppm`);
    lines.push(
      `  maximum    ${duration(o.phase.timeOfMaxSeconds)} after the start, ${duration(o.phase.timeOfMaxAfterPeriastronSeconds)} after periastron (${fixed(o.phase.timeOfMaxAfterPeriastronSeconds / resolved.thermal.orbit.periodSeconds, 4)} of the orbit)`,
    );
    lines.push(
      `  transit       ${o.transit.occurs ? `depth ${sig(o.transit.depth * 1e6, 4)} ppm` : "none (the discs do not overlap)"} at conjunction, ${duration(o.transit.timeSeconds)} after the start`,
    );
    lines.push(
      `  occultation   ${o.occultation.occurs ? `depth ${sig(o.occultation.depth * 1e6, 4)} ppm` : "none (the discs do not overlap)"} at conjunction, ${duration(o.occultation.timeSeconds)} after the start`,
    );
    lines.push(
      "  (conjunction times, not mid-times of closest approach; blackbody star without limb darkening; thermal emission only, no reflected light)",
    );
  } else {
    lines.push("", "No observer given: add `observer` (inclination, argumentOfPeriastron, passband) and body.radius for the phase curve.");
  }
  lines.push(
    `  solver   ${sim.mode === "periodic" ? `${sim.iterations} shooting iterations (most of any cell), ` : ""}${sim.orbitsIntegrated} orbits per cell, ${sim.work.steps} steps and ${sim.work.evaluations} evaluations over ${g.longitudes * g.latitudes} cells`,
  );
  lines.push("");
  lines.push(
    "Reading real data: a phase curve computed here comes from a simplified surface (slab cells, a solid-body wind, no atmosphere",
    "dynamics); a fit to observations is only as good as that model, so weigh its uncertainties with that in mind.",
  );
  lines.push("", CAUTION, "");
  return lines.join("\n");
}

export function mapDocument(resolved: ResolvedScenario, o: ObservedMap, withSeries: boolean) {
  const { sim } = o;
  const stats = gridStatistics(o);
  const g = sim.history.grid;
  const h = sim.history;
  return {
    calorbit: VERSION,
    scenario: resolvedScenarioRecord(resolved),
    summary: {
      periodSeconds: resolved.thermal.orbit.periodSeconds,
      cycleOrbits: sim.cycleOrbits,
      temperature: { minK: stats.minK, maxK: stats.maxK, meanK: stats.meanK, swingK: stats.maxK - stats.minK },
      radiativeTimeSeconds: sim.radiativeTimeSeconds,
      tauOverPeriod: sim.radiativeTimeSeconds / resolved.thermal.orbit.periodSeconds,
      energy: { absorbedWPerM2: sim.energy.absorbedWPerM2, emittedWPerM2: sim.energy.emittedWPerM2 },
      energyBalanceResidual: sim.energy.residual,
      map: { longitudes: g.longitudes, latitudes: g.latitudes, windRadPerSecond: resolved.thermal.map?.windRadPerSecond ?? 0 },
      phaseCurve: o.phase,
      transit: o.transit,
      occultation: o.occultation,
    },
    solver: {
      mode: sim.mode,
      iterations: sim.iterations,
      orbitsIntegrated: sim.orbitsIntegrated,
      periodicityResidual: sim.periodicityResidual,
      steps: sim.work.steps,
      rejectedSteps: sim.work.rejected,
      evaluations: sim.work.evaluations,
    },
    ...(withSeries
      ? {
          series: {
            timeSeconds: Array.from(h.timeSeconds),
            trueAnomalyRad: Array.from(h.trueAnomalyRad),
            distanceM: Array.from(h.distanceM),
            substellarLongitudeRad: Array.from(h.substellarLongitudeRad),
            ...(o.curve
              ? {
                  fluxRatio: Array.from(o.curve.fluxRatio),
                  phaseAngleRad: Array.from(o.curve.phaseAngleRad),
                  subObserverLongitudeRad: Array.from(o.curve.subObserverLongitudeRad),
                  brightnessTemperatureK: Array.from(o.curve.brightnessTemperatureK),
                  transitCoveredFraction: Array.from(o.curve.transitCoveredFraction),
                }
              : {}),
          },
        }
      : {}),
  };
}

export const MAP_CSV_COLUMNS = [
  "time_s",
  "orbit_phase",
  "true_anomaly_deg",
  "distance_au",
  "substellar_longitude_deg",
  "sub_observer_longitude_deg",
  "phase_angle_deg",
  "flux_ratio",
  "brightness_temperature_K",
  "transit_covered_fraction",
] as const;

/** The phase curve and its geometry through the reported span. */
export function mapSeriesCsv(resolved: ResolvedScenario, o: ObservedMap): string {
  const h = o.sim.history;
  const lines = [
    `# calorbit ${VERSION}`,
    `# scenario (SI units): ${JSON.stringify(resolvedScenarioRecord(resolved))}`,
    `# mode: ${o.sim.mode}; regime: map; orbit_phase = mean anomaly / 360 deg (0 at periastron); flux_ratio = planet / star in the passband (the planet partly hidden during the occultation); longitudes in the cell frame`,
    MAP_CSV_COLUMNS.join(","),
  ];
  for (let s = 0; s < h.timeSeconds.length; s++) {
    const c = o.curve;
    lines.push(
      [
        h.timeSeconds[s]!.toPrecision(10),
        ((resolved.thermal.orbit.meanAnomalyAtStartRad + (TWO_PI * h.timeSeconds[s]!) / h.orbit.periodSeconds) / TWO_PI).toPrecision(8),
        degrees(h.trueAnomalyRad[s]!).toPrecision(8),
        au(h.distanceM[s]!).toPrecision(10),
        degrees(h.substellarLongitudeRad[s]!).toPrecision(8),
        c ? degrees(c.subObserverLongitudeRad[s]!).toPrecision(8) : "",
        c ? degrees(c.phaseAngleRad[s]!).toPrecision(8) : "",
        c ? c.fluxRatio[s]!.toPrecision(8) : "",
        c ? c.brightnessTemperatureK[s]!.toPrecision(8) : "",
        c ? c.transitCoveredFraction[s]!.toPrecision(8) : "",
      ].join(","),
    );
  }
  return lines.join("\n") + "\n";
}

/** The surface map at one sample: one row per cell. */
export function mapSnapshotCsv(resolved: ResolvedScenario, o: ObservedMap, sample: number): string {
  const h = o.sim.history;
  const g = h.grid;
  const cells = g.longitudes * g.latitudes;
  const lines = [
    `# calorbit ${VERSION}`,
    `# scenario (SI units): ${JSON.stringify(resolvedScenarioRecord(resolved))}`,
    `# surface temperature map at time_s = ${h.timeSeconds[sample]!.toPrecision(10)} (${fixed(days(h.timeSeconds[sample]!), 4)} d); cell centres; longitude 0 under the star at periastron`,
    "longitude_deg,latitude_deg,area_fraction,temperature_K",
  ];
  for (let k = 0; k < cells; k++) {
    lines.push([degrees(g.longitudeRad[k]!).toFixed(4), degrees(g.latitudeRad[k]!).toFixed(4), g.areaFraction[k]!.toPrecision(8), h.temperatureK[sample * cells + k]!.toPrecision(8)].join(","));
  }
  return lines.join("\n") + "\n";
}


function escapeXml(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/** The phase curve in ppm against orbital phase, transit and occultation marked, beside the surface map at one moment. */
export function mapSvg(resolved: ResolvedScenario, o: ObservedMap, sample: number): string {
  const width = 1000;
  const height = 460;
  const h = o.sim.history;
  const g = h.grid;
  const cells = g.longitudes * g.latitudes;
  const period = h.orbit.periodSeconds;
  const parts: string[] = [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="DejaVu Sans, Arial, sans-serif" font-size="13">`,
    `<title>${escapeXml(resolved.thermal.name)}</title>`,
    `<rect x="0" y="0" width="${width}" height="${height}" fill="#ffffff"/>`,
    `<text x="70" y="28" font-size="16" font-weight="bold">${escapeXml(resolved.thermal.name)} (calorbit ${VERSION})</text>`,
  ];
  // Left: the phase curve.
  const box = { left: 70, right: 560, top: 50, bottom: 400 };
  const x0 = h.timeSeconds[0]!;
  const x1 = h.timeSeconds[h.timeSeconds.length - 1]!;
  const px = (t: number) => box.left + ((t - x0) / (x1 - x0 || 1)) * (box.right - box.left);
  if (o.curve) {
    const ppm = Array.from(o.curve.fluxRatio, (f) => f * 1e6);
    const lo = 0;
    const hi = Math.max(...ppm) * 1.08 || 1;
    const py = (v: number) => box.bottom - ((v - lo) / (hi - lo)) * (box.bottom - box.top);
    parts.push(`<rect x="${box.left}" y="${box.top}" width="${box.right - box.left}" height="${box.bottom - box.top}" fill="none" stroke="#888"/>`);
    for (const v of niceTicks(lo, hi, 5)) {
      parts.push(`<line x1="${box.left - 4}" x2="${box.left}" y1="${py(v).toFixed(1)}" y2="${py(v).toFixed(1)}" stroke="#444"/>`);
      parts.push(`<text x="${box.left - 8}" y="${(py(v) + 4).toFixed(1)}" text-anchor="end">${sig(v, 4)}</text>`);
    }
    for (const v of niceTicks(x0 / period, x1 / period, 6)) {
      const x = px(v * period);
      parts.push(`<line x1="${x.toFixed(1)}" x2="${x.toFixed(1)}" y1="${box.bottom}" y2="${box.bottom + 4}" stroke="#444"/>`);
      parts.push(`<text x="${x.toFixed(1)}" y="${box.bottom + 18}" text-anchor="middle">${sig(v, 3)}</text>`);
    }
    parts.push(`<text x="${(box.left + box.right) / 2}" y="${box.bottom + 40}" text-anchor="middle">time (orbits since the start)</text>`);
    parts.push(`<text transform="translate(20 ${(box.top + box.bottom) / 2}) rotate(-90)" text-anchor="middle">planet / star flux (ppm)</text>`);
    const marks: [string, number][] = [];
    if (o.transit?.occurs) marks.push(["transit", o.transit.timeSeconds]);
    if (o.occultation?.occurs) marks.push(["occultation", o.occultation.timeSeconds]);
    for (const [label, t0] of marks) {
      for (let t = t0; t <= x1; t += period) {
        if (t < x0) continue;
        const x = px(t);
        parts.push(`<line class="${label}" x1="${x.toFixed(1)}" x2="${x.toFixed(1)}" y1="${box.top}" y2="${box.bottom}" stroke="${CHART_COLOURS.marker}" stroke-dasharray="4 3"/>`);
        parts.push(`<text x="${(x + 3).toFixed(1)}" y="${box.top + 14}" fill="${CHART_COLOURS.marker}">${label}</text>`);
      }
    }
    const d = ppm.map((v, i) => `${i === 0 ? "M" : "L"}${px(h.timeSeconds[i]!).toFixed(2)},${py(v).toFixed(2)}`).join("");
    parts.push(`<path class="flux" d="${d}" fill="none" stroke="${CHART_COLOURS.temperature}" stroke-width="1.8"/>`);
    const at = px(h.timeSeconds[sample]!);
    parts.push(`<line x1="${at.toFixed(1)}" x2="${at.toFixed(1)}" y1="${box.top}" y2="${box.bottom}" stroke="${CHART_COLOURS.grey}" stroke-width="0.8"/>`);
  } else {
    parts.push(`<text x="${box.left}" y="${box.top + 20}">No observer in the scenario: no phase curve.</text>`);
  }
  // Right: the surface map at the chosen sample, longitude across, latitude up.
  const mapBox = { left: 620, right: 960, top: 70, bottom: 70 + 170 };
  const cw = (mapBox.right - mapBox.left) / g.longitudes;
  const ch = (mapBox.bottom - mapBox.top) / g.latitudes;
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k < cells; k++) {
    const t = h.temperatureK[sample * cells + k]!;
    lo = Math.min(lo, t);
    hi = Math.max(hi, t);
  }
  parts.push(`<text x="${mapBox.left}" y="${mapBox.top - 12}">surface at ${fixed(days(h.timeSeconds[sample]!), 3)} d (longitude −180° to 180°)</text>`);
  for (let j = 0; j < g.latitudes; j++) {
    for (let i = 0; i < g.longitudes; i++) {
      const k = j * g.longitudes + i;
      const t = h.temperatureK[sample * cells + k]!;
      const y = mapBox.bottom - (j + 1) * ch;
      parts.push(`<rect x="${(mapBox.left + i * cw).toFixed(2)}" y="${y.toFixed(2)}" width="${(cw + 0.3).toFixed(2)}" height="${(ch + 0.3).toFixed(2)}" fill="${rampColour((t - lo) / (hi - lo || 1))}"/>`);
    }
  }
  for (let b = 0; b <= 20; b++) {
    parts.push(`<rect x="${(mapBox.left + (b * (mapBox.right - mapBox.left)) / 21).toFixed(2)}" y="${mapBox.bottom + 24}" width="${((mapBox.right - mapBox.left) / 21 + 0.5).toFixed(2)}" height="12" fill="${rampColour(b / 20)}"/>`);
  }
  parts.push(`<text x="${mapBox.left}" y="${mapBox.bottom + 54}">${fixed(lo, 0)} K</text>`);
  parts.push(`<text x="${mapBox.right}" y="${mapBox.bottom + 54}" text-anchor="end">${fixed(hi, 0)} K</text>`);
  parts.push(`<text x="${(mapBox.left + mapBox.right) / 2}" y="${mapBox.bottom + 54}" text-anchor="middle">temperature</text>`);
  parts.push(`</svg>`);
  return parts.join("\n") + "\n";
}

/** What the viewer needs to redraw the phase curve live for another observer or passband: the map's whole history. */
export function mapViewDocument(resolved: ResolvedScenario, o: ObservedMap) {
  const h = o.sim.history;
  return {
    kind: "map" as const,
    ...mapDocument(resolved, o, false),
    history: {
      longitudes: h.grid.longitudes,
      latitudes: h.grid.latitudes,
      orbit: h.orbit,
      frame: h.frame,
      timeSeconds: Array.from(h.timeSeconds),
      meanAnomalyRad: Array.from(h.meanAnomalyRad),
      trueAnomalyRad: Array.from(h.trueAnomalyRad),
      distanceM: Array.from(h.distanceM),
      substellarLongitudeRad: Array.from(h.substellarLongitudeRad),
      // four significant figures are plenty for a picture and a live curve; they keep the page's download small
      temperatureK: Array.from(h.temperatureK, (t) => Number(t.toPrecision(5))),
    },
    telescope: o.telescope
      ? {
          observer: o.telescope.observer,
          passband: o.telescope.band.band,
          planetRadiusM: o.telescope.planetRadiusM,
          starRadiusM: o.telescope.starRadiusM,
          starTemperatureK: o.telescope.starTemperatureK,
        }
      : null,
  };
}

export type MapViewDocument = ReturnType<typeof mapViewDocument>;
