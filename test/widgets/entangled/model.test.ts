import { describe, expect, it } from "vitest";
import { QuietframeError } from "../../../src/errors";
import { conditionalVariance, duanBound, duanSum, eprVariances, logarithmicNegativity } from "../../../src/engine/entanglement";
import {
  computeEntangled,
  conditionalArmCovariance,
  createEntangledState,
  ELLIPSE_SERIES,
  entangledStateText,
  loadEntangledState,
  sliderPosition,
  sliderValue,
  SPECTRUM_SERIES,
} from "../../../widgets/entangled/model";
import { entangledPanel } from "../../../widgets/entangled/notebook";

/**
 * The entangled-light panel against closed forms. Lossy two-mode squeezed vacuum keeps the
 * standard form V = [[α I, γ Z], [γ Z, β I]] (Z = diag(1, −1), vacuum ½) with c = cosh 2r,
 * s = sinh 2r and
 *   α = (η1(c − 1) + 1)/2,  β = (η2(c − 1) + 1)/2,  γ = √(η1η2) s/2
 * (each arm mixed with vacuum at a beam splitter of transmission η_j). Lossless values:
 * EPR variances e^{−2r} and a Duan sum 2e^{−2r} below the separability bound 2 (Duan, Giedke,
 * Cirac & Zoller, PRL 84, 2722 (2000)); log-negativity 2r/ln 2 ebits (Adesso & Illuminati,
 * J. Phys. A 40, 7821 (2007)); conditional variance Var(X1 | X2) = α − γ²/β = (1/2)/cosh 2r.
 */
function closedForm(r: number, eta1: number, eta2: number): Float64Array {
  const c = Math.cosh(2 * r);
  const s = Math.sinh(2 * r);
  const a = (eta1 * (c - 1) + 1) / 2;
  const b = (eta2 * (c - 1) + 1) / 2;
  const g = (Math.sqrt(eta1 * eta2) * s) / 2;
  return Float64Array.of(a, 0, g, 0, 0, a, 0, -g, g, 0, b, 0, 0, -g, 0, b);
}

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1e-300);

describe("panel numbers", () => {
  it.each([
    [0.3, 1, 1],
    [1.15, 0.9, 0.8],
    [2, 0.5, 0.95],
    [0.7, 0.2, 1],
  ])("r = %f, η1 = %f, η2 = %f: equal entanglement.ts applied to the closed-form covariance", (r, eta1, eta2) => {
    const c = computeEntangled(createEntangledState({ r, efficiency1: eta1, efficiency2: eta2 }));
    const v = closedForm(r, eta1, eta2);
    for (let i = 0; i < 16; i++) expect(Math.abs(c.covariance[i] - v[i]), `V[${i}]`).toBeLessThan(1e-12 * Math.cosh(2 * r));
    const e = eprVariances(v);
    expect(rel(c.eprX, e.x)).toBeLessThan(1e-10);
    expect(rel(c.eprP, e.p)).toBeLessThan(1e-10);
    expect(rel(c.duanSum, duanSum(v))).toBeLessThan(1e-10);
    expect(rel(c.logNegativity, logarithmicNegativity(v))).toBeLessThan(1e-10);
    expect(rel(c.conditionalVariance, conditionalVariance(v, 0, [2]))).toBeLessThan(1e-10);
    // Closed form of the standard form: Var(X1 − X2) = α + β − 2γ, Var(X1 | X2) = α − γ²/β.
    const [a, b, g] = [v[0], v[10], v[2]];
    expect(rel(c.eprX, a + b - 2 * g)).toBeLessThan(1e-10);
    expect(rel(c.conditionalVariance, a - (g * g) / b)).toBeLessThan(1e-10);
    expect(c.duanBound).toBe(duanBound());
    expect(c.duanBound).toBe(2);
  });

  it.each([0.2, 0.5, 1, 1.5])("lossless r = %f: EPR e^{−2r} (Duan et al. 2000), (1/2)/cosh 2r, E_N = 2r/ln 2 (Adesso & Illuminati 2007)", (r) => {
    const c = computeEntangled(createEntangledState({ r }));
    expect(rel(c.eprX, Math.exp(-2 * r))).toBeLessThan(1e-12);
    expect(rel(c.eprP, Math.exp(-2 * r))).toBeLessThan(1e-12);
    expect(rel(c.duanSum, 2 * Math.exp(-2 * r))).toBeLessThan(1e-12);
    expect(c.duanSum).toBeLessThan(2);
    expect(rel(c.conditionalVariance, 0.5 / Math.cosh(2 * r))).toBeLessThan(1e-12);
    expect(rel(c.logNegativity, (2 * r) / Math.LN2)).toBeLessThan(1e-11);
  });

  it("−10 dB means r = ln 10 / 2, so lossless EPR variances of exactly one tenth of vacuum", () => {
    const c = computeEntangled(createEntangledState({ squeezingDb: -10 }));
    expect(rel(c.r, Math.LN10 / 2)).toBeLessThan(1e-15);
    expect(rel(c.eprX, 0.1)).toBeLessThan(1e-12);
  });

  it("one arm fully lost (η2 = 0) leaves a separable state: Duan sum ≥ 2, E_N = 0, no conditional squeezing", () => {
    const c = computeEntangled(createEntangledState({ r: 1, efficiency2: 0 }));
    expect(c.duanSum).toBeGreaterThanOrEqual(2);
    expect(c.logNegativity).toBe(0);
    expect(c.conditionalVariance).toBe(c.covariance[0]);
  });
});

