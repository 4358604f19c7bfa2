import { beforeAll, describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { QuietframeError, QuietframeErrors } from "../../src/errors";
import { UnstableSetupError } from "../../src/engine/stability";
import { evaluate, evaluateSetup, loadSetup, prepare } from "../../src/pipeline";
import { assemble } from "../../src/setup/assemble";
import type { SetupDescription } from "../../src/setup/format";
import { expectAllClose } from "../helpers/close";
import { loadMathjs, type MathJs } from "../helpers/mathjs";
import { setup } from "../helpers/setups";

/**
 * Signal recycling on the `interferometer` component against Buonanno & Chen, Phys. Rev. D 64,
 * 042006 (2001) ("BC" below), Sec. II–III: the two-photon input-output relation of a
 * signal-recycled Michelson with arm cavities (lossless),
 *   b = (1/M)[e^{2iβ} C a + √(2K) τ e^{iβ} D h/h_SQL],
 *   M   = 1 + ρ² e^{4iβ} − 2ρ e^{2iβ}(cos 2φ + (K/2) sin 2φ),
 *   C11 = C22 = (1 + ρ²)(cos 2φ + (K/2) sin 2φ) − 2ρ cos 2β,
 *   C12 = −τ²(sin 2φ + K sin²φ),   C21 = τ²(sin 2φ − K cos²φ),
 *   D1  = −(1 + ρ e^{2iβ}) sin φ,   D2 = −(−1 + ρ e^{2iβ}) cos φ,
 * with K, β, h_SQL of Kimble et al., Phys. Rev. D 65, 022002 (2001) and the readout
 * b_ζ = b1 sin ζ + b2 cos ζ, so that
 *   S_h = h_SQL² (|C11 sin ζ + C21 cos ζ|² + |C12 sin ζ + C22 cos ζ|²) / (2K τ² |D1 sin ζ + D2 cos ζ|²).
 * (Coefficients written from memory of BC's eqs. (2.20)–(2.26); ρ = 0 gives back Kimble et al.'s
 * conventional interferometer, which interferometer.test.ts checks against its own source.)
 * Our homodyne angle θ is measured from the amplitude quadrature, cos θ b1 + sin θ b2, so ζ = 90° − θ.
 * The resonances (the optical spring among them) are the zeros of M (BC Sec. IV).
 */

const MASS = 30;
const L = 4000;
const F_ARM = 100;
const GAMMA = 2 * Math.PI * F_ARM;
const OMEGA0 = (2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9;
/** I_SQL = mL²γ⁴/(4ω0) (Kimble et al. 2001); BC's example runs at I0 = I_SQL. */
const I_SQL = (MASS * L * L * GAMMA ** 4) / (4 * OMEGA0);
/** P_arm = I0 c/(2Lγ): the component takes the circulating arm power (see interferometer.ts). */
const armPower = (i0: number) => (i0 * SPEED_OF_LIGHT) / (2 * L * GAMMA);

type C = [number, number];
const cadd = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]];
const cmul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const cscale = (s: number, a: C): C => [s * a[0], s * a[1]];
const cexp = (t: number): C => [Math.cos(t), Math.sin(t)];
const cabs2 = (a: C) => a[0] * a[0] + a[1] * a[1];

function kimbleK(f: number, i0: number): number {
  const w = 2 * Math.PI * f;
  return (i0 / I_SQL) * ((2 * GAMMA ** 4) / (w ** 2 * (GAMMA ** 2 + w ** 2)));
}

function hSql2(f: number): number {
  return (8 * HBAR) / (MASS * (2 * Math.PI * f) ** 2 * L ** 2);
}

