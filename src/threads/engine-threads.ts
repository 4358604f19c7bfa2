/**
 * What the engine's worker threads share (Node only): where the compiled worker script is,
 * and how work is cut into chunks that shrink as a job nears its end, with each worker kept
 * a few chunks ahead so that none waits for a message between chunks. Tolerance maps hand out
 * rows this way, Monte Carlo spreads hand out samples.
 */
import { existsSync } from "node:fs";
import { join } from "node:path";

/**
 * The compiled worker script (one script serves tolerance rows and spread samples). Built code
 * finds it beside the tolerance module; code run from the TypeScript sources (the test runner)
 * uses the built one, so `npm run build` must have run.
 */
export function workerScript(): string {
  const fromSources = __filename.endsWith(".ts");
  const file = fromSources ? join(__dirname, "..", "..", "dist", "src", "tolerance", "worker.js") : join(__dirname, "..", "tolerance", "worker.js");
  if (!existsSync(file)) {
    throw new Error(`the engine's worker script dist/src/tolerance/worker.js is missing: run "npm run build" first`);
  }
  return file;
}

/** How many chunks each worker is kept ahead by. */
export const CHUNKS_AHEAD = 2;

/** Size of the next chunk: a share of what is left (large chunks first, single items at the end), at least `smallest`. */
export function nextChunkSize(left: number, workers: number, smallest = 1): number {
  return Math.min(left, Math.max(smallest, Math.ceil(left / (workers * 4))));
}
