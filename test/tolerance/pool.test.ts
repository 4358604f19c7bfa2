import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { toleranceMap, TolerancePool, ToleranceMapCancelled, type ToleranceMapSpec } from "../../src/node";
import { example, sameBits } from "./helpers";

const squeezed = example("cryogenic-membrane-squeezed.json");

// Part of the detuning range is blue (unstable cells), so statuses and messages are compared too.
const SPEC: ToleranceMapSpec = {
  x: { target: "cavity.detuning", from: "-3 MHz", to: "1 MHz", points: 6 },
  y: { target: "squeezer.squeezing", from: "-12 dB", to: "0 dB", points: 9 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 64 },
  figure: { kind: "margin-band", from: "1.15 MHz", to: "1.2 MHz" },
};
const OTHER: ToleranceMapSpec = {
  x: { target: "squeezer.squeezing", from: "-15 dB", to: "0 dB", points: 5 },
  y: { target: "cavity.inputCoupling", from: "50 %", to: "100 %", points: 4 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 32 },
  figure: { kind: "margin-at", frequency: "1.16 MHz" },
};

describe("a warm pool of worker threads, reused across maps", () => {
  let pool: TolerancePool;
  beforeAll(async () => {
    pool = await TolerancePool.start(2);
  });
  afterAll(async () => {
    await pool.close();
  });

  it("gives the bits of the in-process map, for two different maps in turn and for maps started together", async () => {
    const [inProcess, otherInProcess] = [await toleranceMap(squeezed, SPEC, { workers: 1 }), await toleranceMap(squeezed, OTHER, { workers: 1 })];
    const progress: number[] = [];
    const pooled = await toleranceMap(squeezed, SPEC, { pool, onProgress: (done) => progress.push(done) });
    const [again, other] = await Promise.all([toleranceMap(squeezed, SPEC, { pool }), toleranceMap(squeezed, OTHER, { pool })]);
    expect(inProcess.counts.unstable).toBeGreaterThan(0);
    expect(pooled.workers).toBe(2);
    for (const map of [pooled, again]) {
      expect(sameBits(map.values, inProcess.values)).toBe(true);
      expect(sameBits(map.status, inProcess.status)).toBe(true);
      expect(map.messages).toEqual(inProcess.messages);
    }
    expect(sameBits(other.values, otherInProcess.values)).toBe(true);
    expect(progress).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
  });

  it("a cancelled map rejects with an AbortError and the pool still computes the next map exactly", async () => {
    const controller = new AbortController();
    const error = await toleranceMap(squeezed, SPEC, {
      pool,
      signal: controller.signal,
      onProgress: () => controller.abort(),
    }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ToleranceMapCancelled);
    const early = await toleranceMap(squeezed, SPEC, { pool, signal: AbortSignal.abort() }).catch((e: unknown) => e);
    expect(early).toBeInstanceOf(ToleranceMapCancelled);
    expect((early as ToleranceMapCancelled).rowsDone).toBe(0);
    const after = await toleranceMap(squeezed, OTHER, { pool });
    const inProcess = await toleranceMap(squeezed, OTHER, { workers: 1 });
    expect(sameBits(after.values, inProcess.values)).toBe(true);
  });

  it("refuses something that is not a pool, naming the option", async () => {
    const error = await toleranceMap(squeezed, SPEC, { pool: { size: 2 } }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(QuietframeError);
    expect((error as Error).message).toMatch(/options\.pool/);
  });

  it("a closed pool refuses further maps", async () => {
    const closing = await TolerancePool.start(1);
    await closing.close();
    await expect(toleranceMap(squeezed, OTHER, { pool: closing })).rejects.toThrow(/closed/);
  });
});
