import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { QuietframeError, QuietframeErrors } from "../../src/errors";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { designFilterCavities, type FilterCavityDesign, type FilterDesign, filterShortfall } from "../../src/physics/filter-design";
import type { ComponentDescription, SetupDescription } from "../../src/setup/format";
import { expectAllClose } from "../helpers/close";
import { setup } from "../helpers/setups";

/**
 * Filter cavities against Kimble et al., Phys. Rev. D 65, 022002 (2001), Sec. V ("KLMTV"): with
 * ideal lossless filters a tuned interferometer reaches
 *   input filtering (frequency-dependent squeezing):  S_h = e^{−2r} (h_SQL²/2)(K + 1/K),
 *   output filtering (variational readout):           S_h = h_SQL²/(2K),
 * with K = (I0/I_SQL)·2γ⁴/(Ω²(γ² + Ω²)), I_SQL = mL²γ⁴/(4ω0), h_SQL² = 8ħ/(mΩ²L²).
 * Lossy filters against the sideband picture of a lossy detuned cavity (Khalili, Phys. Rev. D
 * 81, 122002 (2010), Sec. II; Evans et al., Phys. Rev. D 88, 022002 (2013), Sec. II; written from
 * memory): each sideband ω from the carrier is reflected by r(ω) = (γ_0 − γ_in − i(ω + Δ))/(γ − i(ω + Δ))
 * and picks up loss vacuum through 2√(γ_in γ_0)/(γ − i(ω + Δ)); the two-photon matrices follow
 * from the sideband amplitudes (Corbitt, Chen & Mavalvala, Phys. Rev. A 72, 013818 (2005),
 * eq. (6)-type relation, from memory), computed here in the sideband basis itself.
 */

const IFO = { mass: 40, armLength: 4000, armBandwidth: 100, power: 8e5, wavelength: 1064e-9 };
const GAMMA = 2 * Math.PI * IFO.armBandwidth;
const OMEGA0 = (2 * Math.PI * SPEED_OF_LIGHT) / IFO.wavelength;
const I0 = (2 * IFO.armLength * GAMMA * IFO.power) / SPEED_OF_LIGHT;
const I_SQL = (IFO.mass * IFO.armLength ** 2 * GAMMA ** 4) / (4 * OMEGA0);
const GRID = { from: 3, to: 3000, points: 67 };

function kimbleK(f: number): number {
  const w = 2 * Math.PI * f;
  return (I0 / I_SQL) * ((2 * GAMMA ** 4) / (w ** 2 * (GAMMA ** 2 + w ** 2)));
}
function hSql2(f: number): number {
  return (8 * HBAR) / (IFO.mass * (2 * Math.PI * f) ** 2 * IFO.armLength ** 2);
}

function filterComponent(name: string, d: FilterCavityDesign): ComponentDescription {
  return { name, type: "filter-cavity", params: { length: `${d.length} m`, detuning: `${d.detuning} Hz`, inputTransmission: d.inputTransmission, roundTripLoss: d.roundTripLoss } };
}

function ifoComponent(): ComponentDescription {
  return { name: "ifo", type: "interferometer", params: { mass: `${IFO.mass} kg`, armLength: `${IFO.armLength} m`, armBandwidth: `${IFO.armBandwidth} Hz`, power: `${IFO.power} W` } };
}

/** squeezer → fc1 → fc2 → interferometer → phase homodyne. */
function inputFiltered(design: FilterDesign, r: number): SetupDescription {
  return setup(
    [
      { name: "light", type: "squeezed", params: { r, angle: `${design.squeezeAngle} rad` } },
      filterComponent("fc1", design.filters[0]),
      filterComponent("fc2", design.filters[1]),
      ifoComponent(),
      { name: "detector", type: "homodyne", params: { angle: "90 deg" } },
    ],
    [
      ["light.out", "fc1.in"],
      ["fc1.out", "fc2.in"],
      ["fc2.out", "ifo.in"],
      ["ifo.out", "detector.in"],
    ],
    { signal: { kind: "strain", on: "ifo" } },
  );
}

