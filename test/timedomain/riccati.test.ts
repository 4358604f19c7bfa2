import { describe, expect, it } from "vitest";
import { uncertaintyMargin } from "../../src/engine/covariance";
import { QuietframeError } from "../../src/errors";
import { assemble } from "../../src/setup/assemble";
import { loadSetup } from "../../src/pipeline";
import { conditionalSteadyState, conditionalTransient, groundCovariance, riccatiResidual } from "../../src/timedomain";
import { relativeDifference } from "../helpers/close";
import { probedBody } from "../helpers/setups";
import { handModel, relativeMatrixError, stiffCavityBody } from "./helpers";

/**
 * Continuous position measurement, in the model's units (one-sided PSDs, vacuum 1; the
 * white inputs have symmetrized correlation (N/2)δ). A body read by a QND position probe of
 * strength k through a phase-quadrature homodyne detector:
 *   dX = ω P dt,  dP = (−Ω² X/ω) dt + k dq₁,  dy = k X dt + dq₂ (η = 1),
 * so Q = diag(0, k²/2), C = (k, 0), R = 1/2, S = 0, and the stationary Riccati equation
 * A V + V Aᵀ + Q − 2k² V e₁e₁ᵀ V = 0 (Wiseman & Milburn, Quantum Measurement and Control
 * (2010), ch. 6; Doherty & Jacobs, Phys. Rev. A 60, 2700 (1999)) reads, for V = [[a, b], [b, c]]:
 *   xx:  2ω b − 2k² a² = 0
 *   xp:  ω c − (Ω²/ω) a − 2k² a b = 0
 *   pp:  −2(Ω²/ω) b + k²/2 − 2k² b² = 0.
 * Free mass (Ω = 0): b = 1/2, a = √(ω/2)/k, c = k²a/ω, det V = 1/4 (a pure state).
 * Oscillator (undamped, ω = Ω scale): b = (√(Ω² + k⁴) − Ω)/(2k²) = k²/(2(√(Ω² + k⁴) + Ω)), a = √(Ωb)/k,
 * c = a + 2k²ab/Ω; again b² + Ωb/k² = 1/4 makes det V = 1/4 for any strength k.
 */
