import { describe, expect, it } from "vitest";
import { uncertaintyMargin } from "../../src/engine/covariance";
import { symmetricEigenvalues } from "../../src/linalg";
import { fastUncertaintyMargin, smallestSymmetricEigenvalue } from "../../src/timedomain/smallest-eigenvalue";
import { GaussianSource } from "../../src/timedomain/random";
import { handModel } from "./helpers";

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

  it("finds repeated and exactly zero eigenvalues (diag(3, 0, 0, 5) rotated)", () => {
    const c = Math.cos(0.3);
    const s = Math.sin(0.3);
    // Rotation in the (0, 1) and (2, 3) planes of diag(3, 0, 0, 5).
    const a = Float64Array.of(3 * c * c, 3 * c * s, 0, 0, 3 * c * s, 3 * s * s, 0, 0, 0, 0, 5 * s * s, 5 * c * s, 0, 0, 5 * c * s, 5 * c * c);
    expect(Math.abs(smallestSymmetricEigenvalue(a, 4))).toBeLessThan(1e-15);
  });

  it("the uncertainty margin equals uncertaintyMargin of engine/covariance.ts", () => {
    const model = handModel({
      modes: ["a", "b", "c"],
      A: Array.from({ length: 6 }, () => new Array(6).fill(0)),
      B: Array.from({ length: 6 }, () => []),
      N: [],
    });
    for (let seed = 0; seed < 10; seed++) {
      const r = randomSymmetric(6, seed);
      // V = RRᵀ/6 + I/2 (positive, near the quantum limit).
      const v = new Float64Array(36);
      for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) {
        let s = i === j ? 0.5 : 0;
        for (let k = 0; k < 6; k++) s += (r[i * 6 + k] * r[j * 6 + k]) / 6;
        v[i * 6 + j] = s;
      }
      expect(Math.abs(fastUncertaintyMargin(model.modes, v, 6) - uncertaintyMargin(model, v))).toBeLessThan(1e-13);
    }
    // Vacuum: the margin is exactly 0 (pure state at the limit).
    const vacuum = new Float64Array(36);
    for (let i = 0; i < 6; i++) vacuum[i * 7] = 0.5;
    expect(Math.abs(fastUncertaintyMargin(model.modes, vacuum, 6))).toBeLessThan(1e-15);
  });
});
