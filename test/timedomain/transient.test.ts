import { beforeAll, describe, expect, it } from "vitest";
import { diffusionMatrix, stationaryCovariance } from "../../src/engine/covariance";
import { assemble } from "../../src/setup/assemble";
import { loadSetup } from "../../src/pipeline";
import { thermalOccupation } from "../../src/reference/limits";
import { groundCovariance, transientCovariance } from "../../src/timedomain";
import { relativeDifference } from "../helpers/close";
import { loadMathjs, type MathJs, type MathMatrix } from "../helpers/mathjs";
import { cavityReadout, setup } from "../helpers/setups";
import { fromRows, relativeMatrixError, toRows } from "./helpers";

const membrane = assemble(
  loadSetup(
    cavityReadout({
      body: { mass: "5 ng", frequency: "1.2 MHz", Q: 1e4, temperature: "6 K", damping: "symmetric" },
      cavity: { linewidth: "8 MHz", detuning: "-2 MHz", inputCoupling: 0.9, g0: "150 Hz", photons: 1e7 },
      efficiency: 0.9,
    }),
  ),
).model;

describe("unconditional covariance over time", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });

  it("starts at V(0) and relaxes to the stationary covariance of mathjs lyap (mathjs as reference)", () => {
    const n = membrane.nStates;
    const v0 = groundCovariance(membrane);
    expect(relativeMatrixError(transientCovariance(membrane, v0, 0), v0)).toBe(0);
    // mathjs lyap(A, Q) solves A P + P Aᵀ + Q = 0.
    const ref = fromRows(math.lyap(toRows(membrane.A, n), toRows(diffusionMatrix(membrane), n)) as number[][]);
    // 1e4 mechanical damping times (γ = 2π·120 Hz): the transient is e^{−γt} ≪ 1e-12.
    const late = transientCovariance(membrane, v0, 1e4 / (2 * Math.PI * 120));
    expect(relativeMatrixError(late, ref)).toBeLessThan(1e-8);
  });

  it("equals e^{At}(V0 − V∞)e^{Aᵀt} + V∞ at intermediate times, with e^{At} from mathjs expm (Lyapunov identity)", () => {
    const n = membrane.nStates;
    const v0 = groundCovariance(membrane);
    const vInf = stationaryCovariance(membrane);
    for (const t of [1e-9, 3e-7, 2e-5, 4e-4]) {
      const e = (
        math.expm(
          math.matrix(
            toRows(
              membrane.A.map((x) => x * t),
              n,
            ),
          ),
        ) as MathMatrix
      ).toArray() as number[][];
      const d = toRows(
        v0.map((x, i) => x - vInf[i]),
        n,
      );
      const expected = math.add(math.multiply(math.multiply(e, d), math.transpose(e)), toRows(vInf, n)) as number[][];
      expect(relativeMatrixError(transientCovariance(membrane, v0, t), fromRows(expected)), `t = ${t} s`).toBeLessThan(1e-8);
    }
  });

  it("needs no stationary state: a free mass kicked by white force noise spreads as Var x = x0 + D t³/3 (integral of Brownian momentum; common practice, no source)", () => {
    // dX = w P dt, dP = √D' dW with white noise of one-sided PSD 1 → diffusion q = k²/2 on P.
    const w = 3;
    const k = 0.4;
    const model = {
      ...membrane,
      nStates: 2,
      nInputs: 1,
      nOutputs: 0,
      A: Float64Array.of(0, w, 0, 0),
      B: Float64Array.of(0, k),
      C: new Float64Array(0),
      D: new Float64Array(0),
      N: Float64Array.of(1),
      modes: [{ owner: "mass", kind: "mechanical" as const, label: "mass", x: 0, p: 1 }],
      outputs: [],
    };
    const t = 2.5;
    const v = transientCovariance(model, groundCovariance(model), t);
    const q = (k * k) / 2;
    // Var X = 1/2 + w² t² /2 + w² q t³/3; Cov = w t/2 + w q t²/2; Var P = 1/2 + q t.
    expect(v[0]).toBeCloseTo(0.5 + (w * w * t * t) / 2 + (w * w * q * t * t * t) / 3, 11);
    expect(v[1]).toBeCloseTo((w * t) / 2 + (w * q * t * t) / 2, 11);
    expect(v[3]).toBeCloseTo(0.5 + q * t, 12);
  });

  it("a damped oscillator in a thermal bath relaxes to n̄ + 1/2 in each quadrature (quantum fluctuation–dissipation theorem, Bose–Einstein n̄)", () => {
    for (const T of [0, 1e-3, 4]) {
      const model = assemble(
        loadSetup(
          setup(
            [
              { name: "light", type: "vacuum" },
              { name: "body", type: "oscillator", params: { mass: "1 ng", frequency: "50 MHz", Q: 1e3, temperature: `${T} K`, damping: "symmetric" } },
              { name: "probe", type: "position-probe", params: { measurementRate: "0 Hz" } },
              { name: "detector", type: "homodyne" },
            ],
            [
              ["light.out", "probe.in"],
              ["probe.out", "detector.in"],
              ["probe.mechanics", "body.body"],
            ],
          ),
        ),
      ).model;
      const nth = thermalOccupation(2 * Math.PI * 50e6, T);
      const gamma = (2 * Math.PI * 50e6) / 1e3;
      const v = transientCovariance(model, groundCovariance(model), 60 / gamma);
      expect(relativeDifference(v[0], nth + 0.5), `T = ${T} K, Var X`).toBeLessThan(1e-11);
      expect(relativeDifference(v[3], nth + 0.5), `T = ${T} K, Var P`).toBeLessThan(1e-11);
      // Halfway: symmetric damping relaxes each variance as n̄ + 1/2 − n̄ e^{−γt} from the ground state.
      const mid = transientCovariance(model, groundCovariance(model), 1 / gamma);
      expect(relativeDifference(mid[0], nth + 0.5 - nth * Math.exp(-1)), `T = ${T} K at t = 1/γ`).toBeLessThan(1e-11);
    }
  });

  it("an oscillator damped by a linked thermal-bath component relaxes to n̄ + 1/2 in X and P (white force noise at the quantum FDT level: ⟨x²⟩ = S_F/(4m²γΩ²), ⟨p²⟩ = S_F/(4γ) with S_F = 2mγħΩ coth(ħΩ/2k_BT))", () => {
    for (const T of [0.01, 4]) {
      const model = assemble(
        loadSetup(
          setup(
            [
              { name: "light", type: "vacuum" },
              // Intrinsic damping negligible (Q = 1e12); the bath gives Q = 1e3.
              { name: "body", type: "oscillator", params: { mass: "1 ng", frequency: "1 MHz", Q: 1e12, temperature: `${T} K` } },
              { name: "gas", type: "thermal-bath", params: { temperature: `${T} K`, dampingRate: "1 kHz" } },
              { name: "probe", type: "position-probe", params: { measurementRate: "0 Hz" } },
              { name: "detector", type: "homodyne" },
            ],
            [
              ["light.out", "probe.in"],
              ["probe.out", "detector.in"],
              ["probe.mechanics", "body.body"],
              ["gas.mechanics", "body.body"],
            ],
          ),
        ),
      ).model;
      const nth = thermalOccupation(2 * Math.PI * 1e6, T);
      const gamma = 2 * Math.PI * 1e3;
      const v = transientCovariance(model, groundCovariance(model), 60 / gamma);
      const { x, p } = model.modes[0];
      const n = model.nStates;
      // The intrinsic bath adds 1e-9 of the damping: relative change ≲ 1e-9.
      expect(relativeDifference(v[x * n + x], nth + 0.5), `T = ${T} K, Var X`).toBeLessThan(1e-8);
      expect(relativeDifference(v[p * n + p], nth + 0.5), `T = ${T} K, Var P`).toBeLessThan(1e-8);
    }
  });
});
