import { beforeAll, describe, expect, it } from "vitest";
import { symmetricEigenvalues } from "../../src/linalg/symmetric-eigen";
import { smallestSymmetricEigenvalue } from "../../src/linalg/smallest-eigenvalue";
import { GaussianSource } from "../../src/timedomain/random";
import { toRows } from "./helpers";
import { type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

/** Deterministic test matrices (seeded; invented data). */
function randomSymmetric(m: number, seed: number): Float64Array {
  const g = new GaussianSource(seed);
  const a = new Float64Array(m * m);
  for (let i = 0; i < m; i++) for (let j = 0; j <= i; j++) a[i * m + j] = a[j * m + i] = g.normal();
  return a;
}

describe("smallest eigenvalue by tridiagonalization and bisection", () => {
  it.each([1, 2, 3, 7, 24, 48])("agrees with the Jacobi solver of src/linalg for order %i (the reference inside the project, itself checked against mathjs)", (m) => {
    for (let seed = 0; seed < 5; seed++) {
      const a = randomSymmetric(m, 1000 * m + seed);
      const ref = symmetricEigenvalues(Float64Array.from(a), m)[0];
      const scale = Math.max(...Array.from(symmetricEigenvalues(Float64Array.from(a), m), Math.abs));
      expect(Math.abs(smallestSymmetricEigenvalue(a, m) - ref)).toBeLessThan(1e-13 * scale * m);
    }
  });

  it.each([4, 12, 30])("matches the smallest of mathjs eigs for order %i (mathjs's symmetric path as reference)", (m) => {
    const a = randomSymmetric(m, 77 + m);
    const values = (math.eigs(toRows(a, m), { eigenvectors: false }).values as unknown as number[]).slice().sort((x, y) => x - y);
    const scale = Math.max(...values.map(Math.abs));
    expect(Math.abs(smallestSymmetricEigenvalue(a, m) - values[0])).toBeLessThan(1e-13 * scale * m);
  });

  it("finds repeated and exactly zero eigenvalues (diag(3, 0, 0, 5) rotated)", () => {
    const c = Math.cos(0.3);
    const s = Math.sin(0.3);
    // Rotation in the (0, 1) and (2, 3) planes of diag(3, 0, 0, 5).
    const a = Float64Array.of(3 * c * c, 3 * c * s, 0, 0, 3 * c * s, 3 * s * s, 0, 0, 0, 0, 5 * s * s, 5 * c * s, 0, 0, 5 * c * s, 5 * c * c);
    expect(Math.abs(smallestSymmetricEigenvalue(a, 4))).toBeLessThan(1e-15);
  });
});
