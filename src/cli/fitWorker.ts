// A fit posterior worker thread: rebuilds the forward model once, then evaluates ln p for the batches it is sent.
import { parentPort, workerData } from "node:worker_threads";
import { ForwardModel, type ForwardSettings } from "../fit/forward.js";
import type { Observations } from "../fit/observations.js";
import { logPosterior } from "../fit/posterior.js";

const data = workerData as { settings: ForwardSettings; observations: Observations; sigma: Float64Array };
const forward = new ForwardModel(data.settings, data.observations);
const lnP = logPosterior(forward, data.settings.parameters, data.sigma);

parentPort!.on("message", (message: { id: number; points: Float64Array[] }) => {
  parentPort!.postMessage({ id: message.id, values: message.points.map((x) => lnP(x)) });
});
