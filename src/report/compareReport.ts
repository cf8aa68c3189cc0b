/** Reports of `calorbit compare` (table, JSON, CSV) and `calorbit insolation` (CSV map). */
import type { InsolationMap } from "../analysis/insolationMap.js";
import type { StateSummary } from "../analysis/summarise.js";
import type { Comparison } from "../run/compare.js";
import type { ResolvedScenario } from "../scenario/resolve.js";
import { VERSION } from "../version.js";
import { resolvedScenarioRecord } from "./document.js";
import { duration, fixed } from "./format.js";
import { CAUTION } from "./text.js";

type Row = Pick<StateSummary, "temperature" | "equilibrium" | "lagSeconds" | "timeInRange">;

function rowsOf(c: Comparison): Array<{ label: string; s: Row } | { label: string; error: string }> {
  const out: Array<{ label: string; s: Row } | { label: string; error: string }> = [];
  for (const row of c.rows) {
    if (!row.simulation) {
      out.push({ label: row.regime, error: row.error ?? "failed" });
      continue;
    }
    const summary = row.simulation.summary;
    if (summary.day && summary.night) {
      out.push({ label: `${row.regime} day`, s: summary.day }, { label: `${row.regime} night`, s: summary.night });
    } else {
      out.push({ label: row.regime, s: summary });
    }
  }
  return out;
}

export function compareTable(resolved: ResolvedScenario, c: Comparison): string {
  const anyWindow = c.rows.some((r) => r.simulation?.summary.timeInRange);
  const head = ["regime", "T min K", "T max K", "T mean K", "swing K", "lag", ...(anyWindow ? ["in range"] : []), "Teq min K", "Teq max K", "Teq mean K"];
  const body: string[][] = rowsOf(c).map((r) => {
    if ("error" in r) return [r.label, `cannot run: ${r.error}`];
    const s = r.s;
    return [
      r.label,
      fixed(s.temperature.minK, 2),
      fixed(s.temperature.maxK, 2),
      fixed(s.temperature.meanK, 2),
      fixed(s.temperature.swingK, 2),
      s.lagSeconds === null ? "—" : duration(s.lagSeconds),
      ...(anyWindow ? [s.timeInRange ? `${fixed(100 * s.timeInRange.fraction, 1)} %` : "—"] : []),
      fixed(s.equilibrium.minK, 2),
      fixed(s.equilibrium.maxK, 2),
      fixed(s.equilibrium.meanK, 2),
    ];
  });
  const widths = head.map((h, i) => Math.max(h.length, ...body.filter((b) => b.length === head.length).map((b) => b[i]!.length)));
  const line = (cells: string[]) =>
    cells.length === head.length ? cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join("  ") : `${cells[0]!.padEnd(widths[0]!)}  ${cells[1]}`;
  const title = `calorbit ${VERSION} — ${resolved.thermal.name}: regimes side by side (periodic steady state)`;
  return [title, "", line(head), ...body.map(line), "", CAUTION].join("\n") + "\n";
}

export function compareDocument(resolved: ResolvedScenario, c: Comparison) {
  return {
    calorbit: { version: VERSION },
    scenario: resolvedScenarioRecord(resolved),
    results: c.rows.map((row) =>
      row.simulation ? { regime: row.regime, summary: row.simulation.summary, solver: row.simulation.solver } : { regime: row.regime, error: row.error },
    ),
  };
}

export function compareCsv(resolved: ResolvedScenario, c: Comparison): string {
  const columns = c.rows.flatMap((r) => r.columns ?? []);
  const lines = [
    `# calorbit ${VERSION}`,
    `# scenario (SI units): ${JSON.stringify(resolvedScenarioRecord(resolved))}`,
    `# compare: one temperature and one equilibrium column per regime (and per hemisphere for daynight) on a shared time axis of ${c.spanOrbits} orbit(s)`,
    ["time_s", ...columns.flatMap((col) => [`temperature_${col.name}_K`, `equilibrium_${col.name}_K`])].join(","),
  ];
  for (let j = 0; j < c.timeSeconds.length; j++) {
    lines.push([c.timeSeconds[j]!.toPrecision(10), ...columns.flatMap((col) => [col.temperatureK[j]!.toPrecision(10), col.equilibriumK[j]!.toPrecision(10)])].join(","));
  }
  return lines.join("\n") + "\n";
}

export function insolationCsv(resolved: ResolvedScenario, map: InsolationMap): string {
  const lines = [
    `# calorbit ${VERSION}`,
    `# scenario (SI units): ${JSON.stringify(resolvedScenarioRecord(resolved))}`,
    "# daily-mean top-of-atmosphere insolation, W/m2 (Berger 1978); rows: latitude in deg; columns: orbit phase = time since periastron / period",
    ["latitude_deg", ...map.phases.map((p) => `phase_${p.toFixed(4)}`)].join(","),
  ];
  map.latitudesDeg.forEach((lat, i) => lines.push([lat.toFixed(3), ...map.rows[i]!.map((q) => q.toFixed(4))].join(",")));
  return lines.join("\n") + "\n";
}
