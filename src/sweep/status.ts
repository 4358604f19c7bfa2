/**
 * Which chunks of a planned sweep are done, running, pending, failed or missing: from the
 * chunk files and their markers, plus Slurm's queue where it is there (squeue; accounting
 * through sacct is often not set up, so a task that left the queue without a result counts
 * as failed). Node only.
 */
import { existsSync, readFileSync } from "node:fs";
import { hostname } from "node:os";
import { readChunk } from "./merge";
import type { StartedMarker } from "./run-chunk";
import type { SweepDir } from "./sweep-dir";

export const CHUNK_STATES = ["done", "running", "pending", "failed", "missing"] as const;
export type ChunkState = (typeof CHUNK_STATES)[number];

export interface ChunkStatus {
  readonly chunk: number;
  readonly state: ChunkState;
  /** Why (failed), where (running), which job (pending). */
  readonly detail?: string;
}

/** Array tasks of this sweep's jobs in Slurm's queue, by chunk: their job id ("123_4") and state ("PENDING", "RUNNING", …). */
export type QueuedTasks = ReadonlyMap<number, { readonly job: string; readonly state: string }>;

export interface SweepStatus {
  readonly chunks: readonly ChunkStatus[];
  readonly counts: Readonly<Record<ChunkState, number>>;
}

/** The state of every chunk; `queue` absent: no Slurm here (started runs are judged by their process). */
export function sweepStatus(dir: SweepDir, queue?: QueuedTasks): SweepStatus {
  const chunks: ChunkStatus[] = [];
  for (let chunk = 0; chunk < dir.sweep.chunks; chunk++) chunks.push(chunkStatus(dir, chunk, queue));
  const counts = Object.fromEntries(CHUNK_STATES.map((s) => [s, chunks.filter((c) => c.state === s).length])) as Record<ChunkState, number>;
  return { chunks, counts };
}

/** Chunks a new submission should run: the missing and the failed ones. */
export function chunksToRun(status: SweepStatus): number[] {
  return status.chunks.filter((c) => c.state === "missing" || c.state === "failed").map((c) => c.chunk);
}

function chunkStatus(dir: SweepDir, chunk: number, queue: QueuedTasks | undefined): ChunkStatus {
  if (existsSync(dir.chunkPath(chunk))) {
    const read = readChunk(dir, chunk);
    return read instanceof Error ? { chunk, state: "failed", detail: read.message } : { chunk, state: "done" };
  }
  const queued = queue?.get(chunk);
  if (queued) {
    return queued.state === "PENDING" ? { chunk, state: "pending", detail: `job ${queued.job}` } : { chunk, state: "running", detail: `job ${queued.job} ${queued.state.toLowerCase()}` };
  }
  const failed = readMarker<{ reason?: string }>(dir.failedPath(chunk));
  if (failed) return { chunk, state: "failed", detail: failed.reason ?? "failed" };
  const started = readMarker<StartedMarker>(dir.startedPath(chunk));
  if (started) {
    if (started.job && queue) return { chunk, state: "failed", detail: `job ${started.job} left the queue without a result (cancelled, out of time or memory, or its node failed)` };
    if (started.host === hostname() && !processAlive(started.pid)) return { chunk, state: "failed", detail: `process ${started.pid} stopped without a result` };
    return { chunk, state: "running", detail: `${started.job ? `job ${started.job}, ` : ""}process ${started.pid} on ${started.host} since ${started.at}` };
  }
  return { chunk, state: "missing" };
}

function readMarker<T>(file: string): T | undefined {
  try {
    return JSON.parse(readFileSync(file, "utf8")) as T;
  } catch {
    return undefined;
  }
}

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === "EPERM";
  }
}
