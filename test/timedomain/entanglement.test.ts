import { describe, expect, it } from "vitest";
import { logarithmicNegativity, modePairCovariance } from "../../src/engine/entanglement";
import { assemble } from "../../src/setup/assemble";
import { loadSetup } from "../../src/pipeline";
import { conditionalSteadyState, groundCovariance, jointVariance, resolveJointVariable, simulateTrajectory, transientCovariance, type JointVariable } from "../../src/timedomain";
import { relativeDifference } from "../helpers/close";
import { setup } from "../helpers/setups";
import { handModel } from "./helpers";

/**
 * Two modes under the two-mode squeezing generator H = ε(x₁p₂ + x₂p₁) ([x, p] = i):
 *   dX₁ = εX₂, dX₂ = εX₁, dP₁ = −εP₂, dP₂ = −εP₁,
 * so from the ground state X₁ − X₂ and P₁ + P₂ shrink as e^{−εt}: a two-mode squeezed state
 * with r = εt, whose logarithmic negativity is 2r/ln 2 ebits (Adesso & Illuminati,
 * J. Phys. A 40, 7821 (2007)) and whose EPR variances are e^{−2r}.
 */
describe("two-mode squeezing over time", () => {
  const eps = 2e3;
  const model = handModel({
    modes: ["a", "b"],
    A: [
      [0, 0, eps, 0],
      [0, 0, 0, -eps],
      [eps, 0, 0, 0],
      [0, -eps, 0, 0],
    ],
    B: [[], [], [], []],
    N: [],
  });

  it("transient covariance: log-negativity 2r/ln 2 with r = εt", () => {
    for (const t of [1e-4, 5e-4, 1.5e-3]) {
      const v = transientCovariance(model, groundCovariance(model), t);
      const en = logarithmicNegativity(modePairCovariance(model, v, "a", "b"));
      expect(relativeDifference(en, (2 * eps * t) / Math.LN2), `t = ${t} s`).toBeLessThan(1e-12);
    }
  });

  it("the run's entanglement series (no read-out: conditional = unconditional) follows 2εt/ln 2, EPR variances e^{−2εt}", () => {
    const r = simulateTrajectory(model, { duration: 1e-3, step: 1e-6, seed: 3, samples: 11 }, { joint: [], pair: ["a", "b"] });
    expect(r.settings.initial).toBe("ground"); // growing modes: no stationary state, so the engine starts from the ground state
    const e = r.entanglement!;
    for (let j = 0; j < r.time.length; j++) {
      const rr = eps * r.time[j];
      expect(Math.abs(e.logNegativity[j] - (2 * rr) / Math.LN2), `t = ${r.time[j]}`).toBeLessThan(1e-11);
      expect(Math.abs(e.unconditionalLogNegativity[j] - (2 * rr) / Math.LN2)).toBeLessThan(1e-11);
      expect(relativeDifference(e.eprX[j], Math.exp(-2 * rr))).toBeLessThan(1e-11);
      expect(relativeDifference(e.eprP[j], Math.exp(-2 * rr))).toBeLessThan(1e-11);
      expect(relativeDifference(e.duanSum[j], 2 * Math.exp(-2 * rr))).toBeLessThan(1e-11);
    }
    expect(e.duanBound).toBe(2);
  });
});

/**
 * A membrane-like oscillator and a matched negative-mass oscillator read in series by the
 * same travelling light (position probes, phase-quadrature homodyne). With s = ±1 the mass
 * signs, both feel the same back-action force k·q₁ on P:
 *   dX₁ = ΩP₁,  dP₁ = −ΩX₁ + k q₁,   dX₂ = −ΩP₂,  dP₂ = ΩX₂ + k q₁.
 * Then u = X₁ + X₂, v = P₁ − P₂ obey du = Ωv dt, dv = −Ωu dt: the back-action drops out of
 * the joint variable (Tsang & Caves, Phys. Rev. X 2, 031016 (2012); Hammerer et al., PRL 102,
 * 020501 (2009)), so from the ground state Var u = 1/2 + 1/2 = 1 for all t, while one body
 * alone is heated at the diffusion rate q = k²/2 = 2Γ (Γ the measurement rate):
 *   Var X₁(t) = 1/2 + q ∫₀ᵗ sin²(Ωs) ds = 1/2 + Γt − Γ sin(2Ωt)/(2Ω)     (derived here).
 * The record y = q₂ + k u measures u without disturbing it, so its conditional variance
 * falls below the ground-state value 1 while X₁'s own keeps growing.
 */
