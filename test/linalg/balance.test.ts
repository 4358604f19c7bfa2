import { beforeAll, describe, expect, it } from "vitest";
import { balanceInPlace } from "../../src/linalg/balance";
import { fromRows, multisetDistance, randomMatrix, seededRandom, toRows, type Eig } from "./helpers";
import { type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

/** S M S⁻¹ with S = diag(10^k): a similarity that makes the entries span many decades. */
function graded(seed: number, n: number, decades: number): Float64Array {
  const rand = seededRandom(seed);
  const a = randomMatrix(rand, n);
  const s = Array.from({ length: n }, (_, i) => 10 ** ((decades * i) / Math.max(n - 1, 1) - decades / 2));
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * n + j] *= s[i] / s[j];
  return a;
}

function offDiagonalSum(a: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) if (i !== j) s += Math.abs(a[i * n + j]);
  return s;
}

describe("Parlett–Reinsch balancing", () => {
  it("is an exact diagonal similarity by powers of two: diagonal kept, a_ij·a_ji kept, every ratio a power of two (definition of the scaling)", () => {
    const n = 6;
    const a = graded(11, n, 8);
    const b = a.slice();
    balanceInPlace(b, n);
    for (let i = 0; i < n; i++) {
      expect(b[i * n + i]).toBe(a[i * n + i]);
      for (let j = 0; j < n; j++) {
        if (i === j) continue;
        expect(b[i * n + j] * b[j * n + i]).toBe(a[i * n + j] * a[j * n + i]);
        const log2 = Math.log2(b[i * n + j] / a[i * n + j]);
        expect(Number.isInteger(log2), `ratio at (${i}, ${j}) is 2^${log2}`).toBe(true);
      }
    }
  });

  it("never increases the off-diagonal 1-norm (each accepted rescaling shrinks its row and column; Parlett & Reinsch 1969)", () => {
    for (let seed = 1; seed <= 20; seed++) {
      const n = 2 + (seed % 7);
      const a = graded(seed, n, seed % 12);
      const b = a.slice();
      balanceInPlace(b, n);
      expect(offDiagonalSum(b, n)).toBeLessThanOrEqual(offDiagonalSum(a, n));
    }
  });

  it("keeps the eigenvalues (mathjs eigs of the original, a mildly graded matrix, as reference)", () => {
    const n = 5;
    const a = graded(3, n, 3);
    const b = a.slice();
    balanceInPlace(b, n);
    const eig = (m: Float64Array): Eig[] =>
      (math.eigs(toRows(m, n), { eigenvectors: false }).values as unknown as (number | { re: number; im: number })[]).map((v) => (typeof v === "number" ? { re: v, im: 0 } : { re: v.re, im: v.im }));
    const scale = Math.max(...eig(a).map((e) => Math.hypot(e.re, e.im)));
    expect(multisetDistance(eig(b), eig(a))).toBeLessThan(1e-10 * scale);
  });

  it("brings [[1, 1e6], [1e-6, 1]] to entries of order one (eigenvalues 1 ± √(1e6·1e-6) = 0 and 2, elementary algebra)", () => {
    const b = fromRows([
      [1, 1e6],
      [1e-6, 1],
    ]);
    balanceInPlace(b, 2);
    expect(Math.abs(b[1])).toBeGreaterThan(0.25);
    expect(Math.abs(b[1])).toBeLessThan(4);
    expect(Math.abs(b[2])).toBeGreaterThan(0.25);
    expect(Math.abs(b[2])).toBeLessThan(4);
    expect(b[1] * b[2]).toBe(1e6 * 1e-6);
  });

  it("keeps exact zeros and the row of an index without off-diagonal entries (a diagonal similarity scales entries, never fills them)", () => {
    const a = fromRows([
      [2, 0, 0],
      [5e3, 1, 7],
      [3e-3, 4, 3],
    ]);
    const b = a.slice();
    balanceInPlace(b, 3);
    for (let k = 0; k < 9; k++) expect(b[k] === 0).toBe(a[k] === 0);
    expect(Array.from(b.subarray(0, 3))).toEqual([2, 0, 0]);
  });
});
