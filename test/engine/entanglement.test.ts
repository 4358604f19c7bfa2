import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import {
  conditionalVariance,
  duanBound,
  duanSum,
  entangledSourceCovariance,
  entangledSourceSpectrum,
  eprVariances,
  logarithmicNegativity,
  partialTransposeSymplecticEigenvalues,
  symplecticEigenvalues,
} from "../../src/engine/entanglement";
import { loadMathjs, type MathJs, type MathMatrix } from "../helpers/mathjs";

/**
 * Entanglement measures of two modes, covariance over (X1, P1, X2, P2) with [X, P] = i and
 * vacuum variance 1/2.
 *
 * Lossless two-mode squeezing: V = ½[[c,0,s,0],[0,c,0,−s],[s,0,c,0],[0,−s,0,c]], c = cosh 2r,
 * s = sinh 2r. Published values: EPR variances Var(X1 − X2) = Var(P1 + P2) = e^{−2r} and the
 * Duan criterion (Duan, Giedke, Cirac & Zoller, PRL 84, 2722 (2000): a separable state has
 * Var(|a|x1 + x2/a) + Var(|a|p1 − p2/a) ≥ a² + 1/a² with [x, p] = i; the sign flips of x2, p2 used
 * here are a local rotation and change nothing); logarithmic negativity E_N = 2r/ln 2 ebits
 * (Adesso & Illuminati, J. Phys. A 40, 7821 (2007)); conditional variance Var(X1 | X2) =
 * (1/2)/cosh 2r (physics notes §4).
 *
 * With power transmissions η1, η2 (mixing each arm with vacuum) the state keeps the standard
 * form V = [[α I, γ Z], [γ Z, β I]] (Z = diag(1, −1)) with
 *   α = (η1(c − 1) + 1)/2,  β = (η2(c − 1) + 1)/2,  γ = √(η1η2) s/2,
 * and (derived here from the invariants det A = α², det B = β², det C = −γ², det V = (αβ − γ²)²):
 *   Var(X1 − X2) = Var(P1 + P2) = α + β − 2γ;  Var(X1 | X2) = α − γ²/β;
 *   symplectic eigenvalues ν± = (√((α + β)² − 4γ²) ± |β − α|)/2;
 *   partial transpose ν̃± = ((α + β) ± √((α − β)² + 4γ²))/2,  E_N = max(0, −log2(2ν̃₋)).
 */

function standardForm(alpha: number, beta: number, gamma: number): Float64Array {
  return Float64Array.of(alpha, 0, gamma, 0, 0, alpha, 0, -gamma, gamma, 0, beta, 0, 0, -gamma, 0, beta);
}

function lossyTmsv(r: number, eta1: number, eta2: number) {
  const c = Math.cosh(2 * r);
  const s = Math.sinh(2 * r);
  const alpha = (eta1 * (c - 1) + 1) / 2;
  const beta = (eta2 * (c - 1) + 1) / 2;
  const gamma = (Math.sqrt(eta1 * eta2) * s) / 2;
  return { alpha, beta, gamma, v: standardForm(alpha, beta, gamma) };
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1e-300);

describe("lossless two-mode squeezing", () => {
  // Up to r = 2: the entries (c ± s)/2 are rounded to ε·cosh 2r, so e^{−2r} itself is known only to
  // about ε·e^{4r} relative, 3e-13 at r = 2 (well inside the 1e-12 checked).
  it.each([0.05, 0.5, 1, 1.15, 2])("r = %f: EPR variances e^{−2r}, Duan sum 2e^{−2r} < 2, Var(X1|X2) = (1/2)/cosh 2r, E_N = 2r/ln 2", (r) => {
    for (const v of [lossyTmsv(r, 1, 1).v, entangledSourceCovariance({ r, efficiency1: 1, efficiency2: 1 })]) {
      const { x, p } = eprVariances(v);
      expect(rel(x, Math.exp(-2 * r))).toBeLessThan(1e-12);
      expect(rel(p, Math.exp(-2 * r))).toBeLessThan(1e-12);
      expect(rel(duanSum(v), 2 * Math.exp(-2 * r))).toBeLessThan(1e-12);
      expect(duanSum(v)).toBeLessThan(duanBound());
      expect(rel(conditionalVariance(v, 0, [2]), 0.5 / Math.cosh(2 * r))).toBeLessThan(1e-12);
      expect(rel(conditionalVariance(v, 1, [3]), 0.5 / Math.cosh(2 * r))).toBeLessThan(1e-12);
      expect(rel(logarithmicNegativity(v), (2 * r) / Math.LN2)).toBeLessThan(1e-11);
      // A pure state: det V = 1/16, i.e. ν₋ν₊ = 1/4 (the individual values of this degenerate pair are
      // only determined to the square root of the rounding, see symplecticEigenvalues).
      const [lo, hi] = symplecticEigenvalues(v);
      expect(rel(lo * hi, 0.25)).toBeLessThan(1e-9);
    }
  });

  it("at r = 3 and 4 the log-negativity is still 2r/ln 2 (it depends on the well-conditioned ν̃₋ = e^{−2r}/2)", () => {
    for (const r of [3, 4]) expect(rel(logarithmicNegativity(lossyTmsv(r, 1, 1).v), (2 * r) / Math.LN2), `r = ${r}`).toBeLessThan(1e-9);
  });

  it("vacuum (r = 0) is separable: E_N = 0, Duan sum exactly 2, conditional variance 1/2", () => {
    const v = standardForm(0.5, 0.5, 0);
    expect(logarithmicNegativity(v)).toBe(0);
    expect(duanSum(v)).toBe(2);
    expect(conditionalVariance(v, 0, [2])).toBe(0.5);
  });
});

