import { beforeAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import { hermitianEmbedding, minEigenvalueHermitian, shiftedPositiveDefinite } from "../../src/linalg/hermitian";
import { randomMatrix, seededRandom } from "./helpers";
import { type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

function randomSymmetric(rand: () => number, n: number): Float64Array {
  const a = randomMatrix(rand, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < i; j++) a[i * n + j] = a[j * n + i];
  return a;
}

/** Random Hermitian: symmetric real part, antisymmetric imaginary part. */
function randomHermitian(rand: () => number, n: number): { re: Float64Array; im: Float64Array } {
  const re = randomSymmetric(rand, n);
  const im = randomMatrix(rand, n);
  for (let i = 0; i < n; i++) {
    im[i * n + i] = 0;
    for (let j = 0; j < i; j++) im[i * n + j] = -im[j * n + i];
  }
  return { re, im };
}

function realEigsSorted(values: unknown): number[] {
  return (values as (number | { re: number })[]).map((v) => (typeof v === "number" ? v : v.re)).sort((x, y) => x - y);
}

describe("hermitianEmbedding", () => {
  it("is [[S, −K], [K, S]] with S + iK the Hermitian part (H + Hᴴ)/2, hence exactly symmetric (definition of the real embedding)", () => {
    const n = 3;
    const re = randomMatrix(seededRandom(5), n);
    const im = randomMatrix(seededRandom(6), n);
    const e = hermitianEmbedding(re, im, n);
    const m = 2 * n;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const s = (re[i * n + j] + re[j * n + i]) / 2;
        const k = (im[i * n + j] - im[j * n + i]) / 2;
        expect(e[i * m + j]).toBe(s);
        expect(e[(i + n) * m + (j + n)]).toBe(s);
        expect(e[i * m + (j + n)]).toBe(-k);
        expect(e[(i + n) * m + j]).toBe(k);
      }
    }
    // Exactly symmetric (the sign of a zero aside).
    for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) expect(Math.abs(e[i * m + j] - e[j * m + i])).toBe(0);
  });
});

