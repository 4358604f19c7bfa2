import { describe, expect, it } from "vitest";
import { BOLTZMANN, HBAR } from "../../src/constants";
import {
  displacementSql,
  freeMassDisplacementSql,
  freeMassForceSql,
  oscillatorSusceptibility,
  strainSql,
  thermalForcePsd,
  thermalOccupation,
  zeroPointDisplacementPsd,
} from "../../src/reference/limits";

const TWO_PI = 2 * Math.PI;

describe("free-mass SQL", () => {
  it("strain SQL √(8ħ/(mΩ²L²)) for 40 kg, 3995 m, 100 Hz is about 1.8e-24 /√Hz (Kimble et al., PRD 65, 022002 (2001))", () => {
    const h = Math.sqrt(strainSql(40, 3995, TWO_PI * 100));
    // The check value is quoted to two digits; 1.8e-24 ± 0.05e-24.
    expect(Math.abs(h - 1.8e-24)).toBeLessThan(0.05e-24);
    // And it is the displacement SQL 2ħ/(mΩ²) of one test mass, times 4 masses, over L²: h² = 4·S_x/L².
    expect(Math.abs(strainSql(40, 3995, TWO_PI * 100) / ((4 * freeMassDisplacementSql(40, TWO_PI * 100)) / 3995 ** 2) - 1)).toBeLessThan(1e-15);
  });

  it("displacement SQL 2ħ/(mΩ²) = 2ħ|χ| for χ = −1/(mΩ²), and force SQL 2ħmΩ² = 2ħ/|χ| (physics notes §2)", () => {
    for (const f of [1, 100, 1e4]) {
      const omega = TWO_PI * f;
      const chi = oscillatorSusceptibility(2, 0, 0, omega);
      expect(Math.abs(chi[0] + 1 / (2 * omega ** 2))).toBeLessThan(1e-15 / omega ** 2);
      expect(Math.abs(displacementSql(chi) / freeMassDisplacementSql(2, omega) - 1)).toBeLessThan(1e-15);
      expect(Math.abs(freeMassForceSql(2, omega) * freeMassDisplacementSql(2, omega) - 4 * HBAR ** 2)).toBeLessThan(1e-15 * 4 * HBAR ** 2);
    }
  });
});

describe("oscillator references", () => {
  const m = 1e-11;
  const wm = TWO_PI * 1e5;
  const gamma = wm / 1e3;

  it("zero-point spectrum 2ħ|Im χ| equals the added-noise SQL 2ħ|χ| on resonance, and only there (Clerk et al., RMP 82, 1155 (2010))", () => {
    const onRes = oscillatorSusceptibility(m, wm, gamma, wm);
    expect(Math.abs(zeroPointDisplacementPsd(onRes) / displacementSql(onRes) - 1)).toBeLessThan(1e-12);
    for (const f of [0.9e5, 0.99e5, 1.01e5, 1.2e5]) {
      const chi = oscillatorSusceptibility(m, wm, gamma, TWO_PI * f);
      expect(zeroPointDisplacementPsd(chi)).toBeLessThan(displacementSql(chi));
    }
  });

  it("a negative mass flips the sign of χ (inverted oscillator, physics notes §4)", () => {
    const a = oscillatorSusceptibility(m, wm, gamma, 0.97 * wm);
    const b = oscillatorSusceptibility(-m, wm, gamma, 0.97 * wm);
    expect(b[0]).toBe(-a[0]);
    expect(b[1]).toBe(-a[1]);
  });
});

describe("thermal force, quantum fluctuation-dissipation theorem", () => {
  const m = 1e-9;
  const gamma = 10;

  it("equals 4mγħΩ(n̄ + 1/2) with the Bose–Einstein occupation n̄ (Callen & Welton 1951; Clerk et al. 2010, Sec. II)", () => {
    for (const [f, T] of [
      [1e6, 0.01],
      [1e9, 0.05],
      [1e3, 300],
      [5e6, 4],
    ]) {
      const omega = TWO_PI * f;
      const expected = 4 * m * gamma * HBAR * omega * (thermalOccupation(omega, T) + 0.5);
      expect(Math.abs(thermalForcePsd(m, gamma, T, omega) / expected - 1)).toBeLessThan(1e-12);
    }
  });

  it("reaches the classical limit 4mγk_BT when k_BT ≫ ħΩ and the zero-point 2mγħΩ at T = 0", () => {
    const omega = TWO_PI * 1e3;
    const classical = 4 * m * gamma * BOLTZMANN * 300;
    // Next term of coth u = 1/u + u/3: relative correction u²/3 with u = ħΩ/2k_BT ≈ 8e-11.
    expect(Math.abs(thermalForcePsd(m, gamma, 300, omega) / classical - 1)).toBeLessThan(1e-15);
    expect(thermalForcePsd(m, gamma, 0, omega)).toBe(2 * m * gamma * HBAR * omega);
  });
});
