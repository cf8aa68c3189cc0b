/**
 * calorbit's browser viewer: loads the result the local server holds and opens the view for its
 * kind (a lumped case computed live in the page, a conduction column, or a sweep).
 */
import type { ResultDocument } from "../src/report/document.js";
import type { SweepTable } from "../src/view/sweepData.js";
import { startColumn, type ColumnDoc } from "./column.js";
import { $ } from "./dom.js";
import { startLumped } from "./lumped.js";
import { startMap } from "./map.js";
import { startZonal } from "./zonal.js";
import type { ZonalViewDocument } from "../src/report/zonalReport.js";
import type { MapViewDocument } from "../src/report/mapReport.js";
import { startSweep } from "./sweep.js";
import { startFit } from "./fit.js";
import type { FitViewDocument } from "../src/fit/view.js";

async function start(): Promise<void> {
  const response = await fetch("result.json");
  const raw = (await response.json()) as { kind?: string };
  if (raw.kind === "sweep") return startSweep((raw as { file: string }).file, (raw as unknown as { table: SweepTable }).table);
  if (raw.kind === "column") return startColumn(raw as unknown as ColumnDoc);
  if (raw.kind === "map") return startMap(raw as unknown as MapViewDocument);
  if (raw.kind === "zonal") return startZonal(raw as unknown as ZonalViewDocument);
  if (raw.kind === "fit") return startFit(raw as unknown as FitViewDocument);
  startLumped(raw as ResultDocument);
}

start().catch((err: unknown) => {
  $("status").textContent = `could not load the result: ${(err as Error).message}`;
});
