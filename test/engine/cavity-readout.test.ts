import { beforeAll, describe, expect, it } from "vitest";
import { loadMathjs, type MathComplex as Complex, type MathJs, type MathMatrix as Matrix } from "../helpers/mathjs";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { QuietframeError } from "../../src/errors";
import { assemble } from "../../src/setup/assemble";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { oscillatorSusceptibility } from "../../src/reference/limits";
import { expectAllClose } from "../helpers/close";
import { cavityReadout, sumTerms } from "../helpers/setups";

/**
 * Cavity optomechanics closed forms of Aspelmeyer, Kippenberg & Marquardt, Rev. Mod. Phys.
 * 86, 1391 (2014), Sec. VI.B (quantum limit of displacement detection), written there as
 * double-sided spectra for a resonantly driven one-sided cavity:
 *   S_FF(Ω)     = ħ² G² n̄ κ / ((κ/2)² + Ω²)                 (back-action force)
 *   S_xx^imp(Ω) = κ / (16 n̄ G² η) · (1 + 4Ω²/κ²)             (imprecision; η = κ_in/κ · η_det)
 * and Sec. V.B (optical spring): the force on the mirror responds to x through
 *   K(Ω) = i ħ G² n̄ [1/(κ/2 − i(Ω + Δ)) − 1/(κ/2 − i(Ω − Δ))],  χ_eff⁻¹ = χ⁻¹ − K
 * (the K(Ω) form is re-derived here from the linearized Langevin equations of that section
 * in our sign convention: ω_c(x) = ω_c − Gx, Δ = ω_L − ω_c, d/dt → −iΩ).
 * One-sided spectra are twice the double-sided ones.
 */
const MASS = 5e-12;
const F_M = 2e6;
const OMEGA_M = 2 * Math.PI * F_M;
const Q = 1e6;
const LENGTH = 1e-3;
const WAVELENGTH = 1064e-9;
const OMEGA_L = (2 * Math.PI * SPEED_OF_LIGHT) / WAVELENGTH;
const G = OMEGA_L / LENGTH; // dω_c/dx for a moving end mirror
const KAPPA = 2 * Math.PI * 5e6;

function cavitySetup(opts: { photons: number; detuning?: number; inputCoupling?: number; efficiency?: number; referTo?: "displacement" | "force" }) {
  return loadSetup(
    cavityReadout({
      body: { mass: `${MASS} kg`, frequency: `${F_M} Hz`, Q, temperature: "0 K" },
      cavity: {
        linewidth: `${KAPPA / (2 * Math.PI)} Hz`,
        detuning: `${(opts.detuning ?? 0) / (2 * Math.PI)} Hz`,
        inputCoupling: opts.inputCoupling ?? 1,
        photons: opts.photons,
        length: `${LENGTH} m`,
        wavelength: `${WAVELENGTH} m`,
      },
      efficiency: opts.efficiency ?? 1,
      referTo: opts.referTo,
    }),
  );
}

describe("resonant cavity readout against the closed forms", () => {
  const grid = { from: 1e5, to: 1e8, points: 61 };
  const n = 3e6;

  it("back-action force: one-sided 2ħ²G²n̄κ/((κ/2)² + Ω²) (AKM 2014, Sec. VI.B)", () => {
    const b = evaluateSetup(cavitySetup({ photons: n, inputCoupling: 0.7, referTo: "force" }), grid).budget;
    // Amplitude fluctuations entering through the coupler and through internal loss both push.
    const ba = sumTerms(b.terms, "light: amplitude", "internal loss (amplitude)");
    const expected = Array.from(b.frequencies, (f) => (2 * HBAR ** 2 * G ** 2 * n * KAPPA) / (KAPPA ** 2 / 4 + (2 * Math.PI * f) ** 2));
    expectAllClose(ba, expected, 1e-9, "back-action");
  });

  it("imprecision: one-sided κ/(8n̄G²η)(1 + 4Ω²/κ²) with η = (κ_in/κ)·η_det (AKM 2014, Sec. VI.B)", () => {
    const etaC = 0.7;
    const etaD = 0.85;
    const b = evaluateSetup(cavitySetup({ photons: n, inputCoupling: etaC, efficiency: etaD }), grid).budget;
    const imp = sumTerms(b.terms, "light: phase", "internal loss (phase)", "detection");
    const expected = Array.from(b.frequencies, (f) => (KAPPA / (8 * n * G ** 2 * etaC * etaD)) * (1 + (4 * (2 * Math.PI * f) ** 2) / KAPPA ** 2));
    expectAllClose(imp, expected, 1e-9, "imprecision");
  });

  it("their product is ħ²/η at every frequency (Heisenberg bound, saturated by a lossless cavity)", () => {
    const bx = evaluateSetup(cavitySetup({ photons: n }), grid).budget;
    const bf = evaluateSetup(cavitySetup({ photons: n, referTo: "force" }), grid).budget;
    const product = sumTerms(bx.terms, "phase").map((v, i) => v * sumTerms(bf.terms, "amplitude")[i]);
    expectAllClose(product, new Float64Array(product.length).fill(HBAR ** 2), 1e-9, "product");
  });
});

