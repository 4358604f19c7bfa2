import { describe, expect, it } from "vitest";
import { BOLTZMANN, HBAR } from "../../src/constants";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { displacementSql, oscillatorSusceptibility, thermalForcePsd, zeroPointDisplacementPsd } from "../../src/reference/limits";
import { expectAllClose } from "../helpers/close";
import { probedBody, sumTerms } from "../helpers/setups";

const MASS = 1e-11; // 10 ng
const F_M = 1e5;
const OMEGA_M = 2 * Math.PI * F_M;
const Q = 1e4;
const GAMMA = OMEGA_M / Q;

function run(opts: { rate: string; efficiency?: number; temperature?: string; referTo?: "displacement" | "force"; massSign?: string }, grid: { from: number; to: number; points: number }) {
  const s = loadSetup(
    probedBody({
      bodyType: "oscillator",
      body: { mass: `${MASS} kg`, frequency: `${F_M} Hz`, Q, temperature: opts.temperature ?? "0 K", massSign: opts.massSign ?? "positive" },
      probe: { measurementRate: opts.rate },
      efficiency: opts.efficiency ?? 1,
      referTo: opts.referTo ?? "displacement",
    }),
  );
  return evaluateSetup(s, grid);
}

const chi = (f: number) => oscillatorSusceptibility(MASS, OMEGA_M, GAMMA, 2 * Math.PI * f);

describe("damped oscillator read by a quantum-limited probe", () => {
  it("prints the oscillator SQL 2ħ|χ| and zero-point 2ħ|Im χ|, equal on resonance (Clerk et al., RMP 82, 1155 (2010))", () => {
    // Log-symmetric bounds put the middle point (index 50) exactly on resonance.
    const e = run({ rate: "100 Hz" }, { from: F_M / 1.1, to: F_M * 1.1, points: 101 });
    const b = e.budget;
    const sql = b.references.find((r) => r.id === "sql")!.psd;
    const zp = b.references.find((r) => r.id === "zero-point")!.psd;
    expectAllClose(
      sql,
      Array.from(b.frequencies, (f) => displacementSql(chi(f))),
      1e-12,
      "SQL",
    );
    expectAllClose(
      zp,
      Array.from(b.frequencies, (f) => zeroPointDisplacementPsd(chi(f))),
      1e-12,
      "zero-point",
    );
    const onResonance = b.frequencies.findIndex((f) => Math.abs(f - F_M) < 1e-6 * F_M);
    expect(onResonance).toBe(50);
    expect(Math.abs(zp[onResonance] / sql[onResonance] - 1)).toBeLessThan(1e-12);
  });

  it("has imprecision × back-action = ħ²/η for any rate and efficiency (Braginsky & Khalili 1992)", () => {
    for (const [rate, eta] of [
      ["10 Hz", 1],
      ["3 kHz", 0.7],
    ] as const) {
      const grid = { from: 5e4, to: 2e5, points: 50 };
      const x = run({ rate, efficiency: eta }, grid).budget;
      const F = run({ rate, efficiency: eta, referTo: "force" }, grid).budget;
      const product = sumTerms(x.terms, "phase quadrature", "detection").map((v, i) => v * sumTerms(F.terms, "amplitude quadrature")[i]);
      expectAllClose(product, new Float64Array(product.length).fill(HBAR ** 2 / eta), 1e-9, `rate ${rate}`);
    }
  });

  it("defines the measurement rate as Γ = x_zpf² S̄_FF/ħ² (double-sided force PSD)", () => {
    const rate = 2 * Math.PI * 250;
    const F = run({ rate: "250 Hz", referTo: "force" }, { from: 1e5, to: 2e5, points: 3 }).budget;
    const xzpf2 = HBAR / (2 * MASS * OMEGA_M);
    const ba = sumTerms(F.terms, "amplitude quadrature");
    for (const v of ba) expect(Math.abs((xzpf2 * (v / 2)) / HBAR ** 2 / rate - 1)).toBeLessThan(1e-12);
  });

  // Added noise = imprecision + back-action: the light's and the detector's terms, not the bath's.
  const added = (b: { terms: readonly { label: string; psd: Float64Array }[] }) => sumTerms(b.terms, "quadrature", "detection");

  it("added noise never drops below 2ħ|χ| and touches it where S_imp = |χ|² S_ba (both sides of resonance)", () => {
    const e = run({ rate: "5 Hz" }, { from: 9.5e4, to: 1.05e5, points: 2001 });
    const b = e.budget;
    const sql = b.references.find((r) => r.id === "sql")!.psd;
    const ratio = Array.from(added(b), (v, i) => v / sql[i]);
    expect(Math.min(...ratio)).toBeGreaterThanOrEqual(1 - 1e-12);
    // Exact touch points from |χ(Ω)|² = S_imp/S_ba: m²((Ω_m² − Ω²)² + γ²Ω²) = S_ba/S_imp.
    const sBa = (2 * HBAR ** 2 * 2 * Math.PI * 5 * 2 * MASS * OMEGA_M) / HBAR;
    const sImp = HBAR ** 2 / sBa;
    const target = sBa / sImp / MASS ** 2;
    // Solve (Ω_m² − u)² + γ² u = target for u = Ω².
    const bq = -(2 * OMEGA_M ** 2 - GAMMA ** 2);
    const cq = OMEGA_M ** 4 - target;
    const disc = Math.sqrt(bq * bq - 4 * cq);
    const roots = [(-bq - disc) / 2, (-bq + disc) / 2].filter((u) => u > 0).map((u) => Math.sqrt(u) / (2 * Math.PI));
    expect(roots).toHaveLength(2);
    for (const fTouch of roots) {
      const e2 = run({ rate: "5 Hz" }, { from: fTouch, to: fTouch * 1.001, points: 2 });
      const r = added(e2.budget)[0] / e2.budget.references.find((x) => x.id === "sql")!.psd[0];
      expect(Math.abs(r - 1)).toBeLessThan(1e-9);
    }
  });

  it("puts the thermal force of the quantum FDT at the resonance into the budget (Markov approximation)", () => {
    for (const T of [0, 0.001, 6, 300]) {
      const b = run({ rate: "1 Hz", temperature: `${T} K`, referTo: "force" }, { from: 8e4, to: 1.2e5, points: 9 }).budget;
      const thermal = sumTerms(b.terms, "thermal");
      const expected = thermalForcePsd(MASS, GAMMA, T, OMEGA_M);
      expectAllClose(thermal, new Float64Array(9).fill(expected), 1e-12, `T = ${T} K`);
      if (T === 0) expect(expected).toBeCloseTo(2 * MASS * GAMMA * HBAR * OMEGA_M, 40);
      if (T === 300) expect(Math.abs(expected / (4 * MASS * GAMMA * BOLTZMANN * T) - 1)).toBeLessThan(1e-6);
    }
  });

  it("a negative-mass oscillator has the mirrored susceptibility −χ and the same SQL (physics notes §4)", () => {
    const grid = { from: 9e4, to: 1.1e5, points: 21 };
    const pos = run({ rate: "50 Hz", referTo: "force" }, grid);
    const neg = run({ rate: "50 Hz", referTo: "force", massSign: "negative" }, grid);
    expectAllClose(neg.budget.total, pos.budget.total, 1e-9, "force-referred noise");
    expect(neg.stability.stable).toBe(true);
  });
});
