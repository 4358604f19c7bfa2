/**
 * Monte Carlo spreads on the warm pool of worker threads that tolerance maps use: the same
 * bits as the in-process run on a pool that served a map and another spread before (and maps
 * after a spread keep theirs), a stop or a failure mid-run stops the pool's threads and leaves
 * the pool usable, and jobs asked for together wait for one another. Reference: spreadAnalysis
 * and toleranceMap in this thread (common practice, no outside source: the claim under test is
 * identity with them). Threads are counted through Node's own 'exit' event.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("node:worker_threads", async (original) => (await vi.importActual<typeof TrackedWorkers>("../helpers/tracked-workers")).trackedWorkerThreads(await original()));

import type * as TrackedWorkers from "../helpers/tracked-workers";
import { tracked } from "../helpers/tracked-workers";

import { DesignRunStopped, spreadAnalysis, type SpreadResult, type UncertaintySpec } from "../../src/design";
import { QuietframeError } from "../../src/errors";
import { bits, FIGURE, GRID, UNCERTAIN } from "../helpers/spread-scenario";
import { spreadAnalysisOnThreads, toleranceMap, TolerancePool, type ToleranceMapSpec } from "../../src/node";
import { example, sameBits } from "../tolerance/helpers";
import { stopAt } from "../helpers/stop-progress";

const squeezed = example("cryogenic-membrane-squeezed.json");
const OTHER_UNCERTAIN: UncertaintySpec[] = [{ target: "detector.efficiency", value: "95 % ± 2 %" }];
const MAP: ToleranceMapSpec = {
  x: { target: "cavity.detuning", from: "-3 MHz", to: "1 MHz", points: 5 },
  y: { target: "squeezer.squeezing", from: "-12 dB", to: "0 dB", points: 6 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 32 },
  figure: { kind: "margin-band", from: "1.15 MHz", to: "1.2 MHz" },
};
const OPTIONS = { samples: 300, seed: 11, grid: GRID, target: "2 dB" };
const OTHER_OPTIONS = { samples: 120, seed: 5, grid: { ...GRID, points: 20 } };

describe("Monte Carlo spreads on a warm pool", () => {
  let pool: TolerancePool;
  let inProcess: SpreadResult;
  let otherInProcess: SpreadResult;
  beforeAll(async () => {
    pool = await TolerancePool.start(2);
    inProcess = spreadAnalysis(squeezed, FIGURE, UNCERTAIN, OPTIONS);
    otherInProcess = spreadAnalysis(squeezed, FIGURE, OTHER_UNCERTAIN, OTHER_OPTIONS);
  });
  afterAll(async () => {
    await pool.close();
  });

  it("gives the in-process bits after a map and after another spread, and the map after them keeps its bits", async () => {
    const mapInProcess = await toleranceMap(squeezed, MAP, { workers: 1 });
    expect(inProcess.failed.unstable).toBeGreaterThan(0);
    expect(inProcess.bands).toBeDefined();
    const created = tracked.created;
    const mapBefore = await toleranceMap(squeezed, MAP, { pool });
    const other = await spreadAnalysisOnThreads(squeezed, FIGURE, OTHER_UNCERTAIN, { ...OTHER_OPTIONS, pool });
    const told: number[] = [];
    const pooled = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { ...OPTIONS, pool, onProgress: (done) => told.push(done) });
    const mapAfter = await toleranceMap(squeezed, MAP, { pool });
    expect(bits(other)).toEqual(bits(otherInProcess));
    expect(bits(pooled)).toEqual(bits(inProcess));
    expect(told[told.length - 1]).toBe(300);
    for (const map of [mapBefore, mapAfter]) {
      expect(sameBits(map.values, mapInProcess.values)).toBe(true);
      expect(sameBits(map.status, mapInProcess.status)).toBe(true);
      expect(map.messages).toEqual(mapInProcess.messages);
    }
    // Every job ran on the pool's two threads: none was started for them.
    expect(tracked.created).toBe(created);
  });

  it("jobs asked for together run one after another with their own bits; workers: 1 uses one of the pool's threads", async () => {
    const created = tracked.created;
    const [a, map, b, one] = await Promise.all([
      spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { ...OPTIONS, pool }),
      toleranceMap(squeezed, MAP, { pool }),
      spreadAnalysisOnThreads(squeezed, FIGURE, OTHER_UNCERTAIN, { ...OTHER_OPTIONS, pool }),
      spreadAnalysisOnThreads(squeezed, FIGURE, OTHER_UNCERTAIN, { ...OTHER_OPTIONS, pool, workers: 1 }),
    ]);
    expect(bits(a)).toEqual(bits(inProcess));
    expect(bits(b)).toEqual(bits(otherInProcess));
    expect(bits(one)).toEqual(bits(otherInProcess));
    expect(map.workers).toBe(2);
    expect(tracked.created).toBe(created);
  });

  it("a stop mid-run rejects with the samples done and stops the pool's threads; the pool then starts fresh ones and gives the same bits", async () => {
    const stop = stopAt(1);
    const created = tracked.created;
    const live = tracked.live.size;
    const e = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { ...OPTIONS, pool, ...stop }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(DesignRunStopped);
    expect(e).toMatchObject({ name: "AbortError", total: 300, unit: "samples", done: stop.calls[0] });
    expect(stop.calls[0]).toBeLessThan(300);
    expect(tracked.live.size).toBe(live - 2);
    const after = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { ...OPTIONS, pool });
    expect(bits(after)).toEqual(bits(inProcess));
    expect(tracked.created).toBe(created + 2);
    expect(tracked.live.size).toBe(live);
  });

  it("an already aborted signal hands out no sample and keeps the threads; a progress callback that throws rejects with its error and the pool goes on", async () => {
    const created = tracked.created;
    const early = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { ...OPTIONS, pool, signal: AbortSignal.abort() }).catch((x: unknown) => x);
    expect(early).toMatchObject({ name: "AbortError", done: 0, total: 300 });
    expect(tracked.created).toBe(created);
    const thrown = new Error("the caller's own progress failed");
    const failed = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, {
      ...OPTIONS,
      pool,
      onProgress: () => {
        throw thrown;
      },
    }).catch((x: unknown) => x);
    expect(failed).toBe(thrown);
    expect(bits(await spreadAnalysisOnThreads(squeezed, FIGURE, OTHER_UNCERTAIN, { ...OTHER_OPTIONS, pool }))).toEqual(bits(otherInProcess));
  });

  it("refuses something that is not a pool, naming options.pool, and a closed pool refuses a spread", async () => {
    const error = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { ...OPTIONS, pool: { size: 2 } as unknown as TolerancePool }).catch((x: unknown) => x);
    expect(error).toBeInstanceOf(QuietframeError);
    expect((error as Error).message).toMatch(/^options\.pool = .*is not a pool of worker threads; allowed: await TolerancePool\.start\(threads\)/);
    const closing = await TolerancePool.start(1);
    await closing.close();
    await expect(spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { ...OPTIONS, pool: closing })).rejects.toThrow(/closed/);
  });
});
