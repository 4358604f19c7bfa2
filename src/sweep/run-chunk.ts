/**
 * Computes one chunk of a planned sweep and writes its result atomically: the rows of a map
 * with the code every tolerance-map worker runs (evaluateRow), the samples of a Monte Carlo
 * with the code every spread worker runs (evaluateSamples), the optimizer starts with the code
 * optimizeDesign runs for each (runStart), so a chunk has the bits the same items get locally. While it runs, a `.started` marker says where (host,
 * process, Slurm task); a failure leaves a `.failed` marker with the reason; the result file
 * appears only whole. Node only.
 */
import { rmSync } from "node:fs";
import { hostname } from "node:os";
import { evaluateSamples, type SampleOutcomes } from "../design/spread";
import { runStart, type StartOutcome } from "../design/optimize";
import { logGrid } from "../setup/grid";
import { evaluateRow, type RowResult } from "../tolerance/evaluate";
import { yieldToEventLoop } from "../tolerance/run";
import { atomicWrite } from "./atomic-write";
import { chunkFileText, type ChunkResult } from "./chunk-file";
import type { ChunkRange } from "./chunks";
import type { GridWork, SampleWork, StartWork } from "./resolve";
import type { SweepDir } from "./sweep-dir";

/** What the `.started` marker holds. */
export interface StartedMarker {
  readonly host: string;
  readonly pid: number;
  /** "<array job>_<task>" under Slurm, else null. */
  readonly job: string | null;
  readonly at: string;
}

/** Samples evaluated between two looks at the event loop (so a stop signal is heard). */
const SAMPLE_BLOCK = 16;

/** Runs chunk `chunk` of the sweep in `dir`; resolves once its result file is written. */
export async function runChunk(dir: SweepDir, chunk: number, env: NodeJS.ProcessEnv = process.env): Promise<ChunkRange> {
  const range = dir.range(chunk);
  rmSync(dir.failedPath(chunk), { force: true });
  const job = env.SLURM_ARRAY_JOB_ID && env.SLURM_ARRAY_TASK_ID ? `${env.SLURM_ARRAY_JOB_ID}_${env.SLURM_ARRAY_TASK_ID}` : null;
  const marker: StartedMarker = { host: hostname(), pid: process.pid, job, at: new Date().toISOString() };
  atomicWrite(dir.startedPath(chunk), `${JSON.stringify(marker)}\n`);
  try {
    const work = dir.sweep.work;
    const result: ChunkResult =
      work.kind === "grid"
        ? { kind: "grid", rows: await gridRows(work, range) }
        : work.kind === "samples"
          ? { kind: "samples", part: await samples(work, range) }
          : { kind: "starts", outcomes: await starts(work, range) };
    atomicWrite(dir.chunkPath(chunk), chunkFileText(dir.sweep.fingerprint, range, result));
  } catch (e) {
    markFailed(dir, chunk, e instanceof Error ? e.message : String(e));
    throw e;
  }
  rmSync(dir.startedPath(chunk), { force: true });
  return range;
}

/** Leaves a `.failed` marker with the reason (a stop signal, an error) in place of the `.started` one. */
export function markFailed(dir: SweepDir, chunk: number, reason: string): void {
  try {
    atomicWrite(dir.failedPath(chunk), `${JSON.stringify({ reason, host: hostname(), pid: process.pid, at: new Date().toISOString() })}\n`);
    rmSync(dir.startedPath(chunk), { force: true });
  } catch {
    // The status still sees a started run whose process is gone, and calls it failed.
  }
}

async function gridRows(work: GridWork, range: ChunkRange): Promise<RowResult[]> {
  const frequencies = logGrid(work.plan.grid);
  const rows: RowResult[] = [];
  for (let j = range.from; j < range.to; j++) {
    rows.push(evaluateRow(work.plan, frequencies, j));
    await yieldToEventLoop();
  }
  return rows;
}

/** The chunk's samples in blocks; the blocks are joined into one part with the bits of one call over the whole range. */
async function samples(work: SampleWork, range: ChunkRange): Promise<SampleOutcomes> {
  const count = range.to - range.from;
  const nf = work.plan.frequencies?.length ?? 0;
  const values = new Float64Array(count);
  const status = new Uint8Array(count);
  const curves = new Float64Array(count * nf);
  let firstFailure: SampleOutcomes["firstFailure"];
  for (let from = range.from; from < range.to; from += SAMPLE_BLOCK) {
    const part = evaluateSamples(work.plan, from, Math.min(range.to, from + SAMPLE_BLOCK));
    values.set(part.values, from - range.from);
    status.set(part.status, from - range.from);
    curves.set(part.curves, (from - range.from) * nf);
    firstFailure ??= part.firstFailure;
    await yieldToEventLoop();
  }
  return { from: range.from, values, status, curves, ...(firstFailure ? { firstFailure } : {}) };
}

async function starts(work: StartWork, range: ChunkRange): Promise<StartOutcome[]> {
  const outcomes: StartOutcome[] = [];
  for (let s = range.from; s < range.to; s++) {
    outcomes.push(runStart(work.plan, s));
    await yieldToEventLoop();
  }
  return outcomes;
}