/** BC's S_h at frequency f for SR mirror power transmission T, detuning φ, readout ζ, power I0. */
function bcNoise(f: number, T: number, phi: number, zeta: number, i0: number): number {
  const rho = Math.sqrt(1 - T);
  const tau2 = T;
  const K = kimbleK(f, i0);
  const beta = Math.atan((2 * Math.PI * f) / GAMMA);
  const e2b = cexp(2 * beta);
  const spring = Math.cos(2 * phi) + (K / 2) * Math.sin(2 * phi);
  const c11: C = [(1 + rho * rho) * spring - 2 * rho * Math.cos(2 * beta), 0];
  const c12: C = [-tau2 * (Math.sin(2 * phi) + K * Math.sin(phi) ** 2), 0];
  const c21: C = [tau2 * (Math.sin(2 * phi) - K * Math.cos(phi) ** 2), 0];
  const c22 = c11;
  const d1 = cscale(-Math.sin(phi), cadd([1, 0], cscale(rho, e2b)));
  const d2 = cscale(-Math.cos(phi), cadd([-1, 0], cscale(rho, e2b)));
  const s = Math.sin(zeta);
  const c = Math.cos(zeta);
  const noise = cabs2(cadd(cscale(s, c11), cscale(c, c21))) + cabs2(cadd(cscale(s, c12), cscale(c, c22)));
  const signal = 2 * K * tau2 * cabs2(cadd(cscale(s, d1), cscale(c, d2)));
  return (hSql2(f) * noise) / signal;
}

interface SrOptions {
  T?: number;
  phi?: number; // rad
  theta?: number; // homodyne angle, rad
  i0?: number;
  control?: "none" | "servo";
  extra?: Record<string, string | number>;
}

function srSetup(o: SrOptions = {}): SetupDescription {
  const params: Record<string, string | number> = {
    mass: `${MASS} kg`,
    armLength: `${L} m`,
    armBandwidth: `${F_ARM} Hz`,
    power: `${armPower(o.i0 ?? I_SQL)} W`,
    ...o.extra,
  };
  if (o.T !== undefined) params.srmTransmission = o.T;
  if (o.phi !== undefined) params.srDetuning = `${o.phi} rad`;
  if (o.control) params.lengthControl = o.control;
  return setup(
    [
      { name: "light", type: "vacuum" },
      { name: "ifo", type: "interferometer", params },
      { name: "detector", type: "homodyne", params: { angle: `${o.theta ?? Math.PI / 2} rad` } },
    ],
    [
      ["light.out", "ifo.in"],
      ["ifo.out", "detector.in"],
    ],
    { signal: { kind: "strain", on: "ifo" } },
  );
}

const GRID = { from: 5, to: 5000, points: 83 };

describe("signal recycling: the tuned limit is today's interferometer", () => {
  it("a mirror that reflects nothing (T = 1) at φ = 0 gives the same bits as no mirror", () => {
    const without = evaluateSetup(loadSetup(srSetup()), GRID).budget;
    const transparent = evaluateSetup(loadSetup(srSetup({ T: 1, phi: 0 })), GRID).budget;
    expect(transparent.total).toEqual(without.total);
    expect(transparent.terms.map((t) => [t.id, t.psd])).toEqual(without.terms.map((t) => [t.id, t.psd]));
  });

  it("a set-up that does not mention signal recycling assembles to the same matrices as before (no mirror path)", () => {
    const a = assemble(loadSetup(srSetup()));
    const b = assemble(loadSetup(srSetup({ extra: { lengthControl: "none" } })));
    expect(a.model.A).toEqual(b.model.A);
    expect(a.model.B).toEqual(b.model.B);
  });
});

