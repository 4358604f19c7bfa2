import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { CellStatus, toleranceMap } from "../../src/node";
import { probedBody } from "../helpers/setups";

/**
 * Outside reference: a free mass m read by a quantum-limited position probe (QND readout,
 * unit detection efficiency) has, at angular frequency Ω,
 *   S_x = ħ²/S_F + S_F/(m²Ω⁴),   S_x,SQL = 2ħ/(mΩ²)   (Braginsky & Khalili, Quantum Measurement, 1992),
 * so S_x/S_SQL = (K + 1/K)/2 with K = S_F/(ħmΩ²): the noise touches the SQL only where
 * S_F = ħmΩ², and the margin is −10·log10((K + 1/K)/2) dB everywhere. The probe's
 * back-action force PSD is S_F = 8ħω_L P/c² for reflected power P (as in test/engine/free-mass-probe.test.ts).
 */
const M0 = 1e-3; // kg
const F = 100; // Hz
const OMEGA_LASER = (2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9;
const backActionForce = (power: number) => (8 * HBAR * OMEGA_LASER * power) / SPEED_OF_LIGHT ** 2;
/** Power whose back-action touches the SQL of mass M0 at F: S_F = ħ M0 Ω². */
const P0 = (M0 * (2 * Math.PI * F) ** 2 * SPEED_OF_LIGHT ** 2) / (8 * OMEGA_LASER);

describe("tolerance map of the free-mass QND readout against the closed form", () => {
  it("the margin over power × mass is −10·log10((K + 1/K)/2) in every cell and peaks (≈ 0 dB) where S_F = ħmΩ²", async () => {
    const setup = probedBody({ body: { mass: "1 g" }, probe: { power: "1 W", wavelength: "1064 nm" } });
    // Powers P0/16 … 16 P0 in factors of 2, masses M0/4 … 4 M0 in factors of 2: the touching
    // power P0·m/M0 of every row falls on a column.
    const map = await toleranceMap(
      setup,
      {
        x: { target: "probe.power", from: `${P0 / 16} W`, to: `${16 * P0} W`, points: 9, scale: "log" },
        y: { target: "body.mass", from: "0.25 g", to: "4 g", points: 5, scale: "log" },
        grid: { from: "1 Hz", to: "10 kHz", points: 201 },
        figure: { kind: "margin-at", frequency: `${F} Hz` },
      },
      { workers: 2 },
    );
    expect(map.status.every((s) => s === CellStatus.ok)).toBe(true);
    expect(map.y.written).toEqual(["250 mg", "500 mg", "1 g", "2 g", "4 g"]);
    const f = map.figure.frequency!;
    expect(Math.abs(f - F)).toBeLessThan(1e-9);
    const omega = 2 * Math.PI * f;
    let worst = 0;
    for (let j = 0; j < 5; j++) {
      const m = map.y.values[j];
      const row = Array.from(map.values.subarray(j * 9, j * 9 + 9));
      for (let i = 0; i < 9; i++) {
        const K = backActionForce(map.x.values[i]) / (HBAR * m * omega * omega);
        const expected = -10 * Math.log10((K + 1 / K) / 2);
        worst = Math.max(worst, Math.abs(row[i] - expected));
        // Never below the SQL at unit efficiency.
        expect(row[i]).toBeLessThanOrEqual(1e-9);
      }
      const argmax = row.indexOf(Math.max(...row));
      // S_F = ħmΩ² at P = P0·m/M0, i.e. column 4 + log2(m/M0) = j + 2.
      expect(argmax, `row ${j} (m = ${map.y.written[j]})`).toBe(j + 2);
      expect(row[argmax]).toBeGreaterThan(-1e-8);
      // One step of 2 in power away: K ≈ 2 or 1/2 (the written powers have 6 digits), −10·log10(1.25) dB.
      expect(row[argmax + (j < 4 ? 1 : -1)]).toBeCloseTo(-10 * Math.log10(1.25), 4);
    }
    expect(worst).toBeLessThan(1e-8);
  });
});
