/**
 * Eigenvalues and eigenvectors of general real (nonsymmetric) matrices, as used for
 * stability checks of linear state-space models dz = A z dt + noise.
 */
import { balanceInPlace } from "./balance";
import { irreducibleBlocks, principalSubmatrix } from "./block-triangular";
import { complexLuFactor, complexLuSolve } from "./complex-lu";
import { hessenbergEigenvalues } from "./francis-qr";
import { reduceToHessenbergInPlace } from "./hessenberg";
import { SingularMatrixError } from "./singular-error";
import { hypot } from "../numeric/portable-math";

export interface ComplexVector {
  re: Float64Array;
  im: Float64Array;
}

export interface EigenvalueOptions {
  /** Total budget of Francis QR sweeps over the whole matrix (default 60·n). */
  maxIterations?: number;
}

function checkSquare(a: Float64Array, n: number, who: string): void {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${who}: order must be a non-negative integer, got ${n}`);
  if (a.length !== n * n) throw new RangeError(`${who}: expected ${n * n} entries for a ${n}×${n} matrix, got ${a.length}`);
  for (let i = 0; i < a.length; i++) {
    if (!Number.isFinite(a[i])) {
      throw new RangeError(`${who}: entry (${Math.floor(i / n)}, ${i % n}) is ${a[i]}, expected a finite number`);
    }
  }
}

/**
 * All n eigenvalues of a real n×n matrix (row-major), complex pairs adjacent with the
 * positive imaginary part first. The input is not modified.
 *
 * Steps: split into irreducible blocks (keeps decoupled scales apart), then per block
 * Parlett–Reinsch balancing, Householder reduction to Hessenberg form and the Francis
 * double-shift QR iteration.
 */
export function realEigenvalues(a: Float64Array, n: number, options: EigenvalueOptions = {}): ComplexVector {
  checkSquare(a, n, "realEigenvalues");
  const budget = options.maxIterations ?? 60 * n;
  const wr = new Float64Array(n);
  const wi = new Float64Array(n);
  const tr = new Float64Array(n);
  const ti = new Float64Array(n);
  let used = 0;
  let out = 0;
  for (const block of irreducibleBlocks(a, n)) {
    const m = block.length;
    if (m === 1) {
      wr[out++] = a[block[0] * n + block[0]];
      continue;
    }
    const h = principalSubmatrix(a, n, block);
    balanceInPlace(h, m);
    reduceToHessenbergInPlace(h, m);
    try {
      used += hessenbergEigenvalues(h, m, tr, ti, 0, budget - used);
    } catch (e) {
      throw new Error(`realEigenvalues: ${(e as Error).message} (budget ${budget} sweeps for n = ${n})`);
    }
    for (let i = 0; i < m; i++) {
      wr[out] = tr[i];
      wi[out] = ti[i];
      out++;
    }
  }
  return { re: wr, im: wi };
}

/** Inverse-iteration sweeps; each multiplies the wanted component by ~1/(relative shift error). */
const INVERSE_ITERATION_STEPS = 4;

/**
 * A unit-norm eigenvector of the real matrix `a` for the eigenvalue λ (as returned by
 * realEigenvalues; inverse iteration heads for the eigenvalue nearest to λ), by
 * inverse iteration on (A − μI) with μ = λ nudged off λ by a relative 1e-10, so the factor
 * is nearly but not exactly singular. An error in λ only slows convergence: each solve
 * amplifies the wanted direction relative to the others by about |gap| / |λ − μ|.
 * Phase is fixed so the largest component is real and positive (reproducible output).
 */
export function eigenvectorFor(a: Float64Array, n: number, lambdaRe: number, lambdaIm: number): ComplexVector {
  checkSquare(a, n, "eigenvectorFor");
  if (!Number.isFinite(lambdaRe) || !Number.isFinite(lambdaIm)) {
    throw new RangeError(`eigenvectorFor: eigenvalue ${lambdaRe} + ${lambdaIm}i is not finite`);
  }
  if (n === 0) return { re: new Float64Array(0), im: new Float64Array(0) };

  let normA = 0;
  for (let i = 0; i < n; i++) {
    let row = 0;
    for (let j = 0; j < n; j++) row += Math.abs(a[i * n + j]);
    normA = Math.max(normA, row);
  }
  // Shift offset relative to |λ| (not ‖A‖) so a small eigenvalue of a weakly coupled
  // small-scale block keeps its separation from its neighbours.
  const magnitude = hypot(lambdaRe, lambdaIm);
  let nudge = magnitude > 0 ? 1e-10 * magnitude : normA > 0 ? 1e-14 * normA : 1;

  const mRe = new Float64Array(n * n);
  const mIm = new Float64Array(n * n);
  const piv = new Int32Array(n);
  // An exactly singular factor only happens if μ hits an eigenvalue to the last bit:
  // move it further away and try again.
  for (let attempt = 0; ; attempt++) {
    const muRe = lambdaRe + nudge;
    const muIm = lambdaIm + 0.5 * nudge;
    mRe.set(a);
    mIm.fill(0);
    for (let i = 0; i < n; i++) {
      mRe[i * n + i] -= muRe;
      mIm[i * n + i] = -muIm;
    }
    try {
      complexLuFactor(mRe, mIm, n, piv);
      break;
    } catch (e) {
      if (!(e instanceof SingularMatrixError) || attempt >= 8) throw e;
      nudge *= 1000;
    }
  }

  // Start from a vector with no special structure so it is unlikely to be orthogonal
  // to the wanted eigenvector.
  const vRe = new Float64Array(n);
  const vIm = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    vRe[i] = 1 + ((i * 0.6180339887498949) % 1);
    vIm[i] = 0.5 - ((i * 0.4142135623730951) % 1);
  }
  normalize(vRe, vIm);
  for (let step = 0; step < INVERSE_ITERATION_STEPS; step++) {
    complexLuSolve(mRe, mIm, n, piv, vRe, vIm, 1);
    normalize(vRe, vIm);
  }
  fixPhase(vRe, vIm);
  return { re: vRe, im: vIm };
}

function normalize(re: Float64Array, im: Float64Array): void {
  let big = 0;
  for (let i = 0; i < re.length; i++) big = Math.max(big, Math.abs(re[i]), Math.abs(im[i]));
  if (big === 0 || !Number.isFinite(big)) throw new Error("eigenvectorFor: inverse iteration lost the vector");
  let ss = 0;
  for (let i = 0; i < re.length; i++) {
    const r = re[i] / big;
    const m = im[i] / big;
    ss += r * r + m * m;
  }
  const inv = 1 / (big * Math.sqrt(ss));
  for (let i = 0; i < re.length; i++) {
    re[i] *= inv;
    im[i] *= inv;
  }
}

/** Multiply by a unit phase so the largest-modulus component becomes real positive. */
function fixPhase(re: Float64Array, im: Float64Array): void {
  let k = 0;
  let best = -1;
  for (let i = 0; i < re.length; i++) {
    const m = hypot(re[i], im[i]);
    if (m > best) {
      best = m;
      k = i;
    }
  }
  const cr = re[k] / best;
  const ci = -im[k] / best;
  for (let i = 0; i < re.length; i++) {
    const r = re[i];
    const m = im[i];
    re[i] = r * cr - m * ci;
    im[i] = r * ci + m * cr;
  }
  im[k] = 0;
}
