import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { inputTransfer, signalResponse } from "../../src/engine/spectra";
import { QuietframeError, QuietframeErrors } from "../../src/errors";
import { evaluate, loadSetup, prepare } from "../../src/pipeline";
import { SetupPreparer } from "../../src/prepare";
import type { SetupDescription } from "../../src/setup/format";
import { expectAllClose } from "../helpers/close";
import { setup, sumTerms } from "../helpers/setups";

/**
 * Classical force and displacement noise of an interferometer's test masses ("force" and
 * "displacement" entering an interferometer: the spectrum of ONE test mass, the four alike and
 * independent).
 *
 * Conversion to strain, derived in src/components/interferometer.ts (testMassForceEntry): the
 * differential arm length ΔL = (x_1e − x_1i) − (x_2e − x_2i) of four independent masses has
 * S_ΔL = 4 S_x, a free mass answers x = −F/(mΩ²), and h = ΔL/L, so
 *   S_h = 4 S_F/(m²Ω⁴L²)   and   S_h = 4 S_x/L².
 * Outside check of the factor 4: the force SQL of one free mass, S_F = 2ħmΩ², and its displacement
 * SQL, S_x = 2ħ/(mΩ²) (Braginsky & Khalili, Quantum Measurement (1992); one-sided), must convert
 * to the strain SQL of a Michelson with four test masses, h_SQL² = 8ħ/(mΩ²L²) (Kimble et al.,
 * Phys. Rev. D 65, 022002 (2001), eq. (2.12)–(2.14), from memory).
 *
 * With detuned signal recycling the light sees ΔL + L·h and ΔL answers the radiation pressure
 * whatever moved it, so the optical spring acts on a force exactly as on the signal: the readout's
 * response to the force column is χ₀/L times its response to strain (χ₀ = −1/(μΩ²), μ = m/4), the
 * readout PSD of a force term carries the spring's resonance through Buonanno & Chen's
 * denominator M (Phys. Rev. D 64, 042006 (2001), eqs. (2.20)–(2.26), from memory, as in
 * signal-recycling.test.ts), and referred to strain it is the free-mass conversion above.
 */