describe("two-mode squeezing with per-arm loss (closed forms derived in the header)", () => {
  it.each([
    [1, 0.9, 0.9],
    [1, 0.95, 0.5],
    [2, 0.7, 0.3],
    [0.4, 0.2, 1],
  ])("r = %f, η1 = %f, η2 = %f", (r, eta1, eta2) => {
    const { alpha, beta, gamma, v } = lossyTmsv(r, eta1, eta2);
    // The source's description matches the mixing-with-vacuum form.
    const fromSource = entangledSourceCovariance({ r, efficiency1: eta1, efficiency2: eta2 });
    for (let i = 0; i < 16; i++) expect(Math.abs(fromSource[i] - v[i])).toBeLessThan(1e-12 * alpha);
    const { x, p } = eprVariances(v);
    expect(rel(x, alpha + beta - 2 * gamma)).toBeLessThan(1e-12);
    expect(rel(p, alpha + beta - 2 * gamma)).toBeLessThan(1e-12);
    expect(rel(conditionalVariance(v, 0, [2]), alpha - (gamma * gamma) / beta)).toBeLessThan(1e-12);
    const [lo, hi] = symplecticEigenvalues(v);
    const root = Math.sqrt((alpha + beta) ** 2 - 4 * gamma ** 2);
    expect(rel(lo * hi, alpha * beta - gamma * gamma)).toBeLessThan(1e-9);
    if (eta1 !== eta2) {
      // Distinct values (a degenerate pair, η1 = η2, is only fixed to √rounding; see above).
      expect(rel(lo, (root - Math.abs(beta - alpha)) / 2)).toBeLessThan(1e-9);
      expect(rel(hi, (root + Math.abs(beta - alpha)) / 2)).toBeLessThan(1e-9);
    }
    const nuMinus = (alpha + beta - Math.sqrt((alpha - beta) ** 2 + 4 * gamma ** 2)) / 2;
    expect(rel(partialTransposeSymplecticEigenvalues(v)[0], nuMinus)).toBeLessThan(1e-9);
    expect(rel(logarithmicNegativity(v), Math.max(0, -Math.log2(2 * nuMinus)))).toBeLessThan(1e-9);
    // Loss never removes the entanglement of a two-mode squeezed state entirely.
    expect(logarithmicNegativity(v)).toBeGreaterThan(0);
  });

  it("asymmetric loss: the a = 1 Duan sum can exceed 2 although the state is entangled; Duan's a² = √(η2/η1) detects it (the criterion is sufficient, not necessary)", () => {
    // a = 1: sum 2(α + β − 2γ) vs 2. With general a: 2(a²α + β/a² − 2γ) < a² + 1/a² ⇔ a²(α − ½) + (β − ½)/a² < 2γ;
    // the best a² = √((β − ½)/(α − ½)) = √(η2/η1) turns it into (c − 1)² < s², true for every r > 0.
    const r = 2;
    const eta1 = 0.95;
    const eta2 = 0.3;
    const { v } = lossyTmsv(r, eta1, eta2);
    expect(duanSum(v)).toBeGreaterThan(duanBound());
    expect(logarithmicNegativity(v)).toBeGreaterThan(0);
    const a = (eta2 / eta1) ** 0.25;
    expect(duanSum(v, undefined, a)).toBeLessThan(duanBound(a));
  });
});

