import { describe, expect, it } from "vitest";
import { HBAR } from "../../src/constants";
import { conditionalVariance, entangledSourceCovariance, entangledSourceSpectrum } from "../../src/engine/entanglement";
import { outputSpectra } from "../../src/engine/spectra";
import { QuietframeError, QuietframeErrors } from "../../src/errors";
import { assemble } from "../../src/setup/assemble";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import type { SetupDescription } from "../../src/setup/format";
import { expectAllClose } from "../helpers/close";
import { setup } from "../helpers/setups";

/**
 * The two-colour entangled source: two-mode squeezed vacuum. Lossless, its one-sided noise
 * matrix (vacuum = 1) over X1, P1, X2, P2 is
 *   [[c, 0, s, 0], [0, c, 0, −s], [s, 0, c, 0], [0, −s, 0, c]],  c = cosh 2r, s = sinh 2r,
 * so Var(X1 − X2) = Var(P1 + P2) = e^{−2r} in units where each quadrature's vacuum variance is
 * 1/2 (physics notes §4; the two-mode squeezed state of Duan et al., PRL 84, 2722 (2000)).
 */

const cosh2 = (r: number) => Math.cosh(2 * r);
const sinh2 = (r: number) => Math.sinh(2 * r);

/**
 * Source → (arm 1 through a position probe at rate 0 on an oscillator, which only serves as the
 * set-up's signal target) → homodyne d1; arm 2 → homodyne d2.
 */
function measured(source: Record<string, string | number>, angle1: string, angle2: string, probeRate = "0 Hz"): SetupDescription {
  return setup(
    [
      { name: "epr", type: "entangled-source", params: source },
      { name: "body", type: "oscillator", params: { mass: "10 ng", frequency: "1 MHz", Q: 1e4, temperature: "0 K", damping: "symmetric" } },
      { name: "probe", type: "position-probe", params: { measurementRate: probeRate } },
      { name: "d1", type: "homodyne", params: { angle: angle1 } },
      { name: "d2", type: "homodyne", params: { angle: angle2 } },
    ],
    [
      ["epr.out1", "probe.in"],
      ["probe.out", "d1.in"],
      ["epr.out2", "d2.in"],
      ["probe.mechanics", "body.body"],
    ],
    { readout: ["d1", "d2"], signal: { kind: "force", on: "body", referTo: "force" } },
  );
}

/** The 2×2 one-sided output spectra [S11, S12, S22] (real parts) at the given frequencies. */
function spectra(s: SetupDescription, freqs: number[]): { s11: number; s12: number; s22: number; imag: number }[] {
  const a = assemble(loadSetup(s));
  const out = outputSpectra(a.model, a.readoutRows, Float64Array.from(freqs));
  return freqs.map((_, k) => ({ s11: out.re[k * 4], s12: out.re[k * 4 + 1], s22: out.re[k * 4 + 3], imag: out.im[k * 4 + 1] }));
}

const FREQS = [10, 1e3, 1e5, 1e7];