describe("spectrum", () => {
  it("white source: flat, at the zero-frequency values in dB", () => {
    const c = computeEntangled(createEntangledState({ r: 1, efficiency1: 0.9, efficiency2: 0.9 }));
    const cond = c.spectrum.filter((row) => row.series === SPECTRUM_SERIES.conditional);
    const epr = c.spectrum.filter((row) => row.series === SPECTRUM_SERIES.epr);
    expect(cond.length).toBeGreaterThan(50);
    for (const row of cond) expect(Math.abs(row.db - 10 * Math.log10(c.conditionalVariance / 0.5))).toBeLessThan(1e-9);
    for (const row of epr) expect(Math.abs(row.db - 10 * Math.log10(c.eprX))).toBeLessThan(1e-9);
  });

  it("with a bandwidth: squeezed at low frequency, back to vacuum (0 dB) far above the linewidth", () => {
    const c = computeEntangled(createEntangledState({ r: 1, bandwidth: 1e6 }));
    const epr = c.spectrum.filter((row) => row.series === SPECTRUM_SERIES.epr);
    // Lossless at Ω → 0 the squeezing is e^{−2r} by construction of the pump (ε = (κ/2) tanh(r/2)).
    expect(Math.abs(epr[0].db - 10 * Math.log10(Math.exp(-2)))).toBeLessThan(0.01);
    expect(Math.abs(epr[epr.length - 1].db)).toBeLessThan(0.05);
    for (let i = 1; i < epr.length; i++) expect(epr[i].db).toBeGreaterThanOrEqual(epr[i - 1].db - 1e-12);
  });
});