describe("minEigenvalueHermitian", () => {
  it("2×2 [[a, −ib], [ib, a]] has eigenvalues a ± b (elementary algebra)", () => {
    for (const [a, b] of [
      [1, 0.5],
      [0.5, 0.5],
      [2, -3],
      [1e6, 1e-3],
    ]) {
      const re = Float64Array.from([a, 0, 0, a]);
      const im = Float64Array.from([0, -b, b, 0]);
      expect(Math.abs(minEigenvalueHermitian(re, im, 2) - (a - Math.abs(b)))).toBeLessThan(1e-15 * (a + Math.abs(b)));
    }
  });

  it("vacuum state saturates the uncertainty relation: V = I/2, Σ = [[0, 1], [−1, 0]] ⇒ min eig of V + (i/2)Σ is 0", () => {
    // V + (i/2)Σ = [[1/2, i/2], [−i/2, 1/2]], eigenvalues 0 and 1 (from memory / 2×2 algebra).
    const re = Float64Array.from([0.5, 0, 0, 0.5]);
    const im = Float64Array.from([0, 0.5, -0.5, 0]);
    expect(Math.abs(minEigenvalueHermitian(re, im, 2))).toBeLessThan(1e-16);
  });

  it("matches mathjs eigs of the real embedding and sees each eigenvalue twice", () => {
    const rand = seededRandom(23);
    for (const n of [1, 2, 3, 5, 8, 13]) {
      const { re, im } = randomHermitian(rand, n);
      const emb: number[][] = [];
      for (let i = 0; i < 2 * n; i++) {
        emb.push(
          Array.from({ length: 2 * n }, (_, j) => {
            const r = i % n;
            const c = j % n;
            const top = i < n;
            const left = j < n;
            if (top === left) return re[r * n + c];
            return top ? -im[r * n + c] : im[r * n + c];
          }),
        );
      }
      // mathjs eigs as reference on the symmetric embedding.
      const ref = realEigsSorted(math.eigs(emb, { eigenvectors: false }).values);
      expect(Math.abs(minEigenvalueHermitian(re, im, n) - ref[0]), `n = ${n}`).toBeLessThan(1e-12 * n);
      // Doubling is what makes the embedding valid: eigenvalues pair up.
      for (let k = 0; k < 2 * n; k += 2) expect(Math.abs(ref[k] - ref[k + 1]), `n = ${n}`).toBeLessThan(1e-10);
    }
  });

  it("uses the Hermitian part (H + Hᴴ)/2 of a non-Hermitian input", () => {
    // Off-diagonal entries 0.5 + 0.2i (upper) and 0.1 + 0.4i (lower): the Hermitian part has
    // z = (0.5 + 0.2i + conj(0.1 + 0.4i))/2 = 0.3 − 0.1i above the diagonal, |z|² = 0.1.
    // Eigenvalues of [[1, z], [z̄, 2]] are 1.5 ± sqrt(0.25 + |z|²) (elementary algebra);
    // the upper triangle alone (|z|² = 0.29) would give a different answer.
    const re = Float64Array.from([1, 0.5, 0.1, 2]);
    const im = Float64Array.from([0, 0.2, 0.4, 0]);
    const want = 1.5 - Math.sqrt(0.25 + 0.1);
    expect(Math.abs(minEigenvalueHermitian(re, im, 2) - want)).toBeLessThan(1e-15);
  });

  it("property: min eigenvalue ≤ every Rayleigh quotient (fast-check, seed 42)", () => {
    const input = fc.integer({ min: 1, max: 8 }).chain((n) =>
      fc.record({
        n: fc.constant(n),
        seed: fc.integer({ min: 1, max: 2 ** 31 - 1 }),
        x: fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 2 * n, maxLength: 2 * n }),
      }),
    );
    fc.assert(
      fc.property(input, ({ n, seed, x }) => {
        const { re, im } = randomHermitian(seededRandom(seed), n);
        const lmin = minEigenvalueHermitian(re, im, n);
        // Rayleigh quotient xᴴ H x / xᴴ x for x = xr + i·xi.
        let num = 0;
        let den = 0;
        for (let i = 0; i < n; i++) {
          den += x[i] ** 2 + x[n + i] ** 2;
          for (let j = 0; j < n; j++) {
            const hr = re[i * n + j];
            const hi = im[i * n + j];
            // Re[(xr_i − i xi_i)(hr + i hi)(xr_j + i xi_j)]
            const pr = hr * x[j] - hi * x[n + j];
            const pi = hr * x[n + j] + hi * x[j];
            num += x[i] * pr + x[n + i] * pi;
          }
        }
        if (den < 1e-12) return true;
        return lmin <= num / den + 1e-12 * n;
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});

describe("shiftedPositiveDefinite", () => {
  /** The smallest eigenvalue of the Hermitian matrix by mathjs eigs of its real embedding (reference). */
  function mathjsMin(re: Float64Array, im: Float64Array, n: number): number {
    const emb = hermitianEmbedding(re, im, n);
    const rows = Array.from({ length: 2 * n }, (_, i) => Array.from(emb.subarray(2 * n * i, 2 * n * (i + 1))));
    return realEigsSorted(math.eigs(rows, { eigenvectors: false }).values)[0];
  }

  it("agrees with mathjs eigs: true when the smallest eigenvalue is above −shift, false when below, away from the boundary", () => {
    const rand = seededRandom(31);
    let yes = 0;
    let no = 0;
    for (let trial = 0; trial < 120; trial++) {
      const n = 1 + (trial % 6);
      const { re, im } = randomHermitian(rand, n);
      const lmin = mathjsMin(re, im, n);
      // Shifts on both sides of −λmin, at least 1e-6 away from it (far beyond rounding).
      const shift = -lmin + (trial % 2 === 0 ? 1 : -1) * (1e-6 + rand());
      const expected = lmin > -shift;
      expect(shiftedPositiveDefinite(re, im, n, shift), `n = ${n}, λmin = ${lmin}, shift = ${shift}`).toBe(expected);
      if (expected) yes++;
      else no++;
    }
    expect(yes).toBeGreaterThan(30);
    expect(no).toBeGreaterThan(30);
  });

  it("a pure state's V + iΣ/2 (smallest eigenvalue exactly 0): true for any positive shift, false for none (vacuum V = I/2, from memory)", () => {
    // One mode: V = diag(1/2, 1/2), Σ/2 = [[0, 1/2], [−1/2, 0]]: eigenvalues 0 and 1.
    const re = Float64Array.from([0.5, 0, 0, 0.5]);
    const im = Float64Array.from([0, 0.5, -0.5, 0]);
    expect(shiftedPositiveDefinite(re, im, 2, 1e-12)).toBe(true);
    expect(shiftedPositiveDefinite(re, im, 2, -1e-12)).toBe(false);
  });

  it("decides nothing (false) for a non-finite entry", () => {
    expect(shiftedPositiveDefinite(Float64Array.from([Number.NaN]), Float64Array.from([0]), 1, 1)).toBe(false);
    expect(shiftedPositiveDefinite(Float64Array.from([Infinity]), Float64Array.from([0]), 1, 1)).toBe(false);
  });
});
