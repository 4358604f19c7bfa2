import { beforeAll, describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { inputTransfer, signalResponse } from "../../src/engine/spectra";
import { QuietframeError, QuietframeErrors } from "../../src/errors";
import { assemble } from "../../src/setup/assemble";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import type { ComponentDescription, SetupDescription } from "../../src/setup/format";
import { expectAllClose } from "../helpers/close";
import { loadMathjs, type MathComplex as Complex, type MathJs } from "../helpers/mathjs";
import { setup, sumTerms } from "../helpers/setups";

/**
 * The `interferometer` component against the two-photon input-output relations of a tuned
 * Michelson with arm cavities and no signal recycling, Kimble, Levin, Matsko, Thorne &
 * Vyatchanin, Phys. Rev. D 65, 022002 (2001), Sec. II–IV ("KLMTV" below):
 *   b1 = a1 e^{2iβ},   b2 = (a2 − K a1) e^{2iβ} + √(2K) (h/h_SQL) e^{iβ},
 *   β = arctan(Ω/γ),   K = (I0/I_SQL) 2γ⁴/(Ω²(γ² + Ω²)),   I_SQL = m L² γ⁴/(4 ω0),
 *   h_SQL² = 8ħ/(mΩ²L²),
 * with γ the arm-cavity half-width (γ = Tc/4L) and I0 the light power at the beam splitter.
 *
 * The component's `power` parameter is the circulating power P_arm of each arm. The link to
 * I0 used below is the lossless build-up of a high-finesse cavity: each arm receives I0/2 and
 * stores P_arm = (I0/2)·4/T, with T = 4Lγ/c (KLMTV; standard Fabry–Perot optics), so
 *   I0 = 2 L γ P_arm / c.
 * Fourier convention of both: e^{−iΩt}; the engine's dark-port output carries an overall
 * sign −1 on both quadratures (a reference-plane convention), which no spectrum sees.
 */
const MASS = 40;
const L = 4000;
const F_ARM = 100;
const GAMMA = 2 * Math.PI * F_ARM;
const WAVELENGTH = 1064e-9;
const OMEGA0 = (2 * Math.PI * SPEED_OF_LIGHT) / WAVELENGTH;
const P_ARM = 8e5;

/** I_SQL = m L² γ⁴/(4ω0) (KLMTV eq. for the conventional interferometer). */
function iSql(mass: number, armLength: number, gamma: number, omega0: number): number {
  return (mass * armLength ** 2 * gamma ** 4) / (4 * omega0);
}

/** I0 = 2LγP_arm/c: power at the beam splitter for a given circulating arm power (lossless arms). */
function beamSplitterPower(pArm: number, armLength = L, gamma = GAMMA): number {
  return (2 * armLength * gamma * pArm) / SPEED_OF_LIGHT;
}

function kimbleK(f: number, opts: { mass?: number; pArm?: number; gamma?: number } = {}): number {
  const mass = opts.mass ?? MASS;
  const gamma = opts.gamma ?? GAMMA;
  const w = 2 * Math.PI * f;
  const i0 = beamSplitterPower(opts.pArm ?? P_ARM, L, gamma);
  return (i0 / iSql(mass, L, gamma, OMEGA0)) * ((2 * gamma ** 4) / (w ** 2 * (gamma ** 2 + w ** 2)));
}

function hSql2(f: number, mass = MASS, armLength = L): number {
  return (8 * HBAR) / (mass * (2 * Math.PI * f) ** 2 * armLength ** 2);
}

interface IfoOptions {
  params?: Record<string, string | number>;
  light?: ComponentDescription;
  angle?: string;
  efficiency?: number;
  referTo?: string;
}

function ifoSetup(o: IfoOptions = {}): SetupDescription {
  return setup(
    [
      o.light ?? { name: "light", type: "vacuum" },
      {
        name: "ifo",
        type: "interferometer",
        params: { mass: `${MASS} kg`, armLength: `${L} m`, armBandwidth: `${F_ARM} Hz`, power: `${P_ARM} W`, ...o.params },
      },
      { name: "detector", type: "homodyne", params: { angle: o.angle ?? "90 deg", efficiency: o.efficiency ?? 1 } },
    ],
    [
      ["light.out", "ifo.in"],
      ["ifo.out", "detector.in"],
    ],
    { signal: o.referTo ? { kind: "strain", on: "ifo", referTo: o.referTo } : { kind: "strain", on: "ifo" } },
  );
}

const GRID = { from: 1, to: 1e4, points: 97 };

describe("interferometer: input-output relations (KLMTV 2001)", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });

  /** Transfer from the dark-port input quadratures and from h to the homodyne output at `angle`. */
  function transfers(angle: string, frequencies: Float64Array) {
    const a = assemble(loadSetup(ifoSetup({ angle })));
    const m = a.model.nInputs;
    const col = (label: string) => a.model.inputs.findIndex((x) => x.owner === "light" && x.label === label);
    const H = inputTransfer(a.model, a.readoutRows, frequencies);
    const s = signalResponse(a.model, a.readoutRows, frequencies);
    return Array.from(frequencies, (_, k) => ({
      a1: math.complex(H.re[k * m + col("amplitude quadrature")], H.im[k * m + col("amplitude quadrature")]),
      a2: math.complex(H.re[k * m + col("phase quadrature")], H.im[k * m + col("phase quadrature")]),
      h: math.complex(s.re[k], s.im[k]),
    }));
  }

  function expectComplexClose(got: Complex, want: Complex, what: string): void {
    const d = math.subtract(got, want) as Complex;
    const scale = math.abs(want) as unknown as number;
    expect((math.abs(d) as unknown as number) / scale, what).toBeLessThan(1e-9);
  }

  it("b1 = a1 e^{2iβ} and b2 = (a2 − K a1) e^{2iβ} + √(2K)(h/h_SQL) e^{iβ}, β = arctan(Ω/γ) (KLMTV Sec. II), up to one overall sign", () => {
    const freqs = Float64Array.from([3, 30, 77, 100, 180, 1e3, 6e3]);
    const amp = transfers("0 deg", freqs);
    const phase = transfers("90 deg", freqs);
    freqs.forEach((f, k) => {
      const w = 2 * Math.PI * f;
      const beta = Math.atan(w / GAMMA);
      const e2 = math.exp(math.complex(0, 2 * beta)) as Complex;
      const e1 = math.exp(math.complex(0, beta)) as Complex;
      const K = kimbleK(f);
      const sign = -1;
      expectComplexClose(amp[k].a1, math.multiply(sign, e2) as Complex, `b1/a1 at ${f} Hz`);
      expect(math.abs(amp[k].a2) as unknown as number, `b1/a2 at ${f} Hz`).toBe(0);
      expect(math.abs(amp[k].h) as unknown as number, `b1/h at ${f} Hz`).toBe(0);
      expectComplexClose(phase[k].a2, math.multiply(sign, e2) as Complex, `b2/a2 at ${f} Hz`);
      expectComplexClose(phase[k].a1, math.multiply(-sign * K, e2) as Complex, `b2/a1 at ${f} Hz`);
      expectComplexClose(phase[k].h, math.multiply((sign * Math.sqrt(2 * K)) / Math.sqrt(hSql2(f)), e1) as Complex, `b2/h at ${f} Hz`);
    });
  });

  it("phase readout of vacuum: S_h = (h_SQL²/2)(K + 1/K) (KLMTV eq. for the conventional interferometer)", () => {
    const b = evaluateSetup(loadSetup(ifoSetup()), GRID).budget;
    expect(b.quantity).toEqual({ name: "strain", unit: "1" });
    const expected = Array.from(b.frequencies, (f) => (hSql2(f) / 2) * (kimbleK(f) + 1 / kimbleK(f)));
    expectAllClose(b.total, expected, 1e-9, "S_h");
    // Shot noise (phase quadrature) and radiation pressure (amplitude quadrature) are the 1/K and K parts.
    expectAllClose(
      sumTerms(b.terms, "phase quadrature"),
      Array.from(b.frequencies, (f) => hSql2(f) / 2 / kimbleK(f)),
      1e-9,
      "shot noise",
    );
    expectAllClose(
      sumTerms(b.terms, "amplitude quadrature"),
      Array.from(b.frequencies, (f) => (hSql2(f) / 2) * kimbleK(f)),
      1e-9,
      "radiation pressure",
    );
  });

  it("the same at other masses, powers and arm widths", () => {
    for (const [mass, pArm, fArm] of [
      [10, 2e5, 40],
      [150, 3e6, 500],
    ]) {
      const gamma = 2 * Math.PI * fArm;
      const s = loadSetup(ifoSetup({ params: { mass: `${mass} kg`, power: `${pArm} W`, armBandwidth: `${fArm} Hz` } }));
      const b = evaluateSetup(s, { from: 0.5, to: 2e4, points: 61 }).budget;
      const expected = Array.from(b.frequencies, (f) => {
        const K = kimbleK(f, { mass, pArm, gamma });
        return (hSql2(f, mass) / 2) * (K + 1 / K);
      });
      expectAllClose(b.total, expected, 1e-9, `m = ${mass} kg, P = ${pArm} W, γ/2π = ${fArm} Hz`);
    }
  });

  it.each([
    [0.5, 0],
    [1.15, Math.PI / 2],
    [0.8, Math.PI / 3],
    [1.5, -0.4],
    [0.3, 2.2],
  ])("frequency-independent squeezing r = %f, θ = %f rad: S_h = (h_SQL²/2)(K + 1/K)[cosh 2R − cos 2(θ + Φ) sinh 2R], Φ = arccot K (KLMTV Sec. IV)", (r, theta) => {
    // KLMTV measure θ from the amplitude quadrature a1 as our squeezed component does; with an
    // opposite sense the asymmetric angles here (π/3, −0.4, 2.2) would fail.
    const light: ComponentDescription = { name: "light", type: "squeezed", params: { r, angle: `${theta} rad` } };
    const b = evaluateSetup(loadSetup(ifoSetup({ light })), GRID).budget;
    const expected = Array.from(b.frequencies, (f) => {
      const K = kimbleK(f);
      const phi = Math.atan(1 / K);
      return (hSql2(f) / 2) * (K + 1 / K) * (Math.cosh(2 * r) - Math.cos(2 * (theta + phi)) * Math.sinh(2 * r));
    });
    expectAllClose(b.total, expected, 1e-9, "squeezed S_h");
  });

  it("detection efficiency η with squeezing: S_h = (h_SQL²/2)[(K + 1/K)(cosh 2R − cos 2(θ+Φ) sinh 2R) + (1 − η)/(ηK)]", () => {
    // Derivation (KLMTV relations + a beam splitter of transmission η before an ideal detector):
    // y = √η b2 + √(1−η) v. Noise: η(1 + K²)[…] + (1 − η); signal power η·2K/h_SQL².
    // Dividing: (h_SQL²/2)[(1 + K²)/K · […] + (1 − η)/(ηK)].
    const eta = 0.9;
    const r = 1.0;
    const theta = Math.PI / 2;
    const light: ComponentDescription = { name: "light", type: "squeezed", params: { r, angle: `${theta} rad` } };
    const b = evaluateSetup(loadSetup(ifoSetup({ light, efficiency: eta })), GRID).budget;
    const expected = Array.from(b.frequencies, (f) => {
      const K = kimbleK(f);
      const phi = Math.atan(1 / K);
      const sq = Math.cosh(2 * r) - Math.cos(2 * (theta + phi)) * Math.sinh(2 * r);
      return (hSql2(f) / 2) * ((K + 1 / K) * sq + (1 - eta) / (eta * K));
    });
    expectAllClose(b.total, expected, 1e-9, "S_h with detection loss");
  });
});

