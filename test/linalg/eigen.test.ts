import { beforeAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import { eigenvectorFor, realEigenvalues } from "../../src/linalg/eigen";
import { type Eig, fromRows, matMul, multisetDistance, pairs, randomMatrix, randomOrthogonal, seededRandom, toRows, transpose } from "./helpers";
import { type Complex, type MathJsStatic, loadMathjs } from "./mathjs-reference";

let math: MathJsStatic;
beforeAll(async () => {
  math = await loadMathjs();
});

/** Companion matrix of the monic polynomial with the given (complex-conjugate-closed) roots. */
function companionFromRoots(roots: Eig[]): Float64Array {
  // Expand Π (x − r) with complex coefficients; the result is real for conjugate-closed roots.
  let cr = [1];
  let ci = [0];
  for (const r of roots) {
    const nr = new Array<number>(cr.length + 1).fill(0);
    const ni = new Array<number>(cr.length + 1).fill(0);
    for (let k = 0; k < cr.length; k++) {
      nr[k + 1] += cr[k];
      ni[k + 1] += ci[k];
      nr[k] -= r.re * cr[k] - r.im * ci[k];
      ni[k] -= r.re * ci[k] + r.im * cr[k];
    }
    cr = nr;
    ci = ni;
  }
  // cr[k] is the coefficient of x^k; companion: ones on the subdiagonal, −c_k in the last column.
  const n = roots.length;
  const a = new Float64Array(n * n);
  for (let i = 1; i < n; i++) a[i * n + i - 1] = 1;
  for (let i = 0; i < n; i++) a[i * n + n - 1] = -cr[i];
  return a;
}

function maxAbsRowSum(a: Float64Array, n: number): number {
  let m = 0;
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let j = 0; j < n; j++) s += Math.abs(a[i * n + j]);
    m = Math.max(m, s);
  }
  return m;
}

