import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { runCli } from "../../src/cli/run";
import { HBAR } from "../../src/constants";
import { stationaryCovariance } from "../../src/engine/covariance";
import { eprVariances, modePairCovariance } from "../../src/engine/entanglement";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import type { ComponentDescription, SetupDescription } from "../../src/setup/format";
import { expectAllClose } from "../helpers/close";
import { setup } from "../helpers/setups";

/**
 * Back-action evasion with a negative-mass spin reference (coherent quantum-noise
 * cancellation / quantum-mechanics-free subspace: Tsang & Caves, PRL 105, 123601 (2010) and
 * PRX 2, 031016 (2012); Hammerer et al., PRL 102, 020501 (2009); Møller et al., Nature 547,
 * 191 (2017); the skeleton of physics notes §5).
 *
 * Model, in dimensionless quadratures ([X, P] = i) and one-sided PSDs with vacuum = 1:
 * the membrane (symmetric damping, so its susceptibility has the same form as the spin's)
 * and the spin each respond to a drive on P with
 *   χ_j(Ω) = s_j Ω_j / (Ω_j² + γ_j²/4 − Ω² − iγ_jΩ),
 * the light couples with k_j = 2√Γ_j (Γ = x_zpf² S̄_FF/ħ²), and a force F on the membrane
 * drives its P with F/p_s, p_s = √(ħmΩ_m). In one beam, the phase quadrature after both
 * systems is
 *   y = a2 + k_m χ_m F/p_s + (k_m² χ_m + k_s² χ_s) a1 + (bath terms),
 * so the force-referred back-action (the light's amplitude-quadrature term) is
 *   S_ba = p_s² |k_m² χ_m + k_s² χ_s|² / (k_m² |χ_m|²),
 * which vanishes for the matched negative-mass twin (k_s = k_m, χ_s = −χ_m), is 4 k_m² p_s²
 * for a matched positive-mass twin (four times the lone probe's k_m² p_s²), and leaves the
 * imprecision p_s²/(k_m²|χ_m|²) (the phase-quadrature term) untouched.
 */

const MASS = 1e-11; // 10 ng
const F_M = 1e6;
const OMEGA_M = 2 * Math.PI * F_M;
const Q = 1e4;
const GAMMA_M = OMEGA_M / Q; // 2π·100 Hz
const RATE = 2 * Math.PI * 1e3; // Γ = 2π·1 kHz
const K2 = 4 * RATE; // k² = 4Γ
const PS2 = HBAR * MASS * OMEGA_M; // p_s²

const GRID = { from: 5e5, to: 2e6, points: 301 };

interface SpinOptions {
  orientation: "positive-mass" | "negative-mass";
  larmor?: number; // Hz
  linewidth?: number; // Hz
  rate?: number; // Hz
}

function membrane(): ComponentDescription {
  return { name: "membrane", type: "oscillator", params: { mass: `${MASS} kg`, frequency: `${F_M} Hz`, Q, temperature: "0 K", damping: "symmetric" } };
}

function spin(o: SpinOptions): ComponentDescription {
  return {
    name: "spin",
    type: "spin-ensemble",
    params: {
      atoms: 1e12,
      spin: 4,
      polarization: 1,
      larmorFrequency: `${o.larmor ?? F_M} Hz`,
      linewidth: `${o.linewidth ?? F_M / Q} Hz`,
      readoutRate: `${o.rate ?? 1e3} Hz`,
      orientation: o.orientation,
    },
  };
}

/** Coherent light → position probe on the membrane → [loss] → [spin] → phase homodyne. */
function singleBeam(reference?: SpinOptions, transmissionBetween?: number): SetupDescription {
  const components: ComponentDescription[] = [
    { name: "light", type: "coherent" },
    membrane(),
    { name: "probe", type: "position-probe", params: { measurementRate: "1 kHz" } },
    { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: 1 } },
  ];
  const connections: [string, string][] = [
    ["light.out", "probe.in"],
    ["probe.mechanics", "membrane.body"],
  ];
  let last = "probe.out";
  if (transmissionBetween !== undefined) {
    components.push({ name: "between", type: "loss", params: { transmission: transmissionBetween } });
    connections.push([last, "between.in"]);
    last = "between.out";
  }
  if (reference) {
    components.push(spin(reference));
    connections.push([last, "spin.in"]);
    last = "spin.out";
  }
  connections.push([last, "detector.in"]);
  return setup(components, connections, { signal: { kind: "force", on: "membrane", referTo: "force" } });
}

