import { beforeAll, describe, expect, it } from "vitest";
import { occupationFromPolarization, polarizationFromOccupation } from "../../src/physics/spin-statistics";
import { diffusionMatrix, stationaryCovariance, uncertaintyMargin } from "../../src/engine/covariance";
import { QuietframeError, QuietframeErrors } from "../../src/errors";
import { assemble } from "../../src/setup/assemble";
import type { StateSpaceModel } from "../../src/network/model";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import type { SetupDescription } from "../../src/setup/format";
import { loadMathjs, type MathComplex, type MathJs, type MathMatrix } from "../helpers/mathjs";
import { setup } from "../helpers/setups";

/**
 * The collective spin oscillator (Holstein–Primakoff picture of a polarized ensemble,
 * Hammerer, Sørensen & Polzik, Rev. Mod. Phys. 82, 1041 (2010)) on its own: its
 * occupation, its stationary state, its Larmor frequency, linewidth and susceptibility.
 */

type Params = Record<string, string | number>;

const BASE_SPIN: Params = {
  atoms: 1e10,
  spin: 4,
  polarization: 1,
  larmorFrequency: "1 MHz",
  linewidth: "100 Hz",
  readoutRate: "0 Hz",
  orientation: "negative-mass",
};

/** Light → position probe on an oscillator → spin ensemble → phase homodyne (the spin needs a signal target beside it). */
function spinSetup(spin: Params, probeRate = "0 Hz"): SetupDescription {
  return setup(
    [
      { name: "light", type: "coherent" },
      { name: "body", type: "oscillator", params: { mass: "10 ng", frequency: "1 MHz", Q: 1e4, temperature: "0 K", damping: "symmetric" } },
      { name: "probe", type: "position-probe", params: { measurementRate: probeRate } },
      { name: "spin", type: "spin-ensemble", params: spin },
      { name: "detector", type: "homodyne" },
    ],
    [
      ["light.out", "probe.in"],
      ["probe.out", "spin.in"],
      ["spin.out", "detector.in"],
      ["probe.mechanics", "body.body"],
    ],
    { signal: { kind: "force", on: "body", referTo: "force" } },
  );
}

function spinModel(spin: Params): StateSpaceModel {
  return assemble(loadSetup(spinSetup(spin))).model;
}

function spinBlock(model: StateSpaceModel): { x: number; p: number; a: number[][] } {
  const mode = model.modes.find((m) => m.owner === "spin")!;
  const n = model.nStates;
  const a = [
    [model.A[mode.x * n + mode.x], model.A[mode.x * n + mode.p]],
    [model.A[mode.p * n + mode.x], model.A[mode.p * n + mode.p]],
  ];
  return { x: mode.x, p: mode.p, a };
}

function toRows(a: Float64Array, n: number): number[][] {
  return Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, i * n + n)));
}

