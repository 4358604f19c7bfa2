import { beforeAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import { SingularMatrixError, complexLuFactor, complexLuSolve, complexLuSolveTransposed } from "../../src/linalg/complex-lu";
import { complexRows, randomMatrix, seededRandom } from "./helpers";
import { type Complex, type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

/** Random complex matrix with a diagonal boost, so it is well conditioned. */
function wellConditioned(rand: () => number, n: number): { re: Float64Array; im: Float64Array } {
  const re = randomMatrix(rand, n);
  const im = randomMatrix(rand, n);
  for (let i = 0; i < n; i++) {
    re[i * n + i] += 2 * Math.sqrt(n);
    im[i * n + i] += Math.sqrt(n);
  }
  return { re, im };
}

/** ‖op(A) X − B‖∞ / (‖A‖∞‖X‖∞ + ‖B‖∞), op = identity or plain transpose. */
function relativeResidual(aRe: Float64Array, aIm: Float64Array, n: number, xRe: Float64Array, xIm: Float64Array, bRe: Float64Array, bIm: Float64Array, nrhs: number, transposed: boolean): number {
  let worst = 0;
  let normA = 0;
  let normX = 0;
  let normB = 0;
  for (let i = 0; i < n; i++) {
    let rowSum = 0;
    for (let k = 0; k < n; k++) rowSum += Math.hypot(aRe[i * n + k], aIm[i * n + k]);
    normA = Math.max(normA, rowSum);
  }
  for (let i = 0; i < n * nrhs; i++) {
    normX = Math.max(normX, Math.hypot(xRe[i], xIm[i]));
    normB = Math.max(normB, Math.hypot(bRe[i], bIm[i]));
  }
  for (let i = 0; i < n; i++) {
    for (let c = 0; c < nrhs; c++) {
      let sr = -bRe[i * nrhs + c];
      let si = -bIm[i * nrhs + c];
      for (let k = 0; k < n; k++) {
        const idx = transposed ? k * n + i : i * n + k;
        const ar = aRe[idx];
        const ai = aIm[idx];
        const xr = xRe[k * nrhs + c];
        const xi = xIm[k * nrhs + c];
        sr += ar * xr - ai * xi;
        si += ar * xi + ai * xr;
      }
      worst = Math.max(worst, Math.hypot(sr, si));
    }
  }
  return worst / (normA * normX + normB);
}

function solveWith(aRe: Float64Array, aIm: Float64Array, n: number, bRe: Float64Array, bIm: Float64Array, nrhs: number, transposed: boolean): { re: Float64Array; im: Float64Array } {
  const fRe = aRe.slice();
  const fIm = aIm.slice();
  const piv = new Int32Array(n);
  complexLuFactor(fRe, fIm, n, piv);
  const xRe = bRe.slice();
  const xIm = bIm.slice();
  (transposed ? complexLuSolveTransposed : complexLuSolve)(fRe, fIm, n, piv, xRe, xIm, nrhs);
  return { re: xRe, im: xIm };
}

describe("complex LU", () => {
  const nrhs = 3;
  for (const transposed of [false, true]) {
    it(`${transposed ? "Aᵀ X = B" : "A X = B"} matches mathjs lusolve for n = 1..30`, () => {
      const rand = seededRandom(transposed ? 7 : 3);
      for (let n = 1; n <= 30; n++) {
        const { re, im } = wellConditioned(rand, n);
        const bRe = randomMatrix(rand, n, nrhs);
        const bIm = randomMatrix(rand, n, nrhs);
        const x = solveWith(re, im, n, bRe, bIm, nrhs, transposed);

        // mathjs lusolve as reference (one right-hand side per call, it takes a vector);
        // math.transpose is the plain, non-conjugate transpose.
        const aRows = complexRows(math, re, im, n);
        const op = transposed ? math.transpose(aRows) : aRows;
        let diff = 0;
        let size = 0;
        for (let c = 0; c < nrhs; c++) {
          const col = Array.from({ length: n }, (_, i) => [math.complex(bRe[i * nrhs + c], bIm[i * nrhs + c])]);
          const ref = math.lusolve(op, col) as unknown as Complex[][];
          for (let i = 0; i < n; i++) {
            const r = math.complex(ref[i][0]);
            diff = Math.max(diff, Math.hypot(x.re[i * nrhs + c] - r.re, x.im[i * nrhs + c] - r.im));
            size = Math.max(size, Math.hypot(r.re, r.im));
          }
        }
        // Diagonal boost keeps cond(A) = O(10), so two backward-stable solvers agree to ~1e-14.
        expect(diff / size, `n = ${n}`).toBeLessThan(1e-12);
        expect(relativeResidual(re, im, n, x.re, x.im, bRe, bIm, nrhs, transposed), `n = ${n}`).toBeLessThan(1e-14);
      }
    });
  }

  it("needs and performs pivoting: [[0, 1], [1, 0]] (zero leading entry)", () => {
    const re = Float64Array.from([0, 1, 1, 0]);
    const im = Float64Array.from([0, 0, 0, 0]);
    const x = solveWith(re, im, 2, Float64Array.from([2, 5]), Float64Array.from([3, 0]), 1, false);
    expect(Array.from(x.re)).toEqual([5, 2]);
    expect(Array.from(x.im)).toEqual([0, 3]);
  });

  it("transposed solve is not the conjugate-transposed solve", () => {
    // A = [[1, i], [0, 1]] ⇒ Aᵀ = [[1, 0], [i, 1]]; Aᵀ x = (1, 0) gives x = (1, −i),
    // whereas Aᴴ x = (1, 0) would give (1, i) (elementary algebra).
    const re = Float64Array.from([1, 0, 0, 1]);
    const im = Float64Array.from([0, 1, 0, 0]);
    const x = solveWith(re, im, 2, Float64Array.from([1, 0]), Float64Array.from([0, 0]), 1, true);
    expect(Array.from(x.re)).toEqual([1, 0]);
    expect(Array.from(x.im)).toEqual([0, -1]);
  });

  it("handles entries near the overflow threshold without spurious infinities", () => {
    const big = 1e300;
    const re = Float64Array.from([big, 0, 0, big]);
    const im = Float64Array.from([big, 0, 0, -big]);
    const x = solveWith(re, im, 2, Float64Array.from([big, 0]), Float64Array.from([0, big]), 1, false);
    // (1+i)x0 = 1 ⇒ x0 = (1 − i)/2; (1 − i)x1 = i ⇒ x1 = (−1 + i)/2 (elementary algebra).
    expect(x.re[0]).toBeCloseTo(0.5, 14);
    expect(x.im[0]).toBeCloseTo(-0.5, 14);
    expect(x.re[1]).toBeCloseTo(-0.5, 14);
    expect(x.im[1]).toBeCloseTo(0.5, 14);
  });

  it("throws SingularMatrixError naming the pivot for a zero column", () => {
    const re = Float64Array.from([1, 0, 3, 2, 0, 1, 5, 0, 2]);
    const im = Float64Array.from([0, 0, 1, 1, 0, 0, 0, 0, 0]);
    let caught: unknown;
    try {
      complexLuFactor(re, im, 3, new Int32Array(3));
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(SingularMatrixError);
    expect((caught as SingularMatrixError).pivotIndex).toBe(1);
    expect((caught as Error).message).toMatch(/singular at pivot 1/);
  });

  it("throws SingularMatrixError for an exactly rank-deficient matrix", () => {
    // Second row = (1 + i) × first row.
    const re = Float64Array.from([1, 2, 0, 3]);
    const im = Float64Array.from([1, -1, 2, 1]);
    expect(() => complexLuFactor(re, im, 2, new Int32Array(2))).toThrow(SingularMatrixError);
  });

  it("throws SingularMatrixError on NaN entries instead of returning garbage", () => {
    const re = Float64Array.from([NaN, 1, 1, 2]);
    const im = new Float64Array(4);
    expect(() => complexLuFactor(re, im, 2, new Int32Array(2))).toThrow(/not finite/);
  });

  it("property: random complex systems have small residuals (fast-check, seed 42)", () => {
    const entry = fc.double({ min: -10, max: 10, noNaN: true });
    const system = fc.integer({ min: 1, max: 12 }).chain((n) =>
      fc.record({
        n: fc.constant(n),
        re: fc.array(entry, { minLength: n * n, maxLength: n * n }),
        im: fc.array(entry, { minLength: n * n, maxLength: n * n }),
        b: fc.array(entry, { minLength: 2 * n, maxLength: 2 * n }),
      }),
    );
    fc.assert(
      fc.property(system, ({ n, re, im, b }) => {
        const aRe = Float64Array.from(re);
        const aIm = Float64Array.from(im);
        // Diagonal dominance so every generated case is nonsingular and well conditioned.
        for (let i = 0; i < n; i++) aRe[i * n + i] += 30 * n;
        const bRe = Float64Array.from(b.slice(0, n));
        const bIm = Float64Array.from(b.slice(n));
        for (const transposed of [false, true]) {
          const x = solveWith(aRe, aIm, n, bRe, bIm, 1, transposed);
          const r = relativeResidual(aRe, aIm, n, x.re, x.im, bRe, bIm, 1, transposed);
          if (!(r < 1e-14)) return false;
        }
        return true;
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});

describe("complex LU with the pivots' reciprocals kept", () => {
  it("factor and transposed solve give the same bits as without, and the kept values are 1/U[k][k]", () => {
    const rand = seededRandom(41);
    for (const n of [1, 3, 6, 11]) {
      const aRe = randomMatrix(rand, n);
      const aIm = randomMatrix(rand, n);
      const bRe = randomMatrix(rand, n, 2);
      const bIm = randomMatrix(rand, n, 2);
      const plain = solveWith(aRe, aIm, n, bRe, bIm, 2, true);
      const fRe = aRe.slice();
      const fIm = aIm.slice();
      const piv = new Int32Array(n);
      const inverses = { re: new Float64Array(n), im: new Float64Array(n) };
      complexLuFactor(fRe, fIm, n, piv, inverses);
      const xRe = bRe.slice();
      const xIm = bIm.slice();
      complexLuSolveTransposed(fRe, fIm, n, piv, xRe, xIm, 2, inverses);
      expect(Array.from(xRe)).toEqual(Array.from(plain.re));
      expect(Array.from(xIm)).toEqual(Array.from(plain.im));
      for (let k = 0; k < n; k++) {
        // (ur + i·ui)(ir + i·ii) = 1 up to rounding (elementary complex arithmetic).
        const ur = fRe[k * n + k];
        const ui = fIm[k * n + k];
        const ir = inverses.re[k];
        const ii = inverses.im[k];
        expect(Math.abs(ur * ir - ui * ii - 1)).toBeLessThan(1e-14);
        expect(Math.abs(ur * ii + ui * ir)).toBeLessThan(1e-14);
      }
    }
  });
});