type Budget = ReturnType<typeof evaluateSetup>["budget"];

/** A budget term by exact label; a term that is zero everywhere is left out of budgets, so it reads as zeros. */
function term(b: Budget, label: string): Float64Array {
  return b.terms.find((t) => t.label === label)?.psd ?? new Float64Array(b.frequencies.length);
}

function evaluate(s: SetupDescription, grid = GRID) {
  return evaluateSetup(loadSetup(s), grid);
}

/** χ(Ω) = sΩ_j/(Ω_j² + γ_j²/4 − Ω² − iγ_jΩ) as [re, im]. */
function chi(sign: number, omegaJ: number, gammaJ: number, omega: number): [number, number] {
  const dr = omegaJ * omegaJ + (gammaJ * gammaJ) / 4 - omega * omega;
  const di = -gammaJ * omega;
  const d2 = dr * dr + di * di;
  return [(sign * omegaJ * dr) / d2, (-sign * omegaJ * di) / d2];
}

const abs2 = ([re, im]: [number, number]): number => re * re + im * im;

describe("one beam through the membrane's probe and then a spin ensemble", () => {
  const alone = evaluate(singleBeam()).budget;
  const negative = evaluate(singleBeam({ orientation: "negative-mass" })).budget;
  const positive = evaluate(singleBeam({ orientation: "positive-mass" })).budget;
  const BA = "light: amplitude quadrature";
  const IMP = "light: phase quadrature";

  it("the lone probe's back-action is k²p_s² = 4Γħm Ω_m and its imprecision p_s²/(k²|χ_m|²) (position-probe definitions)", () => {
    expectAllClose(term(alone, BA), new Float64Array(GRID.points).fill(K2 * PS2), 1e-9, "back-action");
    const imp = Array.from(alone.frequencies, (f) => PS2 / (K2 * abs2(chi(1, OMEGA_M, GAMMA_M, 2 * Math.PI * f))));
    expectAllClose(term(alone, IMP), imp, 1e-9, "imprecision");
  });

  it("a matched negative-mass spin cancels the back-action at every frequency (Tsang & Caves 2010; Hammerer et al. 2009)", () => {
    const cancelled = term(negative, BA);
    const doubled = term(positive, BA);
    for (let i = 0; i < GRID.points; i++) expect(cancelled[i] / doubled[i], `${negative.frequencies[i]} Hz`).toBeLessThan(1e-12);
  });

  it("a matched positive-mass spin in the same place doubles the back-action amplitude: four times the PSD (physics notes §5)", () => {
    expectAllClose(
      term(positive, BA),
      term(alone, BA).map((v) => 4 * v),
      1e-9,
      "back-action ×4",
    );
  });

  it("the imprecision (phase-quadrature term) is unchanged by either reference", () => {
    expectAllClose(term(negative, IMP), term(alone, IMP), 1e-9, "negative-mass");
    expectAllClose(term(positive, IMP), term(alone, IMP), 1e-9, "positive-mass");
  });

  it("the budget still sums to the total, and the references are the membrane's", () => {
    for (const b of [negative, positive]) {
      const sum = new Float64Array(GRID.points);
      for (const t of b.terms) for (let i = 0; i < GRID.points; i++) sum[i] += t.psd[i];
      expectAllClose(sum, b.total, 1e-12, "sum of terms");
      expect(b.references.map((r) => r.id)).toEqual(alone.references.map((r) => r.id));
    }
  });

  // Every mismatch leaves the residual S_ba = p_s²|k_m²χ_m + k_s²χ_s|²/(k_m²|χ_m|²) (derived above):
  // the engine has to compute it, not assume cancellation.
  it.each([
    ["frequency mismatch +300 Hz", { larmor: F_M + 300 }],
    ["frequency mismatch −2 kHz", { larmor: F_M - 2000 }],
    ["linewidth mismatch (250 Hz against 100 Hz)", { linewidth: 250 }],
    ["readout-rate mismatch (1.2 kHz against 1 kHz)", { rate: 1200 }],
  ] as const)("%s: residual back-action ∝ |χ_m + χ_s|² matches the closed form at every frequency", (_, mismatch) => {
    const o: SpinOptions = { orientation: "negative-mass", ...mismatch };
    const b = evaluate(singleBeam(o)).budget;
    const omegaS = 2 * Math.PI * (o.larmor ?? F_M);
    const gammaS = 2 * Math.PI * (o.linewidth ?? F_M / Q);
    const k2s = 4 * 2 * Math.PI * (o.rate ?? 1e3);
    const expected = Array.from(b.frequencies, (f) => {
      const w = 2 * Math.PI * f;
      const cm = chi(1, OMEGA_M, GAMMA_M, w);
      const cs = chi(-1, omegaS, gammaS, w);
      const re = K2 * cm[0] + k2s * cs[0];
      const im = K2 * cm[1] + k2s * cs[1];
      return (PS2 * (re * re + im * im)) / (K2 * abs2(cm));
    });
    expectAllClose(term(b, BA), expected, 1e-9, "residual back-action");
    // A frequency mismatch of δ leaves the residual where |χ_m + χ_s| is largest: near both resonances.
    expectAllClose(term(b, IMP), term(alone, IMP), 1e-9, "imprecision");
  });

  /*
   * Transmission η between the systems (a `loss`, vacuum v in 1 − η): the spin sees
   * √η a1 + √(1−η) v1, and the detector
   *   y = √η (a2 + k X_m) + √(1−η) v2 + k X_s,
   *   X_m = χ_m (F/p_s + k a1 + …),  X_s = χ_s k (√η a1 + √(1−η) v1) + …
   * Referred to force (signal √η k χ_m/p_s):
   *   a1 (back-action):        p_s² k² |χ_m + χ_s|²/|χ_m|²      → 0 for the matched twin, whatever η;
   *   v1 (loss, amplitude):    p_s² k² (1 − η)/η · |χ_s|²/|χ_m|² → (1 − η)/η of the lone probe's back-action;
   *   v2 (loss, phase):        p_s² (1 − η)/(η k² |χ_m|²)        → extra imprecision;
   *   a2 (imprecision):        p_s²/(k² |χ_m|²)                   unchanged.
   * So loss between the systems does not spoil the cancellation of the light's own back-action
   * (both systems see the same a1 with the same rate), but the vacuum that enters in the loss
   * drives the spin alone and is not cancelled.
   */
  it.each([0.9, 0.5, 0.2])("transmission η = %f between the systems leaves the derived residual (1 − η)/η·k²p_s² from the loss vacuum", (eta) => {
    const b = evaluate(singleBeam({ orientation: "negative-mass" }, eta)).budget;
    const ba = term(b, BA);
    for (let i = 0; i < GRID.points; i++) expect(ba[i] / (K2 * PS2)).toBeLessThan(1e-12);
    expectAllClose(term(b, "between: vacuum (amplitude)"), new Float64Array(GRID.points).fill(((1 - eta) / eta) * K2 * PS2), 1e-9, "loss back-action");
    const cm2 = Array.from(b.frequencies, (f) => abs2(chi(1, OMEGA_M, GAMMA_M, 2 * Math.PI * f)));
    expectAllClose(
      term(b, "between: vacuum (phase)"),
      cm2.map((c) => (PS2 * (1 - eta)) / (eta * K2 * c)),
      1e-9,
      "loss imprecision",
    );
    expectAllClose(
      term(b, IMP),
      cm2.map((c) => PS2 / (K2 * c)),
      1e-9,
      "imprecision",
    );
  });
});

