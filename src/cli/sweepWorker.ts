// A sweep worker thread: rebuilds the case list from the definition, runs a warm-up sample, then the chunks it is sent.
import { parentPort, workerData } from "node:worker_threads";
import { caseMaker } from "../sweep/design.js";
import { caseRunner, runChunk, type SweepDefinition } from "../sweep/runCase.js";

const { definition, warmUpIds } = workerData as { definition: SweepDefinition; warmUpIds: number[] };
const makeCase = caseMaker(definition.design);
const run = caseRunner(definition);
// A sample across the sweep first, rows discarded: the compiler sees every kind of case early (see WARM_UP_CASES).
for (const id of warmUpIds) run(makeCase(id));

parentPort!.on("message", (message: { chunk: number; ids: number[] }) => {
  parentPort!.postMessage(runChunk(definition, makeCase, message.chunk, message.ids, run));
});
