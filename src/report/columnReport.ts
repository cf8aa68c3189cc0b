/** Reports of a conduction-column run: readable text, the JSON document, and the CSV series. */
import type { ResolvedScenario } from "../scenario/resolve.js";
import type { ColumnSimulation } from "../run/simulateColumn.js";
import { VERSION } from "../version.js";
import { resolvedScenarioRecord } from "./document.js";
import { au, duration, fixed, sig } from "./format.js";
import { CAUTION, describeScenario } from "./text.js";

export function columnText(resolved: ResolvedScenario, sim: ColumnSimulation): string {
  const s = sim.summary;
  const lines = [`calorbit ${VERSION} — ${resolved.thermal.name}`, ...describeScenario(resolved)];
  lines.push(
    "",
    "Periodic steady state of the column (surface)",
    `  ${"".padEnd(13)}${"min".padStart(12)}${"max".padStart(12)}${"mean".padStart(12)}${"swing".padStart(11)}`,
  );
  const row = (label: string, t: { minK: number; maxK: number; meanK: number; swingK: number }) =>
    `  ${label.padEnd(13)}${fixed(t.minK, 2).padStart(10)} K${fixed(t.maxK, 2).padStart(10)} K${fixed(t.meanK, 2).padStart(10)} K${fixed(t.swingK, 2).padStart(9)} K`;
  lines.push(row("surface", s.temperature), row("equilibrium", s.equilibrium));
  lines.push(`  column      ${sim.solver.layers} layers; thermal inertia at the surface ${sig(s.thermalInertiaSurface)} J m⁻² K⁻¹ s⁻½`);
  if (s.solarDaySeconds !== undefined) lines.push(`  solar day   ${s.solarDaySeconds === null ? "none (synchronous)" : duration(s.solarDaySeconds)}`);
  lines.push(
    `  skin depth  ${s.skinDepths.diurnalM !== null ? `diurnal ${sig(s.skinDepths.diurnalM)} m, ` : ""}orbital ${sig(s.skinDepths.orbitalM)} m`,
    s.lagSeconds === null ? "  lag of maximum after periastron   none (circular orbit)" : `  lag of maximum after periastron   ${duration(s.lagSeconds)}`,
  );
  if (s.timeInRange) lines.push(`  time in ${fixed(s.timeInRange.lowK, 2)}–${fixed(s.timeInRange.highK, 2)} K   ${fixed(100 * s.timeInRange.fraction, 2)} % of the cycle`);
  lines.push(
    `  energy   absorbed ${fixed(s.meanAbsorbedWPerM2, 3)} W m⁻² (with interior flux), emitted ${fixed(s.meanEmittedWPerM2, 3)} W m⁻², residual ${s.energyBalanceResidual.toExponential(1)}`,
    `  solver   Crank–Nicolson, ${sim.solver.stepsPerCycle} steps per cycle, ${sim.solver.cycles} cycles to periodic (residual ${sim.solver.periodicityResidual.toExponential(1)} ≤ tolerance ${sim.solver.requestedTolerance})`,
    "",
    "Depth profile",
    "     depth         min         max        mean",
  );
  const rows = s.depthProfile;
  const stride = Math.max(1, Math.ceil(rows.length / 16));
  rows.forEach((r, i) => {
    if (i % stride === 0 || i === rows.length - 1) {
      lines.push(`  ${sig(r.depthM, 3).padStart(8)} m ${fixed(r.minK, 2).padStart(9)} K ${fixed(r.maxK, 2).padStart(9)} K ${fixed(r.meanK, 2).padStart(9)} K`);
    }
  });
  lines.push("", CAUTION);
  return lines.join("\n") + "\n";
}

export function columnDocument(resolved: ResolvedScenario, sim: ColumnSimulation, withSeries: boolean) {
  const doc: Record<string, unknown> = {
    calorbit: { version: VERSION },
    scenario: resolvedScenarioRecord(resolved),
    column: resolved.thermal.column,
    summary: sim.summary,
    solver: sim.solver,
  };
  if (withSeries) {
    doc.series = {
      timeSeconds: Array.from(sim.series.timeSeconds),
      absorbedWPerM2: Array.from(sim.series.absorbedWPerM2),
      temperatureK: Array.from(sim.series.temperatureK),
      equilibriumK: Array.from(sim.series.equilibriumK),
      depths: sim.series.depths.map((d) => ({ depthM: d.depthM, temperatureK: Array.from(d.temperatureK) })),
    };
  }
  return doc;
}

export function columnCsv(resolved: ResolvedScenario, sim: ColumnSimulation): string {
  const s = sim.series;
  const lines = [
    `# calorbit ${VERSION}`,
    `# scenario (SI units): ${JSON.stringify(resolvedScenarioRecord(resolved))}`,
    `# conduction column: ${sim.solver.layers} layers; depth columns interpolated between layer centres`,
    ["time_s", "distance_au", "absorbed_flux_W_m2", "surface_temperature_K", "equilibrium_K", ...s.depths.map((d) => `temperature_at_${d.depthM}m_K`)].join(","),
  ];
  for (let j = 0; j < s.timeSeconds.length; j++) {
    lines.push(
      [
        s.timeSeconds[j]!.toPrecision(10),
        au(s.distanceM[j]!).toPrecision(10),
        s.absorbedWPerM2[j]!.toPrecision(8),
        s.temperatureK[j]!.toPrecision(10),
        s.equilibriumK[j]!.toPrecision(10),
        ...s.depths.map((d) => d.temperatureK[j]!.toPrecision(10)),
      ].join(","),
    );
  }
  return lines.join("\n") + "\n";
}
