import { parentPort, workerData } from "node:worker_threads";
import { logGrid } from "../engine/grid";
import { evaluateRow } from "./evaluate";
import type { TolerancePlan } from "./spec";
import type { ToWorker, FromWorker } from "./parallel";

/**
 * Entry point of a tolerance-map worker thread (run as the compiled dist/src/tolerance/worker.js).
 * It receives the plan once, then chunks of rows; it answers each finished row, then "idle"
 * to ask for more. Internal errors are reported, not thrown, so the main thread can stop the rest.
 */
const port = parentPort;
if (!port) throw new Error("the tolerance-map worker must run in a worker thread");
const plan = (workerData as { plan: TolerancePlan }).plan;
const frequencies = logGrid(plan.grid);

port.on("message", (message: ToWorker) => {
  for (const y of message.rows) {
    let reply: FromWorker;
    try {
      reply = { type: "row", y, row: evaluateRow(plan, frequencies, y) };
    } catch (e) {
      const error = e instanceof Error ? e : new Error(String(e));
      port.postMessage({ type: "failed", y, message: error.message, stack: error.stack ?? "" } satisfies FromWorker);
      return;
    }
    port.postMessage(reply, [reply.row.values.buffer, reply.row.status.buffer] as ArrayBuffer[]);
  }
  port.postMessage({ type: "idle" } satisfies FromWorker);
});