describe("probe and negative-mass reference in one beam: back-action evasion in the joint variable", () => {
  const f = 1e6;
  const rate = 2e4; // Γ/2π in Hz
  const body = (name: string, sign: "positive" | "negative") => ({
    name,
    type: "oscillator",
    // Q = 1e10 at 0 K: damping γt ≲ 1e-6 over the run, far below the tolerances below.
    params: { mass: "1 ng", frequency: `${f} Hz`, Q: 1e10, temperature: "0 K", damping: "symmetric", massSign: sign },
  });
  const model = assemble(
    loadSetup(
      setup(
        [
          { name: "light", type: "coherent" },
          body("membrane", "positive"),
          body("reference", "negative"),
          { name: "probeM", type: "position-probe", params: { measurementRate: `${rate} Hz` } },
          { name: "probeR", type: "position-probe", params: { measurementRate: `${rate} Hz` } },
          { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: 1 } },
        ],
        [
          ["light.out", "probeM.in"],
          ["probeM.out", "probeR.in"],
          ["probeR.out", "detector.in"],
          ["probeM.mechanics", "membrane.body"],
          ["probeR.mechanics", "reference.body"],
        ],
        { signal: { kind: "force", on: "membrane", referTo: "displacement" } },
      ),
    ),
  ).model;
  const joint: JointVariable = {
    label: "x_membrane + x_reference",
    terms: [
      { component: "membrane", quadrature: "x", weight: 1 },
      { component: "reference", quadrature: "x", weight: 1 },
    ],
  };
  const alone: JointVariable = { label: "x_membrane", terms: [{ component: "membrane", quadrature: "x", weight: 1 }] };
  const r = simulateTrajectory(model, { duration: 1e-4, step: 1e-8, seed: 11, samples: 201, initial: "ground" }, { joint: [joint, alone] });
  const gamma = 2 * Math.PI * rate;
  const omega = 2 * Math.PI * f;

  it("unconditional: Var(x_m + x_r) stays 1 while Var x_m grows as 1/2 + Γt − Γ sin(2Ωt)/(2Ω)", () => {
    const [u, x1] = r.joint;
    expect(u.zeroPoint).toBe(1);
    for (let j = 0; j < r.time.length; j++) {
      const t = r.time[j];
      expect(Math.abs(u.unconditional[j] - 1), `t = ${t}`).toBeLessThan(1e-5);
      const expected = 0.5 + gamma * t - (gamma * Math.sin(2 * omega * t)) / (2 * omega);
      expect(relativeDifference(x1.unconditional[j], expected), `t = ${t}`).toBeLessThan(1e-5);
    }
    // Back-action has grown the lone body's variance many times over by the end.
    expect(x1.unconditional[r.time.length - 1]).toBeGreaterThan(12);
  });

  it("conditional: the measured joint variable is squeezed below its zero point, the membrane's own part keeps growing", () => {
    const [u] = r.joint;
    const last = r.time.length - 1;
    expect(u.conditional[last]).toBeLessThan(0.1 * u.zeroPoint);
    const part = u.parts.membrane;
    expect(part[last]).toBeGreaterThan(5);
    for (let j = 1; j < r.time.length; j++) expect(u.conditional[j]).toBeLessThanOrEqual(u.conditional[j - 1] * (1 + 1e-12));
    expect(r.minUncertaintyMargin).toBeGreaterThanOrEqual(-1e-9);
  });
});

