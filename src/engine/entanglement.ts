/**
 * Entanglement of two bosonic modes from their covariance matrix.
 *
 * Convention: a 4×4 row-major covariance V_ij = ⟨{z_i, z_j}⟩/2 − ⟨z_i⟩⟨z_j⟩ over
 * z = (X1, P1, X2, P2) with [X_j, P_j] = i, so vacuum has V = I/2. This is what
 * `stationaryCovariance` returns for a pair of modes (see `modePairCovariance`).
 */
import { parametricPump, twoModeSpectrum, type TwoModeSqueezing } from "../physics/two-mode-squeezing";
import type { StateSpaceModel } from "../network/model";
import { solve } from "../linalg/real-lu";
import { SingularMatrixError } from "../linalg/singular-error";
import { log } from "../numeric/portable-math";
export type TwoModeCovariance = ArrayLike<number>;

/**
 * Signs of the EPR combinations Var(X1 + x·X2) and Var(P1 + p·P2). The default
 * { x: −1, p: +1 } suits light whose amplitude quadratures are correlated and phase
 * quadratures anti-correlated (the entangled source's convention).
 */
export interface EprConvention {
  readonly x: 1 | -1;
  readonly p: 1 | -1;
}

export const AMPLITUDE_CORRELATED: EprConvention = { x: -1, p: 1 };

const X1 = 0;
const P1 = 1;
const X2 = 2;
const P2 = 3;

function at(v: TwoModeCovariance, i: number, j: number): number {
  return v[i * 4 + j];
}

/** Var(αX1 + βX2) for the quadratures i, j of the two modes. */
function combinationVariance(v: TwoModeCovariance, i: number, j: number, alpha: number, beta: number): number {
  return alpha * alpha * at(v, i, i) + beta * beta * at(v, j, j) + 2 * alpha * beta * at(v, i, j);
}

/** The two EPR variances Var(X1 + x·X2) and Var(P1 + p·P2); both are e^{−2r} for lossless two-mode squeezing. */
export function eprVariances(v: TwoModeCovariance, convention: EprConvention = AMPLITUDE_CORRELATED): { x: number; p: number } {
  return { x: combinationVariance(v, X1, X2, 1, convention.x), p: combinationVariance(v, P1, P2, 1, convention.p) };
}

/**
 * Duan sum Var(|a|X1 + x·X2/a) + Var(|a|P1 + p·P2/a) for a real a ≠ 0 (default 1). Every
 * separable state has it ≥ a² + 1/a² (= 2 for a = 1, in units where vacuum has variance 1/2),
 * so a smaller value proves entanglement. For symmetric Gaussian states in standard form
 * and a = 1 the condition is also necessary.
 */
export function duanSum(v: TwoModeCovariance, convention: EprConvention = AMPLITUDE_CORRELATED, a = 1): number {
  if (!(a !== 0 && Number.isFinite(a))) throw new Error(`Duan parameter a must be finite and non-zero, got ${a}`);
  const s = Math.abs(a);
  return combinationVariance(v, X1, X2, s, convention.x / a) + combinationVariance(v, P1, P2, s, convention.p / a);
}

/** The separability bound a² + 1/a² of the Duan sum. */
export function duanBound(a = 1): number {
  return a * a + 1 / (a * a);
}

function det2(v: TwoModeCovariance, r0: number, c0: number): number {
  return at(v, r0, c0) * at(v, r0 + 1, c0 + 1) - at(v, r0, c0 + 1) * at(v, r0 + 1, c0);
}

/**
 * det V by Gaussian elimination with partial pivoting (backward stable): its relative error is
 * about cond(V)·ε ≈ e^{4r}·ε for squeezing r, where a cofactor expansion would lose e^{8r}·ε.
 */