describe("white two-mode squeezed source", () => {
  it("declares the one-sided noise matrix [[c,0,s,0],[0,c,0,−s],[s,0,c,0],[0,−s,0,c]] as one budget group", () => {
    const r = 0.8;
    const a = assemble(loadSetup(measured({ r }, "0 deg", "0 deg")));
    const group = a.model.groups.filter((g) => g.owner === "epr");
    expect(group).toHaveLength(1);
    expect(group[0].label).toBe("epr: entangled light");
    const cols = group[0].columns;
    expect(cols).toHaveLength(4);
    const m = a.model.nInputs;
    const block = cols.flatMap((i) => cols.map((j) => a.model.N[i * m + j]));
    const c = cosh2(r);
    const s = sinh2(r);
    expectAllClose(block, [c, 0, s, 0, 0, c, 0, -s, s, 0, c, 0, 0, -s, 0, c], 1e-14, "N");
  });

  it.each([0, 0.3, 1.15, 2])("r = %f: Var(X1 − X2) = Var(P1 + P2) = e^{−2r} at every frequency (Duan et al. 2000)", (r) => {
    const xs = spectra(measured({ r }, "0 deg", "0 deg"), FREQS);
    const ps = spectra(measured({ r }, "90 deg", "90 deg"), FREQS);
    for (let k = 0; k < FREQS.length; k++) {
      // Variance of a combination = half its one-sided PSD (vacuum PSD 1 ↔ variance 1/2).
      const varXminus = (xs[k].s11 + xs[k].s22 - 2 * xs[k].s12) / 2;
      const varPplus = (ps[k].s11 + ps[k].s22 + 2 * ps[k].s12) / 2;
      expect(Math.abs(varXminus / Math.exp(-2 * r) - 1)).toBeLessThan(1e-12);
      expect(Math.abs(varPplus / Math.exp(-2 * r) - 1)).toBeLessThan(1e-12);
      expect(xs[k].imag).toBe(0);
    }
  });

  it('squeezing in dB is 10·log10 e^{−2r}: "-10 dB" gives Var(X1 − X2) = 0.1 (physics notes §1)', () => {
    const xs = spectra(measured({ squeezing: "-10 dB" }, "0 deg", "0 deg"), [1e3]);
    expect(Math.abs((xs[0].s11 + xs[0].s22 - 2 * xs[0].s12) / 2 / 0.1 - 1)).toBeLessThan(1e-12);
  });

  /*
   * Arm losses: each arm's quadratures become √η_j q_j + √(1 − η_j) v_j with fresh vacuum v_j,
   * so the diagonal becomes η_j c + 1 − η_j and the cross terms √(η1 η2)·(±s).
   */
  it.each([
    [0.9, 0.9],
    [0.95, 0.6],
    [0.3, 1],
  ])("per-arm efficiencies η1 = %f, η2 = %f mix in vacuum (closed form derived above)", (eta1, eta2) => {
    const r = 1.1;
    const c = cosh2(r);
    const s = sinh2(r);
    const xs = spectra(measured({ r, efficiency1: eta1, efficiency2: eta2 }, "0 deg", "0 deg"), FREQS);
    const ps = spectra(measured({ r, efficiency1: eta1, efficiency2: eta2 }, "90 deg", "90 deg"), FREQS);
    for (let k = 0; k < FREQS.length; k++) {
      expect(Math.abs(xs[k].s11 / (eta1 * c + 1 - eta1) - 1)).toBeLessThan(1e-12);
      expect(Math.abs(xs[k].s22 / (eta2 * c + 1 - eta2) - 1)).toBeLessThan(1e-12);
      expect(Math.abs(xs[k].s12 / (Math.sqrt(eta1 * eta2) * s) - 1)).toBeLessThan(1e-12);
      expect(Math.abs(ps[k].s12 / (-Math.sqrt(eta1 * eta2) * s) - 1)).toBeLessThan(1e-12);
    }
    // The same numbers as the entanglement module's description of the source.
    const spec = entangledSourceSpectrum({ r, efficiency1: eta1, efficiency2: eta2 }, 1e3);
    expect(Math.abs(spec[0] / xs[1].s11 - 1)).toBeLessThan(1e-14);
    expect(Math.abs(spec[2] / xs[1].s12 - 1)).toBeLessThan(1e-14);
  });
});

