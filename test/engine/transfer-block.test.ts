/**
 * The transfer functions for a block of frequencies at once (TransferBlock) against the
 * one-frequency evaluator (TransferEvaluator), bit for bit: every H and h entry compared by its
 * bytes, on every example's model and on random sparse models (fixed seeds) whose pivots change
 * with the frequency, over several blocks and a partial last one, with one and two outputs; and
 * the same error at an undamped mode. Reference: the one-frequency path itself (common practice,
 * no outside source: the claim under test is identity with it).
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { noiseBudget } from "../../src/engine/budget";
import { TransferBlock } from "../../src/engine/transfer-block";
import { TransferEvaluator } from "../../src/engine/transfer";
import type { StateSpaceModel } from "../../src/network/model";
import { prepare } from "../../src/prepare";

const EXAMPLES = join(__dirname, "..", "..", "examples");
const examples = readdirSync(EXAMPLES).filter((f) => f.endsWith(".json"));

/** The bytes of a double, so that −0 and +0 (and NaN payloads) count as different. */
function hex(x: number): string {
  return Buffer.from(new Float64Array([x]).buffer).toString("hex");
}

/** Evaluates `omegas` both ways (block size `size`) and returns the first entry whose bits differ, or undefined. */
function firstDifference(model: StateSpaceModel, rows: readonly number[], omegas: Float64Array, size: number): string | undefined {
  const one = new TransferEvaluator(model, rows);
  const block = new TransferBlock(model, rows, size);
  const m = model.nInputs;
  const p = rows.length;
  for (let from = 0; from < omegas.length; from += size) {
    const count = Math.min(size, omegas.length - from);
    block.solve(omegas, from, count);
    for (let f = 0; f < count; f++) {
      one.at(omegas[from + f]);
      for (let i = 0; i < p * m; i++) {
        if (hex(one.hRe[i]) !== hex(block.hRe[i * size + f]) || hex(one.hIm[i]) !== hex(block.hIm[i * size + f])) return `H[${i}] at Ω = ${omegas[from + f]}`;
      }
      for (let k = 0; k < p; k++) {
        if (hex(one.sRe[k]) !== hex(block.sRe[k * size + f]) || hex(one.sIm[k]) !== hex(block.sIm[k * size + f])) return `h[${k}] at Ω = ${omegas[from + f]}`;
      }
    }
  }
  return undefined;
}

function logOmegas(from: number, to: number, points: number): Float64Array {
  return Float64Array.from({ length: points }, (_, i) => 2 * Math.PI * from * (to / from) ** (i / (points - 1)));
}

/** A model of n states and m inputs with the given entries (the fields TransferEvaluator reads). */
function model(n: number, m: number, outputs: number, entries: { A: number[]; B: number[]; C: number[]; D: number[]; sB: number[]; sD: number[] }): StateSpaceModel {
  return {
    nStates: n,
    nInputs: m,
    nOutputs: outputs,
    A: Float64Array.from(entries.A),
    B: Float64Array.from(entries.B),
    C: Float64Array.from(entries.C),
    D: Float64Array.from(entries.D),
    N: new Float64Array(m * m),
    signalB: Float64Array.from(entries.sB),
    signalD: Float64Array.from(entries.sD),
    modes: [],
    inputs: [],
    groups: [],
    outputs: [],
  };
}

/** Entries of which about half are exactly 0 (as in assembled models), the rest of either sign over several decades. */
const sparse = (length: number) =>
  fc.array(
    fc.oneof(
      fc.constant(0),
      fc.double({ min: -1e3, max: 1e3, noNaN: true, noDefaultInfinity: true }).filter((x) => Math.abs(x) > 1e-3),
    ),
    { minLength: length, maxLength: length },
  );

