import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { designParameter, designProblem, solveForTarget, targetWindow } from "../../src/design";
import { setup, probedBody } from "../helpers/setups";

const OMEGA_LASER = (2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9;
const forcePsd = (power: number) => (8 * HBAR * OMEGA_LASER * power) / SPEED_OF_LIGHT ** 2;

/**
 * Squeezed light (squeeze factor r, phase quadrature squeezed) through a loss of transmission η
 * before a free-mass position probe: the probe's light then has the phase-quadrature noise
 *   S = η e^(−2r) + 1 − η   (in units of vacuum noise; loss mixes in vacuum),
 * so the displacement noise is a·S + b·(η e^(2r) + 1 − η) with a = ħ²/S_F (shot noise of
 * coherent light) and b = S_F/(m²Ω⁴) (back-action); with b/a ≈ 1e-21 at 10 kHz for 1 kg and
 * 1 W, the transmission reaching a target noise a·S is η = (1 − S)/(1 − e^(−2r)).
 */
describe("the root finder against squeezing with loss", () => {
  const r = 1;
  const frequency = 1e4;
  const lossy = (transmission: number) =>
    setup(
      [
        { name: "light", type: "squeezed", params: { r, angle: "90 deg" } },
        { name: "path", type: "loss", params: { transmission } },
        { name: "body", type: "free-mass", params: { mass: "1 kg" } },
        { name: "probe", type: "position-probe", params: { power: "1 W", wavelength: "1064 nm" } },
        { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: 1 } },
      ],
      [
        ["light.out", "path.in"],
        ["path.out", "probe.in"],
        ["probe.out", "detector.in"],
        ["probe.mechanics", "body.body"],
      ],
    );
  const a = HBAR ** 2 / forcePsd(1);
  const b = forcePsd(1) / (2 * Math.PI * frequency) ** 4;

  it.each([0.5, 0.3, 0.8])("the transmission for a noise of S = %f × shot noise is (1 − S)/(1 − e^(−2r))", (S) => {
    const result = solveForTarget(lossy(0.9), { kind: "noise-at", frequency: `${frequency} Hz` }, "path.transmission", a * S);
    expect(result.outcome).toBe("crossing");
    const expected = (1 - S) / (1 - Math.exp(-2 * r));
    // The exact root of the linear form a·(η e^(−2r) + 1 − η) + b·(η e^(2r) + 1 − η) = a·S.
    const exact = (a * S - a - b) / (a * (Math.exp(-2 * r) - 1) + b * (Math.exp(2 * r) - 1));
    expect(Math.abs(exact / expected - 1)).toBeLessThan(1e-15 * 1e3);
    expect(Math.abs(result.solution!.value - expected)).toBeLessThan(1e-9);
    expect(Math.abs(result.solution!.figure / (a * S) - 1)).toBeLessThan(1e-9);
    expect(result.current.reaches).toBe(0.9 * Math.exp(-2 * r) + 0.1 <= S);
  });

  it("a noise below the fully squeezed level e^(−2r) is never reached; the best is at 100 % transmission", () => {
    const result = solveForTarget(lossy(0.9), { kind: "noise-at", frequency: `${frequency} Hz` }, "path.transmission", a * 0.5 * Math.exp(-2 * r));
    expect(result.outcome).toBe("never");
    expect(result.best).toMatchObject({ value: 1, at: "bound" });
    expect(Math.abs(result.best!.figure / (a * Math.exp(-2 * r)) - 1)).toBeLessThan(1e-9);
    expect(result.message).toMatch(/no value of path\.transmission in 0 % … 100 % reaches/);
  });
});

/**
 * A free mass read by a QND probe (η = 1) has the noise (S_SQL/2)(K + 1/K) with K = P/P_SQL(Ω) the
 * power over the power that touches the SQL at Ω (Kimble et al., Phys. Rev. D 65, 022002 (2001)):
 * the margin at Ω is −10·log10((K + 1/K)/2), at most 0 dB at K = 1, and it stays at or above −D dB
 * for K between c − √(c² − 1) and c + √(c² − 1), c = 10^(D/10).
 */
