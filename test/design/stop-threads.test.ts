/**
 * Stopping runs that use worker threads: a Monte Carlo spread on threads and a sweep run on
 * this machine. Every worker is tracked through Node's own 'exit' event, so "no worker is left
 * running" is observed from outside the code under test.
 */
import { describe, expect, it, vi } from "vitest";

vi.mock("node:worker_threads", async (original) => (await vi.importActual<typeof TrackedWorkers>("../helpers/tracked-workers")).trackedWorkerThreads(await original()));

import type * as TrackedWorkers from "../helpers/tracked-workers";
import { tracked } from "../helpers/tracked-workers";

import { DesignRunStopped, spreadAnalysis } from "../../src/design";
import { runSweepLocally, spreadAnalysisOnThreads, ToleranceMapCancelled } from "../../src/node";
import { gridSweep, sampleSweep, squeezed, startSweep } from "../sweep/helpers";
import { stopAt } from "../helpers/stop-progress";

const FIGURE = { kind: "margin-at", frequency: "1.16 MHz" } as const;
const GRID = { from: "1.1 MHz", to: "1.3 MHz", points: 32 };
const UNCERTAIN = [{ target: "detector.efficiency", value: "95 % ± 2 %" }];
const exact = (value: unknown): string => JSON.stringify(value, (_k, v) => (typeof v === "number" && !Number.isFinite(v) ? String(v) : v instanceof Float64Array ? Array.from(v) : v));

describe("stopping a spread on threads", () => {
  it("rejects after the first chunk with the samples done, and every worker has exited", async () => {
    const created = tracked.created;
    const stop = stopAt(1);
    const e = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { samples: 400, seed: 3, grid: GRID, workers: 2, ...stop }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(DesignRunStopped);
    expect(e).toMatchObject({ name: "AbortError", total: 400, unit: "samples", done: stop.calls[0] });
    expect(stop.calls[0]).toBeLessThan(400);
    expect(tracked.created - created).toBe(2);
    expect(tracked.live.size).toBe(0);
  });

  it("on one thread (no workers) stops after the first block of samples", async () => {
    const created = tracked.created;
    const stop = stopAt(1);
    const e = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { samples: 400, seed: 3, grid: GRID, workers: 1, ...stop }).catch((x: unknown) => x);
    // 400 samples in blocks of ⌈400 / 100⌉ = 4.
    expect(e).toMatchObject({ name: "AbortError", done: 4, total: 400, unit: "samples" });
    expect(stop.calls).toEqual([4]);
    expect(tracked.created).toBe(created);
  });

  it("an already aborted signal starts no worker", async () => {
    const created = tracked.created;
    const e = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { samples: 400, grid: GRID, workers: 2, signal: AbortSignal.abort() }).catch((x: unknown) => x);
    expect(e).toMatchObject({ done: 0, total: 400 });
    expect(tracked.created).toBe(created);
  });

  it("with progress and a signal never aborted, gives the bits of the in-process run", async () => {
    const options = { samples: 200, seed: 3, grid: GRID };
    const told: number[] = [];
    const threaded = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { ...options, workers: 2, signal: new AbortController().signal, onProgress: (done) => told.push(done) });
    expect(exact(threaded)).toBe(exact(spreadAnalysis(squeezed, FIGURE, UNCERTAIN, options)));
    expect(told[told.length - 1]).toBe(200);
    expect(tracked.live.size).toBe(0);
  });
});

describe("stopping a sweep run on this machine", () => {
  it("a map, samples and starts each stop at the first progress call, with no worker left", async () => {
    const map = stopAt(1);
    await expect(runSweepLocally(gridSweep(), { workers: 2, ...map })).rejects.toBeInstanceOf(ToleranceMapCancelled);
    const samples = stopAt(1);
    const stoppedSamples = await runSweepLocally(sampleSweep(), { workers: 2, ...samples }).catch((x: unknown) => x);
    expect(stoppedSamples).toMatchObject({ name: "AbortError", unit: "samples", total: 60, done: samples.calls[0] });
    const starts = stopAt(1);
    await expect(runSweepLocally(startSweep(), { ...starts })).rejects.toMatchObject({ unit: "starts", done: 1, total: 5 });
    expect(tracked.live.size).toBe(0);
  });
});
