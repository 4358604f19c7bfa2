import { beforeAll, describe, expect, it } from "vitest";
import { add, allFinite, block, congruence, identity, maxAbs, mul, multiply, norm1, setBlock, symmetrize, transpose } from "../../src/linalg/real-matrix";
import { fromRows, randomMatrix, seededRandom, toRows } from "./helpers";
import { type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

function maxDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let d = 0;
  for (let i = 0; i < b.length; i++) d = Math.max(d, Math.abs(a[i] - b[i]));
  return d;
}

describe("real matrix arithmetic", () => {
  it("multiply (r×k)(k×c) and the square mul agree with mathjs multiply (mathjs as reference)", () => {
    const rand = seededRandom(1);
    const a = randomMatrix(rand, 3, 5);
    const b = randomMatrix(rand, 5, 4);
    const ref = fromRows(math.multiply(toRows(a, 3, 5), toRows(b, 5, 4)) as number[][]);
    expect(maxDiff(multiply(a, b, 3, 5, 4), ref)).toBeLessThan(1e-15 * 5);
    const s = randomMatrix(rand, 4);
    const t = randomMatrix(rand, 4);
    expect(maxDiff(mul(s, t, 4), fromRows(math.multiply(toRows(s, 4), toRows(t, 4)) as number[][]))).toBeLessThan(1e-15 * 4);
  });

  it("transpose and the congruence a·X·aᵀ agree with mathjs (mathjs as reference)", () => {
    const rand = seededRandom(2);
    const r = randomMatrix(rand, 2, 3);
    expect(Array.from(transpose(r, 2, 3))).toEqual((math.transpose(toRows(r, 2, 3)) as number[][]).flat());
    const a = randomMatrix(rand, 4);
    const x = randomMatrix(rand, 4);
    const ref = math.multiply(math.multiply(toRows(a, 4), toRows(x, 4)), math.transpose(toRows(a, 4))) as number[][];
    expect(maxDiff(congruence(a, x, 4), fromRows(ref))).toBeLessThan(1e-14);
  });

  it("norm1 is the largest absolute column sum, as mathjs norm(A, 1) (mathjs as reference)", () => {
    const a = randomMatrix(seededRandom(3), 6);
    expect(norm1(a, 6)).toBeCloseTo(math.norm(toRows(a, 6), 1) as number, 14);
    expect(
      norm1(
        fromRows([
          [1, -7],
          [-2, 3],
        ]),
        2,
      ),
    ).toBe(10);
  });

  it("identity, add and symmetrize follow their definitions (I; A + B; (X + Xᵀ)/2)", () => {
    expect(Array.from(identity(3))).toEqual([1, 0, 0, 0, 1, 0, 0, 0, 1]);
    expect(Array.from(add(Float64Array.of(1, 2), Float64Array.of(0.5, -2)))).toEqual([1.5, 0]);
    const x = fromRows([
      [1, 2, 3],
      [4, 5, 6],
      [7, 8, 9],
    ]);
    const out = symmetrize(x, 3);
    expect(out).toBe(x);
    expect(Array.from(x)).toEqual([1, 3, 5, 3, 5, 7, 5, 7, 9]);
  });

  it("block and setBlock copy a sub-matrix out and back in, with a scale", () => {
    const a = Float64Array.from({ length: 12 }, (_, i) => i); // 3×4
    expect(Array.from(block(a, 4, 1, 2, 2, 2))).toEqual([6, 7, 10, 11]);
    const t = new Float64Array(12);
    setBlock(t, 4, 0, 1, Float64Array.of(1, 2, 3, 4), 2, 2, -2);
    expect(Array.from(t)).toEqual([0, -2, -4, 0, 0, -6, -8, 0, 0, 0, 0, 0]);
  });

  it("maxAbs reports a NaN (so a check on it fails) and allFinite rejects NaN and ±∞", () => {
    expect(maxAbs(Float64Array.of(1, -3, 2))).toBe(3);
    expect(maxAbs(Float64Array.of(1, NaN, 2))).toBeNaN();
    expect(allFinite(Float64Array.of(1, 2))).toBe(true);
    expect(allFinite(Float64Array.of(1, Infinity))).toBe(false);
    expect(allFinite(Float64Array.of(NaN))).toBe(false);
  });
});