describe("finite bandwidth: a non-degenerate parametric oscillator below threshold", () => {
  /*
   * Squeezing spectra of a parametric oscillator below threshold with cavity linewidth κ
   * (energy decay rate) and pump parameter x = ε/(κ/2) (x² = pump power over threshold),
   * for the squeezed and anti-squeezed combinations (Collett & Gardiner, PRA 30, 1386 (1984);
   * Walls & Milburn, Quantum Optics, ch. on squeezed light; from memory):
   *   S∓(Ω) = 1 ∓ 4x/((1 ± x)² + (2Ω/κ)²).
   * In the non-degenerate oscillator X1 − X2 and P1 + P2 carry S₋, X1 + X2 and P1 − P2 carry S₊.
   * At Ω = 0, S₋ = ((1 − x)/(1 + x))², so the level r at zero frequency needs x = tanh(r/2).
   */
  const kappa = 2 * Math.PI * 5e6;
  const squeezedPsd = (x: number, f: number) => 1 - (4 * x) / ((1 + x) ** 2 + ((4 * Math.PI * f) / kappa) ** 2);
  const antiPsd = (x: number, f: number) => 1 + (4 * x) / ((1 - x) ** 2 + ((4 * Math.PI * f) / kappa) ** 2);

  it.each([0.5, 1.5, 3])("r = %f: the output spectra follow S₋ and S₊ at every sideband frequency", (r) => {
    const x = Math.tanh(r / 2);
    const freqs = [1, 1e3, 1e5, 1e6, 2.5e6, 5e6, 2e7, 1e9];
    const source = { r, bandwidth: "5 MHz" };
    const xs = spectra(measured(source, "0 deg", "0 deg"), freqs);
    const ps = spectra(measured(source, "90 deg", "90 deg"), freqs);
    freqs.forEach((f, k) => {
      const minus = squeezedPsd(x, f);
      const plus = antiPsd(x, f);
      expect(Math.abs(xs[k].s11 / ((plus + minus) / 2) - 1), `${f} Hz`).toBeLessThan(1e-10);
      expect(Math.abs((xs[k].s11 + xs[k].s22 - 2 * xs[k].s12) / 2 / minus - 1), `X1 − X2 at ${f} Hz`).toBeLessThan(1e-9);
      expect(Math.abs((ps[k].s11 + ps[k].s22 + 2 * ps[k].s12) / 2 / minus - 1), `P1 + P2 at ${f} Hz`).toBeLessThan(1e-9);
      expect(Math.abs((xs[k].s11 + xs[k].s22 + 2 * xs[k].s12) / 2 / plus - 1), `X1 + X2 at ${f} Hz`).toBeLessThan(1e-10);
    });
    // Far below the linewidth (1 Hz against 5 MHz: corrections of order (2Ω/κ)²/(1 − x)² < 1e-10)
    // the source is the white one with the same r.
    expect(Math.abs((xs[0].s11 + xs[0].s22 - 2 * xs[0].s12) / 2 / Math.exp(-2 * r) - 1)).toBeLessThan(1e-9);
  });

  it("arm losses act on the filtered light as on white light, and the spectrum function agrees with the engine", () => {
    const r = 1.2;
    const source = { r, bandwidth: "5 MHz", efficiency1: 0.8, efficiency2: 0.65 };
    const freqs = [2e5, 3e6, 4e7];
    const xs = spectra(measured(source, "0 deg", "0 deg"), freqs);
    const ps = spectra(measured(source, "90 deg", "90 deg"), freqs);
    freqs.forEach((f, k) => {
      const spec = entangledSourceSpectrum({ r, efficiency1: 0.8, efficiency2: 0.65, bandwidth: 5e6 }, f);
      expect(Math.abs(xs[k].s11 / spec[0] - 1)).toBeLessThan(1e-10);
      expect(Math.abs(xs[k].s12 / spec[2] - 1)).toBeLessThan(1e-10);
      expect(Math.abs(xs[k].s22 / spec[10] - 1)).toBeLessThan(1e-10);
      expect(Math.abs(ps[k].s12 / spec[7] - 1)).toBeLessThan(1e-10);
      const x = Math.tanh(r / 2);
      const c = (antiPsd(x, f) + squeezedPsd(x, f)) / 2;
      expect(Math.abs(xs[k].s22 / (0.65 * c + 0.35) - 1)).toBeLessThan(1e-10);
    });
  });

  it("keeps all its vacua (cavity inputs and arm losses) in one budget group", () => {
    const a = assemble(loadSetup(measured({ r: 1, bandwidth: "5 MHz", efficiency1: 0.9 }, "0 deg", "0 deg")));
    const groups = a.model.groups.filter((g) => g.owner === "epr");
    expect(groups.map((g) => [g.label, g.columns.length])).toEqual([["epr: entangled light", 8]]);
    expect(a.model.modes.filter((m) => m.owner === "epr")).toHaveLength(2);
  });

  it("the band covariance averages the spectrum: a narrow band gives half the spectrum there", () => {
    const source = { r: 1, efficiency1: 1, efficiency2: 1, bandwidth: 5e6 };
    const v = entangledSourceCovariance(source, { from: 1e6, to: 1e6 * (1 + 1e-7) });
    const s = entangledSourceSpectrum(source, 1e6);
    for (let i = 0; i < 16; i++) expect(Math.abs(v[i] - s[i] / 2)).toBeLessThan(1e-6 * Math.abs(s[0]));
  });
});

