import { beforeAll, describe, expect, it } from "vitest";
import { realLuFactor, realLuSolve } from "../../src/linalg/real-lu";
import { SingularMatrixError } from "../../src/linalg/singular-error";
import { maxAbs, randomMatrix, seededRandom, toRows } from "./helpers";
import { type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

describe("real LU", () => {
  it("matches mathjs lusolve for random systems, n = 1..40", () => {
    const rand = seededRandom(11);
    for (let n = 1; n <= 40; n++) {
      const a = randomMatrix(rand, n);
      for (let i = 0; i < n; i++) a[i * n + i] += 2 * Math.sqrt(n); // keeps cond(A) = O(10)
      const b = randomMatrix(rand, n, 1);
      const f = a.slice();
      const piv = new Int32Array(n);
      realLuFactor(f, n, piv);
      const x = b.slice();
      realLuSolve(f, n, piv, x, 1);

      // mathjs lusolve as reference.
      const ref = (
        math.lusolve(
          toRows(a, n),
          Array.from(b, (v) => [v]),
        ) as number[][]
      ).map((r) => r[0]);
      const diff = maxAbs(Array.from(x, (v, i) => v - ref[i]));
      expect(diff / maxAbs(ref), `n = ${n}`).toBeLessThan(1e-12);

      let res = 0;
      for (let i = 0; i < n; i++) {
        let s = -b[i];
        for (let k = 0; k < n; k++) s += a[i * n + k] * x[k];
        res = Math.max(res, Math.abs(s));
      }
      expect(res / (maxAbs(a) * n * maxAbs(x)), `n = ${n}`).toBeLessThan(1e-15);
    }
  });

  it("solves several right-hand sides at once, same as one at a time", () => {
    const rand = seededRandom(12);
    const n = 9;
    const nrhs = 4;
    const a = randomMatrix(rand, n);
    const b = randomMatrix(rand, n, nrhs);
    const f = a.slice();
    const piv = new Int32Array(n);
    realLuFactor(f, n, piv);
    const all = b.slice();
    realLuSolve(f, n, piv, all, nrhs);
    for (let c = 0; c < nrhs; c++) {
      const col = Float64Array.from({ length: n }, (_, i) => b[i * nrhs + c]);
      realLuSolve(f, n, piv, col, 1);
      for (let i = 0; i < n; i++) expect(all[i * nrhs + c]).toBe(col[i]);
    }
  });

  it("throws SingularMatrixError for a rank-deficient matrix", () => {
    // Second row = 2 × first; elimination is exact here (multipliers 1/2), so the last
    // pivot is exactly zero rather than a rounding residue.
    const a = Float64Array.from([1, 2, 3, 2, 4, 6, 1, 0, 1]);
    expect(() => realLuFactor(a.slice(), 3, new Int32Array(3))).toThrow(SingularMatrixError);
    expect(() => realLuFactor(a.slice(), 3, new Int32Array(3))).toThrow(/singular at pivot 2/);
    expect(() => realLuFactor(new Float64Array(4), 2, new Int32Array(2))).toThrow(/singular at pivot 0/);
  });
});