describe("thermal-like occupation of a polarized ensemble", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });

  it("spin-1/2 with polarization p has n_s = (1 − p)/(2p) (Hammerer, Sørensen & Polzik, RMP 82, 1041 (2010))", () => {
    for (const p of [1, 0.99, 0.9, 0.5, 0.1, 1e-3]) {
      const expected = (1 - p) / (2 * p);
      expect(Math.abs(occupationFromPolarization(0.5, p) - expected)).toBeLessThanOrEqual(1e-13 * Math.max(1, expected));
    }
  });

  // Independent check for F > 1/2: build the spin-F operators in the eigenbasis of F_x from the
  // ladder-operator matrix elements ⟨m ± 1|F_±|m⟩ = √(F(F+1) − m(m ± 1)) (any quantum-mechanics
  // textbook), put the atoms in ρ ∝ exp(βF_x) (mathjs expm, a spin-temperature state: common
  // practice for optically pumped vapours, no source), find β by bisection so that ⟨F_x⟩ = pF,
  // and take n_s = Var(F_y)/(pF) − 1/2 from the Holstein–Primakoff scaling X = J_y/√⟨J_x⟩ (RMP 82, 1041).
  it.each([
    [1, 0.4],
    [1.5, 0.7],
    [4, 0.2],
    [4, 0.8],
    [4, 0.97],
    [7.5, 0.6],
  ])("spin F = %f, p = %f: n_s from explicit spin matrices and a spin-temperature state (mathjs expm)", (F, p) => {
    const dim = Math.round(2 * F) + 1;
    const ms = Array.from({ length: dim }, (_, k) => -F + k);
    const fx = math.diag(ms) as unknown as MathMatrix;
    const up = math.zeros(dim, dim) as MathMatrix;
    for (let k = 0; k + 1 < dim; k++) up.set([k + 1, k], Math.sqrt(F * (F + 1) - ms[k] * (ms[k] + 1)));
    const down = math.transpose(up);
    // F_y here is the first transverse component: (F₊ − F₋)/(2i); its square is real: −(F₊ − F₋)²/4.
    const diff = math.subtract(up, down) as MathMatrix;
    const fy2 = math.multiply(-0.25, math.multiply(diff, diff)) as MathMatrix;
    const state = (beta: number) => {
      const rho = math.expm(math.multiply(beta, fx) as MathMatrix);
      const z = math.trace(rho) as number;
      return {
        mean: (math.trace(math.multiply(rho, fx)) as number) / z,
        fy2: (math.trace(math.multiply(rho, fy2)) as number) / z,
      };
    };
    let lo = 0;
    let hi = 60;
    for (let i = 0; i < 200; i++) {
      const mid = (lo + hi) / 2;
      if (state(mid).mean / F > p) hi = mid;
      else lo = mid;
    }
    const s = state((lo + hi) / 2);
    const expected = s.fy2 / (p * F) - 0.5;
    expect(Math.abs(occupationFromPolarization(F, p) / expected - 1)).toBeLessThan(1e-9);
  });

  it("polarization and occupation are inverse descriptions (round trip)", () => {
    for (const F of [0.5, 1, 2.5, 4]) {
      for (const p of [0.05, 0.5, 0.9, 0.999]) {
        const n = occupationFromPolarization(F, p);
        expect(Math.abs(polarizationFromOccupation(F, n) / p - 1), `F = ${F}, p = ${p}`).toBeLessThan(1e-9);
      }
    }
    expect(occupationFromPolarization(4, 1)).toBe(0);
    expect(polarizationFromOccupation(4, 0)).toBe(1);
  });

  it("the component uses the occupation: giving occupation or the equivalent polarization builds the same model", () => {
    const p = 0.8;
    const n = occupationFromPolarization(4, p);
    const a = spinModel({ ...BASE_SPIN, polarization: p });
    const { polarization: _, ...rest } = BASE_SPIN;
    const b = spinModel({ ...rest, occupation: n });
    expect(Array.from(b.N)).toEqual(Array.from(a.N));
    expect(Array.from(b.A)).toEqual(Array.from(a.A));
  });
});