describe("steady conditional state of a continuously measured body (closed forms derived above)", () => {
  it.each([0.1, 1, 30])("free mass, k = %f: V = [[√(ω/2)/k, 1/2], [1/2, k√(ω/2)/ω]], pure", (k) => {
    const w = 2 * Math.PI;
    const model = handModel({
      modes: ["mass"],
      A: [
        [0, w],
        [0, 0],
      ],
      B: [
        [0, 0],
        [k, 0],
      ],
      N: [
        [1, 0],
        [0, 1],
      ],
      C: [[k, 0]],
      D: [[0, 1]],
    });
    const v = conditionalSteadyState(model);
    const a = Math.sqrt(w / 2) / k;
    expect(relativeMatrixError(v, [a, 0.5, 0.5, (k * k * a) / w])).toBeLessThan(1e-12);
    expect(relativeDifference(v[0] * v[3] - v[1] * v[2], 0.25)).toBeLessThan(1e-12);
    expect(riccatiResidual(model, v)).toBeLessThan(1e-12);
  });

  it.each([1e-3, 0.5, 1, 40])("undamped oscillator, k²/Ω = %f: closed-form variances, det V = 1/4", (strength) => {
    const omega = 2 * Math.PI * 1e5;
    const k = Math.sqrt(strength * omega);
    const model = handModel({
      modes: ["oscillator"],
      A: [
        [0, omega],
        [-omega, 0],
      ],
      B: [
        [0, 0],
        [k, 0],
      ],
      N: [
        [1, 0],
        [0, 1],
      ],
      C: [[k, 0]],
      D: [[0, 1]],
    });
    const v = conditionalSteadyState(model);
    // b = (√(Ω² + k⁴) − Ω)/(2k²), written without cancellation for weak measurement.
    const b = (k * k) / (2 * (Math.sqrt(omega * omega + k * k * k * k) + omega));
    const a = Math.sqrt(omega * b) / k;
    const c = a + (2 * k * k * a * b) / omega;
    expect(relativeMatrixError(v, [a, b, b, c])).toBeLessThan(1e-11);
    expect(relativeDifference(v[0] * v[3] - v[1] * v[1], 0.25)).toBeLessThan(1e-11);
  });

  it("the position-probe component on a high-Q oscillator at 0 K gives the same variances (damping γ/Γ = 1e-6 → relative change ≲ 1e-5)", () => {
    // Γ_meas = k²/4 (position-probe definition, measurement rate 10 kHz), Ω = 2π·1 MHz.
    const model = assemble(
      loadSetup(
        probedBody({
          bodyType: "oscillator",
          body: { mass: "1 ng", frequency: "1 MHz", Q: 1e11, temperature: "0 K", damping: "symmetric" },
          probe: { measurementRate: "10 kHz" },
        }),
      ),
    ).model;
    const omega = 2 * Math.PI * 1e6;
    const k2 = 4 * 2 * Math.PI * 1e4;
    const v = conditionalSteadyState(model);
    const b = k2 / (2 * (Math.sqrt(omega * omega + k2 * k2) + omega));
    const a = Math.sqrt((omega * b) / k2);
    const c = a + (2 * k2 * a * b) / omega;
    const mode = model.modes[0];
    const n = model.nStates;
    expect(relativeDifference(v[mode.x * n + mode.x], a)).toBeLessThan(1e-5);
    expect(relativeDifference(v[mode.p * n + mode.p], c)).toBeLessThan(1e-5);
    expect(riccatiResidual(model, v)).toBeLessThan(1e-10);
  });

  it("a free mass read by a probe of given power: Cov(X, P) = 1/2 and det V = 1/4 (free-mass closed form above)", () => {
    const model = assemble(loadSetup(probedBody({ body: { mass: "1 g" }, probe: { power: "10 mW" } }))).model;
    const v = conditionalSteadyState(model);
    const n = model.nStates;
    const { x, p } = model.modes[0];
    expect(relativeDifference(v[x * n + x] * v[p * n + p] - v[x * n + p] * v[p * n + x], 0.25)).toBeLessThan(1e-10);
    expect(v[x * n + p]).toBeCloseTo(0.5, 10);
  });
});

