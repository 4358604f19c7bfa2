import { beforeAll, describe, expect, it } from "vitest";
import { symmetricEigenvalues } from "../../src/linalg/symmetric-eigen";
import { randomMatrix, seededRandom, toRows } from "./helpers";
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

function realEigsSorted(values: unknown): number[] {
  return (values as (number | { re: number })[]).map((v) => (typeof v === "number" ? v : v.re)).sort((x, y) => x - y);
}

describe("symmetricEigenvalues (Jacobi)", () => {
  it("matches mathjs eigs on random symmetric matrices, n = 1..25", () => {
    const rand = seededRandom(17);
    for (let n = 1; n <= 25; n++) {
      const a = randomSymmetric(rand, n);
      const got = symmetricEigenvalues(a, n);
      // mathjs eigs as reference (its symmetric path, which converges reliably).
      const ref = realEigsSorted(math.eigs(toRows(a, n), { eigenvectors: false }).values);
      // Symmetric eigenvalues are perfectly conditioned: both solvers are within a few eps·‖A‖.
      for (let i = 0; i < n; i++) expect(Math.abs(got[i] - ref[i]), `n = ${n}`).toBeLessThan(1e-12 * n);
    }
  });

  it("returns ascending order and leaves the input unchanged", () => {
    const a = randomSymmetric(seededRandom(3), 7);
    const copy = a.slice();
    const got = symmetricEigenvalues(a, 7);
    for (let i = 1; i < 7; i++) expect(got[i]).toBeGreaterThanOrEqual(got[i - 1]);
    expect(Array.from(a)).toEqual(Array.from(copy));
  });

  it("keeps tiny eigenvalues of a graded positive definite matrix to high relative accuracy", () => {
    // D H D with H = [[1, 0.5], [0.5, 1]], D = diag(1, 1e-10): eigenvalues ≈ 1 and 0.75e-20.
    // The product of the eigenvalues is det = 0.75e-20, so small = det / large (elementary
    // algebra). An absolute-accuracy method (error ~ eps·‖A‖ ≈ 1e-16) would lose it entirely.
    const a = Float64Array.from([1, 0.5e-10, 0.5e-10, 1e-20]);
    const got = symmetricEigenvalues(a, 2);
    const det = 1e-20 - 0.25e-20;
    const large = got[1];
    expect(Math.abs(got[0] - det / large) / (det / large)).toBeLessThan(1e-14);
  });
});
