/**
 * Exact discretization of dz = A z dt + noise with diffusion Q over a step h:
 *   z(t + h) = Φ z(t) + ξ,  Φ = e^{Ah},  Cov ξ = W(h) = ∫₀ʰ e^{As} Q e^{Aᵀs} ds.
 *
 * W over a short step comes from one exponential of the block matrix [[−A, Q], [0, Aᵀ]]h
 * (Van Loan, IEEE Trans. Autom. Control 23, 395 (1978)); that block holds e^{−Ah}, which
 * overflows or cancels for long steps of a stiff model, so the step is first cut to
 * h/2^k with ‖A‖h/2^k ≤ 1/2 and then doubled k times with
 *   Φ(2h) = Φ(h)²,  W(2h) = Φ(h) W(h) Φ(h)ᵀ + W(h),
 * where every term stays bounded. Works for stable, marginally stable and growing A alike.
 */
import { expm } from "../linalg/expm";
import { block, congruence, mul, norm1, setBlock, symmetrize, transpose } from "../linalg/real-matrix";

export interface DiscreteStep {
  /** e^{Ah}, n×n. */
  readonly phi: Float64Array;
  /** Covariance of the noise gathered over the step, n×n. */
  readonly w: Float64Array;
}

/** 2^k for an integer k ≥ 0, by doubling (exact): the factor a step is cut by. */
export function powerOfTwo(k: number): number {
  let x = 1;
  for (let i = 0; i < k; i++) x *= 2;
  return x;
}

/** Number of halvings that bring ‖A‖₁·h to at most 1/2. */
export function halvingsFor(normTimesH: number): number {
  let k = 0;
  let x = normTimesH;
  while (x > 0.5 && k < 2000) {
    x *= 0.5;
    k++;
  }
  return k;
}

export function discreteStep(a: ArrayLike<number>, q: ArrayLike<number>, n: number, h: number): DiscreteStep {
  if (!(h >= 0 && Number.isFinite(h))) throw new RangeError(`discreteStep: step must be finite and ≥ 0, got ${h}`);
  const k = halvingsFor(norm1(a, n) * h);
  let step = shortStep(a, q, n, h / powerOfTwo(k));
  for (let i = 0; i < k; i++) step = compose(step, step, n);
  return step;
}

/** The step `first` followed by `second`: Φ = Φ₂Φ₁, W = Φ₂W₁Φ₂ᵀ + W₂. */
export function compose(first: DiscreteStep, second: DiscreteStep, n: number): DiscreteStep {
  const w = congruence(second.phi, first.w, n);
  for (let i = 0; i < w.length; i++) w[i] += second.w[i];
  return { phi: mul(second.phi, first.phi, n), w: symmetrize(w, n) };
}

/** The step repeated `count` times (count ≥ 1), by binary powering. */
export function repeatStep(step: DiscreteStep, count: number, n: number): DiscreteStep {
  let result: DiscreteStep | undefined;
  let power = step;
  let c = count;
  while (c > 0) {
    if (c % 2 === 1) result = result ? compose(result, power, n) : power;
    c = Math.floor(c / 2);
    if (c > 0) power = compose(power, power, n);
  }
  if (!result) throw new RangeError(`repeatStep: count must be ≥ 1, got ${count}`);
  return result;
}

/** Van Loan's block exponential for a step with ‖A‖h ≤ 1/2. */
function shortStep(a: ArrayLike<number>, q: ArrayLike<number>, n: number, h: number): DiscreteStep {
  // W is linear in Q: exponentiate with Q scaled to the size of A·h and scale back, so a
  // large diffusion (a hot bath) does not force extra squarings or swamp the A blocks.
  const qNorm = norm1(q, n) * h;
  const scale = qNorm > 0 ? qNorm : 1;
  const m = 2 * n;
  const big = new Float64Array(m * m);
  setBlock(big, m, 0, 0, a, n, n, -h);
  setBlock(big, m, 0, n, q, n, n, h / scale);
  setBlock(big, m, n, n, transpose(a, n), n, n, h);
  const e = expm(big, m);
  const phiT = block(e, m, n, n, n, n);
  const phi = transpose(phiT, n);
  const w = mul(phi, block(e, m, 0, n, n, n), n);
  for (let i = 0; i < w.length; i++) w[i] *= scale;
  return { phi, w: symmetrize(w, n) };
}
