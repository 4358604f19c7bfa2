/**
 * A detuned cavity's ports are in the frame of the drive laser's carrier, its mode in the frame
 * of its own mean field ā (src/components/cavity.ts). Checked against the steady state
 * ā = √κ_in ā_in/(κ/2 − iΔ) and the linearized Langevin equation
 * δȧ = (iΔ − κ/2)δa + √κ_in δa_in + iGā·x (Aspelmeyer, Kippenberg & Marquardt, Rev. Mod. Phys.
 * 86, 1391 (2014), Sec. II.B and III; ω_c(x) = ω_c − Gx, Δ = ω_L − ω_c, d/dt → −iΩ), written
 * with ā complex in the laser's frame, and against the laser's intensity-noise term.
 * Two-photon quadratures: δa = (q1 + iq2)/√2 with vacuum one-sided PSD 1 (Caves & Schumaker 1985).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { evaluate, loadSetup, prepare } from "../../src/pipeline";
import type { ComponentDescription, SetupDescription } from "../../src/setup/format";
import { assemble } from "../../src/setup/assemble";
import { expectAllClose } from "../helpers/close";
import { loadMathjs, type MathComplex as Complex, type MathJs, type MathMatrix as Matrix } from "../helpers/mathjs";
import { cavityReadout, setup, sumTerms } from "../helpers/setups";

const WAVELENGTH = 1064e-9;
const OMEGA_L = (2 * Math.PI * SPEED_OF_LIGHT) / WAVELENGTH;
const LINEWIDTH = 2e5; // Hz, FWHM
const KAPPA = 2 * Math.PI * LINEWIDTH;
const POWER = 1e-6; // W: weak, so that the red-detuned optical spring keeps the body stable
const grid = { from: "50 kHz", to: "2 MHz", points: 121 };
const FREQUENCIES = [1e4, 1.3e5, 4e5, 2e6];

function detunedCavity(detuning: number, o: { light?: ComponentDescription; angle?: string; inputCoupling?: number } = {}): SetupDescription {
  return {
    ...cavityReadout({
      body: { mass: "1e-9 kg", frequency: "1e5 Hz", Q: 1e5, temperature: "0 K" },
      cavity: { linewidth: `${LINEWIDTH} Hz`, wavelength: "1064 nm", length: "0.01 m", power: `${POWER} W`, detuning: `${detuning} Hz`, inputCoupling: o.inputCoupling ?? 1 },
      referTo: "displacement",
      ...(o.light ? { light: o.light } : {}),
      ...(o.angle ? { angle: o.angle } : {}),
    }),
    grid,
  };
}

describe("a detuned cavity's incoming light is in the drive laser's frame", () => {
  it("a coherent source's amplitudeExcess gives the budget of the laser intensity term of the same PSD (1e-12), at any readout angle", () => {
    // Both are the same noise on the drive's amplitude quadrature: RIN S_RIN adds P·S_RIN/(2ħω) to it
    // (shot noise 2ħωP of a coherent beam, Caves, Phys. Rev. D 23, 1693 (1981); the excess form is
    // common practice). Before the ports were put in the laser's frame the two differed when detuned.
    const rinAsd = 3e-7;
    const excess = (POWER * rinAsd ** 2) / (2 * HBAR * OMEGA_L);
    for (const detuning of [-0.7 * LINEWIDTH, -0.25 * LINEWIDTH]) {
      for (const angle of ["90 deg", "35 deg"]) {
        const base = detunedCavity(detuning, { angle });
        const withRin = {
          ...base,
          classicalNoise: [
            {
              name: "rin",
              enters: "laser intensity",
              on: "cavity",
              spectrum: {
                unit: "1/√Hz",
                points: [
                  [1, rinAsd],
                  [1e8, rinAsd],
                ] as [number, number][],
              },
            },
          ],
        };
        const noisy = evaluate(prepare(withRin)).budget;
        const excessLight = detunedCavity(detuning, { angle, light: { name: "light", type: "coherent", params: { amplitudeExcess: `${10 * Math.log10(1 + excess)} dB` } } });
        const reference = evaluate(prepare(excessLight)).budget;
        const at = `Δ = ${detuning / LINEWIDTH} FWHM, angle ${angle}`;
        expectAllClose(noisy.total, reference.total, 1e-12, `total, ${at}`);
        expectAllClose(sumTerms(noisy.terms, "light: amplitude", "rin"), sumTerms(reference.terms, "light: amplitude"), 1e-12, `amplitude quadrature, ${at}`);
        expectAllClose(sumTerms(noisy.terms, "light: phase"), sumTerms(reference.terms, "light: phase"), 1e-12, `phase quadrature, ${at}`);
      }
    }
  });

  describe("with mathjs complex arithmetic", () => {
    let math: MathJs;
    beforeAll(async () => {
      math = await loadMathjs();
    });
    const c = (re: number, im: number) => math.complex(re, im);
    const div = (a: Complex, b: Complex) => math.divide(a, b) as Complex;
    const relativeError = (got: Complex, want: Complex) => {
      const d = math.subtract(got, want) as Complex;
      return Math.hypot(d.re, d.im) / Math.hypot(want.re, want.im);
    };

    it("the source's amplitude and phase quadratures drive the intracavity photon number as the laser-frame steady state says", () => {
      // Drive a_in = ā_in(1 + ε/2 + iφ) with ā_in = √(P/ħω_L) real, ε/2 = q1/(√2ā_in), φ = q2/(√2ā_in).
      // Linearizing δn = ā*δa + ā δa* with ā = √κ_in ā_in/(κ/2 − iΔ) gives, derived by hand,
      //   δn/n = [q1 (p + q) + i q2 (p − q)]/(√2 ā_in),  p = (κ/2 − iΔ)/(κ/2 − iΔ − iΩ), q = (κ/2 + iΔ)/(κ/2 + iΔ − iΩ).
      // The radiation-pressure force is ħG·δn (same source, Sec. III), so this is the force the drive's
      // noise exerts. The model's cavity block gives δn/n = √2·δa1/√n (quadratures of the real mean field).
      for (const detuning of [-0.7 * LINEWIDTH, 0.3 * LINEWIDTH]) {
        const delta = 2 * Math.PI * detuning;
        const { model } = assemble(loadSetup(detunedCavity(detuning)));
        const mode = model.modes.find((m) => m.owner === "cavity")!;
        const amplitudeColumn = model.inputs.findIndex((i) => i.owner === "light");
        const at = (r: number, k: number) => model.A[r * model.nStates + k];
        const photons = (KAPPA * POWER) / (HBAR * OMEGA_L * (KAPPA ** 2 / 4 + delta ** 2));
        const aIn = Math.sqrt(POWER / (HBAR * OMEGA_L));
        for (const f of FREQUENCIES) {
          const w = 2 * Math.PI * f;
          const block = math.matrix([
            [c(-at(mode.x, mode.x), -w), c(-at(mode.x, mode.p), 0)],
            [c(-at(mode.p, mode.x), 0), c(-at(mode.p, mode.p), -w)],
          ]);
          const p = div(c(KAPPA / 2, -delta), c(KAPPA / 2, -delta - w));
          const q = div(c(KAPPA / 2, delta), c(KAPPA / 2, delta - w));
          const expected = [math.add(p, q) as Complex, math.multiply(c(0, 1), math.subtract(p, q)) as Complex];
          for (const [k, name] of [
            [0, "amplitude"],
            [1, "phase"],
          ] as const) {
            const column = amplitudeColumn + k;
            const b = [[model.B[mode.x * model.nInputs + column]], [model.B[mode.p * model.nInputs + column]]];
            const delta1 = (math.lusolve(block, b) as Matrix).get([0, 0]) as Complex;
            const engine = math.multiply(delta1, Math.SQRT2 / Math.sqrt(photons)) as Complex;
            const want = math.divide(expected[k], Math.SQRT2 * aIn) as Complex;
            expect(relativeError(engine, want), `δn/n per ${name} quadrature, Δ = ${detuning / LINEWIDTH} FWHM, ${f} Hz`).toBeLessThan(1e-12);
          }
        }
      }
    });

    it("the reflected light is read in the drive laser's frame: the body's signal splits between the quadratures as δa_out = −√κ_in δa says", () => {
      // δa(Ω) = iGā x(Ω)/(κ/2 − iΔ − iΩ) with ā ∝ 1/(κ/2 − iΔ) in the laser's frame, δa_out = −√κ_in δa.
      // Quadratures q1 = (U + W)/√2, q2 = (U − W)/(i√2) with U = δa_out(Ω), W = δa_out(−Ω)* (x real), so
      //   q2/q1 = (u − v)/(i(u + v)),  u = iā/(κ/2 − iΔ − iΩ),  v = −iā*/(κ/2 + iΔ − iΩ),
      // whatever the body's response x(Ω) (optical spring included). Undercoupled, so that the
      // reflected carrier's own phase differs from the laser's too.
      for (const detuning of [-0.7 * LINEWIDTH, 0.3 * LINEWIDTH]) {
        const delta = 2 * Math.PI * detuning;
        const quadrature =
          (angle: string) =>
          (f: number): Complex => {
            const { model } = assemble(loadSetup(detunedCavity(detuning, { angle, inputCoupling: 0.4 })));
            const n = model.nStates;
            const w = 2 * Math.PI * f;
            const m = math.matrix(Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => c(-model.A[i * n + j], i === j ? -w : 0))));
            const z = math.lusolve(
              m,
              Array.from(model.signalB, (v) => [v]),
            ) as Matrix;
            const row = model.outputs.findIndex((o) => o.owner === "detector");
            let y = c(model.signalD[row], 0);
            for (let j = 0; j < n; j++) y = math.add(y, math.multiply(z.get([j, 0]) as Complex, model.C[row * n + j])) as Complex;
            return y;
          };
        const q1 = quadrature("0 deg");
        const q2 = quadrature("90 deg");
        const meanField = div(c(1, 0), c(KAPPA / 2, -delta));
        for (const f of FREQUENCIES) {
          const w = 2 * Math.PI * f;
          const u = div(math.multiply(c(0, 1), meanField) as Complex, c(KAPPA / 2, -delta - w));
          const v = div(math.multiply(c(0, -1), math.conj(meanField)) as Complex, c(KAPPA / 2, delta - w));
          const want = div(math.subtract(u, v) as Complex, math.multiply(c(0, 1), math.add(u, v)) as Complex);
          const got = div(q2(f), q1(f));
          expect(relativeError(got, want), `q2/q1, Δ = ${detuning / LINEWIDTH} FWHM, ${f} Hz`).toBeLessThan(1e-9);
        }
      }
    });
  });

  it("a mean field alone changes nothing the detector sees: squeezed light through a driven detuned cavity with no body equals the undriven filter (1e-12)", () => {
    // A linear cavity without mechanics responds to its fluctuations whatever its carrier (the
    // Langevin equation above without the x term does not contain ā): the port frames must cancel.
    // Common practice, no source beyond that equation.
    const throughCavity = (drive: Record<string, string>) =>
      setup(
        [
          { name: "light", type: "squeezed", params: { squeezing: "-8 dB", angle: "30 deg" } },
          { name: "filter", type: "cavity", params: { linewidth: `${LINEWIDTH} Hz`, detuning: `${-0.6 * LINEWIDTH} Hz`, inputCoupling: 0.8, ...drive } },
          { name: "body", type: "free-mass", params: { mass: "1 g" } },
          { name: "probe", type: "position-probe", params: { power: "1 mW" } },
          { name: "detector", type: "homodyne", params: { angle: "70 deg" } },
        ],
        [
          ["light.out", "filter.in"],
          ["filter.out", "probe.in"],
          ["probe.out", "detector.in"],
          ["probe.mechanics", "body.body"],
        ],
        { grid: { from: "10 kHz", to: "1 MHz", points: 41 } },
      );
    const driven = evaluate(prepare(throughCavity({ power: "5 mW" }))).budget;
    const undriven = evaluate(prepare(throughCavity({}))).budget;
    expectAllClose(driven.total, undriven.total, 1e-12, "total");
    expectAllClose(sumTerms(driven.terms, "light"), sumTerms(undriven.terms, "light"), 1e-12, "squeezed light");
  });
});
