import { beforeAll, describe, expect, it } from "vitest";
import { GaussianSource, ZIGGURAT_LAYERS, ZIGGURAT_R, ZIGGURAT_V, ZIGGURAT_X } from "../../src/timedomain/random";
import { loadMathjs, type MathJs } from "../helpers/mathjs";

const f = (x: number): number => Math.exp(-0.5 * x * x);

describe("seeded normal deviates (ziggurat, 128 layers)", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });
  /** Φ(x) from mathjs erf (mathjs as reference). */
  const phi = (x: number): number => 0.5 * (1 + (math.erf(x / Math.SQRT2) as number));

  it("every layer has the same area v; the bottom one is r·f(r) plus the tail ∫_r^∞ f = √(π/2) erfc(r/√2) (Marsaglia & Tsang 2000, constants for 128 layers)", () => {
    const tail = Math.sqrt(Math.PI / 2) * (1 - (math.erf(ZIGGURAT_R / Math.SQRT2) as number));
    expect(Math.abs(ZIGGURAT_R * f(ZIGGURAT_R) + tail - ZIGGURAT_V) / ZIGGURAT_V).toBeLessThan(1e-12);
    for (let i = 1; i < ZIGGURAT_LAYERS; i++) {
      const area = ZIGGURAT_X[i] * (f(ZIGGURAT_X[i + 1]) - f(ZIGGURAT_X[i]));
      // The recursion from the bottom amplifies the rounding of r and v to ~1e-9 at the top.
      expect(Math.abs(area - ZIGGURAT_V) / ZIGGURAT_V, `layer ${i}`).toBeLessThan(1e-8);
    }
  });

  it("Kolmogorov–Smirnov against Φ: √N·D below 1.95, the 0.1 % point of the Kolmogorov distribution (fixed seed)", () => {
    const n = 200_000;
    const g = new GaussianSource(2024);
    const z = Float64Array.from({ length: n }, () => g.normal()).sort();
    let d = 0;
    for (let i = 0; i < n; i++) {
      const c = phi(z[i]);
      d = Math.max(d, (i + 1) / n - c, c - i / n);
    }
    expect(Math.sqrt(n) * d).toBeLessThan(1.95);
  });

  it("moments and tails: mean 0, variance 1, P(|z| > 3.5) = 2(1 − Φ(3.5)) within five standard errors", () => {
    const n = 2_000_000;
    const g = new GaussianSource(77);
    let sum = 0;
    let sum2 = 0;
    let beyond = 0;
    let beyondTail = 0;
    for (let i = 0; i < n; i++) {
      const z = g.normal();
      sum += z;
      sum2 += z * z;
      if (Math.abs(z) > 3.5) beyond++;
      if (Math.abs(z) > ZIGGURAT_R + 0.5) beyondTail++;
    }
    expect(Math.abs(sum / n)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(sum2 / n - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    for (const [count, at] of [
      [beyond, 3.5],
      [beyondTail, ZIGGURAT_R + 0.5],
    ] as const) {
      const p = 2 * (1 - phi(at));
      expect(Math.abs(count - n * p), `beyond ${at}`).toBeLessThan(5 * Math.sqrt(n * p * (1 - p)));
    }
  });

  it("the same seed gives the same sequence, another seed another one", () => {
    const a = new GaussianSource(5);
    const b = new GaussianSource(5);
    const c = new GaussianSource(6);
    const xs = Array.from({ length: 1000 }, () => a.normal());
    expect(Array.from({ length: 1000 }, () => b.normal())).toEqual(xs);
    expect(Array.from({ length: 1000 }, () => c.normal())).not.toEqual(xs);
  });
});
