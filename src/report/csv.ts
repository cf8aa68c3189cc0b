/**
 * The series as CSV: '#' comment lines record the calorbit version and the resolved scenario
 * (SI, as JSON), then one header row whose names carry their units.
 */
import type { ResolvedScenario } from "../scenario/resolve.js";
import type { Simulation } from "../run/simulate.js";
import { VERSION } from "../version.js";
import { resolvedScenarioRecord } from "./document.js";
import { au, degrees } from "./format.js";

export const CSV_COLUMNS = [
  "time_s",
  "orbit_phase",
  "true_anomaly_deg",
  "distance_au",
  "stellar_flux_W_m2",
  "absorbed_flux_W_m2",
  "temperature_K",
  "equilibrium_K",
] as const;

export function seriesCsv(resolved: ResolvedScenario, sim: Simulation): string {
  const s = sim.series;
  const extra = s.states.slice(1);
  const depths = s.depths ?? [];
  const stateNote = s.states.length > 1 ? `; temperature_K, equilibrium_K and absorbed_flux_W_m2 are the ${s.states[0]!.name} side` : "";
  const lines: string[] = [
    `# calorbit ${VERSION}`,
    `# scenario (SI units): ${JSON.stringify(resolvedScenarioRecord(resolved))}`,
    `# mode: ${sim.solver.mode}; regime: ${resolved.thermal.regime}; orbit_phase = mean anomaly / 360 deg (0 at periastron)${stateNote}${depths.length > 0 ? `; conduction column of ${sim.solver.layers} layers: temperature_K is the surface, depth columns interpolated between layer centres` : ""}`,
    [
      ...CSV_COLUMNS,
      ...extra.flatMap((st) => [`temperature_${st.name}_K`, `equilibrium_${st.name}_K`, `absorbed_flux_${st.name}_W_m2`]),
      ...depths.map((d) => `temperature_at_${d.depthM}m_K`),
    ].join(","),
  ];
  const TWO_PI = 2 * Math.PI;
  for (let j = 0; j < s.timeSeconds.length; j++) {
    const m = s.meanAnomalyRad[j]!;
    lines.push(
      [
        s.timeSeconds[j]!.toPrecision(10),
        (m / TWO_PI).toPrecision(8),
        degrees(s.trueAnomalyRad[j]!).toPrecision(8),
        au(s.distanceM[j]!).toPrecision(10),
        s.stellarFluxWPerM2[j]!.toPrecision(8),
        s.absorbedWPerM2[j]!.toPrecision(8),
        s.temperatureK[j]!.toPrecision(10),
        s.equilibriumK[j]!.toPrecision(10),
        ...extra.flatMap((st) => [st.temperatureK[j]!.toPrecision(10), st.equilibriumK[j]!.toPrecision(10), st.absorbedWPerM2[j]!.toPrecision(8)]),
        ...depths.map((d) => d.temperatureK[j]!.toPrecision(10)),
      ].join(","),
    );
  }
  return lines.join("\n") + "\n";
}
