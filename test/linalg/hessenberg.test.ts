import { beforeAll, describe, expect, it } from "vitest";
import { reduceToHessenbergInPlace } from "../../src/linalg/hessenberg";
import { knownSpectrum, multisetDistance, randomMatrix, seededRandom, spreadSpectrum, toRows, type Eig } from "./helpers";
import { type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

function eigs(a: Float64Array, n: number): Eig[] {
  return (math.eigs(toRows(a, n), { eigenvectors: false }).values as unknown as (number | { re: number; im: number })[]).map((v) =>
    typeof v === "number" ? { re: v, im: 0 } : { re: v.re, im: v.im },
  );
}

describe("Householder reduction to Hessenberg form", () => {
  it.each([3, 5, 8])("order %i: exact zeros below the subdiagonal, same eigenvalues (mathjs eigs as reference), same trace and Frobenius norm (orthogonal similarity)", (n) => {
    const a = randomMatrix(seededRandom(40 + n), n);
    const h = a.slice();
    reduceToHessenbergInPlace(h, n);
    for (let i = 2; i < n; i++) for (let j = 0; j < i - 1; j++) expect(h[i * n + j]).toBe(0);
    let traceA = 0;
    let traceH = 0;
    let frobA = 0;
    let frobH = 0;
    for (let i = 0; i < n; i++) {
      traceA += a[i * n + i];
      traceH += h[i * n + i];
    }
    for (let i = 0; i < n * n; i++) {
      frobA += a[i] * a[i];
      frobH += h[i] * h[i];
    }
    expect(Math.abs(traceH - traceA)).toBeLessThan(1e-13 * n);
    expect(Math.abs(Math.sqrt(frobH) - Math.sqrt(frobA))).toBeLessThan(1e-13 * n * Math.sqrt(frobA));
    expect(multisetDistance(eigs(h, n), eigs(a, n))).toBeLessThan(1e-11 * n);
  });

  it("order 13 with a known spectrum (Q B Qᵀ, a similarity): det(H − μI) is Π(λ_k − μ), the characteristic polynomial (mathjs det against the closed form)", () => {
    const want = spreadSpectrum(4, 5);
    const { a, n } = knownSpectrum(seededRandom(13), want);
    const h = a.slice();
    reduceToHessenbergInPlace(h, n);
    for (let i = 2; i < n; i++) for (let j = 0; j < i - 1; j++) expect(h[i * n + j]).toBe(0);
    for (const mu of [0.37, -1.9, 2.6, 4]) {
      const shifted = toRows(h, n).map((row, i) => row.map((x, j) => (i === j ? x - mu : x)));
      const det = math.det(shifted) as number;
      // Conjugate pairs multiply to a real factor: (μ − a)² + b².
      let poly = 1;
      for (const e of want) poly *= e.im === 0 ? e.re - mu : Math.sqrt((mu - e.re) ** 2 + e.im ** 2);
      expect(Math.abs(det - poly), `μ = ${mu}`).toBeLessThan(1e-11 * Math.abs(poly) * n);
    }
  });

  it("leaves a matrix that is already upper Hessenberg bit for bit unchanged (nothing to annihilate)", () => {
    const n = 5;
    const a = randomMatrix(seededRandom(9), n);
    for (let i = 2; i < n; i++) for (let j = 0; j < i - 1; j++) a[i * n + j] = 0;
    const h = a.slice();
    reduceToHessenbergInPlace(h, n);
    expect(Array.from(h)).toEqual(Array.from(a));
  });
});