/** vacuum → interferometer → fc1 → fc2 → homodyne at the design's readout angle. */
function outputFiltered(design: FilterDesign): SetupDescription {
  return setup(
    [
      { name: "light", type: "vacuum" },
      ifoComponent(),
      filterComponent("fc1", design.filters[0]),
      filterComponent("fc2", design.filters[1]),
      { name: "detector", type: "homodyne", params: { angle: `${design.readoutAngle} rad` } },
    ],
    [
      ["light.out", "ifo.in"],
      ["ifo.out", "fc1.in"],
      ["fc1.out", "fc2.in"],
      ["fc2.out", "detector.in"],
    ],
    { signal: { kind: "strain", on: "ifo" } },
  );
}

describe("ideal filter cavities (KLMTV Sec. V, lossless)", () => {
  const design = designFilterCavities(IFO, { length: 4000 });

  it("the design's SQL frequency is where K = 1", () => {
    expect(Math.abs(kimbleK(design.sqlFrequency) - 1)).toBeLessThan(1e-12);
  });

  it.each([0.5, 1.15, 1.7])("input filtering with r = %f: S_h = e^{−2r}(h_SQL²/2)(K + 1/K) at every frequency", (r) => {
    const b = evaluateSetup(loadSetup(inputFiltered(design, r)), GRID).budget;
    const expected = Array.from(b.frequencies, (f) => Math.exp(-2 * r) * (hSql2(f) / 2) * (kimbleK(f) + 1 / kimbleK(f)));
    expectAllClose(b.total, expected, 1e-9, "S_h");
  });

  it("output filtering (variational readout): S_h = h_SQL²/(2K), below the SQL at every frequency", () => {
    const b = evaluateSetup(loadSetup(outputFiltered(design)), GRID).budget;
    const expected = Array.from(b.frequencies, (f) => hSql2(f) / (2 * kimbleK(f)));
    expectAllClose(b.total, expected, 1e-9, "S_h");
  });

  it("at other interferometer parameters (m = 10 kg, P = 2e5 W, γ/2π = 40 Hz) and a 300 m filter", () => {
    const ifo = { mass: 10, armLength: 4000, armBandwidth: 40, power: 2e5 };
    const d = designFilterCavities(ifo, { length: 300 });
    const g = 2 * Math.PI * 40;
    const iSql = (10 * 4000 ** 2 * g ** 4) / (4 * OMEGA0);
    const i0 = (2 * 4000 * g * 2e5) / SPEED_OF_LIGHT;
    const K = (f: number) => (i0 / iSql) * ((2 * g ** 4) / ((2 * Math.PI * f) ** 2 * (g ** 2 + (2 * Math.PI * f) ** 2)));
    const h2 = (f: number) => (8 * HBAR) / (10 * (2 * Math.PI * f) ** 2 * 4000 ** 2);
    const description = outputFiltered(d);
    description.components[1] = { name: "ifo", type: "interferometer", params: { mass: "10 kg", armLength: "4000 m", armBandwidth: "40 Hz", power: "2e5 W" } };
    const b = evaluateSetup(loadSetup(description), GRID).budget;
    expectAllClose(
      b.total,
      Array.from(b.frequencies, (f) => h2(f) / (2 * K(f))),
      1e-9,
      "S_h",
    );
  });

  it("the lossless shortfall report is 0 dB and its closed form matches the engine", () => {
    const freqs = Float64Array.of(5, 30, 100, 700);
    const input = filterShortfall(IFO, design, freqs, { use: "input", r: 1 });
    const output = filterShortfall(IFO, design, freqs, { use: "output" });
    for (const report of [input, output]) for (const db of report.shortfallDb) expect(Math.abs(db)).toBeLessThan(1e-9);
    expectAllClose(input.actual, evaluateSetup(loadSetup(inputFiltered(design, 1)), freqs as unknown as typeof GRID).budget.total, 1e-9, "input");
  });
});

