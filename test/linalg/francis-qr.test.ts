import { beforeAll, describe, expect, it } from "vitest";
import { eigenvalues2x2, hessenbergEigenvalues } from "../../src/linalg/francis-qr";
import { reduceToHessenbergInPlace } from "../../src/linalg/hessenberg";
import { knownSpectrum, multisetDistance, randomMatrix, seededRandom, spreadSpectrum, toRows, type Eig } from "./helpers";
import { type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

function n0(pairs: number, reals: number): number {
  return 2 * pairs + reals;
}

function eigsOf(h: Float64Array, n: number): Eig[] {
  const wr = new Float64Array(n);
  const wi = new Float64Array(n);
  hessenbergEigenvalues(h.slice(), n, wr, wi, 0, 60 * n);
  return Array.from(wr, (re, i) => ({ re, im: wi[i] }));
}

describe("eigenvalues of a 2×2 block", () => {
  it.each([
    [1, 2, 3, 4],
    [0, 1, -1, 0],
    [2, 1, 0, 2],
    [-0.5, 3, -3, -0.5],
    [1e-8, 1, 1e-20, 1e-8],
  ])("[[%f, %f], [%f, %f]] gives (a+d)/2 ± √(((a−d)/2)² + bc) (quadratic formula)", (a, b, c, d) => {
    const out = new Float64Array(4);
    eigenvalues2x2(a, b, c, d, out);
    const mid = (a + d) / 2;
    const disc = ((a - d) / 2) ** 2 + b * c;
    const want: Eig[] =
      disc >= 0
        ? [
            { re: mid + Math.sqrt(disc), im: 0 },
            { re: mid - Math.sqrt(disc), im: 0 },
          ]
        : [
            { re: mid, im: Math.sqrt(-disc) },
            { re: mid, im: -Math.sqrt(-disc) },
          ];
    const got = [
      { re: out[0], im: out[1] },
      { re: out[2], im: out[3] },
    ];
    expect(multisetDistance(got, want)).toBeLessThan(1e-15 * Math.max(1, Math.abs(a), Math.abs(b), Math.abs(c), Math.abs(d)));
  });

  it("keeps the small root of a nearly singular block to full relative accuracy (product of the roots = det, Vieta)", () => {
    // [[1, 1], [1e-12, 1e-12]]... det = 1e-12 − 1e-12 = 0 would be exact; use det = 1e-13 instead.
    const a = 1;
    const b = 1;
    const c = -1e-13;
    const d = 0;
    const out = new Float64Array(4);
    eigenvalues2x2(a, b, c, d, out);
    const small = Math.abs(out[0]) < Math.abs(out[2]) ? out[0] : out[2];
    const large = Math.abs(out[0]) < Math.abs(out[2]) ? out[2] : out[0];
    const det = a * d - b * c;
    expect(Math.abs(small * large - det) / det).toBeLessThan(1e-15);
  });
});

describe("Francis double-shift QR on a Hessenberg matrix", () => {
  it.each([2, 4, 7])("order %i: eigenvalues match mathjs eigs of the same matrix (mathjs as reference)", (n) => {
    const h = randomMatrix(seededRandom(70 + n), n);
    reduceToHessenbergInPlace(h, n);
    const ref = (math.eigs(toRows(h, n), { eigenvectors: false }).values as unknown as (number | { re: number; im: number })[]).map((v) =>
      typeof v === "number" ? { re: v, im: 0 } : { re: v.re, im: v.im },
    );
    expect(multisetDistance(eigsOf(h, n), ref)).toBeLessThan(1e-10 * n);
  });

  it.each([
    [3, 6],
    [6, 8],
  ])("%i complex pairs and %i real eigenvalues, hidden by an orthogonal similarity, are recovered (closed-form spectrum)", (pairs, reals) => {
    const want = spreadSpectrum(pairs, reals);
    const { a, n } = knownSpectrum(seededRandom(100 + n0(pairs, reals)), want);
    reduceToHessenbergInPlace(a, n);
    // A normal matrix: every eigenvalue is perfectly conditioned, so a backward-stable solver is within a few eps·‖A‖·n.
    expect(multisetDistance(eigsOf(a, n), want)).toBeLessThan(1e-12 * n);
  });

  it("a companion matrix (already Hessenberg) of (x − 1)(x − 2)(x − 3)(x − 4) gives 1, 2, 3, 4 (its characteristic polynomial)", () => {
    // x⁴ − 10x³ + 35x² − 50x + 24: ones on the subdiagonal, −c_k in the last column.
    const c = [24, -50, 35, -10];
    const n = 4;
    const h = new Float64Array(n * n);
    for (let i = 1; i < n; i++) h[i * n + i - 1] = 1;
    for (let i = 0; i < n; i++) h[i * n + n - 1] = -c[i];
    const want = [1, 2, 3, 4].map((re) => ({ re, im: 0 }));
    expect(multisetDistance(eigsOf(h, n), want)).toBeLessThan(1e-11);
  });

  it("reports when the sweep budget runs out, and returns the sweeps it used otherwise", () => {
    const n = 6;
    const h = randomMatrix(seededRandom(5), n);
    reduceToHessenbergInPlace(h, n);
    const wr = new Float64Array(n);
    const wi = new Float64Array(n);
    expect(() => hessenbergEigenvalues(h.slice(), n, wr, wi, 0, 0)).toThrow();
    const used = hessenbergEigenvalues(h.slice(), n, wr, wi, 0, 60 * n);
    expect(used).toBeGreaterThan(0);
    expect(used).toBeLessThanOrEqual(60 * n);
  });
});