describe("TransferBlock gives TransferEvaluator's bits", () => {
  it.each(examples)("%s: every frequency of its grid, blocks of 64 and of 7", (file) => {
    const prepared = prepare(readFileSync(join(EXAMPLES, file), "utf8"));
    const { model: m, readoutRows } = prepared.assembled;
    const grid = prepared.setup.grid ?? { from: 1, to: 1e5 };
    const omegas = logOmegas(grid.from, grid.to, 300);
    expect(firstDifference(m, readoutRows, omegas, 64)).toBeUndefined();
    expect(firstDifference(m, readoutRows, omegas, 7)).toBeUndefined();
  });

  it("random sparse models of 1 … 6 states, one and two outputs, frequencies across the poles", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 6 }).chain((n) =>
          fc.record({
            n: fc.constant(n),
            A: sparse(n * n),
            B: sparse(n * 3),
            C: sparse(2 * n),
            D: sparse(2 * 3),
            sB: sparse(n),
            sD: sparse(2),
            outputs: fc.constantFrom([0], [1], [0, 1], [1, 0]),
          }),
        ),
        (r) => {
          const mdl = model(r.n, 3, 2, r);
          const omegas = logOmegas(1e-3, 1e4, 150);
          let expected: string | undefined;
          try {
            for (const w of omegas) new TransferEvaluator(mdl, r.outputs).at(w);
          } catch (e) {
            // A random model singular on the grid: both ways must refuse it alike.
            expected = (e as Error).message;
          }
          if (expected !== undefined) {
            expect(() => firstDifference(mdl, r.outputs, omegas, 16)).toThrow(expected);
            return;
          }
          expect(firstDifference(mdl, r.outputs, omegas, 16)).toBeUndefined();
        },
      ),
      { seed: 12, numRuns: 300 },
    );
  });

  it("random sparse models of four states read by one output (the written-out kernel), frequencies across the poles", () => {
    fc.assert(
      fc.property(fc.record({ A: sparse(16), B: sparse(12), C: sparse(8), D: sparse(6), sB: sparse(4), sD: sparse(2), output: fc.constantFrom(0, 1) }), (r) => {
        const mdl = model(4, 3, 2, r);
        const omegas = logOmegas(1e-3, 1e4, 130);
        let expected: string | undefined;
        try {
          for (const w of omegas) new TransferEvaluator(mdl, [r.output]).at(w);
        } catch (e) {
          // A random model singular on the grid: both ways must refuse it alike.
          expected = (e as Error).message;
        }
        if (expected !== undefined) {
          expect(() => firstDifference(mdl, [r.output], omegas, 64)).toThrow(expected);
          return;
        }
        expect(firstDifference(mdl, [r.output], omegas, 64)).toBeUndefined();
      }),
      { seed: 44, numRuns: 400 },
    );
  });

  it("an undamped mode exactly on a frequency of the block: the same error at the same frequency", () => {
    // Two modes: one undamped at Ω₀ = 3 rad/s, one damped; 4 states, so the LU path.
    const w0 = 3;
    const mdl = model(4, 1, 1, {
      A: [0, w0, 0, 0, -w0, 0, 0, 0, 0, 0, -0.1, 2, 0, 0, -2, -0.1],
      B: [1, 0, 0, 1],
      C: [1, 0, 1, 0],
      D: [0],
      sB: [0, 1, 0, 0],
      sD: [0],
    });
    const omegas = Float64Array.from([1, 2, w0, 4]);
    const one = new TransferEvaluator(mdl, [0]);
    let expected = "";
    try {
      for (const w of omegas) one.at(w);
    } catch (e) {
      expected = (e as Error).message;
    }
    expect(expected).toMatch(/undamped mode exactly at/);
    expect(() => new TransferBlock(mdl, [0], 4).solve(omegas, 0, 4)).toThrow(expected);
  });
});

describe("a budget of a few frequencies (one at a time) and of many (in blocks) give the same bits at each frequency", () => {
  it.each(examples)("%s: each of 9 frequencies alone against the same frequencies inside a 200-point grid", (file) => {
    const { assembled, setup } = prepare(readFileSync(join(EXAMPLES, file), "utf8"));
    const range = setup.grid ?? { from: 1, to: 1e5 };
    const grid = Float64Array.from(logOmegas(range.from, range.to, 200), (w) => w / (2 * Math.PI));
    const many = noiseBudget(assembled, grid);
    for (const k of [0, 1, 15, 16, 63, 64, 100, 128, 199]) {
      const one = noiseBudget(assembled, grid.slice(k, k + 1));
      expect(hex(one.total[0]), `total at point ${k}`).toBe(hex(many.total[k]));
      for (const term of one.terms) {
        const same = many.terms.find((t) => t.id === term.id);
        expect(same, `term ${term.id}`).toBeDefined();
        expect(hex(term.psd[0]), `${term.id} at point ${k}`).toBe(hex(same!.psd[k]));
      }
    }
  });
});
