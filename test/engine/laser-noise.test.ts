/**
 * Laser intensity and frequency noise as classical terms on the coupler that carries the
 * drive: against the coherent source's excess noise, the radiation-pressure force of a
 * cavity's circulating power, the detuned cavity's intracavity intensity, and a displacement
 * of the cavity length.
 */
import { describe, expect, it } from "vitest";
import { evaluate, prepare } from "../../src/pipeline";
import type { SetupDescription } from "../../src/setup/format";
import { tabulateBudget } from "../../src/engine/tabulate";
import { expectAllClose } from "../helpers/close";
import { cavityReadout, probedBody, sumTerms } from "../helpers/setups";

// CODATA 2018 (exact in the 2019 SI): reduced Planck constant; speed of light (exact by definition).
const HBAR = 1.054571817e-34;
const C = 299792458;

const WAVELENGTH = 1064e-9;
const OMEGA_L = (2 * Math.PI * C) / WAVELENGTH;
const MASS = 1e-9; // kg
const F_M = 1e5; // Hz
const Q = 1e5;
const LINEWIDTH = 2e5; // Hz, FWHM
const LENGTH = 0.01; // m
const grid = { from: "50 kHz", to: "2 MHz", points: 121 };

/** A constant relative intensity noise ASD (1/√Hz), tabulated over the grid and a bit beyond. */
const RIN_ASD = 3e-7;
const flat = (asd: number): [number, number][] => [
  [1, asd],
  [1e8, asd],
];

function oscillatorCavity(cavity: Record<string, string | number>, referTo: "force" | "displacement" = "force", light?: SetupDescription["components"][number]): SetupDescription {
  return {
    ...cavityReadout({
      body: { mass: `${MASS} kg`, frequency: `${F_M} Hz`, Q, temperature: "0 K" },
      cavity: { linewidth: `${LINEWIDTH} Hz`, wavelength: "1064 nm", length: `${LENGTH} m`, ...cavity },
      referTo,
      ...(light ? { light } : {}),
    }),
    grid,
  };
}

function withRin(setup: SetupDescription, asd: [number, number][], on = "cavity"): SetupDescription {
  return { ...setup, classicalNoise: [{ name: "rin", enters: "laser intensity", on, spectrum: { unit: "1/√Hz", points: asd } }] };
}