describe("transient of the Riccati equation", () => {
  /** Classical RK4 on dV/dt = AV + VAᵀ + Q − (VCᵀ + S)R⁻¹(CV + Sᵀ) for a 2×2 case with one output. */
  function rk4(model: ReturnType<typeof handModel>, v0: Float64Array, t: number, steps: number): Float64Array {
    const f = (v: Float64Array): Float64Array => {
      const [a11, a12, a21, a22] = model.A;
      const [b1, b2] = [model.B[0], model.B[2]]; // noise q1 drives both states through column 0
      const [c1, c2] = model.C;
      // Q = B(N/2)Bᵀ with N = I and a single driving column; R = D(N/2)Dᵀ = 1/2; S = 0.
      const q = [0.5 * b1 * b1, 0.5 * b1 * b2, 0.5 * b1 * b2, 0.5 * b2 * b2];
      const av = [a11 * v[0] + a12 * v[2], a11 * v[1] + a12 * v[3], a21 * v[0] + a22 * v[2], a21 * v[1] + a22 * v[3]];
      const vc = [v[0] * c1 + v[1] * c2, v[2] * c1 + v[3] * c2];
      const out = new Float64Array(4);
      for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) out[i * 2 + j] = av[i * 2 + j] + av[j * 2 + i] + q[i * 2 + j] - 2 * vc[i] * vc[j];
      return out;
    };
    let v = Float64Array.from(v0);
    const h = t / steps;
    for (let s = 0; s < steps; s++) {
      const k1 = f(v);
      const k2 = f(v.map((x, i) => x + 0.5 * h * k1[i]));
      const k3 = f(v.map((x, i) => x + 0.5 * h * k2[i]));
      const k4 = f(v.map((x, i) => x + h * k3[i]));
      v = v.map((x, i) => x + (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]));
    }
    return v;
  }

  it("agrees with a fine-step RK4 integration on a small non-stiff case (brute force, common practice)", () => {
    const model = handModel({
      modes: ["body"],
      A: [
        [-0.2, 1.3],
        [-1.0, -0.1],
      ],
      B: [
        [0.3, 0],
        [0.8, 0],
      ],
      N: [
        [1, 0],
        [0, 1],
      ],
      C: [[0.9, 0.2]],
      D: [[0, 1]],
    });
    const v0 = Float64Array.of(2, 0.3, 0.3, 1.5);
    const times = Float64Array.of(0, 0.05, 0.4, 1.7, 6);
    const ours = conditionalTransient(model, v0, times);
    expect(relativeMatrixError(ours[0], v0)).toBe(0);
    for (let i = 1; i < times.length; i++) {
      const ref = rk4(model, v0, times[i], 20000);
      expect(relativeMatrixError(ours[i], ref), `t = ${times[i]}`).toBeLessThan(1e-11);
    }
    // Long times reach the stationary solution.
    const late = conditionalTransient(model, v0, Float64Array.of(200))[0];
    expect(relativeMatrixError(late, conditionalSteadyState(model))).toBeLessThan(1e-12);
  });

  it("stays accurate in a stiff set-up: Q = 1e7 oscillator behind a cavity of linewidth ~1e8 rad/s, 1e-9 s … 1e2 s", () => {
    const model = stiffCavityBody();
    const times = Float64Array.of(0, 1e-9, 1e-7, 1e-5, 1e-3, 1e-1, 10, 100);
    const vs = conditionalTransient(model, groundCovariance(model), times);
    const n = model.nStates;
    for (let i = 0; i < vs.length; i++) {
      const v = vs[i];
      expect(v.every(Number.isFinite)).toBe(true);
      for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) expect(v[a * n + b]).toBe(v[b * n + a]);
      // Physical: V + iΣ/2 ≥ 0 up to rounding of the largest variance.
      const largest = Math.max(...Array.from({ length: n }, (_, a) => v[a * n + a]));
      expect(uncertaintyMargin(model, v), `t = ${times[i]} s`).toBeGreaterThanOrEqual(-1e-12 * largest);
    }
    const steady = conditionalSteadyState(model);
    expect(riccatiResidual(model, steady)).toBeLessThan(1e-9);
    // The last time is far beyond every time scale (the slowest, 1/γ_m ≈ 16 s, is shortened by the measurement).
    expect(relativeMatrixError(vs[vs.length - 1], steady)).toBeLessThan(1e-8);
  });

  it("refuses an unmeasured undamped mode: no steady state, QuietframeError naming the mode", () => {
    const model = handModel({
      modes: ["pendulum"],
      A: [
        [0, 1],
        [-1, 0],
      ],
      B: [
        [0, 0],
        [0.1, 0],
      ],
      N: [
        [1, 0],
        [0, 1],
      ],
    });
    expect(() => conditionalSteadyState(model)).toThrow(QuietframeError);
    expect(() => conditionalSteadyState(model)).toThrow(/pendulum/);
  });

  it("refuses an output without noise of its own (R singular), naming it", () => {
    const model = handModel({
      modes: ["body"],
      A: [
        [-1, 0],
        [0, -1],
      ],
      B: [
        [1, 0],
        [0, 1],
      ],
      N: [
        [1, 0],
        [0, 1],
      ],
      C: [[1, 0]],
      D: [[0, 0]],
    });
    let caught: unknown;
    try {
      conditionalSteadyState(model);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(QuietframeError);
    expect((caught as QuietframeError).path).toBe("readout");
    expect((caught as QuietframeError).message).toMatch(/detector0/);
  });
});