describe("stationary state of the spin oscillator", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });

  it("without probing sits at variance n_s + 1/2 in both quadratures (Lyapunov; mathjs lyap as reference)", () => {
    for (const occupation of [0, 0.3, 12]) {
      const { polarization: _, ...rest } = BASE_SPIN;
      const model = spinModel({ ...rest, occupation, probeBroadening: "40 Hz" });
      const n = model.nStates;
      const v = stationaryCovariance(model);
      // mathjs lyap(A, Q) solves A P + P Aᵀ + Q = 0 with Q = B (N/2) Bᵀ, our equation.
      const ref = math.lyap(toRows(model.A, n), toRows(diffusionMatrix(model), n)) as number[][];
      const { x, p } = spinBlock(model);
      for (const [i, j] of [
        [x, x],
        [p, p],
        [x, p],
      ]) {
        expect(Math.abs(v[i * n + j] - ref[i][j]), `V[${i}][${j}]`).toBeLessThanOrEqual(1e-9 * (occupation + 0.5));
      }
      // Quantum FDT for symmetric (amplitude) damping: a mode in a bath of occupation n relaxes to n + 1/2.
      expect(Math.abs(v[x * n + x] / (occupation + 0.5) - 1)).toBeLessThan(1e-9);
      expect(Math.abs(v[p * n + p] / (occupation + 0.5) - 1)).toBeLessThan(1e-9);
      expect(Math.abs(v[x * n + p])).toBeLessThan(1e-12);
      expect(uncertaintyMargin(model, v)).toBeGreaterThanOrEqual(-1e-12);
    }
  });

  it("is heated by the readout's back-action: Var X + Var P = 2n_s + 1 + 2Γ/γ (heating at the measurement rate Γ, Clerk et al., RMP 82, 1155 (2010); from memory)", () => {
    // d⟨X² + P²⟩/dt = −γ⟨X² + P²⟩ + γ(2n_s + 1) + k²/2 with k² = 4Γ; the precession conserves X² + P².
    const occupation = 0.25;
    const { polarization: _, ...rest } = BASE_SPIN;
    for (const [rate, broadening] of [
      ["300 Hz", "0 Hz"],
      ["2 kHz", "50 Hz"],
    ] as const) {
      const model = spinModel({ ...rest, occupation, readoutRate: rate, probeBroadening: broadening });
      const v = stationaryCovariance(model);
      const n = model.nStates;
      const { x, p } = spinBlock(model);
      const gamma = 2 * Math.PI * (100 + parseFloat(broadening));
      const Gamma = 2 * Math.PI * parseFloat(rate) * (rate.includes("k") ? 1000 : 1);
      const expected = 2 * occupation + 1 + (2 * Gamma) / gamma;
      expect(Math.abs((v[x * n + x] + v[p * n + p]) / expected - 1), rate).toBeLessThan(1e-9);
    }
  });
});

