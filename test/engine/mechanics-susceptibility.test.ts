/**
 * A mechanical body's susceptibility and the reference curves built on it. The damped
 * oscillator χ = 1/(m(Ω_m² − Ω² − iγΩ)) (textbook form, from memory; e.g. any mechanics text
 * on the driven damped oscillator) must be the reference module's oscillatorSusceptibility bit
 * for bit for viscous baths; the free-mass force SQL is 2ħmΩ² (2ħ/|χ| with χ = −1/(mΩ²),
 * Braginsky & Khalili, "Quantum Measurement", 1992). Each closure reuses its own scratch pair,
 * so calls in any order give the same bits as the first. Fixed seeds.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { HBAR } from "../../src/constants";
import type { MechanicalBody, ThermalBathInfo } from "../../src/physics/mechanical-body";
import { forceSignalReference, susceptibility } from "../../src/physics/mechanics";
import { oscillatorSusceptibility } from "../../src/reference/limits";

function body(mass: number, massSign: 1 | -1, omega: number, baths: ThermalBathInfo[]): MechanicalBody {
  return { owner: "m", mode: { x: 0, p: 1 } as unknown as MechanicalBody["mode"], xScale: 1, pScale: HBAR, mass, massSign, omega, baths };
}

const bath = (kind: ThermalBathInfo["kind"]) =>
  fc.record({ owner: fc.constant("b"), kind: fc.constant(kind), gamma: fc.double({ min: 1e-6, max: 1e4, noNaN: true }), temperature: fc.double({ min: 0, max: 300, noNaN: true }) });

describe("mechanical susceptibility", () => {
  it("with viscous baths only is oscillatorSusceptibility of the signed mass and the summed damping, bit for bit", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-15, max: 1e3, noNaN: true }),
        fc.constantFrom(1 as const, -1 as const),
        fc.double({ min: 0, max: 1e7, noNaN: true }),
        fc.array(bath("viscous"), { maxLength: 3 }),
        fc.double({ min: 1e-2, max: 1e8, noNaN: true }),
        (mass, sign, omegaM, baths, omega) => {
          const total = baths.reduce((s, b) => s + b.gamma, 0);
          const got = susceptibility(body(mass, sign, omegaM, baths), omega);
          const expected = oscillatorSusceptibility(sign * mass, omegaM, total, omega);
          return Object.is(got[0], expected[0]) && Object.is(got[1], expected[1]);
        },
      ),
      { seed: 20261205, numRuns: 400 },
    );
  });

  it("puts a free mass's force SQL at 2ħmΩ² (relative 1e-14: a different order of roundings)", () => {
    const mass = 5e-12;
    const sql = forceSignalReference(body(mass, 1, 0, [])).curves.find((c) => c.id === "sql")!;
    for (const omega of [1, 2 * Math.PI * 1e3, 7.3e6]) {
      const expected = 2 * HBAR * mass * omega * omega;
      expect(Math.abs(sql.psd(omega) / expected - 1)).toBeLessThan(1e-14);
    }
  });

  it("gives every reference curve and the referral factor the same bits whatever was called before", () => {
    const baths: ThermalBathInfo[] = [
      { owner: "a", kind: "viscous", gamma: 3.1, temperature: 4 },
      { owner: "b", kind: "symmetric", gamma: 0.7, temperature: 0.02 },
    ];
    const make = () => forceSignalReference(body(2e-9, 1, 2 * Math.PI * 1.2e6, baths));
    const omegas = [2 * Math.PI * 1.1e6, 2 * Math.PI * 1.2e6, 2 * Math.PI * 1.3e6];
    const read = (r: ReturnType<typeof make>, omega: number) => [...r.curves.map((c) => c.psd(omega)), r.quantities[0].psdFactor(omega)];
    const fresh = omegas.map((omega) => read(make(), omega));
    const shared = make();
    // Interleaved and repeated, on one reference: each closure's scratch pair must hold nothing over.
    const again = [...omegas, ...omegas.slice().reverse()].map((omega) => read(shared, omega));
    const expected = [...fresh, ...fresh.slice().reverse()];
    expect(again.map((row, i) => row.every((v, k) => Object.is(v, expected[i][k])))).toEqual(expected.map(() => true));
    expect(fresh[0]).toHaveLength(4);
  });
});
