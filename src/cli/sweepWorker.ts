// A sweep worker thread: rebuilds the case list from the definition and runs the chunks it is sent.
import { parentPort, workerData } from "node:worker_threads";
import { caseMaker } from "../sweep/design.js";
import { caseRunner, runChunk, type SweepDefinition } from "../sweep/runCase.js";

const definition = (workerData as { definition: SweepDefinition }).definition;
const makeCase = caseMaker(definition.design);
const run = caseRunner(definition);

parentPort!.on("message", (message: { chunk: number; ids: number[] }) => {
  parentPort!.postMessage(runChunk(definition, makeCase, message.chunk, message.ids, run));
});
