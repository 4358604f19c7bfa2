import { beforeAll, describe, expect, it } from "vitest";
import { noiseBudget } from "../../src/engine/budget";
import { outputSpectra, signalResponse } from "../../src/engine/spectra";
import { assemble } from "../../src/setup/assemble";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import type { SetupDescription } from "../../src/setup/format";
import { expectAllClose } from "../helpers/close";
import { loadMathjs, type MathJs } from "../helpers/mathjs";
import { probedBody, setup } from "../helpers/setups";

const GRID = { from: 1, to: 1e4, points: 60 };

/** A free mass read by a QND probe whose output light is split 50/50 onto two homodynes. */
function splitReadout(angle1: string, angle2: string, efficiency = 1, transmission = 0.5): SetupDescription {
  return setup(
    [
      { name: "light", type: "coherent" },
      { name: "body", type: "free-mass", params: { mass: "10 g" } },
      { name: "probe", type: "position-probe", params: { power: "0.3 W" } },
      { name: "open", type: "vacuum" },
      { name: "split", type: "beam-splitter", params: { transmission } },
      { name: "d1", type: "homodyne", params: { angle: angle1, efficiency } },
      { name: "d2", type: "homodyne", params: { angle: angle2, efficiency } },
    ],
    [
      ["light.out", "probe.in"],
      ["probe.out", "split.in1"],
      ["open.out", "split.in2"],
      ["split.out1", "d1.in"],
      ["split.out2", "d2.in"],
      ["probe.mechanics", "body.body"],
    ],
    { readout: ["d1", "d2"] },
  );
}

describe("optimal combination of several detector outputs", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });

  it("recovers the unsplit beam: two phase readouts of a lossless split equal one (information is conserved by a beam splitter)", () => {
    for (const [eta, T] of [
      [1, 0.5],
      [0.8, 0.5],
      [0.9, 0.2],
    ]) {
      const both = evaluateSetup(loadSetup(splitReadout("90 deg", "90 deg", eta, T)), GRID).budget;
      const single = evaluateSetup(loadSetup(probedBody({ body: { mass: "10 g" }, probe: { power: "0.3 W" }, efficiency: eta })), GRID).budget;
      expectAllClose(both.total, single.total, 1e-9, `η = ${eta}, T = ${T}`);
    }
  });

  it("equals 1/(h† S_y⁻¹ h) computed with mathjs complex matrices from the raw output spectra (mathjs as reference)", () => {
    const a = assemble(loadSetup(splitReadout("20 deg", "100 deg", 0.85, 0.35)));
    const freqs = Float64Array.of(3, 30, 300, 3000);
    const budget = noiseBudget(a, freqs);
    const s = outputSpectra(a.model, a.readoutRows, freqs);
    const h = signalResponse(a.model, a.readoutRows, freqs);
    freqs.forEach((f, k) => {
      const S = math.matrix([
        [math.complex(s.re[k * 4], s.im[k * 4]), math.complex(s.re[k * 4 + 1], s.im[k * 4 + 1])],
        [math.complex(s.re[k * 4 + 2], s.im[k * 4 + 2]), math.complex(s.re[k * 4 + 3], s.im[k * 4 + 3])],
      ]);
      const hv = math.matrix([[math.complex(h.re[k * 2], h.im[k * 2])], [math.complex(h.re[k * 2 + 1], h.im[k * 2 + 1])]]);
      const q = math.multiply(math.ctranspose(hv), math.multiply(math.inv(S), hv)) as unknown as { get(i: number[]): { re: number } };
      const chi2 = (1 / (0.01 * (2 * Math.PI * f) ** 2)) ** 2; // displacement referral of a free mass
      const expected = chi2 / q.get([0, 0]).re;
      expect(Math.abs(budget.total[k] / expected - 1), `${f} Hz`).toBeLessThan(1e-9);
    });
  });

  it("never does worse than the better of the two detectors alone", () => {
    const both = evaluateSetup(loadSetup(splitReadout("30 deg", "95 deg", 0.9)), GRID).budget;
    for (const only of ["d1", "d2"]) {
      const desc = splitReadout("30 deg", "95 deg", 0.9);
      desc.readout = [only];
      const alone = evaluateSetup(loadSetup(desc), GRID).budget;
      for (let i = 0; i < GRID.points; i++) expect(both.total[i]).toBeLessThanOrEqual(alone.total[i] * (1 + 1e-12));
    }
  });
});