function det4(v: TwoModeCovariance): number {
  const a = Float64Array.from({ length: 16 }, (_, i) => v[i]);
  let det = 1;
  for (let col = 0; col < 4; col++) {
    let pivot = col;
    for (let r = col + 1; r < 4; r++) if (Math.abs(a[r * 4 + col]) > Math.abs(a[pivot * 4 + col])) pivot = r;
    const d = a[pivot * 4 + col];
    if (d === 0) return 0;
    if (pivot !== col) {
      for (let c = 0; c < 4; c++) [a[col * 4 + c], a[pivot * 4 + c]] = [a[pivot * 4 + c], a[col * 4 + c]];
      det = -det;
    }
    det *= d;
    for (let r = col + 1; r < 4; r++) {
      const f = a[r * 4 + col] / d;
      for (let c = col; c < 4; c++) a[r * 4 + c] -= f * a[col * 4 + c];
    }
  }
  return det;
}

/**
 * The two symplectic eigenvalues ν₋ ≤ ν₊ from the invariants Δ and det V:
 * ν±² = (Δ ± √(Δ² − 4 det V))/2, with ν₋² computed as 2 det V/(Δ + √…) to avoid cancellation.
 */
function symplecticPair(delta: number, det: number): [number, number] {
  const root = Math.sqrt(Math.max(0, delta * delta - 4 * det));
  const plus2 = 0.5 * (delta + root);
  const minus2 = plus2 > 0 ? det / plus2 : 0;
  return [Math.sqrt(Math.max(0, minus2)), Math.sqrt(plus2)];
}

/**
 * Symplectic eigenvalues [ν₋, ν₊] of V (a physical state has ν₋ ≥ 1/2). Δ = det A + det B + 2 det C.
 * When the two are (nearly) equal, as for a pure symmetric state, each is determined only to
 * about the square root of the rounding in Δ² − 4 det V; their product √det V is not affected.
 */
export function symplecticEigenvalues(v: TwoModeCovariance): [number, number] {
  return symplecticPair(det2(v, 0, 0) + det2(v, 2, 2) + 2 * det2(v, 0, 2), det4(v));
}

/**
 * Symplectic eigenvalues [ν̃₋, ν̃₊] of the partial transpose (P2 → −P2), which flips the sign
 * of det C: Δ̃ = det A + det B − 2 det C. The state is entangled exactly when ν̃₋ < 1/2.
 */
export function partialTransposeSymplecticEigenvalues(v: TwoModeCovariance): [number, number] {
  return symplecticPair(det2(v, 0, 0) + det2(v, 2, 2) - 2 * det2(v, 0, 2), det4(v));
}

/** Logarithmic negativity in bits (ebits), E_N = max(0, −log2(2ν̃₋)); 2r/ln 2 for lossless two-mode squeezing. */
export function logarithmicNegativity(v: TwoModeCovariance): number {
  const [nu] = partialTransposeSymplecticEigenvalues(v);
  if (nu >= 0.5) return 0;
  return -log(2 * nu) / Math.LN2;
}

/**
 * Conditional variance of quadrature `target` given ideal measurements of the quadratures
 * `given` (indices into X1, P1, X2, P2): the Schur complement V_tt − V_tG V_GG⁻¹ V_Gt.
 * For lossless two-mode squeezing Var(X1 | X2) = (1/2)/cosh 2r.
 */
export function conditionalVariance(v: TwoModeCovariance, target: number, given: readonly number[] = [X2]): number {
  const k = given.length;
  if (given.includes(target)) return 0;
  const g = new Float64Array(k * k);
  const rhs = new Float64Array(k);
  for (let a = 0; a < k; a++) {
    rhs[a] = at(v, given[a], target);
    for (let b = 0; b < k; b++) g[a * k + b] = at(v, given[a], given[b]);
  }
  let solution: Float64Array;
  try {
    solution = solve(g, rhs, k, 1);
  } catch (e) {
    if (e instanceof SingularMatrixError) throw new Error("conditional variance: the measured quadratures have a singular covariance");
    throw e;
  }
  let reduction = 0;
  for (let a = 0; a < k; a++) reduction += rhs[a] * solution[a];
  return at(v, target, target) - reduction;
}

/**
 * The 4×4 covariance of two of a model's modes (X_a, P_a, X_b, P_b) taken from its full
 * stationary covariance `v` (n×n, e.g. from `stationaryCovariance`); modes are named by owner.
 */
