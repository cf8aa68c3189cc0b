// A sweep worker thread: rebuilds the case list from the definition and runs the chunks it is sent.
import { parentPort, workerData } from "node:worker_threads";
import { caseMaker } from "../sweep/design.js";
import { caseCells, formatRow, statusIndex, type Cell, type SweepDefinition } from "../sweep/runCase.js";
import type { ChunkResult } from "./sweep.js";

const definition = (workerData as { definition: SweepDefinition }).definition;
const makeCase = caseMaker(definition.design);
const statusAt = statusIndex(definition);

parentPort!.on("message", (message: { chunk: number; ids: number[] }) => {
  const rows: Cell[][] = message.ids.map((id) => caseCells(definition, makeCase(id)));
  let failed = 0;
  let firstFailure: string | null = null;
  for (const row of rows) {
    if (row[statusAt] !== "ok") {
      failed++;
      firstFailure ??= String(row[statusAt]);
    }
  }
  const result: ChunkResult =
    definition.format === "parquet"
      ? { chunk: message.chunk, count: rows.length, failed, firstFailure, rows }
      : { chunk: message.chunk, count: rows.length, failed, firstFailure, text: rows.map((r) => formatRow(definition, r)).join("\n") + "\n" };
  parentPort!.postMessage(result);
});
