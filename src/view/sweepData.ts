/**
 * A sweep file (CSV or JSON Lines, as `calorbit sweep` writes it) reduced to columns for the
 * viewer: the varied inputs, the numeric metrics, and which rows succeeded. Pure: no DOM, no files.
 */
export interface SweepTable {
  inputs: string[];
  metrics: string[];
  /** Column values by name; non-numeric cells are NaN. */
  columns: Record<string, number[]>;
  ok: boolean[];
  rows: number;
}

const NON_METRICS = new Set(["case_id", "status", "integrator"]);

function splitCsvLine(line: string): string[] {
  const out: string[] = [];
  let field = "";
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i]!;
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        field += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ",") {
      out.push(field);
      field = "";
    } else field += ch;
  }
  out.push(field);
  return out;
}

export function parseSweepText(text: string): SweepTable {
  const lines = text.split("\n").filter((l) => l !== "" && !l.startsWith("#"));
  let header: string[];
  let records: Record<string, unknown>[];
  if (lines[0]?.startsWith("{")) {
    // The first object of a JSON Lines sweep holds its definition under a marker key, not a case.
    records = lines.map((l) => JSON.parse(l) as Record<string, unknown>).filter((r) => !("calorbitSweep" in r));
    header = Object.keys(records.find((r) => r.status === "ok") ?? records[0] ?? {});
  } else {
    header = splitCsvLine(lines[0] ?? "");
    records = lines.slice(1).map((l) => {
      const cells = splitCsvLine(l);
      return Object.fromEntries(header.map((h, i) => [h, cells[i] ?? ""]));
    });
  }
  return sweepTableFromRecords(header, records);
}

/** A sweep's rows (any format, read by the caller) as the viewer's table; a Parquet reader gives bigint ids. */
export function sweepTableFromRecords(header: string[], records: Record<string, unknown>[]): SweepTable {
  const statusAt = header.indexOf("status");
  const inputs = header.slice(1, statusAt < 0 ? 1 : statusAt);
  const metrics = header.slice(statusAt + 1).filter((h) => !NON_METRICS.has(h));
  const columns: Record<string, number[]> = {};
  for (const name of [...inputs, ...metrics]) {
    columns[name] = records.map((r) => {
      const v = r[name];
      const x = typeof v === "number" ? v : typeof v === "bigint" ? Number(v) : v === "" || v === null || v === undefined ? NaN : Number(v);
      return Number.isFinite(x) ? x : NaN;
    });
  }
  return { inputs, metrics, columns, ok: records.map((r) => r.status === "ok"), rows: records.length };
}

/** Distinct sorted values of a column (the grid levels of an input). */
export function levels(values: number[]): number[] {
  return [...new Set(values.filter(Number.isFinite))].sort((a, b) => a - b);
}