describe("detuned cavity: optical spring and damping", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });
  /** Force-to-position response of the assembled model, computed with mathjs complex matrices. */
  function mechanicalResponse(detuning: number, f: number): Complex {
    const a = assemble(cavitySetup({ photons: 1e6, detuning }));
    const { model } = a;
    const nS = model.nStates;
    const omega = 2 * Math.PI * f;
    const M = math.matrix(Array.from({ length: nS }, (_, i) => Array.from({ length: nS }, (_, j) => math.complex(-model.A[i * nS + j], i === j ? -omega : 0))));
    const sol = math.lusolve(
      M,
      Array.from(model.signalB, (v) => [v]),
    ) as Matrix;
    const body = model.modes.find((m) => m.owner === "body")!;
    const xScale = Math.sqrt(HBAR / (MASS * OMEGA_M));
    return math.multiply(sol.get([body.x, 0]) as Complex, xScale) as unknown as Complex;
  }

  function closedForm(detuning: number, f: number): Complex {
    const omega = 2 * Math.PI * f;
    const [cr, ci] = oscillatorSusceptibility(MASS, OMEGA_M, OMEGA_M / Q, omega);
    const chiInv = math.divide(1, math.complex(cr, ci)) as Complex;
    const t1 = math.divide(1, math.complex(KAPPA / 2, -(omega + detuning))) as Complex;
    const t2 = math.divide(1, math.complex(KAPPA / 2, -(omega - detuning))) as Complex;
    const K = math.multiply(math.complex(0, HBAR * G ** 2 * 1e6), math.subtract(t1, t2)) as Complex;
    return math.divide(1, math.subtract(chiInv, K)) as Complex;
  }

  it.each([-1, -0.3, 0.2])("x/F equals 1/(χ⁻¹ − K(Ω)) for Δ = %f κ", (d) => {
    const detuning = d * KAPPA;
    for (const f of [1e5, 1.9e6, 2e6, 2.1e6, 3e7]) {
      const got = mechanicalResponse(detuning, f);
      const want = closedForm(detuning, f);
      const diff = math.subtract(got, want) as Complex;
      const rel = Math.hypot(diff.re, diff.im) / Math.hypot(want.re, want.im);
      expect(rel, `f = ${f} Hz`).toBeLessThan(1e-9);
    }
  });

  it("red detuning damps the mode; strong blue detuning makes the set-up unstable and says why", () => {
    const red = evaluateSetup(cavitySetup({ photons: 1e6, detuning: -0.5 * KAPPA }), { from: 1e6, to: 3e6, points: 3 });
    expect(red.stability.stable).toBe(true);
    let caught: unknown;
    try {
      evaluateSetup(cavitySetup({ photons: 1e9, detuning: +0.5 * KAPPA }), { from: 1e6, to: 3e6, points: 3 });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(QuietframeError);
    const msg = (caught as Error).message;
    expect(msg).toMatch(/unstable/);
    expect(msg).toMatch(/'body'/);
    expect(msg).toMatch(/blue-detuned/);
  });
});