describe("quantum-mechanics-free subspace of membrane and spin (Tsang & Caves, PRX 2, 031016 (2012))", () => {
  // With the matched negative-mass twin the back-action drives X_m and X_s with χ and −χ and P_m,
  // P_s with the same response (γ/2 − iΩ)/((γ/2 − iΩ)² + Ω_j²), which does not depend on the sign:
  // X_m + X_s and P_m − P_s (commuting: [X_m + X_s, P_m − P_s] = i − i = 0) see none of it and stay
  // at the zero-temperature baths' value 1/2 + 1/2 = 1, while each system alone is heated to
  // Var X + Var P = 1 + 2Γ/γ (back-action heating, as for the lone spin in spin-ensemble.test.ts).
  it("X_m + X_s and P_m − P_s keep variance 1 while each system is heated by 2Γ/γ", () => {
    const e = evaluate(singleBeam({ orientation: "negative-mass" }), { from: 9e5, to: 1.1e6, points: 3 });
    const v = stationaryCovariance(e.assembled.model);
    const pair = modePairCovariance(e.assembled.model, v, "membrane", "spin");
    const { x, p } = eprVariances(pair, { x: 1, p: -1 });
    expect(Math.abs(x - 1)).toBeLessThan(1e-9);
    expect(Math.abs(p - 1)).toBeLessThan(1e-9);
    const heated = 1 + (2 * RATE) / GAMMA_M;
    expect(Math.abs((pair[0] + pair[5]) / heated - 1)).toBeLessThan(1e-9);
    expect(Math.abs((pair[10] + pair[15]) / heated - 1)).toBeLessThan(1e-9);
  });
});