export function modePairCovariance(model: StateSpaceModel, v: ArrayLike<number>, ownerA: string, ownerB: string): Float64Array {
  const find = (owner: string) => {
    const mode = model.modes.find((m) => m.owner === owner);
    if (!mode) throw new Error(`the model has no mode owned by '${owner}'`);
    return mode;
  };
  const a = find(ownerA);
  const b = find(ownerB);
  const idx = [a.x, a.p, b.x, b.p];
  const n = model.nStates;
  const out = new Float64Array(16);
  for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) out[i * 4 + j] = v[idx[i] * n + idx[j]];
  return out;
}

/**
 * One-sided spectral covariance (vacuum = 1) of the entangled source's two output beams at
 * sideband frequency f (Hz), quadrature order X1, P1, X2, P2; white without a bandwidth.
 */
export function entangledSourceSpectrum(source: TwoModeSqueezing, frequency: number): Float64Array {
  return twoModeSpectrum(source, 2 * Math.PI * frequency);
}

/**
 * Covariance (vacuum 1/2) of the pair of modes that a flat filter over the sideband band
 * [from, to] (Hz) cuts out of the two beams: V = ½·(1/(to − from))∫ S(f) df. Without a
 * bandwidth (white source), or for a band of zero width, it is S/2 at that frequency.
 * With a bandwidth the integrals of the two Lorentzians are done in closed form.
 */
export function entangledSourceCovariance(source: TwoModeSqueezing, band?: { from: number; to: number }): Float64Array {
  const white = source.bandwidth === undefined || source.bandwidth === Infinity;
  if (white || !band || band.to === band.from) {
    return twoModeSpectrum(source, band ? 2 * Math.PI * band.from : 0).map((x) => 0.5 * x);
  }
  if (!(band.from >= 0 && band.to > band.from)) throw new Error(`band must satisfy 0 ≤ from < to, got ${band.from}…${band.to}`);
  const kappa = 2 * Math.PI * (source.bandwidth as number);
  const w1 = 2 * Math.PI * band.from;
  const w2 = 2 * Math.PI * band.to;
  const eps = parametricPump(kappa, source.r);
  const slow = kappa / 2 - eps;
  const fast = kappa / 2 + eps;
  // Mean of 2κε/(w² + Ω²) over [Ω1, Ω2]: 2κε (atan(Ω2/w) − atan(Ω1/w))/(w (Ω2 − Ω1)).
  const mean = (w: number): number => (2 * kappa * eps * atanDifference(w2 / w, w1 / w)) / (w * (w2 - w1));
  const plus = mean(slow);
  const minus = mean(fast);
  const c = 1 + 0.5 * (plus - minus);
  const s = 0.5 * (plus + minus);
  const a1 = source.efficiency1 * c + (1 - source.efficiency1);
  const a2 = source.efficiency2 * c + (1 - source.efficiency2);
  const x = Math.sqrt(source.efficiency1 * source.efficiency2) * s;
  return Float64Array.of(a1, 0, x, 0, 0, a1, 0, -x, x, 0, a2, 0, 0, -x, 0, a2).map((y) => 0.5 * y);
}

/**
 * atan(b) − atan(a) for 0 ≤ a ≤ b, from + − × ÷ and √ only (the model avoids platform
 * transcendental functions): the difference is atan((b − a)/(1 + ab)), exact for a, b ≥ 0.
 */
function atanDifference(b: number, a: number): number {
  if (b === Infinity) return Math.PI / 2 - atanNonNegative(a);
  return atanNonNegative((b - a) / (1 + a * b));
}

/** atan(x) for x ≥ 0: reflect above 1, halve the angle three times, then the Taylor series. */
function atanNonNegative(x: number): number {
  if (x > 1) return Math.PI / 2 - atanNonNegative(1 / x);
  let y = x;
  let doublings = 0;
  while (y > 0.05) {
    // atan y = 2 atan(y/(1 + √(1 + y²)))
    y = y / (1 + Math.sqrt(1 + y * y));
    doublings++;
  }
  const y2 = y * y;
  let term = y;
  let sum = y;
  for (let k = 1; k < 20; k++) {
    term *= -y2;
    sum += term / (2 * k + 1);
  }
  return sum * (1 << doublings);
}