describe("Duan sum below 2 ⇔ entangled, for symmetric states in standard form (Duan et al. 2000)", () => {
  // Symmetric standard form α = β, C = diag(γ, −γ): physical when α² − γ² ≥ 1/4; the Duan sum is
  // 4(α − |γ|) and ν̃₋ = α − |γ|, so both say "entangled" exactly when α − |γ| < 1/2.
  it("agrees with the log-negativity on random physical symmetric states (fast-check, fixed seed)", () => {
    let entangled = 0;
    let separable = 0;
    fc.assert(
      fc.property(fc.double({ min: 0.5, max: 20, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (alpha, u) => {
        const gamma = u * Math.sqrt(alpha * alpha - 0.25);
        const v = standardForm(alpha, alpha, gamma);
        const duanSays = duanSum(v) < 2;
        const negativitySays = logarithmicNegativity(v) > 0;
        // Skip the boundary itself, where rounding decides.
        fc.pre(Math.abs(alpha - gamma - 0.5) > 1e-9);
        expect(duanSays).toBe(negativitySays);
        if (negativitySays) entangled++;
        else separable++;
      }),
      { seed: 20240611, numRuns: 500 },
    );
    expect(entangled).toBeGreaterThan(20);
    expect(separable).toBeGreaterThan(20);
  });
});

describe("symplectic eigenvalues against mathjs (eigenvalues ±iν of Σ V)", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });

  /** A random physical state S diag(ν1, ν1, ν2, ν2) Sᵀ with S a product of symplectic maps. */
  function randomState(seed: number): { v: number[][]; nu: [number, number] } {
    let state = seed;
    const rnd = () => {
      state = (state * 1103515245 + 12345) % 2147483648;
      return state / 2147483648;
    };
    const nu1 = 0.5 + 2 * rnd();
    const nu2 = 0.5 + 2 * rnd();
    const d = math.diag([nu1, nu1, nu2, nu2]);
    const r = 1.5 * rnd();
    const ch = Math.cosh(r);
    const sh = Math.sinh(r);
    const tms = math.matrix([
      [ch, 0, sh, 0],
      [0, ch, 0, -sh],
      [sh, 0, ch, 0],
      [0, -sh, 0, ch],
    ]);
    const t = 2 * Math.PI * rnd();
    const [c, s] = [Math.cos(t), Math.sin(t)];
    const bs = math.matrix([
      [c, 0, s, 0],
      [0, c, 0, s],
      [-s, 0, c, 0],
      [0, -s, 0, c],
    ]);
    const q1 = Math.exp(rnd() - 0.5);
    const q2 = Math.exp(rnd() - 0.5);
    const local = math.diag([q1, 1 / q1, q2, 1 / q2]);
    const S = math.multiply(local, math.multiply(bs, tms));
    const v = math.multiply(S, math.multiply(d, math.transpose(S))) as unknown as MathMatrix;
    return { v: v.toArray() as number[][], nu: [Math.min(nu1, nu2), Math.max(nu1, nu2)] };
  }

  const sigma = [
    [0, 1, 0, 0],
    [-1, 0, 0, 0],
    [0, 0, 0, 1],
    [0, 0, -1, 0],
  ];

  /**
   * Symplectic eigenvalues as mathjs finds them: with M = V^{1/2} Σ V^{1/2} (real antisymmetric,
   * eigenvalues ±iν), the symmetric matrix Mᵀ M has eigenvalues ν², each twice (Williamson's
   * theorem; see e.g. Adesso & Illuminati 2007). mathjs sqrtm and eigs (symmetric) do the work.
   */
  function mathjsSymplectic(v: number[][]): number[] {
    const root = math.sqrtm(math.matrix(v));
    const m = math.multiply(root, math.multiply(math.matrix(sigma), root));
    const mtm = math.multiply(math.transpose(m), m) as MathMatrix;
    const sym = (mtm.toArray() as number[][]).map((row, i, all) => row.map((x, j) => (x + all[j][i]) / 2));
    const values = math.eigs(sym).values as unknown as number[] | MathMatrix;
    const list = (Array.isArray(values) ? values : (values.toArray() as number[])).map((x) => Math.sqrt(Math.max(0, x)));
    return list.sort((a, b) => a - b);
  }

  it.each([1, 2, 3, 4, 5, 6])("random physical state #%i: ν from the invariants = construction = mathjs; partial transpose too", (seed) => {
    const { v, nu } = randomState(seed);
    const flat = v.flat();
    const [lo, hi] = symplecticEigenvalues(flat);
    expect(rel(lo, nu[0])).toBeLessThan(1e-9);
    expect(rel(hi, nu[1])).toBeLessThan(1e-9);
    const ref = mathjsSymplectic(v);
    expect(rel(lo, ref[0])).toBeLessThan(1e-9);
    expect(rel(hi, ref[3])).toBeLessThan(1e-9);
    // Partial transpose: P2 → −P2.
    const flip = [1, 1, 1, -1];
    const vpt = v.map((row, i) => row.map((x, j) => x * flip[i] * flip[j]));
    const refPt = mathjsSymplectic(vpt);
    const [ptLo, ptHi] = partialTransposeSymplecticEigenvalues(flat);
    expect(rel(ptLo, refPt[0])).toBeLessThan(1e-9);
    expect(rel(ptHi, refPt[3])).toBeLessThan(1e-9);
    expect(rel(logarithmicNegativity(flat), Math.max(0, -Math.log2(2 * refPt[0])))).toBeLessThan(1e-9);
  });

  it("conditional variance given several quadratures is the Schur complement (mathjs inv)", () => {
    const { v } = randomState(11);
    const given = [1, 2, 3];
    const vgg = given.map((i) => given.map((j) => v[i][j]));
    const vtg = given.map((j) => v[0][j]);
    const reduction = math.multiply(vtg, math.multiply(math.inv(vgg), vtg)) as unknown as number;
    expect(rel(conditionalVariance(v.flat(), 0, given), v[0][0] - reduction)).toBeLessThan(1e-9);
  });
});