/*
 * Two beams from the entangled source: arm 1 reads the membrane (detector d1), arm 2 the
 * spin (detector d2), both on the phase quadrature, outputs combined optimally. With
 * n1 = a2 + g_m a1 + b_m, n2 = b2 + g_s b1 + b_s (g_j = k²χ_j, b_j the bath noises) and the
 * source's noise matrix (c = cosh 2r, s = sinh 2r; ⟨a1 b1⟩ = s, ⟨a2 b2⟩ = −s):
 *   S11 = c(1 + |g_m|²) + B_m,  S22 = c(1 + |g_s|²) + B_s,  S12 = −s + s g_m g_s*,
 *   B_j = k² γ_j (|γ_j/2 − iΩ|² + Ω_j²)/|(γ_j/2 − iΩ)² + Ω_j²|²  (zero-point bath noise in X_j),
 * and the optimal estimate 1/(h† S⁻¹ h) with h = (kχ_m/p_s, 0) gives
 *   S_F = p_s² (S11 − |S12|²/S22)/(k²|χ_m|²).
 * For the matched negative-mass spin (g_s = −g_m, L = 1 + |g_m|², c² − s² = 1) this is
 *   S_F = p_s²/(k²|χ_m|²) · [B_m + B_s + (L² − B_s²)/(cL + B_s)],
 * which is the lone probe (imprecision + back-action + membrane bath) at r = 0 and falls
 * toward the two baths alone, B_m + B_s, as (imprecision + back-action)/cosh 2r: both the
 * imprecision and the back-action are removed (the EPR correlation conditions a2 on b2 and
 * the negative-mass spin turns b1 into a copy of the membrane's back-action). That limit is
 * the single-beam matched case minus its imprecision term, not the single-beam value itself.
 */