const MASS = 30; // kg, each test mass
const L = 4000; // m
const F_ARM = 100; // Hz
const GAMMA = 2 * Math.PI * F_ARM;
const OMEGA0 = (2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9;
/** I_SQL = mL²γ⁴/(4ω0) (Kimble et al. 2001); P_arm = I0·c/(2Lγ) (interferometer.ts). */
const I_SQL = (MASS * L * L * GAMMA ** 4) / (4 * OMEGA0);
const P_ARM = (I_SQL * SPEED_OF_LIGHT) / (2 * L * GAMMA);

const GRID = { from: 5, to: 5000, points: 83 };
/** Tabulated from 1 Hz to 10 kHz, wider than the grid. */
const TABLE_FREQUENCIES = [1, 3, 10, 30, 100, 300, 1000, 3000, 10000];

const omega = (f: number) => 2 * Math.PI * f;
/** A power law c·f^k: log-log interpolation between tabulated points gives it back exactly. */
const forceAsd = (f: number) => 3e-15 * (f / 10) ** -2;
const displacementAsd = (f: number) => 2e-20 * (f / 100) ** -0.5;

type Entry = "force" | "displacement" | "strain";
const UNITS: Record<Entry, string> = { force: "N/√Hz", displacement: "m/√Hz", strain: "1/√Hz" };

function term(name: string, enters: Entry, asd: (f: number) => number): NonNullable<SetupDescription["classicalNoise"]>[number] {
  return { name, enters, on: "ifo", spectrum: { unit: UNITS[enters], points: TABLE_FREQUENCIES.map((f): [number, number] => [f, asd(f)]) } };
}

interface IfoOptions {
  /** Signal-recycling mirror transmission and one-way detuning phase (rad). */
  srm?: { T: number; phi: number };
  classicalNoise?: SetupDescription["classicalNoise"];
}

function ifo(o: IfoOptions = {}): SetupDescription {
  const params: Record<string, string | number> = { mass: `${MASS} kg`, armLength: `${L} m`, armBandwidth: `${F_ARM} Hz`, power: `${P_ARM} W` };
  if (o.srm) Object.assign(params, { srmTransmission: o.srm.T, srDetuning: `${o.srm.phi} rad`, lengthControl: "servo" });
  return setup(
    [
      { name: "light", type: "vacuum" },
      { name: "ifo", type: "interferometer", params },
      { name: "detector", type: "homodyne", params: { angle: "90 deg" } },
    ],
    [
      ["light.out", "ifo.in"],
      ["ifo.out", "detector.in"],
    ],
    { signal: { kind: "strain", on: "ifo", referTo: "strain" }, ...(o.classicalNoise ? { classicalNoise: o.classicalNoise } : {}) },
  );
}

const budgetOf = (s: SetupDescription) => evaluate(prepare(loadSetup(s)), GRID).budget;
const freeMassStrain = (f: number) => (4 * forceAsd(f) ** 2) / (MASS ** 2 * omega(f) ** 4 * L ** 2);

describe("force and displacement of each test mass, free masses", () => {
  it("a force term equals a strain term of S_h = 4 S_F/(m²Ω⁴L²), and its label names the test masses", () => {
    const budget = budgetOf(ifo({ classicalNoise: [term("suspension", "force", forceAsd)] }));
    expectAllClose(sumTerms(budget.terms, "suspension"), Array.from(budget.frequencies, freeMassStrain), 1e-12, "S_h of the force term");
    const asStrain = budgetOf(ifo({ classicalNoise: [term("suspension", "strain", (f) => Math.sqrt(freeMassStrain(f)))] }));
    expectAllClose(budget.total, asStrain.total, 1e-12, "total against the strain term");
    const t = budget.terms.find((x) => x.owner === "suspension")!;
    expect(t.category).toBe("classical");
    expect(t.label).toBe("suspension: force on each test mass of ifo (classical)");
  });

  it("a displacement term equals a strain term of S_h = 4 S_x/L² and adds to the quantum total", () => {
    const quiet = budgetOf(ifo());
    const budget = budgetOf(ifo({ classicalNoise: [term("coating", "displacement", displacementAsd)] }));
    const expected = Array.from(budget.frequencies, (f) => (4 * displacementAsd(f) ** 2) / L ** 2);
    const coating = sumTerms(budget.terms, "coating");
    expectAllClose(coating, expected, 1e-12, "S_h of the displacement term");
    expectAllClose(
      budget.total,
      Array.from(quiet.total, (v, i) => v + coating[i]),
      1e-15,
      "total",
    );
    expect(budget.terms.find((x) => x.owner === "coating")!.label).toBe("coating: displacement of each test mass of ifo (classical)");
  });

  it("one test mass's force SQL 2ħmΩ² and displacement SQL 2ħ/(mΩ²) each convert to the strain SQL 8ħ/(mΩ²L²)", () => {
    // √(2ħmΩ²) ∝ f and √(2ħ/(mΩ²)) ∝ 1/f: power laws, so the tables give them back exactly.
    const forceSql = (f: number) => Math.sqrt(2 * HBAR * MASS) * omega(f);
    const displacementSql = (f: number) => Math.sqrt((2 * HBAR) / MASS) / omega(f);
    const budget = budgetOf(ifo({ classicalNoise: [term("forceAtSql", "force", forceSql), term("motionAtSql", "displacement", displacementSql)] }));
    const hSql2 = Array.from(budget.frequencies, (f) => (8 * HBAR) / (MASS * omega(f) ** 2 * L ** 2));
    expectAllClose(sumTerms(budget.terms, "forceAtSql"), hSql2, 1e-12, "force SQL in strain");
    expectAllClose(sumTerms(budget.terms, "motionAtSql"), hSql2, 1e-12, "displacement SQL in strain");
    expectAllClose(budget.references.find((r) => r.id === "sql")!.psd, hSql2, 1e-12, "the engine's own strain SQL");
  });
});

describe("the terms follow the interferometer's values in searches", () => {
  it("a SetupPreparer's mass and arm length scale the force term as 1/(m²L²) and the displacement term as 1/L², as prepare(setup, values) does", () => {
    const s = ifo({ classicalNoise: [term("suspension", "force", forceAsd), term("coating", "displacement", displacementAsd)] });
    const values = { "ifo.mass": "60 kg", "ifo.armLength": "8 km" };
    const preparer = new SetupPreparer(s);
    const base = evaluate(preparer.prepare(), GRID).budget;
    const changed = evaluate(preparer.prepare(values), GRID).budget;
    expect(changed.total).toEqual(evaluate(prepare(s, values), GRID).budget.total);
    // (30 kg · 4 km / (60 kg · 8 km))² = 1/16 and (4 km / 8 km)² = 1/4: powers of two, so the terms scale exactly.
    expectAllClose(
      sumTerms(changed.terms, "suspension"),
      Array.from(sumTerms(base.terms, "suspension"), (v) => v / 16),
      1e-12,
      "force term",
    );
    expectAllClose(
      sumTerms(changed.terms, "coating"),
      Array.from(sumTerms(base.terms, "coating"), (v) => v / 4),
      1e-12,
      "displacement term",
    );
  });
});

describe("force on the test masses with detuned signal recycling: the optical spring acts on it as on the signal", () => {
  // Buonanno & Chen's detuned example (ρ = 0.9, φ = π/2 − 0.47) at I0 = I_SQL, read at ζ = 0 (homodyne 90°).
  const T = 0.19;
  const PHI = Math.PI / 2 - 0.47;
  const withForce = ifo({ srm: { T, phi: PHI }, classicalNoise: [term("suspension", "force", forceAsd)] });

  type C = [number, number];
  const cmul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
  const cabs2 = (a: C) => a[0] * a[0] + a[1] * a[1];
  const cexp = (t: number): C => [Math.cos(t), Math.sin(t)];

  /**
   * |response of b_ζ to h|² = 2Kτ²|D_ζ|²/(|M|² h_SQL²) at ζ = 0 (D_ζ = D2 = −(−1 + ρe^{2iβ}) cos φ),
   * in units where the vacuum's one-sided PSD is 1; M = 1 + ρ²e^{4iβ} − 2ρe^{2iβ}(cos 2φ + (K/2) sin 2φ)
   * vanishes at the optical spring's resonance (Buonanno & Chen 2001, Sec. II and IV). `withSpring`
   * false drops the radiation-pressure part (K/2) sin 2φ from M, leaving M₀: the light's response
   * without the spring.
   */
  function bcSignalResponse2(f: number, withSpring = true): number {
    const rho = Math.sqrt(1 - T);
    const w = omega(f);
    const K = (2 * GAMMA ** 4) / (w ** 2 * (GAMMA ** 2 + w ** 2));
    const beta = Math.atan(w / GAMMA);
    const e2b = cexp(2 * beta);
    const spring = Math.cos(2 * PHI) + (withSpring ? (K / 2) * Math.sin(2 * PHI) : 0);
    const e4b = cmul(e2b, e2b);
    const m: C = [1 + rho * rho * e4b[0] - 2 * rho * spring * e2b[0], rho * rho * e4b[1] - 2 * rho * spring * e2b[1]];
    const d2: C = [-Math.cos(PHI) * (-1 + rho * e2b[0]), -Math.cos(PHI) * rho * e2b[1]];
    const hSql2 = (8 * HBAR) / (MASS * w ** 2 * L ** 2);
    return (2 * K * T * cabs2(d2)) / (cabs2(m) * hSql2);
  }

  /** The readout's complex response to the force column and to the strain signal, on a log grid. */
  function responses(from: number, to: number, points: number) {
    const prepared = prepare(loadSetup(withForce));
    const model = prepared.assembled.model;
    const column = model.classicalInputs![0].column;
    const frequencies = new Float64Array(Array.from({ length: points }, (_, i) => from * (to / from) ** (i / (points - 1))));
    const toForce = inputTransfer(model, prepared.assembled.readoutRows, frequencies);
    const toStrain = signalResponse(model, prepared.assembled.readoutRows, frequencies);
    const m = model.nInputs;
    return {
      prepared,
      frequencies,
      force: Array.from(frequencies, (_, k): C => [toForce.re[k * m + column], toForce.im[k * m + column]]),
      strain: Array.from(frequencies, (_, k): C => [toStrain.re[k], toStrain.im[k]]),
    };
  }
  /** The column carries the generalized force (F_1e − F_1i − F_2e + F_2i)/4, of PSD S_F/4. */
  const readoutPsd = (response: C, f: number) => (cabs2(response) * forceAsd(f) ** 2) / 4;

  it("the readout answers the force column exactly as the strain χ₀/L, χ₀ = −4/(mΩ²) (the engine's own responses)", () => {
    const r = responses(GRID.from, GRID.to, GRID.points);
    const ratios = r.force.map((a, k) => cmul(a, [r.strain[k][0], -r.strain[k][1]]).map((v) => v / cabs2(r.strain[k])));
    const chiOverL = Array.from(r.frequencies, (f) => -4 / (MASS * omega(f) ** 2 * L));
    expectAllClose(
      ratios.map((q) => q[0]),
      chiOverL,
      1e-12,
      "Re(H_F/H_h)",
    );
    ratios.forEach((q, k) => expect(Math.abs(q[1] / chiOverL[k])).toBeLessThan(1e-12));
  });

  it("the force term's readout PSD is the free-mass strain times Buonanno & Chen's |signal response|², spring resonance included", () => {
    const r = responses(GRID.from, GRID.to, GRID.points);
    expectAllClose(
      r.force.map((a, k) => readoutPsd(a, r.frequencies[k])),
      Array.from(r.frequencies, (f) => freeMassStrain(f) * bcSignalResponse2(f)),
      1e-9,
      "readout PSD of the force term",
    );
  });

  it("it differs from the free-mass conversion read through the interferometer without the spring by |M₀/M|², which peaks at the spring's resonance", () => {
    // 30 Hz to 300 Hz in steps of 0.5 %: fine enough to place the peak.
    const r = responses(30, 300, 463);
    const springGain = r.force.map((a, k) => readoutPsd(a, r.frequencies[k]) / (freeMassStrain(r.frequencies[k]) * bcSignalResponse2(r.frequencies[k], false)));
    const best = springGain.indexOf(Math.max(...springGain));
    // The growing spring resonance the stability report names (held by the declared servo).
    const resonance = r.prepared.stability.held[0].frequency;
    expect(Math.abs(r.frequencies[best] / resonance - 1)).toBeLessThan(0.03);
    expect(springGain[best]).toBeGreaterThan(10);
  });

  it("referred to strain, the force term is the free-mass conversion 4 S_F/(m²Ω⁴L²) at this detuning too", () => {
    const budget = budgetOf(withForce);
    expectAllClose(sumTerms(budget.terms, "suspension"), Array.from(budget.frequencies, freeMassStrain), 1e-12, "S_h of the force term, detuned");
  });
});

describe("bad input for the test masses' noise", () => {
  function problem(s: SetupDescription): QuietframeError {
    try {
      loadSetup(s);
    } catch (e) {
      if (e instanceof QuietframeError) return e;
      if (e instanceof QuietframeErrors && e.problems.length === 1) return e.problems[0];
      throw e;
    }
    throw new Error("expected a QuietframeError");
  }

  it.each([
    ["force", "m/√Hz", "N/√Hz"],
    ["displacement", "N/√Hz", "m/√Hz"],
    ["force", "1/√Hz", "N/√Hz"],
  ] as const)("%s given in %s is refused, naming the unit field, the value and the allowed unit", (enters, unit, allowed) => {
    const bad = { ...term("wrong", enters, forceAsd), spectrum: { unit, points: TABLE_FREQUENCIES.map((f): [number, number] => [f, 1e-15]) } };
    const e = problem(ifo({ classicalNoise: [bad] }));
    expect(e.path).toBe("classicalNoise[0].spectrum.unit");
    expect(e.message).toContain(unit);
    expect(e.message).toContain(allowed);
  });

  it("a place the interferometer does not take lists strain, force and displacement", () => {
    const e = problem(ifo({ classicalNoise: [{ ...term("wrong", "force", forceAsd), enters: "velocity" }] }));
    expect(e.path).toBe("classicalNoise[0].enters");
    expect(e.message).toContain('"strain" or "force" or "displacement"');
  });
});