describe("lossy filter cavities (Khalili 2010; Evans et al. 2013)", () => {
  const LOSS = 60e-6;
  const design = designFilterCavities(IFO, { length: 300, roundTripLoss: LOSS });

  /**
   * Independent sideband-picture calculation: for the sideband pair ±Ω the fields a(±Ω) (with
   * a1 = (a₊ + a₋†)/√2, a2 = (a₊ − a₋†)/(√2 i)) are reflected by r(±Ω) and pick up loss vacuum,
   * so in the basis u = a1 + i a2, w = a1 − i a2 the transfer is diagonal with r(Ω + Δ) on u and
   * r(Ω − Δ) on w (in the engine's Δ convention). The noise of a quadrature vector v is
   * |v·T x|² summed over independent inputs x.
   */
  function sidebandNoise(d: FilterDesign, f: number, r: number): number {
    const w = 2 * Math.PI * f;
    type C = [number, number];
    const div = (a: C, b: C): C => {
      const q = b[0] ** 2 + b[1] ** 2;
      return [(a[0] * b[0] + a[1] * b[1]) / q, (a[1] * b[0] - a[0] * b[1]) / q];
    };
    const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
    // Each stage as (u-factor, w-factor); a quadrature pair (q1, q2) ↦ (u, w) = (q1 + i q2, q1 − i q2).
    const stages = d.filters.map((fc) => {
      const gIn = (SPEED_OF_LIGHT * fc.inputTransmission) / (4 * fc.length);
      const g0 = (SPEED_OF_LIGHT * fc.roundTripLoss) / (4 * fc.length);
      const g = gIn + g0;
      const delta = 2 * Math.PI * fc.detuning;
      const refl = (x: number): C => div([g0 - gIn, -x], [g, -x]);
      const leak = (x: number): C => div([-2 * Math.sqrt(gIn * g0), 0], [g, -x]);
      return { ru: refl(w + delta), rw: refl(w - delta), lu: leak(w + delta), lw: leak(w - delta) };
    });
    // Readout row after the interferometer in (q1, q2): b2 − 0·b1 with b2 = a2 − K a1 → v = (−K, 1)
    // on the filtered input; in the (u, w) basis q1 = (u + w)/2, q2 = (u − w)/(2i).
    const K = kimbleK(f);
    const vu: C = [-K / 2, -1 / 2]; // −K/2 + 1/(2i)
    const vw: C = [-K / 2, 1 / 2]; // −K/2 − 1/(2i)
    // Source noise: phase-squeezed (e^{2r} on q1, e^{−2r} on q2), as independent real inputs x1, x2.
    const sources: { u: C; w: C }[] = [
      { u: [Math.exp(r), 0], w: [Math.exp(r), 0] }, // √(e^{2r}) x1 on q1 → u = w
      { u: [0, Math.exp(-r)], w: [0, -Math.exp(-r)] }, // √(e^{−2r}) x2 on q2 → u = i·, w = −i·
    ];
    // Loss vacua of each filter enter as two independent real quadratures each.
    let total = 0;
    const throughStages = (start: number, x: { u: C; w: C }): { u: C; w: C } => stages.slice(start).reduce((acc, s) => ({ u: mul(s.ru, acc.u), w: mul(s.rw, acc.w) }), x);
    const noiseOf = (x: { u: C; w: C }) => {
      const y = mul(vu, x.u);
      const z = mul(vw, x.w);
      return (y[0] + z[0]) ** 2 + (y[1] + z[1]) ** 2;
    };
    for (const s of sources) total += noiseOf(throughStages(0, s));
    stages.forEach((s, j) => {
      for (const unit of [
        { u: [1, 0] as C, w: [1, 0] as C },
        { u: [0, 1] as C, w: [0, -1] as C },
      ]) {
        total += noiseOf(throughStages(j + 1, { u: mul(s.lu, unit.u), w: mul(s.lw, unit.w) }));
      }
    });
    return (hSql2(f) / (2 * K)) * total;
  }

  it("input filtering with 60 ppm round-trip loss: the engine equals the sideband-picture noise", () => {
    const r = 1.15;
    const b = evaluateSetup(loadSetup(inputFiltered(design, r)), GRID).budget;
    expectAllClose(
      b.total,
      Array.from(b.frequencies, (f) => sidebandNoise(design, f, r)),
      1e-9,
      "S_h",
    );
  });

  it("the shortfall report equals the engine, is positive where the filters act and fades far above them", () => {
    const r = 1.15;
    const freqs = Float64Array.of(5, 20, 60, 200, 2000);
    const report = filterShortfall(IFO, design, freqs, { use: "input", r });
    expectAllClose(report.actual, evaluateSetup(loadSetup(inputFiltered(design, r)), freqs as unknown as typeof GRID).budget.total, 1e-9, "input shortfall vs engine");
    expect(report.shortfallDb.every((db) => db > 0)).toBe(true);
    expect(report.shortfallDb[1]).toBeGreaterThan(report.shortfallDb[4]);
    const output = filterShortfall(IFO, design, freqs, { use: "output" });
    expectAllClose(output.actual, evaluateSetup(loadSetup(outputFiltered(design)), freqs as unknown as typeof GRID).budget.total, 1e-9, "output shortfall vs engine");
  });

  it("keeps the ideal half-widths: T = 4Lγ/c − ε for each filter", () => {
    const ideal = designFilterCavities(IFO, { length: 300 });
    design.filters.forEach((fc, j) => {
      expect(fc.halfWidth).toBe(ideal.filters[j].halfWidth);
      expect(Math.abs(fc.inputTransmission + LOSS - ideal.filters[j].inputTransmission) / ideal.filters[j].inputTransmission).toBeLessThan(1e-12);
    });
  });
});