describe("interferometer: arm loss", () => {
  /*
   * Closed form derived here from the same model (KLMTV's arm cavity with a lossy end, loss
   * port by the input-output relation of Gardiner & Collett, Phys. Rev. A 31, 3761 (1985)).
   * Round-trip loss ε splits the half-width into γ_0 = εc/4L (loss) and γ_in = γ − γ_0 (dark
   * port). With D = γ − iΩ and μ = m/4:
   *   d1 = (√(2γ_in) a1 + √(2γ_0) v1)/D,   d2 = (√(2γ_in) a2 + √(2γ_0) v2 + Gā(ΔL + Lh))/D,
   *   ΔL = −ħGā d1/(μΩ²),                   b2 = a2 − √(2γ_in) d2.
   * Direct phase noise: |1 − 2γ_in/D|² + 4γ_inγ_0/|D|² = ((γ_0 − γ_in)² + Ω² + 4γ_inγ_0)/|D|² = 1.
   * Back-action: (4γ_in² + 4γ_inγ_0)(ħG²n/μΩ²)²/|D|⁴ = (γ_in/γ) K²,  K = 2γħG²n/(μΩ²|D|²).
   * Signal power: 2γ_in G²n L²/|D|² = (γ_in/γ) K μΩ²L²/ħ = (γ_in/γ) 2K/h_SQL².
   * So S_h = (h_SQL²/2)(K + 1/(ηK)) with η = γ_in/γ = 1 − εc/(4Lγ) and K the lossless K at the
   * same circulating power and total width: exactly what a lossless interferometer read with
   * detection efficiency η gives (the previous test with R = 0).
   */
  const EPS = 5e-3;
  const ETA = 1 - (EPS * SPEED_OF_LIGHT) / (4 * L * GAMMA);

  it("phase readout: S_h = (h_SQL²/2)(K + 1/(ηK)), η = 1 − εc/(4Lγ)", () => {
    expect(ETA).toBeGreaterThan(0.8);
    expect(ETA).toBeLessThan(0.9);
    const b = evaluateSetup(loadSetup(ifoSetup({ params: { opticalLoss: EPS } })), GRID).budget;
    const expected = Array.from(b.frequencies, (f) => (hSql2(f) / 2) * (kimbleK(f) + 1 / (ETA * kimbleK(f))));
    expectAllClose(b.total, expected, 1e-9, "S_h with arm loss");
    expect(b.terms.map((t) => t.label)).toContain("ifo: arm loss (amplitude)");
  });

  it("equals a lossless interferometer read with detection efficiency η (same closed form)", () => {
    const lossy = evaluateSetup(loadSetup(ifoSetup({ params: { opticalLoss: EPS } })), GRID).budget;
    const detector = evaluateSetup(loadSetup(ifoSetup({ efficiency: ETA })), GRID).budget;
    expectAllClose(lossy.total, detector.total, 1e-9, "arm loss vs detection loss");
  });
});

