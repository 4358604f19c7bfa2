import { parentPort, type MessagePort } from "node:worker_threads";
import { spreadChunkHandler, type FromSpreadWorker, type ToSpreadWorker } from "../design/spread-job";
import { logGrid } from "../setup/grid";
import { evaluateRow } from "./evaluate";
import type { TolerancePlan } from "./spec";
import type { ToWorker, FromWorker } from "./parallel";

/**
 * Entry point of the engine's worker threads (run as the compiled dist/src/tolerance/worker.js).
 * Tolerance maps: a thread receives the plan with its first chunk of each map. It answers each finished row, then "idle" after each
 * chunk. Monte Carlo spreads: the job comes with a thread's first chunk of samples of each
 * spread, and each chunk is answered with their outcomes. One thread serves maps and spreads
 * in any order. Internal errors are reported, not thrown, so the main thread can stop the rest.
 */
const port = parentPort;
if (!port) throw new Error("the engine's worker must run in a worker thread");
const mapRows = mapRowsHandler(port);
const spreadSamples = spreadSamplesHandler(port);
port.on("message", (message: ToWorker | ToSpreadWorker) => ("spread" in message ? spreadSamples(message) : mapRows(message)));
port.postMessage({ type: "ready", map: 0 } satisfies FromWorker);

function mapRowsHandler(port: MessagePort): (message: ToWorker) => void {
  let plan: TolerancePlan | undefined;
  let frequencies: Float64Array = new Float64Array(0);
  return (message) => {
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
  };
}

function spreadSamplesHandler(port: MessagePort): (chunk: ToSpreadWorker) => void {
  const evaluate = spreadChunkHandler();
  return (chunk) => {
    const { spread } = chunk;
    try {
      const part = evaluate(chunk);
      port.postMessage({ type: "samples", spread, part } satisfies FromSpreadWorker, [part.values.buffer, part.status.buffer, part.curves.buffer] as ArrayBuffer[]);
    } catch (e) {
      const error = e instanceof Error ? e : new Error(String(e));
      port.postMessage({ type: "failed", spread, message: error.message, stack: error.stack ?? "" } satisfies FromSpreadWorker);
    }
  };
}