describe("plain cavity as a filter, and bad input", () => {
  it("a `cavity` with nothing linked is the same filter: κ = 2γ, κ_in/κ = T/(T + ε)", () => {
    const design = designFilterCavities(IFO, { length: 300, roundTripLoss: 20e-6 });
    const asCavity = (name: string, d: FilterCavityDesign): ComponentDescription => ({
      name,
      type: "cavity",
      params: { linewidth: `${2 * d.halfWidth} Hz`, detuning: `${d.detuning} Hz`, inputCoupling: d.inputTransmission / (d.inputTransmission + d.roundTripLoss) },
    });
    const plain = inputFiltered(design, 1);
    plain.components[1] = asCavity("fc1", design.filters[0]);
    plain.components[2] = asCavity("fc2", design.filters[1]);
    const a = evaluateSetup(loadSetup(plain), GRID).budget.total;
    const b = evaluateSetup(loadSetup(inputFiltered(design, 1)), GRID).budget.total;
    expectAllClose(a, b, 1e-9, "cavity vs filter-cavity");
  });

  function problem(params: Record<string, string | number>): QuietframeError {
    const d = setup(
      [{ name: "light", type: "squeezed", params: { r: 1 } }, { name: "fc", type: "filter-cavity", params }, ifoComponent(), { name: "detector", type: "homodyne" }],
      [
        ["light.out", "fc.in"],
        ["fc.out", "ifo.in"],
        ["ifo.out", "detector.in"],
      ],
      { signal: { kind: "strain", on: "ifo" } },
    );
    try {
      loadSetup(d);
    } catch (e) {
      if (e instanceof QuietframeError) return e;
      if (e instanceof QuietframeErrors && e.problems.length === 1) return e.problems[0];
      throw e;
    }
    throw new Error("expected a QuietframeError");
  }

  it("a transmission plus loss of 1 or more is refused", () => {
    const e = problem({ length: "300 m", inputTransmission: 0.7, roundTripLoss: 0.4 });
    expect(e.path).toBe("components.fc.inputTransmission");
    expect(e.message).toContain("inputTransmission + roundTripLoss < 1");
  });

  it("a detuning beyond half the free spectral range is refused with the limit in Hz", () => {
    const e = problem({ length: "300 m", inputTransmission: 1e-4, detuning: "300 kHz" });
    expect(e.path).toBe("components.fc.detuning");
    expect(e.message).toContain("free spectral range");
  });

  it("the design refuses a loss that alone is wider than the filter, naming the field", () => {
    expect(() => designFilterCavities(IFO, { length: 4000, roundTripLoss: 0.1 })).toThrow(/options\.roundTripLoss/);
    expect(() => designFilterCavities({ ...IFO, mass: -1 }, { length: 300 })).toThrow(/interferometer\.mass.*kg/);
    expect(() => designFilterCavities(IFO, { length: Number.NaN })).toThrow(/options\.length/);
  });
});