describe("realEigenvalues", () => {
  it("matches mathjs eigs on random nonsymmetric matrices, n = 1..20, 30, 40", () => {
    const rand = seededRandom(2024);
    let compared = 0;
    for (const n of [...Array.from({ length: 20 }, (_, i) => i + 1), 30, 40]) {
      for (let rep = 0; rep < (n <= 20 ? 5 : 1); rep++) {
        const a = randomMatrix(rand, n);
        const got = pairs(realEigenvalues(a, n));
        const normA = maxAbsRowSum(a, n);

        // Every computed λ must make A − λI numerically singular: mathjs lusolve as
        // reference shows ‖(A − λI)⁻¹ b‖ ≫ ‖b‖/‖A‖ (an error of 1e-9·‖A‖ in λ would cap
        // the growth near 1e9; accurate eigenvalues give ≳ 1e12).
        for (const e of got) {
          const shifted = toRows(a, n).map((row, i) => row.map((x, j) => (i === j ? math.complex(x - e.re, -e.im) : math.complex(x, 0))));
          const b = Array.from({ length: n }, (_, i) => [math.complex(1 + i / n, 0)]);
          let growth = Infinity; // mathjs refusing an exactly singular system is a pass
          try {
            const x = math.lusolve(shifted, b) as unknown as Complex[][];
            growth = (Math.max(...x.map((r) => math.abs(r[0]) as unknown as number)) * normA) / 2;
          } catch (err) {
            expect(String(err)).toMatch(/singular/);
          }
          expect(growth, `n = ${n}, λ = ${JSON.stringify(e)}`).toBeGreaterThan(1e9);
        }

        // mathjs eigs as reference for the full multiset (multiplicities included). Its
        // nonsymmetric solver does not converge for some random matrices (it throws); those
        // are covered by the check above only, and a minimum number of comparisons is enforced.
        let ref: Eig[];
        try {
          ref = (math.eigs(toRows(a, n), { eigenvectors: false }).values as unknown as (number | Complex)[]).map((v) => (typeof v === "number" ? { re: v, im: 0 } : { re: v.re, im: v.im }));
        } catch (err) {
          expect(String(err)).toMatch(/failed to converge/);
          continue;
        }
        compared++;
        // Random matrices have modest eigenvalue condition numbers (≲ 1e3), so two
        // backward-stable solvers (errors ~ 1e-15·‖A‖·cond) agree far inside 1e-9·‖A‖.
        expect(multisetDistance(got, ref), `n = ${n}`).toBeLessThan(1e-9 * normA);
      }
    }
    expect(compared).toBeGreaterThanOrEqual(40);
  });

  it("2×2 damped oscillator [[0, w], [−w, −g]]: λ = −g/2 ± i·sqrt(w² − g²/4)", () => {
    // Closed form by elementary algebra: λ² + gλ + w² = 0.
    for (const [w, g] of [
      [1, 0.1],
      [2 * Math.PI * 1e3, 1e-2],
      [3, 5.5],
    ]) {
      const got = pairs(realEigenvalues(Float64Array.from([0, w, -w, -g]), 2));
      const disc = w * w - (g * g) / 4;
      const want =
        disc >= 0
          ? [
              { re: -g / 2, im: Math.sqrt(disc) },
              { re: -g / 2, im: -Math.sqrt(disc) },
            ]
          : [
              { re: -g / 2 + Math.sqrt(-disc), im: 0 },
              { re: -g / 2 - Math.sqrt(-disc), im: 0 },
            ];
      expect(multisetDistance(got, want)).toBeLessThan(1e-14 * Math.max(w, g));
      // The damping itself must come out to relative accuracy, not only relative to |λ|.
      if (disc >= 0) for (const e of got) expect(Math.abs(e.re + g / 2)).toBeLessThan(1e-12 * g);
    }
  });

  it("companion matrices recover known polynomial roots", () => {
    const cases: Eig[][] = [
      [1, 2, 3, 4, 5].map((r) => ({ re: r, im: 0 })),
      [
        { re: -1, im: 2 },
        { re: -1, im: -2 },
        { re: 0.5, im: 0 },
        { re: -3, im: 0 },
      ],
      // Sixth roots of unity.
      Array.from({ length: 6 }, (_, k) => ({ re: Math.cos((k * Math.PI) / 3), im: Math.sin((k * Math.PI) / 3) })),
      [
        { re: -0.1, im: 10 },
        { re: -0.1, im: -10 },
        { re: -0.2, im: 1 },
        { re: -0.2, im: -1 },
        { re: 7, im: 0 },
      ],
    ];
    for (const roots of cases) {
      const n = roots.length;
      const got = pairs(realEigenvalues(companionFromRoots(roots), n));
      // Roots here are simple and separated; companion eigenvalues are then accurate to
      // roughly eps·(coefficient size)·(root conditioning) ≈ 1e-11 for these polynomials.
      const scale = Math.max(...roots.map((r) => Math.hypot(r.re, r.im)));
      expect(multisetDistance(got, roots), JSON.stringify(roots)).toBeLessThan(1e-9 * scale);
    }
  });

  it("keeps each block's accuracy in a block-diagonal matrix mixing scales 1e-9 … 1e9", () => {
    // Slow mechanical oscillator (w = 1, g = 1e-8), a fast cavity (κ = 1e8, Δ = 1e9), and a
    // small 3×3 block that needs real QR sweeps; states interleaved by a permutation.
    const blocks: { a: number[][]; want: Eig[] }[] = [
      {
        a: [
          [0, 1],
          [-1, -1e-8],
        ],
        want: [
          { re: -5e-9, im: Math.sqrt(1 - 2.5e-17) },
          { re: -5e-9, im: -Math.sqrt(1 - 2.5e-17) },
        ],
      },
      {
        a: [
          [-5e7, 1e9],
          [-1e9, -5e7],
        ],
        want: [
          { re: -5e7, im: 1e9 },
          { re: -5e7, im: -1e9 },
        ],
      },
      {
        // Upper triangular 3×3 at scale 1e-9, conjugated by a fixed rotation below.
        a: [
          [-1e-9, 2e-9, 0.5e-9],
          [0, -3e-9, 1e-9],
          [0, 0, -7e-9],
        ],
        want: [
          { re: -1e-9, im: 0 },
          { re: -3e-9, im: 0 },
          { re: -7e-9, im: 0 },
        ],
      },
    ];
    // Hide the triangular structure of the third block: Q T Qᵀ with a random orthogonal Q.
    const q = randomOrthogonal(seededRandom(5), 3);
    const t = fromRows(blocks[2].a);
    blocks[2].a = toRows(matMul(matMul(q, t, 3, 3, 3), transpose(q, 3), 3, 3, 3), 3);

    const n = 7;
    const dense = new Float64Array(n * n);
    let off = 0;
    for (const b of blocks) {
      const m = b.a.length;
      for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) dense[(off + i) * n + off + j] = b.a[i][j];
      off += m;
    }
    const perm = [4, 0, 6, 2, 5, 1, 3];
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[perm[i] * n + perm[j]] = dense[i * n + j];

    const got = pairs(realEigenvalues(a, n));
    // Tolerance 1e-9 relative, for real and imaginary parts separately: the blocks are
    // decoupled exactly, so each is computed at its own scale with error ~ eps·cond; the
    // margin covers the modest conditioning of the rotated triangular block. An error
    // relative to ‖A‖ ≈ 1e9 instead (≈ 1e-7 absolute) would wipe out every small eigenvalue.
    for (const b of blocks) {
      for (const w of b.want) {
        const near = got.reduce((best, e) => (Math.hypot(e.re - w.re, e.im - w.im) < Math.hypot(best.re - w.re, best.im - w.im) ? e : best));
        expect(Math.abs(near.re - w.re), `Re of ${JSON.stringify(w)}`).toBeLessThanOrEqual(1e-9 * Math.abs(w.re));
        expect(Math.abs(near.im - w.im), `Im of ${JSON.stringify(w)}`).toBeLessThanOrEqual(1e-9 * Math.abs(w.im));
      }
    }
  });

  it("keeps small eigenvalues accurate under one-way coupling from a 1e8-scale block", () => {
    // Block upper triangular: a dense 3×3 block at scale 1e-8 is driven (coupling 1e2) by a
    // dense 3×3 block at scale 1e8 that it does not act back on; states interleaved. The
    // eigenvalues are those of the two diagonal blocks. Treated as one matrix, rounding of
    // size eps·1e8 ≈ 1e-8 would move the 1e-8-scale eigenvalues by O(100 %).
    const rand = seededRandom(31);
    const small = fromRows([
      [-1, 2, 0.5],
      [0, -3, 1],
      [0, 0, -7],
    ]);
    const large = fromRows([
      [-1, 2, 0.5],
      [0, -2, 1],
      [0, 0, -5],
    ]);
    const want = [-1e-8, -3e-8, -7e-8, -1e8, -2e8, -5e8];
    for (let rep = 0; rep < 10; rep++) {
      const q1 = randomOrthogonal(rand, 3);
      const q2 = randomOrthogonal(rand, 3);
      const b1 = matMul(matMul(q1, small, 3, 3, 3), transpose(q1, 3), 3, 3, 3);
      const b2 = matMul(matMul(q2, large, 3, 3, 3), transpose(q2, 3), 3, 3, 3);
      const n = 6;
      const d = new Float64Array(n * n);
      for (let i = 0; i < 3; i++) {
        for (let j = 0; j < 3; j++) {
          d[i * n + j] = 1e-8 * b1[i * 3 + j];
          d[(i + 3) * n + j + 3] = 1e8 * b2[i * 3 + j];
          d[i * n + j + 3] = 1e2 * (2 * rand() - 1);
        }
      }
      const perm = [3, 0, 4, 1, 5, 2];
      const a = new Float64Array(n * n);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[perm[i] * n + perm[j]] = d[i * n + j];
      const got = realEigenvalues(a, n);
      // Same 1e-9 relative tolerance and reasoning as the block-diagonal case above.
      for (const w of want) {
        const err = Math.min(...Array.from(got.re, (r, i) => Math.hypot(r - w, got.im[i])));
        expect(err, `λ = ${w}, rep ${rep}`).toBeLessThanOrEqual(1e-9 * Math.abs(w));
      }
    }
  });

  it("cyclic permutation matrices (plain Francis shifts stall; needs the exceptional shifts) give roots of unity", () => {
    for (const n of [3, 4, 5, 8]) {
      const a = new Float64Array(n * n);
      for (let i = 0; i < n; i++) a[i * n + ((i + n - 1) % n)] = 1;
      const want = Array.from({ length: n }, (_, k) => ({
        re: Math.cos((2 * Math.PI * k) / n),
        im: Math.sin((2 * Math.PI * k) / n),
      }));
      // Characteristic polynomial λⁿ − 1 (from memory); simple, well-separated roots on a
      // normal matrix, so backward-stable errors are a few eps.
      expect(multisetDistance(pairs(realEigenvalues(a, n)), want), `n = ${n}`).toBeLessThan(1e-12);
    }
  });

  it("nilpotent [[0, w], [0, 0]] gives exactly zero eigenvalues", () => {
    const got = realEigenvalues(Float64Array.from([0, 1e6, 0, 0]), 2);
    expect(Array.from(got.re)).toEqual([0, 0]);
    expect(Array.from(got.im)).toEqual([0, 0]);
  });

  it("a 3×3 nilpotent Jordan block hidden by a rotation gives eigenvalues near 0", () => {
    const j = fromRows([
      [0, 1, 0],
      [0, 0, 1],
      [0, 0, 0],
    ]);
    const q = randomOrthogonal(seededRandom(9), 3);
    const a = matMul(matMul(q, j, 3, 3, 3), transpose(q, 3), 3, 3, 3);
    const got = pairs(realEigenvalues(a, 3));
    // A perturbation δ of a k×k Jordan block moves its eigenvalue by ~δ^(1/k); with
    // δ ≈ 10·eps·‖A‖ and k = 3 that is ≈ 1.3e-5·‖A‖, so 1e-4·‖A‖ is a safe bound that a
    // genuinely nonzero eigenvalue (≥ 1e-2 here for any visible error) would not meet.
    const bound = 1e-4 * maxAbsRowSum(a, 3);
    for (const e of got) expect(Math.hypot(e.re, e.im)).toBeLessThan(bound);
  });

  it("zero matrix gives zero eigenvalues", () => {
    const got = realEigenvalues(new Float64Array(25), 5);
    expect(Array.from(got.re)).toEqual([0, 0, 0, 0, 0]);
    expect(Array.from(got.im)).toEqual([0, 0, 0, 0, 0]);
  });

  it("does not modify its input", () => {
    const a = randomMatrix(seededRandom(1), 6);
    const copy = a.slice();
    realEigenvalues(a, 6);
    expect(Array.from(a)).toEqual(Array.from(copy));
  });

  it("throws a clear error when the QR sweep budget is exhausted", () => {
    const a = randomMatrix(seededRandom(4), 6);
    expect(() => realEigenvalues(a, 6, { maxIterations: 1 })).toThrow(/realEigenvalues: .*did not converge.*budget 1 sweeps for n = 6/);
  });

  it("rejects non-finite input", () => {
    expect(() => realEigenvalues(Float64Array.from([1, NaN, 0, 1]), 2)).toThrow(/entry \(0, 1\) is NaN/);
  });

  it("property: eigenvalues sum to the trace and come in conjugate pairs (fast-check, seed 42)", () => {
    const matrix = fc.integer({ min: 1, max: 12 }).chain((n) =>
      fc.record({
        n: fc.constant(n),
        a: fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: n * n, maxLength: n * n }),
      }),
    );
    fc.assert(
      fc.property(matrix, ({ n, a }) => {
        const m = Float64Array.from(a);
        const { re, im } = realEigenvalues(m, n);
        let trace = 0;
        let sumRe = 0;
        let sumIm = 0;
        for (let i = 0; i < n; i++) {
          trace += m[i * n + i];
          sumRe += re[i];
          sumIm += im[i];
        }
        // Orthogonal similarity preserves the trace up to ~n·eps·‖A‖ per step.
        const tol = 1e-12 * n * Math.max(1, maxAbsRowSum(m, n));
        if (!(Math.abs(sumRe - trace) < tol && Math.abs(sumIm) < tol)) return false;
        // Complex values are reported as adjacent conjugate pairs, positive part first.
        for (let i = 0; i < n; i++) {
          if (im[i] === 0) continue;
          if (!(im[i] > 0 && i + 1 < n && im[i + 1] === -im[i] && re[i + 1] === re[i])) return false;
          i++;
        }
        return true;
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});

describe("eigenvectorFor", () => {
  function residual(a: Float64Array, n: number, lr: number, li: number, v: { re: Float64Array; im: Float64Array }): number {
    let worst = 0;
    for (let i = 0; i < n; i++) {
      let sr = -(lr * v.re[i] - li * v.im[i]);
      let si = -(lr * v.im[i] + li * v.re[i]);
      for (let k = 0; k < n; k++) {
        sr += a[i * n + k] * v.re[k];
        si += a[i * n + k] * v.im[k];
      }
      worst = Math.max(worst, Math.hypot(sr, si));
    }
    return worst;
  }

  it("gives unit vectors with small ‖A v − λ v‖ for every eigenvalue of random matrices", () => {
    const rand = seededRandom(77);
    for (const n of [1, 2, 3, 5, 8, 13, 21, 34]) {
      const a = randomMatrix(rand, n);
      const eig = realEigenvalues(a, n);
      for (let k = 0; k < n; k++) {
        const v = eigenvectorFor(a, n, eig.re[k], eig.im[k]);
        let norm = 0;
        for (let i = 0; i < n; i++) norm += v.re[i] ** 2 + v.im[i] ** 2;
        expect(Math.sqrt(norm)).toBeCloseTo(1, 14);
        // Backward-stable eigenpair: residual ~ eps·‖A‖·(small factor).
        expect(residual(a, n, eig.re[k], eig.im[k], v), `n = ${n}, k = ${k}`).toBeLessThan(1e-12 * maxAbsRowSum(a, n));
      }
    }
  });

  it("damped oscillator eigenvector is parallel to (w, λ)", () => {
    const w = 3;
    const g = 0.4;
    const a = Float64Array.from([0, w, -w, -g]);
    const lr = -g / 2;
    const li = Math.sqrt(w * w - (g * g) / 4);
    const v = eigenvectorFor(a, 2, lr, li);
    // First row of (A − λ)v = 0: −λ v0 + w v1 = 0 ⇒ v ∝ (w, λ) (elementary algebra).
    // Parallel ⇔ v0·λ − v1·w = 0 (complex).
    const cr = v.re[0] * lr - v.im[0] * li - v.re[1] * w;
    const ci = v.re[0] * li + v.im[0] * lr - v.im[1] * w;
    expect(Math.hypot(cr, ci)).toBeLessThan(1e-13 * w);
  });

  it("localises a mode of a decoupled block on that block's states", () => {
    // States 0,1: fast cavity; states 2,3: slow weakly damped oscillator.
    const a = fromRows([
      [-5e7, 1e9, 0, 0],
      [-1e9, -5e7, 0, 0],
      [0, 0, 0, 1],
      [0, 0, -1, -1e-8],
    ]);
    const eig = realEigenvalues(a, 4);
    const k = Array.from(eig.re).findIndex((re, i) => Math.abs(re) < 1 && eig.im[i] > 0);
    const v = eigenvectorFor(a, 4, eig.re[k], eig.im[k]);
    expect(Math.hypot(v.re[0], v.im[0], v.re[1], v.im[1])).toBeLessThan(1e-12);
    expect(Math.hypot(v.re[2], v.im[2], v.re[3], v.im[3])).toBeCloseTo(1, 12);
    // Largest component made real and positive (|v| = 1 over two states ⇒ it is ≥ 1/√2).
    const mags = Array.from(v.re, (r, i) => Math.hypot(r, v.im[i]));
    const big = mags.indexOf(Math.max(...mags));
    expect(v.im[big]).toBe(0);
    expect(v.re[big]).toBeGreaterThanOrEqual(Math.SQRT1_2 - 1e-15);
  });

  it("works for an exactly known eigenvalue where A − λI is exactly singular", () => {
    const a = fromRows([
      [2, 0, 0],
      [0, 3, 1],
      [0, 0, 5],
    ]);
    const v = eigenvectorFor(a, 3, 3, 0);
    expect(v.re[1]).toBeCloseTo(1, 12);
    expect(Math.hypot(v.re[0], v.re[2], v.im[0], v.im[1], v.im[2])).toBeLessThan(1e-9);
  });
});
