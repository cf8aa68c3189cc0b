/**
 * A passband's response table as text: CSV with '#' comment lines, a header whose first column
 * names the wavelength unit as its suffix (`wavelength_um`, `wavelength_nm`, `wavelength_m`), and
 * a second column with the response (any scale: only its shape matters for a flux ratio).
 */
import { CalorbitError } from "../errors.js";
import type { Passband } from "../physics/planck.js";
import { parseQuantity } from "./units.js";

export function parsePassbandTable(text: string, source: string): Extract<Passband, { kind: "table" }> {
  const fail = (line: number, given: string, allowed: string): never => {
    throw new CalorbitError("SCENARIO_INVALID", `${source}: not a passband table`, [{ path: `${source}:${line}`, given: given.slice(0, 80), allowed }]);
  };
  const rows = text.replace(/^\uFEFF/, "").split(/\r?\n/);
  let header: string[] | null = null;
  let unitToMetres = 1;
  const wavelengthM: number[] = [];
  const response: number[] = [];
  rows.forEach((raw, index) => {
    const line = raw.trim();
    if (line === "" || line.startsWith("#")) return;
    const cells = line.split(",").map((c) => c.trim());
    if (!header) {
      header = cells;
      const match = /^wavelength_(.+)$/.exec(cells[0] ?? "");
      if (!match || cells.length < 2) fail(index + 1, line, "a header such as wavelength_um,response");
      const unit = parseQuantity("length", `1 ${match![1]}`);
      if (!unit.ok) fail(index + 1, cells[0]!, `wavelength_<unit> with a length unit (um, nm, m)`);
      unitToMetres = (unit as { valueSI: number }).valueSI;
      return;
    }
    const l = Number(cells[0]);
    const r = Number(cells[1]);
    if (cells.length < 2 || !(l > 0) || !Number.isFinite(l)) fail(index + 1, line, "a positive wavelength and a response");
    if (!(r >= 0) || !Number.isFinite(r)) fail(index + 1, line, "a response ≥ 0");
    if (wavelengthM.length > 0 && !(l * unitToMetres > wavelengthM[wavelengthM.length - 1]!)) fail(index + 1, line, "wavelengths in increasing order");
    wavelengthM.push(l * unitToMetres);
    response.push(r);
  });
  if (wavelengthM.length < 2) fail(rows.length, `${wavelengthM.length} rows`, "at least two rows of (wavelength, response)");
  if (!response.some((r) => r > 0)) fail(rows.length, "a response of 0 everywhere", "a response > 0 somewhere");
  return { kind: "table", wavelengthM, response };
}
