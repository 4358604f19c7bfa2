import { beforeAll, describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { quantileSorted, spreadAnalysis } from "../../src/design";
import { evaluateSamples, planSpread } from "../../src/design/spread";
import { GaussianSource } from "../../src/timedomain/random";
import { loadMathjs, type MathJs } from "../helpers/mathjs";
import { probedBody, setup } from "../helpers/setups";

let math: MathJs;
beforeAll(async () => {
  math = await loadMathjs();
});

const OMEGA_LASER = (2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9;
const forcePsd = (power: number) => (8 * HBAR * OMEGA_LASER * power) / SPEED_OF_LIGHT ** 2;

/**
 * A case linear in the uncertain parameter: squeezed light (r = 1, phase squeezed) through a loss
 * of transmission η before a free-mass probe. The displacement noise at Ω is exactly
 *   N(η) = a·(η e^(−2r) + 1 − η) + b·(η e^(2r) + 1 − η),  a = ħ²/S_F, b = S_F/(m²Ω⁴)
 * (loss mixes in vacuum; shot noise and back-action of a QND probe, Braginsky & Khalili 1992),
 * so a normal η gives a normal N with mean N(μ) and deviation |dN/dη|σ.
 */
const R = 1;
const F = 300;
const lossy = setup(
  [
    { name: "light", type: "squeezed", params: { r: R, angle: "90 deg" } },
    { name: "path", type: "loss", params: { transmission: 0.5 } },
    { name: "body", type: "free-mass", params: { mass: "1 g" } },
    { name: "probe", type: "position-probe", params: { power: "1 W", wavelength: "1064 nm" } },
    { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: 1 } },
  ],
  [
    ["light.out", "path.in"],
    ["path.out", "probe.in"],
    ["probe.out", "detector.in"],
    ["probe.mechanics", "body.body"],
  ],
  { grid: { from: "10 Hz", to: "1 kHz", points: 21 } },
);
const noiseAt = (eta: number, f: number) => {
  const a = HBAR ** 2 / forcePsd(1);
  const b = forcePsd(1) / (1e-3 ** 2 * (2 * Math.PI * f) ** 4);
  return a * (eta * Math.exp(-2 * R) + 1 - eta) + b * (eta * Math.exp(2 * R) + 1 - eta);
};
const slope = (f: number) => noiseAt(1, f) - noiseAt(0, f);

describe("Monte Carlo spread against an exact distribution (a figure linear in the parameter)", () => {
  const samples = 2000;
  const seed = 17;
  const run = () => spreadAnalysis(lossy, { kind: "noise-at", frequency: `${F} Hz` }, [{ target: "path.transmission", value: "50 % ± 5 %" }], { samples, seed, target: noiseAt(0.55, F) });

  it("draws are centre + spread·z with the seeded normal deviates of src/timedomain/random.ts, none redrawn (ten deviations from either bound)", () => {
    const r = run();
    const z = new GaussianSource(seed);
    const draws = r.draws["path.transmission"];
    for (let i = 0; i < samples; i++) expect(draws[i]).toBe(0.5 + 0.05 * z.normal());
    expect(r.uncertain[0]).toMatchObject({ truncated: false, redrawn: 0, distribution: "normal" });
  });

  it("each sample's figure is N(η) of the closed form, and the percentiles are N of the draws' percentiles (a decreasing map swaps 5 % and 95 %)", () => {
    const r = run();
    const draws = r.draws["path.transmission"];
    for (let i = 0; i < samples; i++) expect(Math.abs(r.values[i] / noiseAt(draws[i], F) - 1)).toBeLessThan(1e-12);
    const sorted = Float64Array.from(draws).sort();
    const decreasing = slope(F) < 0;
    expect(Math.abs(r.distribution.median / noiseAt(quantileSorted(sorted, 0.5), F) - 1)).toBeLessThan(1e-12);
    expect(Math.abs(r.distribution.p5 / noiseAt(quantileSorted(sorted, decreasing ? 0.95 : 0.05), F) - 1)).toBeLessThan(1e-12);
    expect(Math.abs(r.distribution.p95 / noiseAt(quantileSorted(sorted, decreasing ? 0.05 : 0.95), F) - 1)).toBeLessThan(1e-12);
  });

  it("the samples pass a Kolmogorov–Smirnov test against the exact normal N(N(μ), |N′|σ) at the 1 % level (critical value 1.63/√n; Massey, JASA 46 (1951) 68), with the normal CDF from mathjs erf", () => {
    const r = run();
    const mean = noiseAt(0.5, F);
    const sd = Math.abs(slope(F)) * 0.05;
    const x = Float64Array.from(r.values).sort();
    let d = 0;
    for (let i = 0; i < samples; i++) {
      const cdf = 0.5 * (1 + (math.erf((x[i] - mean) / (sd * Math.SQRT2)) as number));
      d = Math.max(d, Math.abs(cdf - i / samples), Math.abs(cdf - (i + 1) / samples));
    }
    expect(d).toBeLessThan(1.63 / Math.sqrt(samples));
  });

  it("first-order propagation is exact here and is judged to hold; the probability of reaching the target is Φ(±(target − mean)/σ) within four binomial standard errors", () => {
    const r = run();
    const sd = Math.abs(slope(F)) * 0.05;
    expect(Math.abs(r.linear.deviation / sd - 1)).toBeLessThan(1e-6);
    expect(r.linear.holds).toBe(true);
    expect(r.linear.terms[0].share).toBe(1);
    // Lower noise is better: the target noiseAt(0.55) is reached for η ≥ 0.55 when the noise falls with η.
    const z = (noiseAt(0.55, F) - noiseAt(0.5, F)) / sd;
    const exact = slope(F) < 0 ? 0.5 * (1 + (math.erf(z / Math.SQRT2) as number)) : 0.5 * (1 - (math.erf(z / Math.SQRT2) as number));
    const se = Math.sqrt((exact * (1 - exact)) / samples);
    expect(Math.abs(r.probability!.reached - exact)).toBeLessThan(4 * se);
  });

  it("noise bands: at every grid frequency the 5/50/95 % curves are the closed form at the draws' percentiles", () => {
    const r = run();
    const sorted = Float64Array.from(r.draws["path.transmission"]).sort();
    const bands = r.bands!;
    expect(bands.unit).toBe("m²/Hz");
    for (let i = 0; i < bands.frequencies.length; i++) {
      const f = bands.frequencies[i];
      const decreasing = slope(f) < 0;
      expect(Math.abs(bands.median[i] / noiseAt(quantileSorted(sorted, 0.5), f) - 1)).toBeLessThan(1e-12);
      expect(Math.abs(bands.p5[i] / noiseAt(quantileSorted(sorted, decreasing ? 0.95 : 0.05), f) - 1)).toBeLessThan(1e-12);
      expect(Math.abs(bands.p95[i] / noiseAt(quantileSorted(sorted, decreasing ? 0.05 : 0.95), f) - 1)).toBeLessThan(1e-12);
    }
  });

  it("noise bands are the 5/50/95 % order statistics of each frequency's column of sample curves, bit for bit, on a grid of 13 points (columns gathered 8 at a time; common practice, no source: the definition itself)", () => {
    const options = { samples: 300, seed, grid: { from: 10, to: 1e4, points: 13 } };
    const uncertain = [{ target: "path.transmission", value: "50 % ± 5 %" }];
    const figure = { kind: "noise-at", frequency: `${F} Hz` } as const;
    const r = spreadAnalysis(lossy, figure, uncertain, options);
    const plan = planSpread(lossy, figure, uncertain, options);
    const outcomes = evaluateSamples(plan, 0, plan.samples);
    const nf = 13;
    for (let i = 0; i < nf; i++) {
      const column = Float64Array.from({ length: plan.samples }, (_, s) => outcomes.curves[s * nf + i]).sort();
      expect(Object.is(r.bands!.p5[i], quantileSorted(column, 0.05)), `p5 at point ${i}`).toBe(true);
      expect(Object.is(r.bands!.median[i], quantileSorted(column, 0.5)), `median at point ${i}`).toBe(true);
      expect(Object.is(r.bands!.p95[i], quantileSorted(column, 0.95)), `p95 at point ${i}`).toBe(true);
    }
  });

  it("the same seed gives the same bits", () => {
    const a = run();
    const b = run();
    expect(Array.from(a.values)).toEqual(Array.from(b.values));
  });
});

describe("Monte Carlo against first-order propagation for small uncertainties", () => {
  it("mass and power of a free-mass probe ± 0.5 %: the mean agrees with the nominal margin within 4σ/√N, and the variance with Σ(∂F/∂p σ_p)² within the 99.9 % χ² bounds for N − 1 degrees of freedom, 1 ± 3.29·√(2/(N − 1))", () => {
    const n = 1000;
    const s = probedBody({ body: { mass: "1 g" }, probe: { power: "500 W", wavelength: "1064 nm" } });
    const r = spreadAnalysis(
      s,
      { kind: "margin-at", frequency: "100 Hz" },
      [
        { target: "body.mass", value: "± 5 mg" },
        { target: "probe.power", value: "± 2.5 W" },
      ],
      { samples: n, seed: 3, bands: false },
    );
    const ratio = (r.distribution.deviation / r.linear.deviation) ** 2;
    expect(Math.abs(ratio - 1)).toBeLessThan(3.29 * Math.sqrt(2 / (n - 1)));
    expect(Math.abs(r.distribution.mean - r.nominal)).toBeLessThan((4 * r.distribution.deviation) / Math.sqrt(n));
    expect(r.linear.holds).toBe(true);
    expect(r.bands).toBeUndefined();
  });

  it("near the SQL-touching power the margin curves over the spread: the linear estimate fails and says so", () => {
    // At P_SQL the margin has its maximum: first order gives no spread, the Monte Carlo does.
    const pSql = (HBAR * 1e-3 * (2 * Math.PI * 100) ** 2 * SPEED_OF_LIGHT ** 2) / (8 * HBAR * OMEGA_LASER);
    const s = probedBody({ body: { mass: "1 g" }, probe: { power: `${pSql} W`, wavelength: "1064 nm" } });
    const r = spreadAnalysis(s, { kind: "margin-at", frequency: "100 Hz" }, [{ target: "probe.power", value: `± ${pSql * 0.2} W` }], { samples: 400, seed: 2, bands: false });
    expect(r.linear.holds).toBe(false);
    expect(r.linear.note).toMatch(/the linear estimate fails/);
  });

  it("a distribution that reaches a bound is truncated by redrawing: every draw of '99 % ± 2 %' is at most 100 %", () => {
    const s = probedBody({ body: { mass: "1 g" }, probe: { power: "500 W" }, efficiency: 0.99 });
    const r = spreadAnalysis(s, { kind: "margin-at", frequency: "100 Hz" }, [{ target: "detector.efficiency", value: "99 % ± 2 %" }], { samples: 300, seed: 4, bands: false });
    const draws = r.draws["detector.efficiency"];
    expect(Math.max(...draws)).toBeLessThanOrEqual(1);
    expect(r.uncertain[0].truncated).toBe(true);
    expect(r.uncertain[0].redrawn).toBeGreaterThan(0);
  });
});