describe("the optimal combination does the conditioning", () => {
  /*
   * Arm 1 reads an oscillator (phase quadrature, rate Γ); arm 2 goes straight to a phase
   * detector. With n1 = a2 + g a1 + b, n2 = b2: S11 = cL + B, S22 = c, S12 = −s (L = 1 + |g|²),
   * and the optimal estimate has S11 − s²/c = c|g|² + 1/c + B:
   * the imprecision is divided by cosh 2r (a2 conditioned on b2: Var(P1 | P2) = (1/2)/cosh 2r),
   * the back-action multiplied by cosh 2r (a1 is anti-squeezed and nobody measures b1).
   */
  it("divides the imprecision by cosh 2r and multiplies the back-action by cosh 2r", () => {
    const r = 0.9;
    const grid = { from: 9e5, to: 1.1e6, points: 41 };
    const plain = evaluateSetup(loadSetup(measured({ r: 0 }, "90 deg", "90 deg", "1 kHz")), grid).budget;
    const epr = evaluateSetup(loadSetup(measured({ r }, "90 deg", "90 deg", "1 kHz")), grid).budget;
    const mass = 1e-11;
    const omegaM = 2 * Math.PI * 1e6;
    const k2 = 4 * 2 * Math.PI * 1e3;
    const ps2 = HBAR * mass * omegaM;
    const gamma = omegaM / 1e4;
    const c = cosh2(r);
    // Conditional variance from the entanglement module, for the factor 1/cosh 2r.
    const v = entangledSourceCovariance({ r, efficiency1: 1, efficiency2: 1 });
    const conditioning = 2 * conditionalVariance(v, 1, [3]);
    expect(Math.abs(conditioning * c - 1)).toBeLessThan(1e-12);
    const bathTerm = plain.terms.find((t) => t.label.startsWith("body"))!.psd;
    const expected = Array.from(epr.frequencies, (f, i) => {
      const w = 2 * Math.PI * f;
      const dr = omegaM ** 2 + gamma ** 2 / 4 - w ** 2;
      const chi2 = omegaM ** 2 / (dr ** 2 + (gamma * w) ** 2);
      const imprecision = ps2 / (k2 * chi2);
      const backAction = k2 * ps2;
      return imprecision * conditioning + backAction * c + bathTerm[i];
    });
    expectAllClose(epr.total, expected, 1e-9, "conditioned total");
    expect(epr.terms.map((t) => t.label)).toContain("epr: entangled light");
  });
});

describe("bad entangled-source input names the field, the value and what is allowed", () => {
  const problem = (params: Record<string, string | number>): QuietframeError => {
    try {
      loadSetup(measured(params, "0 deg", "0 deg"));
    } catch (e) {
      if (e instanceof QuietframeError) return e;
      if (e instanceof QuietframeErrors && e.problems.length === 1) return e.problems[0];
      throw e;
    }
    throw new Error("expected a QuietframeError");
  };

  it("positive squeezing in dB", () => {
    const e = problem({ squeezing: "3 dB" });
    expect(e.path).toBe("components.epr.squeezing");
    expect(e.value).toBe("3 dB");
    expect(e.allowed).toContain("squeezing ≤ 0 dB");
  });

  it("both or neither of squeezing and r", () => {
    expect(problem({ squeezing: "-6 dB", r: 0.7 }).message).toContain("both squeezing and r");
    expect(problem({ efficiency1: 0.9 }).message).toContain("neither squeezing nor r");
  });

  it("r beyond 10, efficiency beyond 1, zero bandwidth", () => {
    expect(problem({ r: 12 }).path).toBe("components.epr.r");
    const eff = problem({ r: 1, efficiency2: 1.2 });
    expect(eff.path).toBe("components.epr.efficiency2");
    expect(eff.value).toBe(1.2);
    expect(problem({ r: 1, bandwidth: "0 Hz" }).path).toBe("components.epr.bandwidth");
    const deep = problem({ squeezing: "-100 dB" });
    expect(deep.path).toBe("components.epr.squeezing");
    expect(deep.allowed).toContain("r ≤ 10");
  });
});