describe("Larmor frequency, linewidth and susceptibility", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });

  it("f_L = γ_g·B is linear in the field (linear Zeeman regime; common practice, no source)", () => {
    const { larmorFrequency: _, ...rest } = BASE_SPIN;
    const ratio = 3.5e9; // Hz/T
    for (const [field, tesla] of [
      ["100 uT", 1e-4],
      ["314.3 uT", 3.143e-4],
      ["2 G", 2e-4],
    ] as const) {
      const { a } = spinBlock(spinModel({ ...rest, field, gyromagneticRatio: "3.5 GHz/T" }));
      // orientation "negative-mass": dX/dt = −Ω_L P
      expect(Math.abs(-a[0][1] / (2 * Math.PI * ratio * tesla) - 1), field).toBeLessThan(1e-12);
      expect(Math.abs(a[1][0] / (2 * Math.PI * ratio * tesla) - 1), field).toBeLessThan(1e-12);
    }
    const doubled = spinBlock(spinModel({ ...rest, field: "200 uT", gyromagneticRatio: "3.5 GHz/T" })).a[0][1];
    const single = spinBlock(spinModel({ ...rest, field: "100 uT", gyromagneticRatio: "3.5 GHz/T" })).a[0][1];
    expect(Math.abs(doubled / single - 2)).toBeLessThan(1e-12);
    // The same Larmor frequency given directly builds the same dynamics.
    const direct = spinBlock(spinModel({ ...BASE_SPIN, larmorFrequency: "350 kHz" })).a;
    const fromField = spinBlock(spinModel({ ...rest, field: "100 uT", gyromagneticRatio: "3.5 GHz/T" })).a;
    for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) expect(Math.abs(fromField[i][j] - direct[i][j])).toBeLessThanOrEqual(1e-9 * Math.abs(direct[0][1]));
  });

  it("T2 gives the linewidth 1/(πT2): the transverse amplitude decays as e^{−t/T2} (Bloch equations; from memory)", () => {
    const { linewidth: _, ...rest } = BASE_SPIN;
    const { a } = spinBlock(spinModel({ ...rest, t2: "2 ms" }));
    // Each quadrature decays at γ/2 = 1/T2.
    expect(Math.abs(-a[0][0] * 2e-3 - 1)).toBeLessThan(1e-12);
    expect(Math.abs(-a[1][1] * 2e-3 - 1)).toBeLessThan(1e-12);
    const viaLinewidth = spinBlock(spinModel({ ...BASE_SPIN, linewidth: `${1 / (Math.PI * 2e-3)} Hz` })).a;
    expect(Math.abs(viaLinewidth[0][0] / a[0][0] - 1)).toBeLessThan(1e-12);
  });

  // χ_s(Ω) is the response of X to a drive on P: solving (γ/2 − iΩ)X − sΩ_L P = 0,
  // sΩ_L X + (γ/2 − iΩ)P = f gives χ_s = sΩ_L/(Ω_L² + γ²/4 − Ω² − iγΩ), the susceptibility of a
  // mechanical oscillator with amplitude (symmetric) damping scaled to dimensionless quadratures
  // (derived here; the mechanical form is the engine's own, checked in test/engine/oscillator-probe).
  it("has χ_s = sΩ_L/(Ω_L² + γ²/4 − Ω² − iγΩ), and the negative orientation flips its sign (physics notes §4–5)", () => {
    const omegaL = 2 * Math.PI * 1e6;
    const gamma = 2 * Math.PI * (100 + 30);
    const chiOf = (orientation: string, f: number) => {
      const { a } = spinBlock(spinModel({ ...BASE_SPIN, orientation, probeBroadening: "30 Hz" }));
      const w = 2 * Math.PI * f;
      const m = math.matrix([
        [math.complex(-a[0][0], -w), math.complex(-a[0][1], 0)],
        [math.complex(-a[1][0], 0), math.complex(-a[1][1], -w)],
      ]);
      const inv = math.inv(m) as MathMatrix;
      return inv.get([0, 1]) as MathComplex;
    };
    for (const f of [3e5, 9.99e5, 1e6, 1.0003e6, 4e6]) {
      const w = 2 * Math.PI * f;
      const den = math.complex(omegaL ** 2 + gamma ** 2 / 4 - w ** 2, -gamma * w);
      for (const [orientation, s] of [
        ["positive-mass", 1],
        ["negative-mass", -1],
      ] as const) {
        const expected = math.divide(s * omegaL, den) as MathComplex;
        const got = chiOf(orientation, f);
        const scale = math.abs(expected) as unknown as number;
        expect(math.abs(math.subtract(got, expected) as MathComplex) as unknown as number, `${orientation} at ${f} Hz`).toBeLessThan(1e-9 * scale);
      }
      const pos = chiOf("positive-mass", f);
      const neg = chiOf("negative-mass", f);
      expect(neg.re).toBe(-pos.re);
      expect(neg.im).toBe(-pos.im);
    }
  });

  it("reads X_s into the phase quadrature with k = 2√Γ and leaves the amplitude quadrature alone (QND, like the position probe)", () => {
    const model = spinModel({ ...BASE_SPIN, readoutRate: "2.5 kHz" });
    const { x } = spinBlock(model);
    const n = model.nStates;
    const k = 2 * Math.sqrt(2 * Math.PI * 2500);
    // The detector (90°, efficiency 1) reads q2_out = q2_in + k_probe X_body + k X_spin.
    expect(Math.abs(model.C[x] / k - 1)).toBeLessThan(1e-14);
    expect(model.C.length).toBe(n);
  });
});

