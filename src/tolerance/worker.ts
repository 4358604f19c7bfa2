import { parentPort, workerData } from "node:worker_threads";
import { logGrid } from "../setup/grid";
import { evaluateRow } from "./evaluate";
import type { TolerancePlan } from "./spec";
import type { ToWorker, FromWorker } from "./parallel";

/**
 * Entry point of a tolerance-map worker thread (run as the compiled dist/src/tolerance/worker.js).
 * A one-map worker receives its plan in workerData; a pooled worker receives a plan with the
 * first chunk of each map. It answers each finished row, then "idle" after each chunk. Internal
 * errors are reported, not thrown, so the main thread can stop the rest.
 */
const port = parentPort;
if (!port) throw new Error("the tolerance-map worker must run in a worker thread");
let plan = (workerData as { plan?: TolerancePlan } | undefined)?.plan;
let frequencies = plan ? logGrid(plan.grid) : new Float64Array(0);

port.on("message", (message: ToWorker) => {
  const { map } = message;
  if (message.plan) {
    plan = message.plan;
    frequencies = logGrid(plan.grid);
  }
  for (const y of message.rows) {
    let reply: FromWorker;
    try {
      if (!plan) throw new Error("internal: rows arrived before a plan");
      reply = { type: "row", map, y, row: evaluateRow(plan, frequencies, y) };
    } catch (e) {
      const error = e instanceof Error ? e : new Error(String(e));
      port.postMessage({ type: "failed", map, y, message: error.message, stack: error.stack ?? "" } satisfies FromWorker);
      return;
    }
    port.postMessage(reply, [reply.row.values.buffer, reply.row.status.buffer] as ArrayBuffer[]);
  }
  port.postMessage({ type: "idle", map } satisfies FromWorker);
});
port.postMessage({ type: "ready", map: 0 } satisfies FromWorker);