describe("two beams from the entangled source: membrane on arm 1, spin on arm 2", () => {
  function twoBeams(r: number, orientation: SpinOptions["orientation"]): SetupDescription {
    return setup(
      [
        { name: "epr", type: "entangled-source", params: { r, wavelength1: "1064 nm", wavelength2: "852 nm" } },
        membrane(),
        { name: "probe", type: "position-probe", params: { measurementRate: "1 kHz" } },
        spin({ orientation }),
        { name: "d1", type: "homodyne", params: { angle: "90 deg" } },
        { name: "d2", type: "homodyne", params: { angle: "90 deg" } },
      ],
      [
        ["epr.out1", "probe.in"],
        ["probe.out", "d1.in"],
        ["epr.out2", "spin.in"],
        ["spin.out", "d2.in"],
        ["probe.mechanics", "membrane.body"],
      ],
      { readout: ["d1", "d2"], signal: { kind: "force", on: "membrane", referTo: "force" } },
    );
  }

  function bath(omegaJ: number, gammaJ: number, omega: number): number {
    const dr = gammaJ / 2;
    const di = -omega;
    // (γ/2 − iΩ)² + Ω_j²
    const qr = dr * dr - di * di + omegaJ * omegaJ;
    const qi = 2 * dr * di;
    return (K2 * gammaJ * (dr * dr + di * di + omegaJ * omegaJ)) / (qr * qr + qi * qi);
  }

  function closedForm(r: number, sign: number, f: number): number {
    const w = 2 * Math.PI * f;
    const c = Math.cosh(2 * r);
    const s = Math.sinh(2 * r);
    const cm = chi(1, OMEGA_M, GAMMA_M, w);
    const cs = chi(sign, OMEGA_M, GAMMA_M, w);
    const gm: [number, number] = [K2 * cm[0], K2 * cm[1]];
    const gs: [number, number] = [K2 * cs[0], K2 * cs[1]];
    const bm = bath(OMEGA_M, GAMMA_M, w);
    const bs = bath(OMEGA_M, GAMMA_M, w);
    const s11 = c * (1 + abs2(gm)) + bm;
    const s22 = c * (1 + abs2(gs)) + bs;
    // S12 = −s + s g_m conj(g_s)
    const s12r = -s + s * (gm[0] * gs[0] + gm[1] * gs[1]);
    const s12i = s * (gm[1] * gs[0] - gm[0] * gs[1]);
    return (PS2 * (s11 - (s12r * s12r + s12i * s12i) / s22)) / (K2 * abs2(cm));
  }

  /** The matched case in its compact form, free of the cancellation in S11 − |S12|²/S22 at large r. */
  function compactMatched(r: number, f: number): number {
    const w = 2 * Math.PI * f;
    const cm = chi(1, OMEGA_M, GAMMA_M, w);
    const L = 1 + K2 * K2 * abs2(cm);
    const bm = bath(OMEGA_M, GAMMA_M, w);
    const bs = bm; // identical susceptibility forms and zero temperature
    return (PS2 / (K2 * abs2(cm))) * (bm + bs + (L * L - bs * bs) / (Math.cosh(2 * r) * L + bs));
  }

  const GRID2 = { from: 8e5, to: 1.25e6, points: 91 };
  // The optimal combination inverts the 2×2 output spectrum, whose entries grow as cosh 2r
  // while its determinant does not: its relative accuracy is about cosh²(2r)·5e-16 (1e-9 at
  // r = 4, 6e-8 at r = 5, measured against the compact closed form), so the checks stop at
  // r = 3.5 (30 dB of two-mode squeezing, beyond any source in practice). The general closed
  // form S11 − |S12|²/S22 cancels the same way, so it is used up to r = 3.
  const RS = [0, 0.5, 1, 1.5, 2, 3, 3.5];
  const matched = RS.map((r) => evaluate(twoBeams(r, "negative-mass"), GRID2).budget);

  it("matches the general closed form of the optimal combination (r ≤ 3, both orientations)", () => {
    RS.forEach((r, j) => {
      if (r > 3) return;
      expectAllClose(
        matched[j].total,
        Array.from(matched[j].frequencies, (f) => closedForm(r, -1, f)),
        1e-9,
        `negative-mass, r = ${r}`,
      );
    });
    for (const r of [0.5, 2]) {
      const b = evaluate(twoBeams(r, "positive-mass"), GRID2).budget;
      expectAllClose(
        b.total,
        Array.from(b.frequencies, (f) => closedForm(r, 1, f)),
        1e-9,
        `positive-mass, r = ${r}`,
      );
    }
  });

  it("matches the compact matched closed form for every r, with the entangled light as one budget term", () => {
    RS.forEach((r, j) => {
      expectAllClose(
        matched[j].total,
        Array.from(matched[j].frequencies, (f) => compactMatched(r, f)),
        1e-9,
        `r = ${r}`,
      );
    });
    expect(matched[3].terms.filter((t) => t.label.startsWith("epr")).map((t) => t.label)).toEqual(["epr: entangled light"]);
  });

  it("improves monotonically with r at every frequency", () => {
    for (let j = 1; j < RS.length; j++) {
      for (let i = 0; i < GRID2.points; i++) {
        expect(matched[j].total[i], `r = ${RS[j]} at ${matched[j].frequencies[i]} Hz`).toBeLessThan(matched[j - 1].total[i]);
      }
    }
  });

  it("needs the negative mass: a positive-mass spin on arm 2 does worse at every frequency", () => {
    const r = 2;
    const pos = evaluate(twoBeams(r, "positive-mass"), GRID2).budget;
    const neg = matched[RS.indexOf(r)];
    for (let i = 0; i < GRID2.points; i++) expect(pos.total[i], `${pos.frequencies[i]} Hz`).toBeGreaterThan(neg.total[i]);
  });

  it("at r = 0 it is the lone probe; as r grows it approaches the single-beam matched case minus its imprecision (the two baths)", () => {
    const lone = evaluate(singleBeam(), GRID2).budget;
    expectAllClose(matched[0].total, lone.total, 1e-9, "r = 0 vs lone probe");
    const single = evaluate(singleBeam({ orientation: "negative-mass" }), GRID2).budget;
    const imprecision = term(single, "light: phase quadrature");
    const floor = single.total.map((v, i) => v - imprecision[i]);
    const rLarge = RS[RS.length - 1];
    const large = matched[RS.length - 1];
    const c = Math.cosh(2 * rLarge);
    const outcomes = new Set<boolean>();
    for (let i = 0; i < GRID2.points; i++) {
      const at = `${large.frequencies[i]} Hz`;
      // Above the floor by at most (imprecision + back-action of the lone probe)/cosh 2r.
      expect(large.total[i], at).toBeGreaterThanOrEqual(floor[i] * (1 - 1e-9));
      expect(large.total[i] - floor[i], at).toBeLessThanOrEqual(lone.total[i] / c + 1e-9 * floor[i]);
      // Below the single-beam matched case (which keeps its imprecision) exactly where the closed
      // form says: (L² − B_s²)/(cL + B_s) < 1, i.e. where cosh 2r exceeds about (imprecision +
      // back-action)/imprecision. Near resonance, where back-action dominates, not yet at r = 3.5.
      const w = 2 * Math.PI * large.frequencies[i];
      const L = 1 + K2 * K2 * abs2(chi(1, OMEGA_M, GAMMA_M, w));
      const bs = bath(OMEGA_M, GAMMA_M, w);
      const beats = (L * L - bs * bs) / (c * L + bs) < 1;
      expect(large.total[i] < single.total[i], at).toBe(beats);
      outcomes.add(beats);
    }
    expect([...outcomes].sort()).toEqual([false, true]); // the grid sees both regimes
  });
});

