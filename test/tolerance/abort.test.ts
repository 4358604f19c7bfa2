import { describe, expect, it, vi } from "vitest";

// Every worker the map creates is tracked (test/helpers/tracked-workers.ts).
vi.mock("node:worker_threads", async (original) => (await vi.importActual<typeof TrackedWorkers>("../helpers/tracked-workers")).trackedWorkerThreads(await original()));

import type * as TrackedWorkers from "../helpers/tracked-workers";
import { tracked } from "../helpers/tracked-workers";

import { toleranceMap, ToleranceMapCancelled, type ToleranceMapSpec } from "../../src/node";
import { example } from "./helpers";

const squeezed = example("cryogenic-membrane-squeezed.json");
const SPEC: ToleranceMapSpec = {
  x: { target: "squeezer.squeezing", from: "-15 dB", to: "0 dB", points: 20 },
  y: { target: "cavity.inputCoupling", from: "50 %", to: "100 %", points: 60 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 256 },
  figure: { kind: "margin-at", frequency: "1.16 MHz" },
};

describe("cancelling a map", () => {
  it("rejects with a clear AbortError after the first finished row, and every worker has exited", async () => {
    const controller = new AbortController();
    let calls = 0;
    const pending = toleranceMap(squeezed, SPEC, {
      workers: 2,
      signal: controller.signal,
      onProgress: () => {
        calls++;
        if (calls === 1) controller.abort();
      },
    });
    const error = await pending.then(
      () => undefined,
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(ToleranceMapCancelled);
    const cancelled = error as ToleranceMapCancelled;
    expect(cancelled.name).toBe("AbortError");
    expect(cancelled.message).toMatch(/^tolerance map cancelled after \d+ of 60 rows/);
    expect(cancelled.rowsDone).toBeGreaterThanOrEqual(1);
    expect(cancelled.rowsDone).toBeLessThan(60);
    expect(tracked.created).toBe(2);
    expect(tracked.live.size).toBe(0);
    // No progress after the rejection.
    const seen = calls;
    await new Promise((r) => setTimeout(r, 200));
    expect(calls).toBe(seen);
  });

  it("an already aborted signal rejects before any worker starts; in-process runs stop too", async () => {
    const before = tracked.created;
    const error = await toleranceMap(squeezed, SPEC, { workers: 2, signal: AbortSignal.abort() }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ToleranceMapCancelled);
    expect(tracked.created).toBe(before);

    const controller = new AbortController();
    let rows = 0;
    const inProcess = await toleranceMap(squeezed, SPEC, {
      workers: 1,
      signal: controller.signal,
      onProgress: (done) => {
        rows = done;
        if (done === 3) controller.abort();
      },
    }).catch((e: unknown) => e);
    expect(inProcess).toBeInstanceOf(ToleranceMapCancelled);
    expect((inProcess as ToleranceMapCancelled).rowsDone).toBe(3);
    expect(rows).toBe(3);
    expect(tracked.created).toBe(before);
  });
});
