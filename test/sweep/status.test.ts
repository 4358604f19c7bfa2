/**
 * The status of a planned sweep from its chunk files and markers, without Slurm and with a
 * queue as squeue would report it: done, running, pending, failed (a failure marker, a damaged
 * result, a run whose process or job is gone) and missing; a submission runs only the missing
 * and failed chunks. Common practice, no outside source: the states follow the files.
 */
import { writeFileSync } from "node:fs";
import { hostname } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { chunksToRun, markFailed, planSweep, runChunk, sweepStatus } from "../../src/sweep";
import { gridSweep, scratch } from "./helpers";

const tmp = scratch();
afterAll(tmp.cleanup);

describe("sweepStatus", () => {
  it("reads each chunk's state from its files, and from the queue where there is one", async () => {
    const dir = planSweep(gridSweep({ chunkSize: 1 }), join(tmp.make("status"), "sweep"));
    await runChunk(dir, 0, {});
    await runChunk(dir, 1, {});
    writeFileSync(dir.chunkPath(1), "{");
    markFailed(dir, 2, "stopped by SIGTERM before its result was written");
    // A run on this host whose process is gone (a pid far above any pid_max), and one that is alive (this process).
    writeFileSync(dir.startedPath(3), JSON.stringify({ host: hostname(), pid: 2 ** 30, job: null, at: "2026-01-01T00:00:00Z" }));
    writeFileSync(dir.startedPath(4), JSON.stringify({ host: hostname(), pid: process.pid, job: null, at: "2026-01-01T00:00:00Z" }));

    const local = sweepStatus(dir);
    expect(local.chunks.map((c) => c.state)).toEqual(["done", "failed", "failed", "failed", "running"]);
    expect(local.chunks[1].detail).toContain("is truncated or not JSON");
    expect(local.chunks[2].detail).toBe("stopped by SIGTERM before its result was written");
    expect(local.chunks[3].detail).toBe(`process ${2 ** 30} stopped without a result`);
    expect(local.counts).toEqual({ done: 1, running: 1, pending: 0, failed: 3, missing: 0 });
    expect(chunksToRun(local)).toEqual([1, 2, 3]);

    // With Slurm: a started task still in the queue runs; one that left it without a result failed; a queued one is pending.
    writeFileSync(dir.startedPath(3), JSON.stringify({ host: "node17", pid: 4242, job: "81_3", at: "2026-01-01T00:00:00Z" }));
    writeFileSync(dir.startedPath(4), JSON.stringify({ host: "node18", pid: 4243, job: "81_4", at: "2026-01-01T00:00:00Z" }));
    const queue = new Map([
      [4, { job: "81_4", state: "RUNNING" }],
      [2, { job: "82_2", state: "PENDING" }],
    ]);
    const slurm = sweepStatus(dir, queue);
    expect(slurm.chunks.map((c) => c.state)).toEqual(["done", "failed", "pending", "failed", "running"]);
    expect(slurm.chunks[3].detail).toContain("job 81_3 left the queue without a result");
    expect(chunksToRun(slurm)).toEqual([1, 3]);
  });

  it("calls a chunk without any file missing", () => {
    const dir = planSweep(gridSweep(), join(tmp.make("status-empty"), "sweep"));
    expect(sweepStatus(dir).counts).toEqual({ done: 0, running: 0, pending: 0, failed: 0, missing: 3 });
  });
});
