import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import type { MechanismBudget, MechanismTerm } from "../../src/engine/mechanisms";
import { evaluate, evaluateMechanisms, loadSetup, prepare } from "../../src/pipeline";
import type { ComponentDescription, SetupDescription } from "../../src/setup/format";
import type { NoiseBudget } from "../../src/engine/budget";
import { expectAllClose } from "../helpers/close";
import { cavityReadout, probedBody, setup } from "../helpers/setups";

/**
 * The budget by mechanism (src/engine/mechanisms.ts) against closed forms of imprecision,
 * back-action and their cross-correlation:
 * - a travelling-wave QND probe of a free mass: S_x^imp·S_F^ba = ħ² (one-sided) without
 *   correlation, and S_x^imp·S_F^ba − S_xF² = ħ² for a variational (tilted) homodyne, the
 *   correlated form of the Heisenberg bound (Braginsky & Khalili, Quantum Measurement (1992),
 *   ch. on linear measurements; Kimble et al., Phys. Rev. D 65, 022002 (2001), Sec. V);
 * - the tuned interferometer's two-photon relations b2 = (a2 − K a1)e^{2iβ} + … (Kimble et al.
 *   2001, Sec. II–IV): shot noise h_SQL²/(2K), radiation pressure h_SQL²K/2, and for light with
 *   noise matrix N the cross term −h_SQL² N12; read at the angle ζ from the amplitude
 *   quadrature the cross term is −h_SQL² cot ζ, and cot ζ = K gives h_SQL²/(2K) (their
 *   variational readout, lossless).
 * Every check also holds the parts to the budget's own terms: they add up to rounding.
 */