describe("laser intensity noise", () => {
  it("a constant RIN gives the budget of the coherent source with amplitudeExcess 10·log10(1 + P·S_RIN/(2ħω)) dB", () => {
    // Internal consistency: δP = √(2ħωP)·δa₁ with a vacuum δa₁ of PSD 1 (shot noise 2ħωP), so a RIN
    // S_RIN adds P·S_RIN/(2ħω) to the amplitude quadrature's PSD (Caves, Phys. Rev. D 23, 1693 (1981),
    // shot noise of a coherent beam; the excess form is common practice).
    for (const drive of [{ power: "2 mW" }, { probe: "1 mW" }]) {
      const power = "power" in drive ? 2e-3 : 1e-3;
      const excess = (power * RIN_ASD ** 2) / (2 * HBAR * OMEGA_L);
      const db = `${10 * Math.log10(1 + excess)} dB`;
      const base =
        "probe" in drive
          ? { ...probedBody({ body: { mass: "1 g" }, probe: { power: "1 mW", wavelength: "1064 nm" } }), grid: { from: "10 Hz", to: "10 kHz", points: 61 } }
          : oscillatorCavity({ power: "2 mW" }, "displacement");
      const on = "probe" in drive ? "probe" : "cavity";
      const noisy = evaluate(prepare(withRin(base, flat(RIN_ASD), on))).budget;
      const excessLight = { ...base, components: base.components.map((c) => (c.name === "light" ? { ...c, params: { amplitudeExcess: db } } : c)) };
      const reference = evaluate(prepare(excessLight)).budget;
      expectAllClose(noisy.total, reference.total, 1e-12, `total (${on})`);
      expectAllClose(sumTerms(noisy.terms, "light: amplitude", "rin"), sumTerms(reference.terms, "light: amplitude"), 1e-12, `amplitude quadrature (${on})`);
    }
  });

  it("on resonance, its radiation-pressure force is (2P_circ/c)²·S_RIN/(1 + (2Ω/κ)²), and |χ|² times that in displacement", () => {
    // Radiation-pressure force on a mirror reflecting power P: F = 2P/c (Saleh & Teich, Fundamentals of
    // Photonics, ch. on photon momentum; from memory). The circulating power of a cavity holding n
    // photons over a round trip 2L/c is P_circ = nħω c/(2L). On resonance the circulating power follows
    // the input power through the cavity's pole at half the FWHM κ (Aspelmeyer, Kippenberg & Marquardt,
    // Rev. Mod. Phys. 86, 1391 (2014), Sec. II.B: ȧ = −(κ/2)a + √κ_in a_in), so δP_circ/P_circ has PSD
    // S_RIN/(1 + (2Ω/κ)²).
    const photons = 3e7;
    const pCirc = (photons * HBAR * OMEGA_L * C) / (2 * LENGTH);
    const kappa = 2 * Math.PI * LINEWIDTH;
    const expectedForce = (f: number) => (((2 * pCirc) / C) ** 2 * RIN_ASD ** 2) / (1 + ((2 * 2 * Math.PI * f) / kappa) ** 2);
    const inForce = evaluate(prepare(withRin(oscillatorCavity({ photons }, "force"), flat(RIN_ASD)))).budget;
    expectAllClose(sumTerms(inForce.terms, "rin"), Array.from(inForce.frequencies, expectedForce), 1e-12, "S_F");
    // χ(Ω) = 1/(m(Ω_m² − Ω² − iγΩ)), γ = Ω_m/Q (same source, Sec. II); no optical spring on resonance.
    const omegaM = 2 * Math.PI * F_M;
    const chi2 = (f: number) => {
      const w = 2 * Math.PI * f;
      return 1 / ((MASS * (omegaM ** 2 - w ** 2)) ** 2 + (MASS * (omegaM / Q) * w) ** 2);
    };
    const inDisplacement = evaluate(prepare(withRin(oscillatorCavity({ photons }, "displacement"), flat(RIN_ASD)))).budget;
    expectAllClose(
      sumTerms(inDisplacement.terms, "rin"),
      Array.from(inDisplacement.frequencies, (f) => chi2(f) * expectedForce(f)),
      1e-12,
      "|χ|² S_F",
    );
  });

  it("detuned, it drives the intracavity photon number as the steady state ā = √κ_in ā_in/(κ/2 − iΔ) says", () => {
    // From ȧ = (iΔ − κ/2)a + √κ_in a_in (Aspelmeyer, Kippenberg & Marquardt 2014, Sec. II.B) with the
    // drive ā_in(1 + ε/2) for a relative intensity ε: δn/n = (ε/2)[(κ/2 − iΔ)/(κ/2 − iΔ − iΩ) +
    // (κ/2 + iΔ)/(κ/2 + iΔ − iΩ)], derived by hand. The model's cavity block, driven by the term's column,
    // gives δn/n = √2·δa₁/√n (its quadratures are those of the real mean field).
    const detuning = -0.7 * LINEWIDTH;
    const power = 1e-6; // weak, so that the red-detuned optical spring keeps the body stable
    const setup = withRin(oscillatorCavity({ power: `${power} W`, detuning: `${detuning} Hz` }, "displacement"), flat(RIN_ASD));
    const prepared = prepare(setup);
    const { model } = prepared.assembled;
    const mode = model.modes.find((m) => m.owner === "cavity")!;
    const column = model.inputs.findIndex((i) => i.owner === "rin");
    const at = (r: number, c: number) => model.A[r * model.nStates + c];
    const b1 = model.B[mode.x * model.nInputs + column];
    const b2 = model.B[mode.p * model.nInputs + column];
    const kappa = 2 * Math.PI * LINEWIDTH;
    const delta = 2 * Math.PI * detuning;
    const kIn = kappa;
    const photons = (kIn * power) / (HBAR * OMEGA_L * (kappa ** 2 / 4 + delta ** 2));
    const columnPsd = (power * RIN_ASD ** 2) / (2 * HBAR * OMEGA_L);
    for (const f of [1e4, 1.3e5, 4e5, 2e6]) {
      const w = 2 * Math.PI * f;
      // Solve (−iΩ − A_cc) t = b for the cavity block by Cramer's rule, in complex numbers [re, im].
      const m11: [number, number] = [-at(mode.x, mode.x), -w];
      const m22: [number, number] = [-at(mode.p, mode.p), -w];
      const m12 = -at(mode.x, mode.p);
      const m21 = -at(mode.p, mode.x);
      const det: [number, number] = [m11[0] * m22[0] - m11[1] * m22[1] - m12 * m21, m11[0] * m22[1] + m11[1] * m22[0]];
      const num1: [number, number] = [b1 * m22[0] - m12 * b2, b1 * m22[1]];
      const d2 = det[0] ** 2 + det[1] ** 2;
      const t1 = [(num1[0] * det[0] + num1[1] * det[1]) / d2, (num1[1] * det[0] - num1[0] * det[1]) / d2];
      const engine = (2 * (t1[0] ** 2 + t1[1] ** 2) * columnPsd) / photons;
      const h = kappa / 2;
      const term = (re: number, im: number, dre: number, dim: number): [number, number] => {
        const dd = dre ** 2 + dim ** 2;
        return [(re * dre + im * dim) / dd, (im * dre - re * dim) / dd];
      };
      const p = term(h, -delta, h, -delta - w);
      const q = term(h, delta, h, delta - w);
      const expected = RIN_ASD ** 2 * (((p[0] + q[0]) / 2) ** 2 + ((p[1] + q[1]) / 2) ** 2);
      expect(Math.abs(engine - expected) / expected, `S_RIN,circ at ${f} Hz`).toBeLessThan(1e-12);
    }
  });
});