describe("signal recycling against Buonanno & Chen 2001", () => {
  it.each([
    // [T, φ, ζ]: tuned signal recycling, tuned resonant sideband extraction, and BC's detuned example
    // (ρ = 0.9, φ = π/2 − 0.47) at two readout quadratures.
    [0.19, 0, 0],
    // At φ = 90° the signal leaves in b1 (BC's D2 ∝ cos φ = 0), so it is read at ζ = 90°.
    [0.19, Math.PI / 2, Math.PI / 2],
    [0.19, Math.PI / 2 - 0.47, 0],
    [0.19, Math.PI / 2 - 0.47, Math.PI / 2 - 0.3],
    [0.033, 0.3, 1.0],
  ])("T = %f, φ = %f rad, ζ = %f rad: S_h equals BC's (lossless, I0 = I_SQL)", (T, phi, zeta) => {
    const detuned = Math.sin(2 * phi) !== 0 && Math.abs(Math.sin(2 * phi)) > 1e-12;
    const s = loadSetup(srSetup({ T, phi, theta: Math.PI / 2 - zeta, control: detuned ? "servo" : "none" }));
    const b = evaluate(prepare(s), GRID).budget;
    const expected = Array.from(b.frequencies, (f) => bcNoise(f, T, phi, zeta, I_SQL));
    expectAllClose(b.total, expected, 1e-9, "S_h");
  });

  it("at a higher power (I0 = 3 I_SQL) and with squeezing off, the detuned S_h still matches", () => {
    const i0 = 3 * I_SQL;
    const b = evaluate(prepare(loadSetup(srSetup({ T: 0.1, phi: 1.2, i0, control: "servo" }))), GRID).budget;
    expectAllClose(
      b.total,
      Array.from(b.frequencies, (f) => bcNoise(f, 0.1, 1.2, 0, i0)),
      1e-9,
      "S_h",
    );
  });
});