describe("interferometer: reference values", () => {
  it("I_SQL = mL²γ⁴/(4ω0) ≈ 1e4 W for m = 30 kg, L = 4 km, γ = 2π×100 Hz, 1064 nm (KLMTV quote about 10 kW)", () => {
    const gamma = 2 * Math.PI * 100;
    const value = iSql(30, 4000, gamma, OMEGA0);
    // 30·(4e3)²·(628.3)⁴ / (4·1.7704e15) = 1.056e4 W
    expect(value).toBeGreaterThan(1.0e4);
    expect(value).toBeLessThan(1.1e4);
    // The component ties it to its power parameter: with I0 = I_SQL, K(Ω = γ) = 1 and the
    // noise touches the SQL there (S_h = h_SQL²), and nowhere else (K + 1/K > 2 for K ≠ 1).
    const pArm = (value * SPEED_OF_LIGHT) / (2 * 4000 * gamma);
    const s = loadSetup(
      setup(
        [
          { name: "light", type: "vacuum" },
          { name: "ifo", type: "interferometer", params: { mass: "30 kg", armLength: "4 km", armBandwidth: "100 Hz", power: `${pArm} W` } },
          { name: "detector", type: "homodyne", params: { angle: "90 deg" } },
        ],
        [
          ["light.out", "ifo.in"],
          ["ifo.out", "detector.in"],
        ],
        { signal: { kind: "strain", on: "ifo" } },
      ),
    );
    const b = evaluateSetup(s, { from: 10, to: 1000, points: 5 }).budget; // 10, 31.6, 100, 316, 1000 Hz
    const sql = b.references.find((r) => r.id === "sql")!.psd;
    expect(b.frequencies[2]).toBe(100);
    expect(Math.abs(b.total[2] / sql[2] - 1)).toBeLessThan(1e-9);
    for (const i of [0, 1, 3, 4]) expect(b.total[i] / sql[i]).toBeGreaterThan(1.05);
  });

  it("strain SQL √(8ħ/(mΩ²L²)) for 40 kg, 3995 m, 100 Hz ≈ 1.8e-24 /√Hz through the reference curve (KLMTV; value from the physics notes)", () => {
    const s = loadSetup(ifoSetup({ params: { armLength: "3995 m" } }));
    const b = evaluateSetup(s, { from: 100, to: 1000, points: 2 }).budget;
    const sql = b.references.find((r) => r.id === "sql")!;
    expect(sql.label).toMatch(/SQL/);
    expect(Math.abs(Math.sqrt(sql.psd[0]) / 1.8e-24 - 1)).toBeLessThan(0.03);
    expect(Math.abs(sql.psd[0] / hSql2(100, 40, 3995) - 1)).toBeLessThan(1e-12);
  });

  it("referred to displacement: L² S_h, and the SQL becomes 2ħ/(μΩ²) with the reduced mass μ = m/4 of the differential mode", () => {
    const h = evaluateSetup(loadSetup(ifoSetup()), GRID).budget;
    const x = evaluateSetup(loadSetup(ifoSetup({ referTo: "displacement" })), GRID).budget;
    expect(x.quantity).toEqual({ name: "displacement", unit: "m" });
    expectAllClose(
      x.total,
      Array.from(h.total, (v) => v * L * L),
      1e-12,
      "displacement",
    );
    // Free-mass displacement SQL 2ħ/(mΩ²) (Braginsky & Khalili 1992) of a body of mass m/4.
    const sql = x.references.find((r) => r.id === "sql")!.psd;
    expectAllClose(
      sql,
      Array.from(x.frequencies, (f) => (2 * HBAR) / ((MASS / 4) * (2 * Math.PI * f) ** 2)),
      1e-12,
      "displacement SQL",
    );
  });
});