describe("examples/hybrid-spin-reference.json (invented tabletop scenario)", () => {
  const file = join(__dirname, "..", "..", "examples", "hybrid-spin-reference.json");
  const cli = (args: string[]) => {
    let out = "";
    let err = "";
    const code = runCli(args, { out: (s) => (out += s), err: (s) => (err += s) });
    return { code, out, err };
  };

  it("passes `check` and `summary`", () => {
    const check = cli(["check", file]);
    expect(check.code, check.err).toBe(0);
    expect(check.out).toContain("stable");
    const summary = cli(["summary", file]);
    expect(summary.code, summary.err).toBe(0);
    expect(summary.out).toContain("below the SQL");
  });

  it("its negative-mass cell lowers the noise in the wings against the same set-up without the cell (common practice, no source: a sanity check)", () => {
    const doc = JSON.parse(readFileSync(file, "utf8")) as SetupDescription;
    const without: SetupDescription = {
      ...doc,
      components: doc.components.filter((c) => c.name !== "cell"),
      connections: doc.connections.filter((c) => !c.some((p) => p.startsWith("cell."))).concat([["transfer.out", "detector.in"]]),
    };
    const grid = { from: 1.05e6, to: 1.07e6, points: 21 };
    const withCell = evaluateSetup(loadSetup(doc), grid).budget.total;
    const withoutCell = evaluateSetup(loadSetup(without), grid).budget.total;
    for (let i = 0; i < grid.points; i++) expect(withCell[i]).toBeLessThan(withoutCell[i]);
  });
});
