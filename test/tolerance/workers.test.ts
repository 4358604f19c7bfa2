import { describe, expect, it } from "vitest";
import { toleranceMap, type ToleranceMap, type ToleranceMapSpec } from "../../src/node";
import { example, sameBits } from "./helpers";

const squeezed = example("cryogenic-membrane-squeezed.json");

// Part of the detuning range is blue (unstable cells), so statuses and messages are compared too.
const SPEC: ToleranceMapSpec = {
  x: { target: "cavity.detuning", from: "-3 MHz", to: "1 MHz", points: 6 },
  y: { target: "squeezer.squeezing", from: "-12 dB", to: "0 dB", points: 7 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 64 },
  figure: { kind: "margin-band", from: "1.15 MHz", to: "1.2 MHz" },
};

async function run(workers: number): Promise<{ map: ToleranceMap; progress: [number, number][] }> {
  const progress: [number, number][] = [];
  const map = await toleranceMap(squeezed, SPEC, { workers, onProgress: (done, total) => progress.push([done, total]) });
  return { map, progress };
}

describe("the number of workers changes nothing but the time", () => {
  it("1, 2 and 3 workers give bit-identical values, statuses and messages; progress reaches the total exactly once, one call per row", async () => {
    const runs = [await run(1), await run(2), await run(3)];
    const [one] = runs;
    expect(one.map.counts.unstable).toBeGreaterThan(0);
    expect(one.map.counts.ok).toBeGreaterThan(0);
    runs.forEach(({ map, progress }, k) => {
      expect(map.workers).toBe(k + 1);
      expect(sameBits(map.values, one.map.values), `values with ${k + 1} workers`).toBe(true);
      expect(sameBits(map.status, one.map.status), `status with ${k + 1} workers`).toBe(true);
      expect(map.messages).toEqual(one.map.messages);
      expect(map.counts).toEqual(one.map.counts);
      expect(progress.map(([d]) => d)).toEqual([1, 2, 3, 4, 5, 6, 7]);
      expect(progress.every(([, t]) => t === 7)).toBe(true);
      expect(progress.filter(([d, t]) => d === t)).toHaveLength(1);
      expect(map.elapsedMs).toBeGreaterThan(0);
    });
  });

  it("uses no more workers than the map has rows", async () => {
    const map = await toleranceMap(squeezed, { ...SPEC, y: { ...SPEC.y, points: 2 } }, { workers: 5 });
    expect(map.workers).toBe(2);
    expect(map.values.length).toBe(12);
  });
});