const GRID = { from: 1, to: 1e4, points: 61 };
const MASS = 40;
const L = 4000;
const F_ARM = 100;
const GAMMA = 2 * Math.PI * F_ARM;
const OMEGA0 = (2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9;
const P_ARM = 8e5;

/** K = (I0/I_SQL)·2γ⁴/(Ω²(γ²+Ω²)), I_SQL = mL²γ⁴/(4ω0), I0 = 2LγP_arm/c (Kimble et al. 2001; see interferometer.test.ts). */
function kimbleK(f: number): number {
  const w = 2 * Math.PI * f;
  const i0 = (2 * L * GAMMA * P_ARM) / SPEED_OF_LIGHT;
  const iSql = (MASS * L ** 2 * GAMMA ** 4) / (4 * OMEGA0);
  return (i0 / iSql) * ((2 * GAMMA ** 4) / (w ** 2 * (GAMMA ** 2 + w ** 2)));
}

/** h_SQL² = 8ħ/(mΩ²L²) (Kimble et al. 2001). */
function hSql2(f: number): number {
  return (8 * HBAR) / (MASS * (2 * Math.PI * f) ** 2 * L ** 2);
}

function ifo(light: ComponentDescription, angle = "90 deg", params: Record<string, string> = {}): SetupDescription {
  return setup(
    [
      light,
      { name: "ifo", type: "interferometer", params: { mass: `${MASS} kg`, armLength: `${L} m`, armBandwidth: `${F_ARM} Hz`, power: `${P_ARM} W`, ...params } },
      { name: "detector", type: "homodyne", params: { angle } },
    ],
    [
      ["light.out", "ifo.in"],
      ["ifo.out", "detector.in"],
    ],
    { signal: { kind: "strain", on: "ifo" } },
  );
}

function run(description: SetupDescription, grid: typeof GRID | Float64Array = GRID): { budget: NoiseBudget; split: MechanismBudget } {
  const prepared = prepare(loadSetup(description));
  return { budget: evaluate(prepared, grid).budget, split: evaluateMechanisms(prepared, grid) };
}

function only(split: MechanismBudget, owner: string): MechanismTerm {
  const terms = split.terms.filter((t) => t.owner === owner);
  expect(terms.map((t) => t.label)).toHaveLength(1);
  return terms[0];
}

/** The parts add up to the whole and the whole is the budget's terms (rounding: a few ulps of the largest part). */
function expectAddsUp(budget: NoiseBudget, term: MechanismTerm): void {
  const nf = budget.frequencies.length;
  for (let f = 0; f < nf; f++) {
    const fromBudget = term.budgetTerms.reduce((s, id) => s + (budget.terms.find((t) => t.id === id)?.psd[f] ?? 0), 0);
    const sum = term.imprecision[f] + term.backAction[f] + term.correlation[f];
    const scale = Math.abs(term.imprecision[f]) + Math.abs(term.backAction[f]) + Math.abs(term.correlation[f]);
    expect(Math.abs(sum - term.psd[f]), `parts vs whole at ${budget.frequencies[f]} Hz`).toBeLessThanOrEqual(1e-13 * scale);
    expect(Math.abs(fromBudget - term.psd[f]), `whole vs budget at ${budget.frequencies[f]} Hz`).toBeLessThanOrEqual(1e-12 * scale);
  }
}

describe("budget by mechanism: tuned interferometer (Kimble et al. 2001)", () => {
  it("vacuum, phase readout: imprecision h_SQL²/(2K), back-action h_SQL²K/2, no correlation", () => {
    const { budget, split } = run(ifo({ name: "light", type: "vacuum" }));
    const t = only(split, "light");
    expect(t.budgetTerms).toHaveLength(2);
    const f = Array.from(budget.frequencies);
    expectAllClose(
      t.imprecision,
      f.map((x) => hSql2(x) / (2 * kimbleK(x))),
      1e-9,
      "imprecision",
    );
    expectAllClose(
      t.backAction,
      f.map((x) => (hSql2(x) * kimbleK(x)) / 2),
      1e-9,
      "back-action",
    );
    expect(t.correlation.every((c) => c === 0)).toBe(true);
    expectAddsUp(budget, t);
  });

  it.each([
    [0.8, Math.PI / 3],
    [1.15, -0.4],
    [0.5, 2.2],
  ])("squeezing r = %f at θ = %f rad: imprecision N22·h_SQL²/(2K), back-action N11·h_SQL²K/2, correlation −N12·h_SQL², N = R(θ)diag(e^{−2r}, e^{2r})R(θ)ᵀ", (r, theta) => {
    const { budget, split } = run(ifo({ name: "light", type: "squeezed", params: { r, angle: `${theta} rad` } }));
    const t = only(split, "light");
    const n11 = Math.exp(-2 * r) * Math.cos(theta) ** 2 + Math.exp(2 * r) * Math.sin(theta) ** 2;
    const n22 = Math.exp(-2 * r) * Math.sin(theta) ** 2 + Math.exp(2 * r) * Math.cos(theta) ** 2;
    const n12 = (Math.exp(-2 * r) - Math.exp(2 * r)) * Math.cos(theta) * Math.sin(theta);
    const f = Array.from(budget.frequencies);
    expectAllClose(
      t.imprecision,
      f.map((x) => (n22 * hSql2(x)) / (2 * kimbleK(x))),
      1e-9,
      "imprecision",
    );
    expectAllClose(
      t.backAction,
      f.map((x) => (n11 * hSql2(x) * kimbleK(x)) / 2),
      1e-9,
      "back-action",
    );
    expectAllClose(
      t.correlation,
      f.map((x) => -n12 * hSql2(x)),
      1e-9,
      "correlation",
    );
    // The sign of the correlation is that of sin 2θ: negative at θ = −0.4 rad.
    expect(Math.sign(t.correlation[0])).toBe(Math.sign(Math.sin(2 * theta)));
    // Total against Kimble et al. 2001 Sec. IV: (h_SQL²/2)(K + 1/K)[cosh 2r − cos 2(θ + Φ) sinh 2r], Φ = arccot K.
    expectAllClose(
      t.psd,
      f.map((x) => {
        const K = kimbleK(x);
        return (hSql2(x) / 2) * (K + 1 / K) * (Math.cosh(2 * r) - Math.cos(2 * (theta + Math.atan(1 / K))) * Math.sinh(2 * r));
      }),
      1e-9,
      "total",
    );
    expectAddsUp(budget, t);
  });

  it("variational readout at ζ with cot ζ = K(50 Hz): correlation −h_SQL² cot ζ, and the total h_SQL²/(2K) at 50 Hz", () => {
    // Derived from the two-photon relations with our homodyne angle ζ from the amplitude
    // quadrature: y ∝ cos ζ a1 + sin ζ (a2 − K a1) + √(2K) sin ζ h/h_SQL, so
    // S_h = (h_SQL²/(2K))[(cot ζ − K)² + 1]: imprecision (h_SQL²/(2K))(cot²ζ + 1),
    // back-action h_SQL²K/2, cross term −h_SQL² cot ζ (Kimble et al. 2001, Sec. V).
    const f0 = 50;
    const zeta = Math.atan(1 / kimbleK(f0));
    const freqs = Float64Array.of(5, 20, f0, 200, 2000);
    const { budget, split } = run(ifo({ name: "light", type: "vacuum" }, `${zeta} rad`), freqs);
    const t = only(split, "light");
    const cot = 1 / Math.tan(zeta);
    const f = Array.from(freqs);
    expectAllClose(
      t.imprecision,
      f.map((x) => (hSql2(x) / (2 * kimbleK(x))) * (cot * cot + 1)),
      1e-9,
      "imprecision",
    );
    expectAllClose(
      t.backAction,
      f.map((x) => (hSql2(x) * kimbleK(x)) / 2),
      1e-9,
      "back-action",
    );
    expectAllClose(
      t.correlation,
      f.map((x) => -hSql2(x) * cot),
      1e-9,
      "correlation",
    );
    expect(t.correlation.every((c) => c < 0)).toBe(true);
    expect(Math.abs(t.psd[2] - hSql2(f0) / (2 * kimbleK(f0))) / t.psd[2]).toBeLessThan(1e-9);
    expectAddsUp(budget, t);
  });

  it("arm loss is light too: its vacuum enters both paths and is split on its own", () => {
    const { budget, split } = run(ifo({ name: "light", type: "vacuum" }, "90 deg", { opticalLoss: "1e-3" }));
    const loss = only(split, "ifo");
    expect(loss.category).toBe("loss");
    expect(loss.backAction.every((v) => v > 0) && loss.imprecision.every((v) => v > 0)).toBe(true);
    expectAddsUp(budget, loss);
    expectAddsUp(budget, only(split, "light"));
    // Detection and the other loss-free terms do not move a body: the homodyne is not listed.
    expect(split.terms.some((t) => t.owner === "detector")).toBe(false);
  });
});

describe("budget by mechanism: QND probe of a free mass (Braginsky & Khalili 1992)", () => {
  const mass = 0.01;
  const power = 0.3;
  const forcePsd = (8 * HBAR * ((2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9) * power) / SPEED_OF_LIGHT ** 2; // S_F = 8ħωP/c²

  it("phase readout: S_F^ba = 8ħωP/c², S_x^imp = ħ²/S_F^ba, no correlation", () => {
    const { budget, split } = run(probedBody({ body: { mass: `${mass} kg` }, probe: { power: `${power} W` } }));
    const t = only(split, "light");
    const f = Array.from(budget.frequencies);
    const chi2 = (x: number) => 1 / (mass * (2 * Math.PI * x) ** 2) ** 2;
    expectAllClose(
      t.backAction,
      f.map((x) => chi2(x) * forcePsd),
      1e-9,
      "back-action |χ|²S_F",
    );
    expectAllClose(
      t.imprecision,
      f.map(() => (HBAR * HBAR) / forcePsd),
      1e-9,
      "imprecision",
    );
    expect(t.correlation.every((c) => c === 0)).toBe(true);
    expectAddsUp(budget, t);
  });

  it.each([30, 70, 120])("homodyne at %f°: S_x^imp·S_F^ba − S_xF² = ħ² with S_xF = ħ cot ζ (correlated Heisenberg bound)", (deg) => {
    const zeta = (deg * Math.PI) / 180;
    const { budget, split } = run(probedBody({ body: { mass: `${mass} kg` }, probe: { power: `${power} W` }, angle: `${deg} deg` }));
    const t = only(split, "light");
    budget.frequencies.forEach((x, k) => {
      const chi = -1 / (mass * (2 * Math.PI * x) ** 2); // free mass χ = −1/(mΩ²), real
      const sF = t.backAction[k] / (chi * chi);
      const sXF = t.correlation[k] / (2 * chi); // S_x = S_imp + χ²S_F + 2χ S_xF for real χ
      expect(Math.abs(sF / forcePsd - 1)).toBeLessThan(1e-9);
      expect(Math.abs(sXF / (HBAR / Math.tan(zeta)) - 1)).toBeLessThan(1e-9);
      expect(Math.abs((t.imprecision[k] * sF - sXF * sXF) / (HBAR * HBAR) - 1)).toBeLessThan(1e-9);
    });
    expectAddsUp(budget, t);
  });
});

describe("budget by mechanism: other set-ups", () => {
  it("a cavity readout of an oscillator adds up to its budget; thermal noise is not listed", () => {
    const description = cavityReadout({
      body: { mass: "1 ng", frequency: "1 MHz", Q: 1e5, temperature: "4 K" },
      cavity: { linewidth: "2 MHz", photons: 1e6, g0: "100 Hz" },
      angle: "60 deg",
    });
    const { budget, split } = run(description, { from: 1e5, to: 1e7, points: 41 });
    expect(split.terms.length).toBeGreaterThan(0);
    for (const t of split.terms) {
      expect(["quantum-light", "loss"]).toContain(t.category);
      expectAddsUp(budget, t);
    }
  });

  it("two detectors combined optimally: the parts add up to the budget's terms", () => {
    const description = setup(
      [
        { name: "light", type: "squeezed", params: { squeezing: "-6 dB", angle: "20 deg" } },
        { name: "body", type: "free-mass", params: { mass: "10 g" } },
        { name: "probe", type: "position-probe", params: { power: "0.3 W" } },
        { name: "open", type: "vacuum" },
        { name: "split", type: "beam-splitter", params: { transmission: 0.35 } },
        { name: "d1", type: "homodyne", params: { angle: "20 deg", efficiency: 0.85 } },
        { name: "d2", type: "homodyne", params: { angle: "100 deg", efficiency: 0.85 } },
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
    const { budget, split } = run(description);
    const t = only(split, "light");
    expect(t.correlation.some((c) => c !== 0)).toBe(true);
    expectAddsUp(budget, t);
  });

  it("a negative-mass spin twin in the same beam cancels the light's back-action, a positive-mass twin quadruples it (physics notes §5; Tsang & Caves, PRL 105, 123601 (2010))", () => {
    // S_ba = p_s²|k_m²χ_m + k_s²χ_s|²/(k_m²|χ_m|²) force-referred: 0 for χ_s = −χ_m at equal rates,
    // 4k_m²p_s² for χ_s = +χ_m, k_m²p_s² alone (back-action-evasion.test.ts derives it).
    const mass = 1e-11;
    const fm = 1e6;
    const k2ps2 = 4 * (2 * Math.PI * 1e3) * HBAR * mass * 2 * Math.PI * fm; // k² = 4Γ, p_s² = ħmΩ_m
    const beam = (orientation?: string) =>
      setup(
        [
          { name: "light", type: "coherent" },
          { name: "membrane", type: "oscillator", params: { mass: `${mass} kg`, frequency: `${fm} Hz`, Q: 1e4, temperature: "0 K", damping: "symmetric" } },
          { name: "probe", type: "position-probe", params: { measurementRate: "1 kHz" } },
          ...(orientation
            ? [{ name: "spin", type: "spin-ensemble", params: { atoms: 1e12, spin: 4, polarization: 1, larmorFrequency: `${fm} Hz`, linewidth: `${fm / 1e4} Hz`, readoutRate: "1 kHz", orientation } }]
            : []),
          { name: "detector", type: "homodyne" },
        ],
        [
          ["light.out", "probe.in"],
          ["probe.mechanics", "membrane.body"],
          ...((orientation
            ? [
                ["probe.out", "spin.in"],
                ["spin.out", "detector.in"],
              ]
            : [["probe.out", "detector.in"]]) as [string, string][]),
        ],
        { signal: { kind: "force", on: "membrane", referTo: "force" } },
      );
    const grid = { from: 5e5, to: 2e6, points: 41 };
    const alone = only(run(beam(), grid).split, "light");
    expectAllClose(alone.backAction, new Float64Array(grid.points).fill(k2ps2), 1e-9, "lone probe");
    const negative = run(beam("negative-mass"), grid);
    const cancelled = only(negative.split, "light");
    expect(Math.max(...cancelled.backAction) / k2ps2).toBeLessThan(1e-12);
    expectAllClose(cancelled.imprecision, alone.imprecision, 1e-9, "imprecision unchanged");
    expectAddsUp(negative.budget, cancelled);
    const positive = only(run(beam("positive-mass"), grid).split, "light");
    expectAllClose(positive.backAction, new Float64Array(grid.points).fill(4 * k2ps2), 1e-9, "positive-mass twin");
  });
});
