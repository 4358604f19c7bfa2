import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { rankParameters } from "../../src/design";
import { probedBody } from "../helpers/setups";

/**
 * The ranking's derivatives against analytic derivatives of the closed form of a free mass m read
 * by a QND position probe of reflected power P at wavelength λ with detection efficiency η:
 *   S_x = ħ²/(η S_F) + S_F/(m²Ω⁴),  S_F = 8ħωP/c²,  ω = 2πc/λ
 * (shot noise and back-action; Braginsky & Khalili, Quantum Measurement, 1992; the product
 * ħ²/η of the two is checked in test/engine/free-mass-probe.test.ts), and the free-mass SQL
 * 2ħ/(mΩ²) (Kimble et al., Phys. Rev. D 65, 022002 (2001)).
 */
const MASS = 1e-3;
const POWER = 2; // W
const WAVELENGTH = 1064e-9;
const ETA = 0.9;
const F = 4; // Hz: shot noise and back-action both count (at 2 W the SQL is touched at 100 Hz·√(2 W/2.5 kW) ≈ 2.8 Hz)
const OMEGA = 2 * Math.PI * F;
const DB = 10 / Math.LN10;

const setup = probedBody({ body: { mass: `${MASS} kg` }, probe: { power: `${POWER} W`, wavelength: "1064 nm" }, efficiency: ETA });
const sF = (p: number, lambda: number) => (8 * HBAR * ((2 * Math.PI * SPEED_OF_LIGHT) / lambda) * p) / SPEED_OF_LIGHT ** 2;
const shot = HBAR ** 2 / (ETA * sF(POWER, WAVELENGTH));
const backAction = sF(POWER, WAVELENGTH) / (MASS ** 2 * OMEGA ** 4);
const total = shot + backAction;

/** d(10·log10 S)/dx from dS/dx. */
const levelSlope = (dS: number) => (DB * dS) / total;
const analyticNoise: Record<string, number> = {
  "probe.power": levelSlope((backAction - shot) / POWER),
  "probe.wavelength": levelSlope((shot - backAction) / WAVELENGTH),
  "body.mass": levelSlope((-2 * backAction) / MASS),
  "detector.efficiency": levelSlope(-shot / ETA),
};

function rank(figure: { kind: "noise-at" | "margin-at"; frequency: string }) {
  return rankParameters(setup, figure, { parameters: Object.keys(analyticNoise), scanPoints: 9 });
}

/** The estimate agrees with the exact slope within four times its own error estimate, or 1e-9 relative (rounding of the figure itself). */
function expectWithinStatedError(target: string, estimate: { levelPerUnit: number; error: number } | undefined, exact: number) {
  expect(estimate, target).toBeDefined();
  const bound = Math.max(4 * estimate!.error, 1e-9 * Math.abs(exact));
  expect(Math.abs(estimate!.levelPerUnit - exact), `${target}: ${estimate!.levelPerUnit} vs ${exact} (stated error ${estimate!.error})`).toBeLessThanOrEqual(bound);
  expect(estimate!.error, `${target}: the stated error is small`).toBeLessThan(1e-6 * Math.abs(exact));
}

describe("sensitivities against analytic derivatives of the free-mass probe's closed form", () => {
  it("d(noise level in dB)/dx for power, wavelength, mass and efficiency", () => {
    const r = rank({ kind: "noise-at", frequency: `${F} Hz` });
    expect(Math.abs(r.current / total - 1)).toBeLessThan(1e-9);
    for (const p of r.parameters) expectWithinStatedError(p.target, p.derivative, analyticNoise[p.target]);
  });

  it("the margin below the SQL 10·log10(2ħ/(mΩ²)/S_x): its mass derivative carries the SQL's own −1/m", () => {
    const r = rank({ kind: "margin-at", frequency: `${F} Hz` });
    const sql = (2 * HBAR) / (MASS * OMEGA ** 2);
    expect(Math.abs(r.current - DB * Math.log(sql / total))).toBeLessThan(1e-9);
    const exact: Record<string, number> = {
      "body.mass": -DB / MASS - analyticNoise["body.mass"],
      "probe.power": -analyticNoise["probe.power"],
      "probe.wavelength": -analyticNoise["probe.wavelength"],
      "detector.efficiency": -analyticNoise["detector.efficiency"],
    };
    for (const p of r.parameters) expectWithinStatedError(p.target, p.derivative, exact[p.target]);
  });

  it("gain per 1 % is the slope times 1 % of the value, in the improving sense; which way helps and the bound on that side", () => {
    const r = rank({ kind: "noise-at", frequency: `${F} Hz` });
    const byTarget = Object.fromEntries(r.parameters.map((p) => [p.target, p]));
    const values: Record<string, number> = { "probe.power": POWER, "probe.wavelength": WAVELENGTH, "body.mass": MASS, "detector.efficiency": ETA };
    for (const [t, slope] of Object.entries(analyticNoise)) {
      // Lower noise is better: the gain is minus the level's change.
      const exactGain = -slope * 0.01 * values[t];
      expect(Math.abs(byTarget[t].gainPer1Percent! - exactGain), t).toBeLessThanOrEqual(1e-8 * Math.abs(exactGain));
      expect(byTarget[t].helps, t).toBe(exactGain > 0 ? "increase" : "decrease");
    }
    // Ranked by |gain per 1 %|, largest first.
    const gains = r.parameters.map((p) => Math.abs(p.gainPer1Percent!));
    expect(gains).toEqual([...gains].sort((a, b) => b - a));
    expect(byTarget["detector.efficiency"].bound).toMatchObject({ value: 1, inclusive: true });
    expect(byTarget["body.mass"].helps).toBe("increase");
    expect(byTarget["body.mass"].bound).toBeUndefined();
    // Power: more helps while shot noise exceeds back-action (no upper bound), less helps otherwise (down to 0 W).
    if (shot > backAction) expect(byTarget["probe.power"].bound).toBeUndefined();
    else expect(byTarget["probe.power"].bound).toMatchObject({ value: 0, inclusive: true });
  });

  it("the best noise that the power alone reaches is the SQL of the detected light, 2ħ/(√η mΩ²), at S_F = ħmΩ²/√η (minimum of the closed form)", () => {
    const r = rank({ kind: "noise-at", frequency: `${F} Hz` });
    const power = r.parameters.find((p) => p.target === "probe.power")!;
    const bestNoise = (2 * HBAR) / (Math.sqrt(ETA) * MASS * OMEGA ** 2);
    const bestForce = (HBAR * MASS * OMEGA ** 2) / Math.sqrt(ETA);
    const bestPower = (bestForce * SPEED_OF_LIGHT ** 2) / (8 * HBAR * ((2 * Math.PI * SPEED_OF_LIGHT) / WAVELENGTH));
    expect(Math.abs(power.best!.figure / bestNoise - 1)).toBeLessThan(1e-9);
    expect(Math.abs(power.best!.value / bestPower - 1)).toBeLessThan(1e-4);
    expect(power.best!.at).toBe("inside");
    // The efficiency's best is its bound, 100 %.
    const eta = r.parameters.find((p) => p.target === "detector.efficiency")!;
    expect(eta.best).toMatchObject({ value: 1, at: "bound" });
  });
});