describe("interferometer: stability, cautions and bad input", () => {
  it("the free differential mode is marginal: no stationary state, spectra still evaluated, with a warning", () => {
    const e = evaluateSetup(loadSetup(ifoSetup()), { from: 10, to: 1000, points: 5 });
    expect(e.stability.stable).toBe(false);
    expect(e.stability.growing).toHaveLength(0);
    expect(e.stability.undamped.length).toBeGreaterThan(0);
    expect(e.physicality).toBeUndefined();
    expect(e.warnings.some((w) => /marginal/.test(w) && /'ifo'/.test(w))).toBe(true);
    for (const v of e.budget.total) expect(Number.isFinite(v) && v > 0).toBe(true);
  });

  it("cautions about hazardous power and defers to local laser-safety rules", () => {
    const e = evaluateSetup(loadSetup(ifoSetup()), { from: 10, to: 1000, points: 2 });
    expect(e.cautions).toHaveLength(1);
    expect(e.cautions[0]).toMatch(/hazardous laser power/);
    expect(e.cautions[0]).toMatch(/laser-safety programme and local rules/);
    // 0.2 W is within Class 3B (5 mW to 0.5 W): a note of its own, not the Class 4 caution.
    const low = evaluateSetup(loadSetup(ifoSetup({ params: { power: "0.2 W" } })), { from: 10, to: 1000, points: 2 });
    expect(low.cautions).toHaveLength(1);
    expect(low.cautions[0]).toMatch(/within Class 3B/);
    expect(low.cautions[0]).not.toMatch(/hazardous laser power|Class 4/);
    const faint = evaluateSetup(loadSetup(ifoSetup({ params: { power: "1 mW" } })), { from: 10, to: 1000, points: 2 });
    expect(faint.cautions).toEqual([]);
  });

  function problemOf(fn: () => unknown): QuietframeError {
    try {
      fn();
    } catch (e) {
      if (e instanceof QuietframeError) return e;
      if (e instanceof QuietframeErrors) return e.problems[0];
      throw e;
    }
    throw new Error("expected a QuietframeError");
  }

  it("rejects an arm width that needs an input-mirror transmission 4Lγ/c ≥ 1, naming field, value and range", () => {
    const e = problemOf(() => loadSetup(ifoSetup({ params: { armBandwidth: "5 kHz" } })));
    expect(e.path).toBe("components.ifo.armBandwidth");
    expect(e.value).toBe("5 kHz");
    // c/(8πL) for L = 4 km: 299792458/(8π·4000) = 2982 Hz
    expect(e.allowed).toMatch(/below c\/\(8πL\) = 2982 Hz/);
  });

  it("rejects a round-trip loss that alone exceeds the arm width", () => {
    const e = problemOf(() => loadSetup(ifoSetup({ params: { opticalLoss: 0.05 } })));
    expect(e.path).toBe("components.ifo.opticalLoss");
    expect(e.value).toBe(0.05);
    // 4Lγ/c = 4·4000·2π·100/299792458 = 0.03353
    expect(e.allowed).toMatch(/< 4Lγ\/c = 0\.03353/);
  });

  it("rejects non-positive mass, arm length, width and power through the parameter ranges", () => {
    for (const [field, value] of [
      ["mass", "0 kg"],
      ["armLength", "-1 m"],
      ["armBandwidth", "0 Hz"],
      ["power", "0 W"],
    ]) {
      const e = problemOf(() => loadSetup(ifoSetup({ params: { [field]: value } })));
      expect(e.path, field).toBe(`components.ifo.${field}`);
      expect(e.value, field).toBe(value);
      expect(e.allowed, field).toBeTruthy();
    }
  });

  it("accepts only a strain signal and strain or displacement referral", () => {
    const bad = { ...ifoSetup(), signal: { kind: "force", on: "ifo" } };
    expect(problemOf(() => loadSetup(bad)).path).toBe("signal.kind");
    const e = problemOf(() => evaluateSetup(loadSetup(ifoSetup({ referTo: "force" })), { from: 10, to: 100, points: 2 }));
    expect(e.path).toBe("signal.referTo");
    expect(e.allowed).toMatch(/"strain" or "displacement"/);
  });
});