describe("carrier offset: the ensemble on one colour of a two-colour scheme", () => {
  // Relation checked here: in a frame rotating at Δ relative to the one where the spin precesses
  // at Ω_L, its Hamiltonian sħΩ_L b†b becomes (sΩ_L − Δ)ħ b†b (rotating-frame transformation
  // H → H − ħΔ b†b; e.g. Gardiner & Zoller, Quantum Noise (2004), interaction picture; from memory),
  // so the light's frame sees the signed frequency ω_f = sΩ_L − Δ, and χ_s = ω_f/(ω_f² + γ²/4 − Ω² − iγΩ).
  const omegaL = 2 * Math.PI * 1e6;

  it("a zero offset reproduces the model without one, bit for bit (matrices and budget)", () => {
    for (const orientation of ["positive-mass", "negative-mass"]) {
      const spin = { ...BASE_SPIN, orientation, readoutRate: "3 kHz" };
      const without = assemble(loadSetup(spinSetup(spin, "2 kHz"))).model;
      const withZero = assemble(loadSetup(spinSetup({ ...spin, carrierOffset: "0 Hz" }, "2 kHz"))).model;
      for (const key of ["A", "B", "C", "D", "N", "signalB", "signalD"] as const) expect(withZero[key], `${orientation} ${key}`).toEqual(without[key]);
      const grid = { from: 9e5, to: 1.1e6, points: 51 };
      const a = evaluateSetup(loadSetup(spinSetup(spin, "2 kHz")), grid).budget;
      const b = evaluateSetup(loadSetup(spinSetup({ ...spin, carrierOffset: "0 Hz" }, "2 kHz")), grid).budget;
      expect(b.total).toEqual(a.total);
    }
  });

  it("the spin rotates at ω_f = sΩ_L − Δ in the light's frame, for either orientation and sign of offset", () => {
    for (const [orientation, s] of [
      ["positive-mass", 1],
      ["negative-mass", -1],
    ] as const) {
      for (const offset of [-2.5e5, 1.5e4, 7e5, 1.3e6]) {
        const { a } = spinBlock(spinModel({ ...BASE_SPIN, orientation, carrierOffset: `${offset} Hz` }));
        const expected = s * omegaL - 2 * Math.PI * offset;
        expect(Math.abs(a[0][1] / expected - 1), `${orientation}, Δ/2π = ${offset} Hz`).toBeLessThan(1e-14);
        expect(Math.abs(-a[1][0] / expected - 1), `${orientation}, Δ/2π = ${offset} Hz`).toBeLessThan(1e-14);
      }
    }
  });

  it("an offset of twice the Larmor frequency turns a positive-mass ensemble into the negative-mass one, bit for bit", () => {
    // ω_f = Ω_L − 2Ω_L = −Ω_L: the relation's consequence, exact in floating point.
    const shifted = spinModel({ ...BASE_SPIN, orientation: "positive-mass", carrierOffset: "2 MHz" });
    const negative = spinModel({ ...BASE_SPIN, orientation: "negative-mass" });
    expect(shifted.A).toEqual(negative.A);
  });

  it("the response in the light's frame is χ_s = ω_f/(ω_f² + γ²/4 − Ω² − iγΩ) (mathjs inverse as reference)", async () => {
    const math = await loadMathjs();
    const gamma = 2 * Math.PI * 100;
    const offset = 9.2e5; // Hz: ω_f/2π = 80 kHz for the positive orientation
    const { a } = spinBlock(spinModel({ ...BASE_SPIN, orientation: "positive-mass", carrierOffset: `${offset} Hz` }));
    const wf = omegaL - 2 * Math.PI * offset;
    for (const f of [2e4, 7.99e4, 8e4, 8.01e4, 3e5]) {
      const w = 2 * Math.PI * f;
      const m = math.matrix([
        [math.complex(-a[0][0], -w), math.complex(-a[0][1], 0)],
        [math.complex(-a[1][0], 0), math.complex(-a[1][1], -w)],
      ]);
      const got = (math.inv(m) as MathMatrix).get([0, 1]) as MathComplex;
      const expected = math.divide(wf, math.complex(wf ** 2 + gamma ** 2 / 4 - w ** 2, -gamma * w)) as MathComplex;
      const scale = math.abs(expected) as unknown as number;
      expect(math.abs(math.subtract(got, expected) as MathComplex) as unknown as number, `at ${f} Hz`).toBeLessThan(1e-9 * scale);
    }
  });
});

