import { describe, expect, it } from "vitest";
import { conditionalSteadyState, conditionalTransient, riccatiResidual, simulateTrajectory, type JointVariable } from "../../src/timedomain";
import { handModel, relativeMatrixError } from "./helpers";

/**
 * Two records whose noise is correlated with the noise that drives the state (S = B(N/2)Dᵀ ≠ 0),
 * as for homodyne angles away from the phase quadrature. An invented classical linear model:
 * what is checked is the filter algebra, against a brute-force integration and against the
 * statistics of seeded runs.
 */
const model = handModel({
  modes: ["body"],
  A: [
    [-0.1, 1],
    [-1, -0.1],
  ],
  B: [
    [0.2, 0, 0],
    [0.5, 0.3, 0],
  ],
  N: [
    [1, 0.2, 0],
    [0.2, 1, 0],
    [0, 0, 1],
  ],
  C: [
    [0.7, 0.1],
    [0, 0.4],
  ],
  D: [
    [0.6, 0.8, 0],
    [0.3, 0, 0.9],
  ],
});

type M = number[][];
const mm = (a: M, b: M): M => a.map((r) => b[0].map((_, j) => r.reduce((s, x, k) => s + x * b[k][j], 0)));
const tr = (a: M): M => a[0].map((_, j) => a.map((r) => r[j]));
const plus = (a: M, b: M, f = 1): M => a.map((r, i) => r.map((x, j) => x + f * b[i][j]));
const scale = (a: M, f: number): M => a.map((r) => r.map((x) => x * f));
const inv2 = (a: M): M => {
  const d = a[0][0] * a[1][1] - a[0][1] * a[1][0];
  return [
    [a[1][1] / d, -a[0][1] / d],
    [-a[1][0] / d, a[0][0] / d],
  ];
};

describe("records with noise correlated to the state's (S ≠ 0) and two outputs", () => {
  const rows = (a: Float64Array, r: number, c: number): M => Array.from({ length: r }, (_, i) => Array.from(a.subarray(i * c, i * c + c)));
  const A = rows(model.A, 2, 2);
  const B = rows(model.B, 2, 3);
  const C = rows(model.C, 2, 2);
  const D = rows(model.D, 2, 3);
  const halfN = scale(rows(model.N, 3, 3), 0.5);
  const Q = mm(mm(B, halfN), tr(B));
  const R = mm(mm(D, halfN), tr(D));
  const S = mm(mm(B, halfN), tr(D));
  const Rinv = inv2(R);

  /** dV/dt = AV + VAᵀ + Q − (VCᵀ + S)R⁻¹(CV + Sᵀ) by classical RK4 (brute force, common practice). */
  function rk4(v0: M, t: number, steps: number): M {
    const f = (v: M): M => {
      const k = plus(mm(v, tr(C)), S);
      return plus(plus(plus(mm(A, v), mm(v, tr(A))), Q), mm(mm(k, Rinv), tr(k)), -1);
    };
    let v = v0;
    const h = t / steps;
    for (let s = 0; s < steps; s++) {
      const k1 = f(v);
      const k2 = f(plus(v, k1, h / 2));
      const k3 = f(plus(v, k2, h / 2));
      const k4 = f(plus(v, k3, h));
      v = plus(v, plus(plus(k1, k4), scale(plus(k2, k3), 2)), h / 6);
    }
    return v;
  }

  it("the transient Riccati solution agrees with RK4 at fine steps, and reaches the steady state (ARE residual at rounding level)", () => {
    const v0 = [
      [1.5, -0.2],
      [-0.2, 0.8],
    ];
    const times = Float64Array.of(0.3, 2, 7);
    const ours = conditionalTransient(model, Float64Array.from(v0.flat()), times);
    times.forEach((t, i) => expect(relativeMatrixError(ours[i], rk4(v0, t, 20000).flat()), `t = ${t}`).toBeLessThan(1e-11));
    const steady = conditionalSteadyState(model);
    expect(riccatiResidual(model, steady)).toBeLessThan(1e-13);
    expect(relativeMatrixError(rk4(v0, 200, 40000).flat(), steady)).toBeLessThan(1e-10);
  });

  it("seeded runs: Σ e²/P over 1000 runs follows χ² with 1000 degrees of freedom, for x, p and x − p (Kalman filter with correlated noise)", () => {
    const joint: JointVariable[] = [
      { label: "x", terms: [{ component: "body", quadrature: "x", weight: 1 }] },
      { label: "p", terms: [{ component: "body", quadrature: "p", weight: 1 }] },
      {
        label: "x − p",
        terms: [
          { component: "body", quadrature: "x", weight: 1 },
          { component: "body", quadrature: "p", weight: -1 },
        ],
      },
    ];
    const runs = 1000;
    const sums = [0, 0, 0];
    for (let seed = 0; seed < runs; seed++) {
      const r = simulateTrajectory(model, { duration: 3, step: 0.02, seed: 5000 + seed, samples: 2, initial: "ground" }, { joint });
      r.joint.forEach((s, v) => {
        const e = s.truth[1] - s.estimate[1];
        sums[v] += (e * e) / s.conditional[1];
      });
    }
    // Mean 1000, standard deviation √2000; five standard deviations (fixed seeds: deterministic).
    sums.forEach((sum, v) => expect(Math.abs(sum - runs), `${joint[v].label}: χ² = ${sum.toFixed(1)}`).toBeLessThan(5 * Math.sqrt(2 * runs)));
  });
});