describe("signal recycling described by the arm mode: signal bandwidth and detuning", () => {
  /**
   * The signal-recycled interferometer as one detuned cavity (Buonanno & Chen, Phys. Rev. D 65,
   * 042001 (2002), Sec. II, from memory): half-width ε = γ(1 − ρ²)/D and detuning
   * λ = 2ργ sin 2φ/D with D = 1 + ρ² + 2ρ cos 2φ (lossless arms, γ the arm half-width); with
   * arm loss, ε gains the loss part γ_0 and γ becomes the coupling part γ_in (derived the same way).
   */
  function pole(T: number, phi: number, gammaIn: number, gammaLoss = 0): { bandwidth: number; detuning: number } {
    const rho = Math.sqrt(1 - T);
    const d = 1 + rho * rho + 2 * rho * Math.cos(2 * phi);
    return { bandwidth: (gammaLoss + (gammaIn * (1 - rho * rho)) / d) / (2 * Math.PI), detuning: (2 * rho * gammaIn * Math.sin(2 * phi)) / d / (2 * Math.PI) };
  }

  it.each([
    [0.19, Math.PI / 2 - 0.47, 0],
    [0.033, 0.3, Math.PI / 3],
    [0.19, 0, 0],
  ])("T = %f, φ = %f rad as (ε, λ) gives BC 2001's S_h at ζ = %f rad", (T, phi, zeta) => {
    const p = pole(T, phi, GAMMA);
    const detuned = p.detuning !== 0;
    const s = srSetup({ theta: Math.PI / 2 - zeta, control: detuned ? "servo" : "none", extra: { signalBandwidth: `${p.bandwidth} Hz`, signalDetuning: `${p.detuning} Hz` } });
    const b = evaluate(prepare(loadSetup(s)), GRID).budget;
    expectAllClose(
      b.total,
      Array.from(b.frequencies, (f) => bcNoise(f, T, phi, zeta, I_SQL)),
      1e-9,
      "S_h",
    );
  });

  it("with arm loss (100 ppm), (ε, λ) with the loss part added gives the same budget as the mirror", () => {
    const loss = 100e-6;
    const gammaLoss = (loss * SPEED_OF_LIGHT) / (4 * L);
    const [T, phi] = [0.1, 1.2];
    const p = pole(T, phi, GAMMA - gammaLoss, gammaLoss);
    const mirror = evaluate(prepare(loadSetup(srSetup({ T, phi, control: "servo", extra: { opticalLoss: loss } }))), GRID).budget;
    const mode = evaluate(prepare(loadSetup(srSetup({ control: "servo", extra: { opticalLoss: loss, signalBandwidth: `${p.bandwidth} Hz`, signalDetuning: `${p.detuning} Hz` } }))), GRID).budget;
    expectAllClose(mode.total, mirror.total, 1e-9, "S_h");
  });

  it("refuses two descriptions at once, a detuning alone, and a bandwidth below the arm-loss width", () => {
    const refusal = (extra: Record<string, string | number>, T?: number) => {
      try {
        loadSetup(srSetup({ T, extra }));
      } catch (e) {
        if (e instanceof QuietframeError) return e;
        if (e instanceof QuietframeErrors && e.problems.length === 1) return e.problems[0];
        throw e;
      }
      throw new Error("expected a QuietframeError");
    };
    expect(refusal({ signalBandwidth: "300 Hz" }, 0.2).message).toContain("described twice");
    expect(refusal({ signalDetuning: "30 Hz" }).path).toBe("components.ifo.signalDetuning");
    const narrow = refusal({ opticalLoss: 1e-3, signalBandwidth: "1 Hz" });
    expect(narrow.path).toBe("components.ifo.signalBandwidth");
    // εc/(8πL) = 1e-3 × 299792458 / (8π × 4000 m) = 2.982 Hz
    expect(narrow.message).toMatch(/arms' own loss width .* = 2\.982 Hz/);
  });
});

describe("optical-spring resonances are the zeros of BC's M", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });

  /**
   * M(Ω)(γ − iΩ)²Ω² as a polynomial (from BC's M with e^{2iβ} = (γ + iΩ)/(γ − iΩ) and
   * K(γ² + Ω²) = ι/Ω², ι = 2(I0/I_SQL)γ⁴):
   *   P(Ω) = −(1 + ρ² + 2ρ cos 2φ)Ω⁴ + 2iγ(ρ² − 1)Ω³ + γ²(1 + ρ² − 2ρ cos 2φ)Ω² − ρι sin 2φ.
   */
  function characteristic(omega: C, T: number, phi: number, i0: number): { value: C; scale: number } {
    const rho = Math.sqrt(1 - T);
    const iota = 2 * (i0 / I_SQL) * GAMMA ** 4;
    const w2 = cmul(omega, omega);
    const w3 = cmul(w2, omega);
    const w4 = cmul(w2, w2);
    const terms: C[] = [
      cscale(-(1 + rho * rho + 2 * rho * Math.cos(2 * phi)), w4),
      cmul([0, 2 * GAMMA * (rho * rho - 1)], w3),
      cscale(GAMMA ** 2 * (1 + rho * rho - 2 * rho * Math.cos(2 * phi)), w2),
      [-rho * iota * Math.sin(2 * phi), 0],
    ];
    return { value: terms.reduce(cadd, [0, 0]), scale: terms.reduce((s, t) => s + Math.sqrt(cabs2(t)), 0) };
  }

  it.each([
    [0.19, Math.PI / 2 - 0.47],
    [0.033, 0.3],
    [0.1, 2.0],
  ])("T = %f, φ = %f rad: every eigenvalue λ of the engine's A (mathjs eigs) gives P(iλ) = 0", (T, phi) => {
    const a = assemble(loadSetup(srSetup({ T, phi, control: "servo" })));
    const n = a.model.nStates;
    expect(n).toBe(4);
    const rows = Array.from({ length: n }, (_, i) => Array.from(a.model.A.subarray(i * n, (i + 1) * n)));
    const values = math.eigs(math.matrix(rows)).values as unknown as { toArray(): unknown[] };
    const eigenvalues = values.toArray().map((v) => (typeof v === "number" ? ([v, 0] as C) : ([(v as { re: number }).re, (v as { im: number }).im] as C)));
    expect(eigenvalues).toHaveLength(4);
    for (const lambda of eigenvalues) {
      // e^{λt} = e^{−iΩt}  ⇒  Ω = iλ
      const omega: C = [-lambda[1], lambda[0]];
      const { value, scale } = characteristic(omega, T, phi, I_SQL);
      expect(Math.sqrt(cabs2(value)) / scale, `λ = ${lambda[0]} + ${lambda[1]}i`).toBeLessThan(1e-9);
    }
  });

  it("0 < φ < 90°: the spring is restoring and its resonance grows while oscillating; 90° < φ < 180°: it is anti-restoring and a mode runs away without oscillating", () => {
    const restoring = prepare(loadSetup(srSetup({ T: 0.19, phi: Math.PI / 2 - 0.47, control: "servo" }))).stability;
    expect(restoring.growing).toHaveLength(0);
    expect(restoring.held.length).toBeGreaterThan(0);
    expect(restoring.held.every((m) => m.frequency > 0)).toBe(true);
    const antiRestoring = prepare(loadSetup(srSetup({ T: 0.19, phi: 2.0, control: "servo" }))).stability;
    expect(antiRestoring.held.some((m) => m.frequency === 0)).toBe(true);
  });
});