/**
 * The same cancellation with a negative-mass spin ensemble as the reference (as in
 * examples/hybrid-spin-reference.json): the ensemble obeys dX = sΩ_L P − (γ/2)X + …,
 * dP = −sΩ_L X − (γ/2)P + k q₁ + … (spin-ensemble component), the oscillator with symmetric
 * damping the same form with s = +1. Matched (Ω_L = Ω_m, equal linewidths, equal readout
 * rates, both baths at zero occupation), u = X_m + X_s and v = P_m − P_s form a damped
 * oscillator driven only by the two zero-temperature baths, which keep Var u = 1 exactly
 * (Møller et al., Nature 547, 191 (2017) for the scheme; the algebra is the one above).
 */
describe("membrane and a matched negative-mass spin ensemble in one beam", () => {
  const f = 1e6;
  const q = 1e4;
  const model = assemble(
    loadSetup(
      setup(
        [
          { name: "light", type: "coherent" },
          { name: "membrane", type: "oscillator", params: { mass: "10 ng", frequency: `${f} Hz`, Q: q, temperature: "0 K", damping: "symmetric" } },
          { name: "probe", type: "position-probe", params: { measurementRate: "1 kHz" } },
          {
            name: "spin",
            type: "spin-ensemble",
            params: { atoms: 1e12, spin: 4, polarization: 1, larmorFrequency: `${f} Hz`, linewidth: `${f / q} Hz`, readoutRate: "1 kHz", orientation: "negative-mass" },
          },
          { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: 1 } },
        ],
        [
          ["light.out", "probe.in"],
          ["probe.out", "spin.in"],
          ["spin.out", "detector.in"],
          ["probe.mechanics", "membrane.body"],
        ],
        { signal: { kind: "force", on: "membrane", referTo: "force" } },
      ),
    ),
  ).model;
  const uVariable: JointVariable = {
    label: "x_membrane + x_spin",
    terms: [
      { component: "membrane", quadrature: "x", weight: 1 },
      { component: "spin", quadrature: "x", weight: 1 },
    ],
  };
  const r = simulateTrajectory(
    model,
    { duration: 2e-3, step: 1e-7, seed: 5, samples: 101, initial: "ground" },
    {
      joint: [uVariable, { label: "x_membrane", terms: [{ component: "membrane", quadrature: "x", weight: 1 }] }],
    },
  );

  it("Var(x_m + x_s) stays at 1 while x_m alone is heated by back-action", () => {
    const [u, x] = r.joint;
    for (let j = 0; j < r.time.length; j++) expect(Math.abs(u.unconditional[j] - 1), `t = ${r.time[j]}`).toBeLessThan(1e-9);
    // Γt = 2π·1e3·2e-3 ≈ 12.6 of heating, less what the damping (γt ≈ 1.3) takes away.
    expect(x.unconditional[r.time.length - 1]).toBeGreaterThan(5);
  });

  it("the measured u settles at the conditional variance of a QND-measured, damped pair: k²s² + γs − γ = 0 (rotating-wave average, derived here)", () => {
    // u and v commute, so both can be known; the record y = q₂ + k u feeds the filter
    // G = 2k² on u, which the rotation at Ω shares equally with v (e₁e₁ᵀ → I/2); the
    // baths diffuse u and v at rate γ each. Riccati: ds/dt = −γs + γ − k²s².
    const gamma = (2 * Math.PI * f) / q;
    const k2 = 4 * 2 * Math.PI * 1e3;
    const s = (-gamma + Math.sqrt(gamma * gamma + 4 * k2 * gamma)) / (2 * k2);
    const w = resolveJointVariable(model, uVariable);
    const steady = jointVariance(conditionalSteadyState(model), w);
    // The rotating-wave average is exact up to O(Γ/Ω, γ/Ω) ≈ 1e-3.
    expect(relativeDifference(steady, s)).toBeLessThan(5e-3);
    // The run's filter, with records integrated over steps of 0.63 rad of the rotation, knows a little less.
    const last = r.joint[0].conditional[r.time.length - 1];
    expect(last).toBeGreaterThanOrEqual(steady);
    expect(last / steady - 1).toBeLessThan(0.03);
  });
});
