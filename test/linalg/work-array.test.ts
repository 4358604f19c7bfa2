/**
 * Reused work arrays: every call hands out zeros, whatever the previous call left in them, and
 * routines that use them give the same bits on repeated calls of different sizes as on a first
 * call. Reference: the routines' first calls themselves (common practice, no outside source:
 * the claim under test is that reuse changes nothing).
 */
import { describe, expect, it } from "vitest";
import { shiftedPositiveDefinite } from "../../src/linalg/hermitian";
import { solveLyapunov } from "../../src/linalg/lyapunov";
import { WorkArray } from "../../src/linalg/work-array";
import { randomMatrix, seededRandom } from "./helpers";

describe("WorkArray", () => {
  it("hands out zeros of the asked length after a longer and a shorter use were written over", () => {
    const work = new WorkArray();
    for (const length of [7, 3, 12, 12, 5, 0]) {
      const a = work.zeros(length);
      expect(a.length).toBe(length);
      expect(a.every((x) => x === 0)).toBe(true);
      a.fill(Number.NaN);
    }
  });

  it("gives a separate array of zeros for a length beyond what it keeps", () => {
    const work = new WorkArray();
    const big = work.zeros(1 << 17);
    big.fill(1);
    const again = work.zeros(1 << 17);
    expect(again).not.toBe(big);
    expect(again.every((x) => x === 0)).toBe(true);
  });
});

describe("routines on reused work arrays give the bits of a first call", () => {
  /** A stable n×n matrix (random, shifted left by its row sums) and a positive semidefinite Q = G Gᵀ. */
  function system(n: number, seed: number): { a: Float64Array; q: Float64Array } {
    const rand = seededRandom(seed);
    const a = randomMatrix(rand, n);
    for (let i = 0; i < n; i++) {
      let row = 0;
      for (let j = 0; j < n; j++) row += Math.abs(a[i * n + j]);
      a[i * n + i] -= row + 1;
    }
    const g = randomMatrix(rand, n);
    const q = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) for (let k = 0; k < n; k++) q[i * n + j] += g[i * n + k] * g[j * n + k];
    return { a, q };
  }

  it("solveLyapunov and shiftedPositiveDefinite, sizes 6, 2, 9, 6 and again in the reverse order", () => {
    // The very first call meets fresh arrays; every later one meets what the previous size left.
    const sizes = [6, 2, 9, 6];
    const outcome = (n: number, seed: number) => {
      const { a, q } = system(n, seed);
      return { v: Buffer.from(solveLyapunov(a, q, n).buffer).toString("hex"), definite: shiftedPositiveDefinite(q, a, n, 1) };
    };
    const first = sizes.map((n, k) => outcome(n, 40 + k));
    for (let k = sizes.length - 1; k >= 0; k--) expect(outcome(sizes[k], 40 + k)).toEqual(first[k]);
    expect(outcome(sizes[0], 40)).toEqual(first[0]);
  });
});