describe("the window and the solve against the free-mass probe's closed form", () => {
  const mass = 1e-3;
  const f = 100;
  const pSql = (HBAR * mass * (2 * Math.PI * f) ** 2 * SPEED_OF_LIGHT ** 2) / (8 * HBAR * OMEGA_LASER);
  const probe = (power: number) => probedBody({ body: { mass: `${mass} kg` }, probe: { power: `${power} W`, wavelength: "1064 nm" } });
  const figure = { kind: "margin-at" as const, frequency: `${f} Hz` };

  it("the window of power keeping −1 dB is P_SQL·(c ∓ √(c² − 1)), c = 10^0.1", () => {
    const c = 10 ** 0.1;
    const w = targetWindow(probe(pSql * 1.3), figure, "probe.power", "-1 dB");
    expect(w.current.reaches).toBe(true);
    expect(w.low!.kind).toBe("crossing");
    expect(w.high!.kind).toBe("crossing");
    expect(Math.abs(w.low!.value / (pSql * (c - Math.sqrt(c * c - 1))) - 1)).toBeLessThan(1e-9);
    expect(Math.abs(w.high!.value / (pSql * (c + Math.sqrt(c * c - 1))) - 1)).toBeLessThan(1e-9);
    expect(Math.abs(w.low!.figure + 1)).toBeLessThan(1e-9);
  });

  it("solving for −3 dB from below P_SQL finds the lower root, from above the upper one (the crossing nearest the current value)", () => {
    const c = 10 ** 0.3;
    const low = solveForTarget(probe(pSql / 10), figure, "probe.power", -3);
    const high = solveForTarget(probe(pSql * 10), figure, "probe.power", -3);
    expect(Math.abs(low.solution!.value / (pSql * (c - Math.sqrt(c * c - 1))) - 1)).toBeLessThan(1e-9);
    expect(Math.abs(high.solution!.value / (pSql * (c + Math.sqrt(c * c - 1))) - 1)).toBeLessThan(1e-9);
  });

  it("1 dB below the SQL is never reached: the result says so and gives the best, 0 dB at P_SQL", () => {
    const result = solveForTarget(probe(pSql / 10), figure, "probe.power", "1 dB", { range: { min: `${pSql / 1e3} W`, max: `${pSql * 1e3} W` } });
    expect(result.outcome).toBe("never");
    expect(result.solution).toBeUndefined();
    expect(Math.abs(result.best!.figure)).toBeLessThan(1e-9);
    expect(Math.abs(result.best!.value / pSql - 1)).toBeLessThan(1e-4);
    expect(result.best!.at).toBe("inside");
  });

  it("a target every value reaches is reported as such; a current value short of the target has no window", () => {
    const everywhere = solveForTarget(probe(pSql), figure, "probe.power", "-60 dB", { range: { min: `${pSql / 10} W`, max: `${pSql * 10} W` } });
    expect(everywhere.outcome).toBe("everywhere");
    const none = targetWindow(probe(pSql * 100), figure, "probe.power", "-1 dB");
    expect(none.current.reaches).toBe(false);
    expect(none.low).toBeUndefined();
    expect(none.message).toMatch(/there is no window around it/);
  });
});

describe("the window of Larmor mismatch in the hybrid spin example", () => {
  const text = readFileSync(join(__dirname, "..", "..", "examples", "hybrid-spin-reference.json"), "utf8");

  it("the bias field window that keeps a 1 dB best margin: the figure equals the target at both ends and the window holds the current field", () => {
    const w = targetWindow(text, { kind: "best-margin" }, "cell.field", "1 dB");
    expect(w.current.reaches).toBe(true);
    expect(w.low!.value).toBeLessThan(w.current.value);
    expect(w.high!.value).toBeGreaterThan(w.current.value);
    for (const end of [w.low!, w.high!]) {
      expect(end.kind).toBe("crossing");
      expect(Math.abs(end.figure - 1)).toBeLessThan(1e-6);
    }
    // Just outside the window the best margin is below 1 dB.
    const problem = designProblem(text, { kind: "best-margin" });
    const field = designParameter(problem.base, "cell.field", "field");
    for (const x of [w.low!.value * (1 - 1e-6), w.high!.value * (1 + 1e-6)]) {
      expect(problem.evaluate({ "cell.field": x }, [field]).value).toBeLessThan(1);
    }
  });
});