describe("covariance of the finite-bandwidth source over a band", () => {
  // The band covariance is ½ × the mean of the one-sided spectrum over the band; here the
  // reference is a direct numerical average (composite Simpson, 20000 panels) of the spectrum.
  it.each([
    [0, 1e6],
    [2e6, 9e6],
    [1e3, 1e8],
  ])("band %f…%f Hz: equals the numerically averaged spectrum", (from, to) => {
    const source = { r: 1.3, efficiency1: 0.9, efficiency2: 0.7, bandwidth: 5e6 };
    const v = entangledSourceCovariance(source, { from, to });
    const n = 20000;
    const h = (to - from) / n;
    const mean = new Float64Array(16);
    for (let k = 0; k <= n; k++) {
      const w = k === 0 || k === n ? 1 : k % 2 === 1 ? 4 : 2;
      const s = entangledSourceSpectrum(source, from + k * h);
      for (let i = 0; i < 16; i++) mean[i] += (w * h * s[i]) / 3 / (to - from);
    }
    for (let i = 0; i < 16; i++) expect(Math.abs(v[i] - mean[i] / 2), `entry ${i}`).toBeLessThan(1e-9 * Math.abs(v[0]));
  });

  it("the closed form uses the integral of a Lorentzian: (atan(Ω2/w) − atan(Ω1/w))/w (checked with Math.atan)", () => {
    const r = 0.8;
    const kappa = 2 * Math.PI * 5e6;
    const eps = (kappa / 2) * Math.tanh(r / 2);
    const [w1, w2] = [2 * Math.PI * 3e5, 2 * Math.PI * 4e7];
    const mean = (w: number) => (2 * kappa * eps * (Math.atan(w2 / w) - Math.atan(w1 / w))) / (w * (w2 - w1));
    const plus = mean(kappa / 2 - eps);
    const minus = mean(kappa / 2 + eps);
    const v = entangledSourceCovariance({ r, efficiency1: 1, efficiency2: 1, bandwidth: 5e6 }, { from: 3e5, to: 4e7 });
    expect(rel(v[0], (1 + (plus - minus) / 2) / 2)).toBeLessThan(1e-13);
    expect(rel(v[2], (plus + minus) / 4)).toBeLessThan(1e-13);
    expect(rel(v[7], -(plus + minus) / 4)).toBeLessThan(1e-13);
  });

  it("a white source's covariance is half its noise matrix, whatever the band", () => {
    const source = { r: 0.7, efficiency1: 0.8, efficiency2: 0.9 };
    const a = entangledSourceCovariance(source);
    const b = entangledSourceCovariance(source, { from: 10, to: 1e9 });
    const s = entangledSourceSpectrum(source, 123);
    for (let i = 0; i < 16; i++) {
      expect(a[i]).toBe(s[i] / 2);
      expect(b[i]).toBe(s[i] / 2);
    }
  });
});