describe("signal recycling: instability in words, the servo, bad input", () => {
  it("a detuned mirror without a servo is refused with the optical spring named and the way out", () => {
    let error: unknown;
    try {
      prepare(loadSetup(srSetup({ T: 0.19, phi: Math.PI / 2 - 0.47 })));
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(UnstableSetupError);
    const message = (error as Error).message;
    expect(message).toContain("optical spring is restoring");
    expect(message).toContain("anti-damps");
    expect(message).toContain('lengthControl: "servo"');
    expect(message).toContain("'ifo'");
  });

  it("an anti-restoring spring says so", () => {
    expect(() => prepare(loadSetup(srSetup({ T: 0.19, phi: 2.0 })))).toThrow(/anti-restoring \(negative rigidity\)/);
  });

  it("with the servo declared the set-up evaluates and the warning names the held resonance", () => {
    const prepared = prepare(loadSetup(srSetup({ T: 0.19, phi: Math.PI / 2 - 0.47, control: "servo" })));
    expect(prepared.stability.stable).toBe(false);
    expect(prepared.physicality).toBeUndefined();
    const warning = prepared.warnings.find((w) => w.startsWith("controlled:"));
    expect(warning).toBeDefined();
    expect(warning).toMatch(/a mode at [0-9.]+ Hz grows at/);
    expect(warning).toContain("optical spring");
    const held = prepared.stability.held[0];
    expect(warning).toContain(held.frequency.toPrecision(4));
  });

  it("a tuned mirror needs no servo and has no spring", () => {
    const prepared = prepare(loadSetup(srSetup({ T: 0.19, phi: 0 })));
    expect(prepared.stability.held).toHaveLength(0);
    expect(prepared.stability.growing).toHaveLength(0);
  });

  function problem(o: SrOptions): QuietframeError {
    try {
      loadSetup(srSetup(o));
    } catch (e) {
      if (e instanceof QuietframeError) return e;
      if (e instanceof QuietframeErrors && e.problems.length === 1) return e.problems[0];
      throw e;
    }
    throw new Error("expected a QuietframeError");
  }

  it("a detuning without a mirror names the field and what is allowed", () => {
    const e = problem({ phi: 0.3 });
    expect(e.path).toBe("components.ifo.srDetuning");
    expect(e.message).toContain("needs a signal-recycling mirror");
    expect(e.message).toContain("srmTransmission");
  });

  it.each([0, 1.5, -0.1])("srmTransmission %f is refused with its range", (T) => {
    const e = problem({ T });
    expect(e.path).toBe("components.ifo.srmTransmission");
  });

  it("an unknown lengthControl word lists the choices", () => {
    const e = problem({ extra: { lengthControl: "loop" } });
    expect(e.path).toBe("components.ifo.lengthControl");
    expect(e.message).toContain("servo");
  });
});
