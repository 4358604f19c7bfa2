import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { optimizeDesign, spreadAnalysis } from "../../src/design";
import type { SetupDescription } from "../../src/setup/format";

/**
 * Long design runs report progress through onProgress; asking for it changes no number
 * (the same seeds give the same result bit for bit, checked through its JSON text).
 */
const squeezed = JSON.parse(readFileSync(join(__dirname, "..", "..", "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;
const FIGURE = { kind: "margin-at", frequency: "1.16 MHz" } as const;
const GRID = { from: "1.1 MHz", to: "1.3 MHz", points: 32 };
const exact = (value: unknown): string => JSON.stringify(value, (_k, v) => (typeof v === "number" && !Number.isFinite(v) ? String(v) : v instanceof Float64Array ? Array.from(v) : v));

describe("progress of long design runs", () => {
  it("spreadAnalysis reports every block once, in order, ending at the sample count, and gives the same result", () => {
    const uncertain = [{ target: "detector.efficiency", value: "95 % ± 2 %" }];
    const calls: [number, number][] = [];
    const withProgress = spreadAnalysis(squeezed, FIGURE, uncertain, { samples: 250, seed: 5, grid: GRID, onProgress: (done, total) => calls.push([done, total]) });
    const plain = spreadAnalysis(squeezed, FIGURE, uncertain, { samples: 250, seed: 5, grid: GRID });
    expect(exact(withProgress)).toBe(exact(plain));
    expect(calls.length).toBeGreaterThan(1);
    expect(calls.every(([, total]) => total === 250)).toBe(true);
    expect(calls.map(([done]) => done)).toEqual([...calls.map(([done]) => done)].sort((a, b) => a - b));
    expect(new Set(calls.map(([done]) => done)).size).toBe(calls.length);
    expect(calls[calls.length - 1]).toEqual([250, 250]);
  });

  it("optimizeDesign reports after each start, ending at the number of starts, and gives the same result", () => {
    const parameters = [{ target: "squeezer.angle", min: "0 deg", max: "180 deg" }];
    const calls: [number, number][] = [];
    const withProgress = optimizeDesign(squeezed, FIGURE, parameters, { starts: 3, seed: 2, grid: GRID, onProgress: (done, total) => calls.push([done, total]) });
    const plain = optimizeDesign(squeezed, FIGURE, parameters, { starts: 3, seed: 2, grid: GRID });
    expect(exact(withProgress)).toBe(exact(plain));
    expect(calls).toEqual([
      [1, 3],
      [2, 3],
      [3, 3],
    ]);
  });
});
