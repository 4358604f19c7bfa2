/**
 * The formulas a methods text states, evaluated at the state's parameters, reproduce the
 * curves the engine computed: the text follows the model actually used.
 */
import { describe, expect, test } from "vitest";
import type { SetupDescription } from "../../../src/setup/format";
import { computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { explorerMethods } from "../../../widgets/explorer/methods/methods";
import { entangledMethods } from "../../../widgets/entangled/methods/methods";
import { computeEntangled, createEntangledState } from "../../../widgets/entangled/model";

// CODATA 2018 (exact in the 2019 SI): reduced Planck constant and Boltzmann constant.
const HBAR = 1.054571817e-34;
const KB = 1.380649e-23;

const M = 10e-12; // 10 ng
const F_M = 1e6;
const Q = 1000; // low, so that the γ²/4 and Ω-dependent parts of the symmetric forms show
const T = 1;
const OMEGA_M = 2 * Math.PI * F_M;
const GAMMA = OMEGA_M / Q;

function probedOscillator(damping: "viscous" | "symmetric", referTo: "force" | "displacement"): SetupDescription {
  return {
    format: "quietframe.setup",
    version: 1,
    name: `${damping} oscillator read by a position probe`,
    components: [
      { name: "light", type: "coherent" },
      { name: "osc", type: "oscillator", params: { mass: "10 ng", frequency: "1 MHz", Q, temperature: "1 K", damping } },
      { name: "probe", type: "position-probe", params: { measurementRate: "2 kHz" } },
      { name: "detector", type: "homodyne", params: { angle: "90 deg" } },
    ],
    connections: [
      ["light.out", "probe.in"],
      ["probe.out", "detector.in"],
      ["probe.mechanics", "osc.body"],
    ],
    readout: ["detector"],
    signal: { kind: "force", on: "osc", referTo },
    grid: { from: "900 kHz", to: "1.1 MHz", points: 201 },
  } as SetupDescription;
}

function thermalTerm(setup: SetupDescription) {
  const state = createExplorerState(setup);
  const computation = computeExplorer(state);
  const budget = computation.evaluation.budget;
  const term = budget.terms.find((t) => t.owner === "osc" && t.category === "thermal");
  expect(term, "the oscillator's thermal term").toBeDefined();
  return { state, computation, budget, psd: term!.psd };
}

const coth = (u: number): number => 1 / Math.tanh(u);
const relative = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe("symmetric damping: the stated thermal force and susceptibility are the computed ones", () => {
  // Source: the text's own Langevin equations (amplitude damping in the Lindblad form, input
  // noises of one-sided PSD 2n̄ + 1 entering through √γ; Gardiner & Collett, Phys. Rev. A 31,
  // 3761 (1985)), solved by hand in the Fourier domain: with a = γ/2 − iΩ,
  // X (a² + Ω_m²) = Ω_m (F/p_zpf + √γ ξ_P) + a √γ ξ_X, so the force-equivalent noise is
  // S_F = p_zpf² γ (2n̄ + 1)(Ω_m² + |a|²)/Ω_m² = ħ m γ coth(ħΩ_m/2k_BT)(Ω_m² + Ω² + γ²/4)/Ω_m.
  const statedForce = (omega: number): number => (HBAR * M * GAMMA * coth((HBAR * OMEGA_M) / (2 * KB * T)) * (OMEGA_M ** 2 + omega ** 2 + GAMMA ** 2 / 4)) / OMEGA_M;
  // The viscous quantum-FDT form (Callen & Welton 1951) that an older text stated for every damping model.
  const viscousFdt = (omega: number): number => 2 * M * GAMMA * HBAR * omega * coth((HBAR * omega) / (2 * KB * T));

  test("the text states the symmetric forms, not the viscous ones", () => {
    const { state, computation } = thermalTerm(probedOscillator("symmetric", "force"));
    const { markdown } = explorerMethods(state, computation);
    expect(markdown).toContain("S\\_F(Ω) = ħmγ coth(ħΩ\\_m/2k\\_BT) (Ω\\_m² + Ω² + γ²/4)/Ω\\_m");
    expect(markdown).toContain("χ(Ω) = 1/(m(Ω\\_m² + γ²/4 − Ω² − iγΩ))");
    expect(markdown).not.toContain("χ(Ω) = 1/(m(Ω\\_m² − Ω² − iγΩ))");
    expect(markdown).not.toContain("S\\_F = 2mγħΩ\\_m coth");
  });

  test("the stated thermal force, evaluated on the grid, is the computed thermal term", () => {
    const { budget, psd } = thermalTerm(probedOscillator("symmetric", "force"));
    let worstViscous = 0;
    budget.frequencies.forEach((f, i) => {
      const omega = 2 * Math.PI * f;
      // Rounding only: the engine solves the same linear system numerically.
      expect(relative(psd[i], statedForce(omega)), `f = ${f} Hz`).toBeLessThan(1e-9);
      worstViscous = Math.max(worstViscous, relative(psd[i], viscousFdt(omega)));
    });
    // The viscous form would be wrong by more than rounding here (the ±% the old text was off by).
    expect(worstViscous).toBeGreaterThan(1e-3);
  });

  test("the stated susceptibility refers force to displacement: S_x / S_F = |χ|²", () => {
    const force = thermalTerm(probedOscillator("symmetric", "force"));
    const displacement = thermalTerm(probedOscillator("symmetric", "displacement"));
    force.budget.frequencies.forEach((f, i) => {
      const omega = 2 * Math.PI * f;
      // χ = 1/(m(Ω_m² + γ²/4 − Ω² − iγΩ)): |χ|² = 1/(m²((Ω_m² + γ²/4 − Ω²)² + γ²Ω²)).
      const chi2 = 1 / (M * M * ((OMEGA_M ** 2 + GAMMA ** 2 / 4 - omega ** 2) ** 2 + GAMMA ** 2 * omega ** 2));
      expect(relative(displacement.budget.total[i] / force.budget.total[i], chi2), `f = ${f} Hz`).toBeLessThan(1e-9);
    });
  });
});

describe("viscous damping: the stated white thermal force is the computed thermal term", () => {
  test("S_F = 2mγħΩ_m coth(ħΩ_m/2k_BT) at every frequency", () => {
    // Callen & Welton, Phys. Rev. 83, 34 (1951), evaluated at the resonance (the text says so).
    const { state, computation, budget, psd } = thermalTerm(probedOscillator("viscous", "force"));
    const stated = 2 * M * GAMMA * HBAR * OMEGA_M * coth((HBAR * OMEGA_M) / (2 * KB * T));
    budget.frequencies.forEach((f, i) => expect(relative(psd[i], stated), `f = ${f} Hz`).toBeLessThan(1e-9));
    const { markdown } = explorerMethods(state, computation);
    expect(markdown).toContain("S\\_F = 2mγħΩ\\_m coth(ħΩ\\_m/2k\\_BT)");
    expect(markdown).toContain("χ(Ω) = 1/(m(Ω\\_m² − Ω² − iγΩ))");
  });
});

describe("entangled light: the stated closed forms are the panel's numbers", () => {
  // Two-mode squeezed vacuum, covariance (1/2)[[c, s], [s, c]] blocks with c = cosh 2r, s = sinh 2r
  // (Weedbrook et al., Rev. Mod. Phys. 84, 621 (2012), Sec. II); a loss η mixes in vacuum:
  // c → η c + 1 − η on the arm's diagonal, s → √(η1η2) s (beam splitter with vacuum, same source).
  test.each([
    { squeezingDb: -8, efficiency1: 0.9, efficiency2: 0.85 },
    { r: 1.5, efficiency1: 0.5, efficiency2: 1 },
    { squeezingDb: -3, efficiency1: 1, efficiency2: 1, bandwidth: 5e6 },
  ])("%o", (options) => {
    const state = createEntangledState(options);
    const c = computeEntangled(state);
    const r = "r" in options ? (options.r as number) : (-(options.squeezingDb as number) / 20) * Math.log(10);
    const a1 = state.efficiency1 * Math.cosh(2 * r) + 1 - state.efficiency1;
    const a2 = state.efficiency2 * Math.cosh(2 * r) + 1 - state.efficiency2;
    const x = Math.sqrt(state.efficiency1 * state.efficiency2) * Math.sinh(2 * r);
    expect(relative(c.r, r)).toBeLessThan(1e-12);
    expect(relative(c.eprX, (a1 + a2 - 2 * x) / 2)).toBeLessThan(1e-9);
    expect(relative(c.eprP, (a1 + a2 - 2 * x) / 2)).toBeLessThan(1e-9);
    expect(relative(c.duanSum, a1 + a2 - 2 * x)).toBeLessThan(1e-9);
    expect(relative(c.conditionalVariance, (a1 - (x * x) / a2) / 2)).toBeLessThan(1e-9);
    const { markdown } = entangledMethods(state, c);
    expect(markdown).toContain("a\\_j = η\\_j cosh 2r + 1 − η\\_j");
    expect(markdown).toContain("Var(X\\_1 − X\\_2) = Var(P\\_1 + P\\_2) = (a\\_1 + a\\_2 − 2c)/2");
    expect(markdown).toContain("Var(X\\_1 \\| X\\_2) = (a\\_1 − c²/a\\_2)/2");
  });
});
