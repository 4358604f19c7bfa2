import { beforeAll, describe, expect, it } from "vitest";
import { realEigenvalues } from "../../src/linalg/eigen";
import { solveLyapunov } from "../../src/linalg/lyapunov";
import { fromRows, matMul, maxAbs, randomMatrix, randomOrthogonal, seededRandom, toRows, transpose } from "./helpers";
import { type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

/** ‖A V + V Aᵀ + Q‖max / (2‖A‖max‖V‖max·n + ‖Q‖max). */
function relativeResidual(a: Float64Array, v: Float64Array, q: Float64Array, n: number): number {
  const av = matMul(a, v, n, n, n);
  const vat = matMul(v, transpose(a, n), n, n, n);
  const r = av.map((x, i) => x + vat[i] + q[i]);
  return maxAbs(r) / (2 * n * maxAbs(a) * maxAbs(v) + maxAbs(q));
}

/** Random stable A: random matrix shifted left of its rightmost eigenvalue. */
function randomStable(rand: () => number, n: number): Float64Array {
  const a = randomMatrix(rand, n);
  const eig = realEigenvalues(a, n);
  const shift = Math.max(...eig.re) + 0.1 + rand();
  for (let i = 0; i < n; i++) a[i * n + i] -= shift;
  return a;
}

/** Random symmetric positive semidefinite Q = B Bᵀ. */
function randomDiffusion(rand: () => number, n: number): Float64Array {
  const b = randomMatrix(rand, n);
  return matMul(b, transpose(b, n), n, n, n);
}

describe("solveLyapunov", () => {
  it("matches the full n²-unknown Kronecker system solved by mathjs lusolve", () => {
    const rand = seededRandom(99);
    for (const n of [1, 2, 3, 4, 6, 9, 12]) {
      const a = randomStable(rand, n);
      const q = randomDiffusion(rand, n);
      const v = solveLyapunov(a, q, n);
      // Reference: (I⊗A + A⊗I) vec(V) = −vec(Q) with all n² unknowns (no symmetry used),
      // solved by mathjs lusolve. Row-major vec: unknown i·n + j is V[i][j].
      const big = Array.from({ length: n * n }, () => new Array<number>(n * n).fill(0));
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          for (let k = 0; k < n; k++) {
            big[i * n + j][k * n + j] += a[i * n + k];
            big[i * n + j][i * n + k] += a[j * n + k];
          }
        }
      }
      const ref = (
        math.lusolve(
          big,
          Array.from(q, (x) => [-x]),
        ) as number[][]
      ).map((r) => r[0]);
      const diff = maxAbs(Array.from(v, (x, i) => x - ref[i]));
      // The shifted random A keeps the Lyapunov operator's condition number O(10–100),
      // so two backward-stable solves agree to ≪ 1e-10.
      expect(diff / maxAbs(ref), `n = ${n}`).toBeLessThan(1e-10);
      expect(relativeResidual(a, v, q, n), `n = ${n}`).toBeLessThan(1e-14);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) expect(v[i * n + j]).toBe(v[j * n + i]);
    }
  });

  it("matches mathjs lyap wherever mathjs's own answer satisfies the equation", () => {
    // mathjs lyap as reference. Its Schur step is not always accurate (for some random
    // matrices its own residual is ~1e-3), so a case counts only when mathjs's residual is
    // at rounding level (about half of these cases); at least 5 of the 16 must qualify so
    // the comparison cannot silently vanish.
    const rand = seededRandom(100);
    let compared = 0;
    for (let rep = 0; rep < 16; rep++) {
      const n = 2 + (rep % 7);
      const a = randomStable(rand, n);
      const q = randomDiffusion(rand, n);
      const v = solveLyapunov(a, q, n);
      const ref = fromRows(math.lyap(toRows(a, n), toRows(q, n)) as unknown as number[][]);
      if (!(relativeResidual(a, ref, q, n) < 1e-14)) continue;
      compared++;
      expect(maxAbs(v.map((x, i) => x - ref[i])) / maxAbs(ref), `n = ${n}`).toBeLessThan(1e-10);
    }
    expect(compared).toBeGreaterThanOrEqual(5);
  });

  it("mathjs lyap sign convention is A P + P Aᵀ + Q = 0, the same as ours (guards the test above)", () => {
    // A = −I, Q = I: A P + P Aᵀ + Q = 0 ⇒ P = I/2; the other convention would give −I/2.
    const p = math.lyap(
      [
        [-1, 0],
        [0, -1],
      ],
      [
        [1, 0],
        [0, 1],
      ],
    ) as unknown as number[][];
    expect(p[0][0]).toBeCloseTo(0.5, 15);
    expect(p[1][1]).toBeCloseTo(0.5, 15);
  });

  it("damped oscillator A = [[0, w], [−w, −g]], Q = diag(0, 2gc) gives V = c·I", () => {
    // With V = c·I: A V + V Aᵀ = c(A + Aᵀ) = diag(0, −2gc), which cancels Q exactly.
    // Uniqueness (A stable) makes V = c·I the solution (elementary algebra).
    for (const [w, g, c] of [
      [1, 0.1, 0.5],
      [2 * Math.PI * 1e5, 1e-3, 3.7e4],
      [1, 1e-8, 1e6],
    ]) {
      const a = Float64Array.from([0, w, -w, -g]);
      const q = Float64Array.from([0, 0, 0, 2 * g * c]);
      const v = solveLyapunov(a, q, 2);
      // The three packed equations are 2w·V01 = 0, w(V11 − V00) − g·V01 = 0 and
      // −2(w·V01 + g·V11) = −2gc: elimination involves only a few roundings, even for w/g = 1e8.
      expect(Math.abs(v[0] - c) / c, `w=${w} g=${g}`).toBeLessThan(1e-14);
      expect(Math.abs(v[3] - c) / c, `w=${w} g=${g}`).toBeLessThan(1e-14);
      expect(Math.abs(v[1]) / c, `w=${w} g=${g}`).toBeLessThan(1e-14);
    }
  });

  it("two decoupled oscillators at very different scales: V = diag(c1·I, c2·I)", () => {
    const w1 = 1;
    const g1 = 1e-3;
    const c1 = 2;
    const w2 = 1e9;
    const g2 = 1e8;
    const c2 = 0.5;
    const a = fromRows([
      [0, w1, 0, 0],
      [-w1, -g1, 0, 0],
      [0, 0, 0, w2],
      [0, 0, -w2, -g2],
    ]);
    const q = new Float64Array(16);
    q[5] = 2 * g1 * c1;
    q[15] = 2 * g2 * c2;
    const v = solveLyapunov(a, q, 4);
    const want = [c1, c1, c2, c2];
    for (let i = 0; i < 4; i++) {
      for (let j = 0; j < 4; j++) {
        const expected = i === j ? want[i] : 0;
        // Cross-block unknowns satisfy a homogeneous nonsingular system (exactly 0); the
        // in-block ones are the 2×2 case above: a few roundings at most.
        expect(Math.abs(v[i * 4 + j] - expected), `(${i}, ${j})`).toBeLessThan(1e-14 * want[i]);
      }
    }
  });

  it("handles n = 40 (820 unknowns) with a small residual", () => {
    const rand = seededRandom(40);
    const n = 40;
    const a = randomStable(rand, n);
    const q = randomDiffusion(rand, n);
    const v = solveLyapunov(a, q, n);
    expect(relativeResidual(a, v, q, n)).toBeLessThan(1e-13);
  });

  it("rejects an undamped oscillator, naming the mode", () => {
    const a = Float64Array.from([0, 1, -1, 0]);
    expect(() => solveLyapunov(a, Float64Array.from([0, 0, 0, 1]), 2)).toThrow(/not stable.*undamped/);
  });

  it("rejects an undamped mode hidden by a rotation next to a damped one", () => {
    const n = 4;
    const d = fromRows([
      [0, 2, 0, 0],
      [-2, 0, 0, 0],
      [0, 0, -1, 3],
      [0, 0, -3, -1],
    ]);
    const q = randomOrthogonal(seededRandom(8), n);
    const a = matMul(matMul(q, d, n, n, n), transpose(q, n), n, n, n);
    expect(() => solveLyapunov(a, randomDiffusion(seededRandom(9), n), n)).toThrow(/not stable.*undamped/);
  });

  it("accepts a 1e-8 damping next to an uncoupled 1e9 cavity", () => {
    const a = fromRows([
      [0, 1, 0, 0],
      [-1, -1e-8, 0, 0],
      [0, 0, -5e7, 1e9],
      [0, 0, -1e9, -5e7],
    ]);
    const q = new Float64Array(16);
    q[5] = 2e-8 * 3; // c = 3 for the slow oscillator (closed form above)
    const v = solveLyapunov(a, q, 4);
    expect(Math.abs(v[0] - 3) / 3).toBeLessThan(1e-12);
    expect(Math.abs(v[5] - 3) / 3).toBeLessThan(1e-12);
  });

  it("rejects a growing mode and a free integrator", () => {
    // [[0.5, 1], [−1, 0.1]]: trace 0.6 > 0 and det > 0 ⇒ a growing complex pair.
    expect(() => solveLyapunov(Float64Array.from([0.5, 1, -1, 0.1]), new Float64Array(4), 2)).toThrow(/growing/);
    expect(() => solveLyapunov(Float64Array.from([0, 1, 0, -1]), new Float64Array(4), 2)).toThrow(/not stable/);
  });

  it("uses the symmetric part of Q", () => {
    const a = Float64Array.from([-1, 0.3, 0.2, -2]);
    const sym = Float64Array.from([1, 0.5, 0.5, 2]);
    const skewed = Float64Array.from([1, 0.9, 0.1, 2]);
    expect(Array.from(solveLyapunov(a, skewed, 2))).toEqual(Array.from(solveLyapunov(a, sym, 2)));
  });
});