describe("bad spin-ensemble input names the field, the value and what is allowed", () => {
  const problem = (params: Params): QuietframeError => {
    try {
      loadSetup(spinSetup(params));
    } catch (e) {
      if (e instanceof QuietframeError) return e;
      if (e instanceof QuietframeErrors && e.problems.length === 1) return e.problems[0];
      throw e;
    }
    throw new Error("expected a QuietframeError");
  };

  it("a spin that is not a half-integer", () => {
    const e = problem({ ...BASE_SPIN, spin: 1.3 });
    expect(e.path).toBe("components.spin.spin");
    expect(e.value).toBe(1.3);
    expect(e.allowed).toContain("0.5, 1, 1.5");
  });

  it("both or neither of polarization and occupation", () => {
    expect(problem({ ...BASE_SPIN, occupation: 0.1 }).message).toContain("both polarization and occupation");
    const { polarization: _, ...rest } = BASE_SPIN;
    const e = problem(rest);
    expect(e.path).toBe("components.spin.polarization");
    expect(e.message).toContain("neither polarization nor occupation");
  });

  it("polarization out of range", () => {
    const e = problem({ ...BASE_SPIN, polarization: 0 });
    expect(e.path).toBe("components.spin.polarization");
    expect(e.allowed).toBe("0 % < polarization ≤ 100 %");
  });

  it("field without gyromagnetic ratio, and field together with larmorFrequency", () => {
    const { larmorFrequency: _, ...rest } = BASE_SPIN;
    const e = problem({ ...rest, field: "100 uT" });
    expect(e.path).toBe("components.spin.gyromagneticRatio");
    const both = problem({ ...BASE_SPIN, field: "100 uT", gyromagneticRatio: "3.5 GHz/T" });
    expect(both.path).toBe("components.spin.larmorFrequency");
    expect(both.value).toBe("1 MHz");
    expect(both.message).toContain("both larmorFrequency and field");
  });

  it("linewidth and t2 together", () => {
    const e = problem({ ...BASE_SPIN, t2: "1 ms" });
    expect(e.path).toBe("components.spin.linewidth");
    expect(e.value).toBe("100 Hz");
  });

  it("too few atoms for the linearized (Holstein–Primakoff) picture", () => {
    const e = problem({ ...BASE_SPIN, atoms: 100, readoutRate: "1 kHz" });
    expect(e.path).toBe("components.spin.atoms");
    expect(e.value).toBe(100);
    expect(e.message).toContain("too small for the linearized spin model");
    expect(e.allowed).toMatch(/^atoms ≥ \d+/);
  });

  it("an unknown orientation", () => {
    const e = problem({ ...BASE_SPIN, orientation: "negative" });
    expect(e.path).toBe("components.spin.orientation");
    expect(e.allowed).toBe('"positive-mass" or "negative-mass"');
  });
});

describe("safety", () => {
  it("cautions about static fields of 0.5 mT and more and defers to local rules", () => {
    const { larmorFrequency: _, ...rest } = BASE_SPIN;
    const strong = evaluateSetup(loadSetup(spinSetup({ ...rest, field: "2 mT", gyromagneticRatio: "500 MHz/T" }, "100 Hz")), { from: 9e5, to: 1.1e6, points: 3 });
    expect(strong.cautions.join(" ")).toMatch(/magnetic field.*implanted.*safety rules/);
    const weak = evaluateSetup(loadSetup(spinSetup({ ...rest, field: "100 uT", gyromagneticRatio: "10 GHz/T" }, "100 Hz")), { from: 9e5, to: 1.1e6, points: 3 });
    // No field caution; the body at 0 K and the 1 W the probe's rate implies keep theirs.
    expect(weak.cautions.filter((c) => c.startsWith("'spin'"))).toEqual([]);
    expect(weak.cautions.map((c) => c.slice(0, c.indexOf("'", 1) + 1))).toEqual(["'body'", "'probe'"]);
  });
});
