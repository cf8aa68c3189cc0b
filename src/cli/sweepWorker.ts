// A sweep worker thread: rebuilds the case list from the definition and runs the chunks it is sent.
import { parentPort, workerData } from "node:worker_threads";
import { caseMaker } from "../sweep/design.js";
import { runCase, type SweepDefinition } from "../sweep/runCase.js";

const definition = (workerData as { definition: SweepDefinition }).definition;
const makeCase = caseMaker(definition.design);

parentPort!.on("message", (message: { chunk: number; ids: number[] }) => {
  const lines = message.ids.map((id) => runCase(definition, makeCase(id)));
  parentPort!.postMessage({ chunk: message.chunk, text: lines.join("\n") + "\n", count: lines.length });
});