describe("laser frequency noise", () => {
  it("equals a displacement of the cavity length with S_x = (Lλ/c)²·S_ν, resonant or detuned", () => {
    // δL/L = δν/ν (the resonance condition of a cavity of length L, ν = qc/(2L)); ν = c/λ.
    const nuAsd = (f: number) => 20 * (f / 1e5) ** -0.5; // Hz/√Hz
    const fs = [1e4, 1e5, 1e6, 1e7];
    for (const detuning of ["0 Hz", `${-0.3 * LINEWIDTH} Hz`]) {
      const base = oscillatorCavity({ power: "1 µW", detuning }, "displacement");
      const frequency = evaluate(
        prepare({ ...base, classicalNoise: [{ name: "fnoise", enters: "laser frequency", on: "cavity", spectrum: { unit: "Hz/√Hz", points: fs.map((f) => [f, nuAsd(f)]) } }] }),
      ).budget;
      const scale = (LENGTH * WAVELENGTH) / C;
      const displacement = evaluate(
        prepare({ ...base, classicalNoise: [{ name: "fnoise", enters: "displacement", on: "body", spectrum: { unit: "m/√Hz", points: fs.map((f) => [f, scale * nuAsd(f)]) } }] }),
      ).budget;
      expectAllClose(sumTerms(frequency.terms, "fnoise"), sumTerms(displacement.terms, "fnoise"), 1e-12, `detuning ${detuning}`);
      expectAllClose(frequency.total, displacement.total, 1e-12, `total, detuning ${detuning}`);
    }
  });

  it("needs the cavity's drive, not its length: a cavity given g0 with the same coupling gives the same term", () => {
    // G = ω_L/L (length) and g0 = G·x_zpf with x_zpf = √(ħ/(2mΩ_m)) (Aspelmeyer, Kippenberg & Marquardt
    // 2014, Sec. III.A) describe the same coupling; frequency noise changes the detuning by 2π·δν either way.
    const xzpf = Math.sqrt(HBAR / (2 * MASS * 2 * Math.PI * F_M));
    const g0 = ((OMEGA_L / LENGTH) * xzpf) / (2 * Math.PI);
    const term = (cavity: Record<string, string | number>) => {
      const base = oscillatorCavity({ power: "1 mW", ...cavity }, "displacement");
      const { length: _length, ...withoutLength } = base.components[2].params as Record<string, string | number>;
      const components = base.components.map((c) => (c.name === "cavity" ? { ...c, params: "g0" in cavity ? withoutLength : c.params } : c));
      const spectrum = { unit: "Hz/√Hz", points: flat(5) };
      return sumTerms(evaluate(prepare({ ...base, components, classicalNoise: [{ name: "fnoise", enters: "laser frequency", on: "cavity", spectrum }] })).budget.terms, "fnoise");
    };
    expectAllClose(term({ g0: `${g0} Hz` }), term({}), 1e-12, "g0 against length");
  });

  it("is a column of its own in the exported budget, labelled by where it enters", () => {
    const setup = { ...oscillatorCavity({ power: "1 mW" }), classicalNoise: [{ name: "fnoise", enters: "laser frequency", on: "cavity", spectrum: { unit: "kHz/rtHz", points: flat(0.01) } }] };
    const budget = evaluate(prepare(setup)).budget;
    const term = budget.terms.find((t) => t.owner === "fnoise")!;
    expect(term.category).toBe("classical");
    expect(term.label).toBe("fnoise: laser frequency at cavity (classical)");
    const table = tabulateBudget(budget, "power");
    expect(Array.from(table.columns.find((c) => c.label.startsWith("fnoise"))!.values)).toEqual(Array.from(term.psd));
  });
});
