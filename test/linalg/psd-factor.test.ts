import { beforeAll, describe, expect, it } from "vitest";
import { applyFactor, psdFactor } from "../../src/linalg/psd-factor";
import { fromRows, randomMatrix, seededRandom, toRows } from "./helpers";
import { type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

/** F Fᵀ by mathjs (reference for the product). */
function product(f: Float64Array, n: number, r: number): Float64Array {
  if (r === 0) return new Float64Array(n * n);
  const rows = toRows(f, n, r);
  return fromRows(math.multiply(rows, math.transpose(rows)) as number[][]);
}

function maxDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let d = 0;
  for (let i = 0; i < b.length; i++) d = Math.max(d, Math.abs(a[i] - b[i]));
  return d;
}

describe("square-root factor of a positive semi-definite matrix", () => {
  it("Σ = G Gᵀ of full rank: rank n and F Fᵀ = Σ (mathjs multiply as reference)", () => {
    const n = 6;
    const g = randomMatrix(seededRandom(8), n);
    const sigma = fromRows(math.multiply(toRows(g, n), math.transpose(toRows(g, n))) as number[][]);
    const f = psdFactor(sigma, n);
    expect(f.r).toBe(n);
    expect(maxDiff(product(f.f, n, f.r), sigma)).toBeLessThan(1e-14 * n);
  });

  it("a rank-2 Σ = u uᵀ + v vᵀ of order 5 keeps rank 2 and is reproduced (mathjs multiply as reference)", () => {
    const n = 5;
    const uv = randomMatrix(seededRandom(9), n, 2);
    const sigma = fromRows(math.multiply(toRows(uv, n, 2), math.transpose(toRows(uv, n, 2))) as number[][]);
    const f = psdFactor(sigma, n);
    expect(f.r).toBe(2);
    expect(maxDiff(product(f.f, n, f.r), sigma)).toBeLessThan(1e-14 * n);
  });

  it("[[4, 2], [2, 3]] gives the pivoted Cholesky columns (2, 1) and (0, √2) (elementary algebra: 3 − 1² = 2)", () => {
    const f = psdFactor(Float64Array.of(4, 2, 2, 3), 2);
    expect(f.r).toBe(2);
    expect(Array.from(f.f)).toEqual([2, 0, 1, Math.SQRT2]);
  });

  it("a free mass's noise diag(0, q) (no noise on the position) factors with rank 1 instead of failing", () => {
    const f = psdFactor(Float64Array.of(0, 0, 0, 2.5), 2);
    expect(f.r).toBe(1);
    expect(f.f[0]).toBe(0);
    expect(f.f[1]).toBe(Math.sqrt(2.5));
    expect(maxDiff(product(f.f, 2, 1), [0, 0, 0, 2.5])).toBeLessThan(1e-15 * 2.5);
    expect(psdFactor(new Float64Array(9), 3).r).toBe(0);
  });

  it("applyFactor gives F g (mathjs multiply as reference)", () => {
    const n = 4;
    const g = randomMatrix(seededRandom(10), n);
    const sigma = fromRows(math.multiply(toRows(g, n), math.transpose(toRows(g, n))) as number[][]);
    const f = psdFactor(sigma, n);
    const x = Float64Array.of(0.3, -1.2, 2, 0.7);
    const out = new Float64Array(n);
    applyFactor(f, x, out);
    const ref = (math.multiply(toRows(f.f, n, f.r), Array.from(x)) as number[]).flat();
    expect(maxDiff(out, ref)).toBeLessThan(1e-14 * n);
  });
});