describe("noise ellipses", () => {
  it.each([
    [1, 1, 1],
    [0.8, 0.6, 0.9],
  ])("r = %f, η1 = %f, η2 = %f: every point satisfies xᵀ V⁻¹ x = 1 for its covariance", (r, eta1, eta2) => {
    const c = computeEntangled(createEntangledState({ r, efficiency1: eta1, efficiency2: eta2 }));
    const v = closedForm(r, eta1, eta2);
    const cx = v[2];
    // Arm 1 given X2: A − (V_{·X2} V_{X2·})/V_{X2X2}; only X1 is correlated with X2.
    const covs: Record<string, [number, number, number]> = {
      [ELLIPSE_SERIES.vacuum]: [0.5, 0, 0.5],
      [ELLIPSE_SERIES.arm1]: [v[0], 0, v[5]],
      [ELLIPSE_SERIES.arm2]: [v[10], 0, v[15]],
      [ELLIPSE_SERIES.conditional]: [v[0] - (cx * cx) / v[10], 0, v[5]],
    };
    for (const [series, [a, b, d]] of Object.entries(covs)) {
      const points = c.ellipses.filter((p) => p.series === series);
      expect(points.length, series).toBeGreaterThan(40);
      const det = a * d - b * b;
      for (const p of points) {
        const q = (d * p.x * p.x - 2 * b * p.x * p.y + a * p.y * p.y) / det;
        expect(Math.abs(q - 1), `${series} point ${p.i}`).toBeLessThan(1e-12);
      }
    }
    // The conditional ellipse is squeezed along X: its X variance is Var(X1 | X2).
    const [ca] = conditionalArmCovariance(c.covariance);
    expect(rel(ca, conditionalVariance(c.covariance, 0, [2]))).toBeLessThan(1e-12);
    expect(ca).toBeLessThan(0.5);
    expect(c.ellipseExtent).toBeGreaterThan(Math.sqrt(Math.max(v[0], v[10])));
  });
});

describe("state", () => {
  it("round-trips through its JSON text and reproduces the numbers exactly", () => {
    const state = createEntangledState({ squeezingDb: -7.5, efficiency1: 0.93, efficiency2: 0.71, bandwidth: 2e6, title: "pair" });
    const again = loadEntangledState(entangledStateText(state));
    expect(again).toEqual(state);
    expect(computeEntangled(again).duanSum).toBe(computeEntangled(state).duanSum);
    const p = entangledPanel(entangledStateText(state));
    expect(p.figures.duanSum).toBe(computeEntangled(state).duanSum);
    expect(entangledPanel(p.state).stateText()).toBe(p.stateText());
  });

  it.each<[string, (s: Record<string, unknown>) => void, string]>([
    ["format", (s) => (s.format = "quietframe.explorer"), "state.format"],
    ["version", (s) => (s.version = 9), "state.version"],
    ["efficiency", (s) => (s.efficiency1 = 1.5), "state.efficiency1"],
    ["efficiency type", (s) => (s.efficiency2 = "90 %"), "state.efficiency2"],
    ["squeeze unit", (s) => (s.squeeze = { unit: "neper", value: 1 }), "state.squeeze.unit"],
    ["squeeze value", (s) => (s.squeeze = { unit: "dB", value: 3 }), "state.squeeze.value"],
    ["bandwidth", (s) => (s.bandwidth = -1), "state.bandwidth"],
    ["unknown field", (s) => (s.extra = 1), "state.extra"],
  ])("refuses a bad %s with a QuietframeError naming the field", (_, spoil, path) => {
    const s = JSON.parse(entangledStateText(createEntangledState({ r: 1 }))) as Record<string, unknown>;
    spoil(s);
    let caught: unknown;
    try {
      loadEntangledState(s);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(QuietframeError);
    expect((caught as QuietframeError).path).toBe(path);
  });

  it("refuses text that is not JSON, and options that mix dB and r", () => {
    expect(() => loadEntangledState("{nope")).toThrow(QuietframeError);
    expect(() => createEntangledState({ r: 1, squeezingDb: -3 })).toThrow(/both squeezingDb and r/);
    expect(() => entangledPanel({ squeeze: 3 } as never)).toThrow(/options\.squeeze/);
  });

  it("slider positions map to values and back", () => {
    expect(sliderValue("dB", 100)).toBe(-10);
    expect(sliderPosition("dB", -10)).toBe(100);
    expect(sliderValue("efficiency", 37)).toBe(0.37);
    expect(sliderPosition("efficiency", 0.37)).toBe(37);
    expect(sliderPosition("r", 9)).toBe(460);
  });

  it("set() recomputes and keeps the squeeze unit", () => {
    const p = entangledPanel({ squeezingDb: -6 });
    const before = p.figures.duanSum;
    p.set({ efficiency1: 0.5 });
    expect(p.state.squeeze).toEqual({ unit: "dB", value: -6 });
    expect(p.figures.duanSum).toBeGreaterThan(before);
  });
});
