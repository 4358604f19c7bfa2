import { describe, expect, it, vi } from "vitest";

/**
 * Every worker the map creates is tracked through Node's own 'exit' event, so "no worker is
 * left running" is observed from outside the code under test.
 */
const tracked = vi.hoisted(() => ({ created: 0, live: new Set<object>() }));

vi.mock("node:worker_threads", async (importOriginal) => {
  const original = await importOriginal<typeof import("node:worker_threads")>();
  class TrackedWorker extends original.Worker {
    constructor(...args: ConstructorParameters<typeof original.Worker>) {
      super(...args);
      tracked.created++;
      tracked.live.add(this);
      this.on("exit", () => tracked.live.delete(this));
    }
  }
  return { ...original, default: { ...original, Worker: TrackedWorker }, Worker: TrackedWorker };
});

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
