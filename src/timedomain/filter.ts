/**
 * The discrete Kalman filter that reads a run's records, and its settling.
 *
 * ẑ_k and P_k are the exact conditional mean and covariance of z_k given Δy_0 … Δy_{k−1}
 * for the exact discrete model of propagation.ts (Kalman filter with correlated noise):
 *   S = Γ P Γᵀ + Σ_yy,  K = (Φ P Γᵀ + Σ_zy) S⁻¹,
 *   ẑ ← Φ ẑ + K (Δy − Γ ẑ),  P ← Φ P Φᵀ + Σ_zz − K S Kᵀ.
 * As h → 0, Γ → C h, Σ_zz → Q h, Σ_zy → S h, Σ_yy → R h, and this becomes the Kalman–Bucy
 * filter: K Δy-update → (P Cᵀ + S) R⁻¹ (dy − C ẑ dt), and P obeys the Riccati equation of
 * riccati.ts. For a finite step P is the covariance given the records integrated over each
 * step, at least the continuous-record covariance and equal to it up to O(h); it is the
 * true error covariance of the estimate shown, so the band ẑ ± √P is honest at any step.
 *
 * Once P reaches the filter's steady state (the doubling limit of the discrete Riccati map)
 * it is frozen there with its gain, and each step costs O(n²) instead of O(n³).
 */
import { realLuFactor, realLuSolve, solve } from "../linalg/real-lu";
import { multiply, symmetrize, transpose } from "../linalg/real-matrix";
import type { ExactStep } from "./propagation";
import { doublingLimit, relativeChange, type RiccatiMap } from "./riccati";

/**
 * Distance of P from the filter's steady state (relative to √(P_ii P_jj)) below which P is
 * frozen. The step-by-step recursion and the doubling limit round differently and settle
 * up to ~1e-10 apart for hot, strongly measured set-ups, so the test is looser than that; P
 * then keeps its own current value, so the series has no jump.
 */
const FILTER_SETTLED = 1e-9;

/**
 * The filter's covariance recursion as a linear-fractional map (the correlated record noise
 * taken out first): with Φ̃ = Φ − Σ_zy Σ_yy⁻¹ Γ, Σ̃ = Σ_zz − Σ_zy Σ_yy⁻¹ Σ_zyᵀ, G = Γᵀ Σ_yy⁻¹ Γ,
 *   P ← Σ̃ + Φ̃ P (I + G P)⁻¹ Φ̃ᵀ,
 * whose doubling limit is the filter's steady state (undefined when there is none).
 */
function filterSteadyState(d: ExactStep): Float64Array | undefined {
  const { n, p } = d;
  let map: RiccatiMap;
  if (p === 0) {
    map = { phi: d.phi, gamma: new Float64Array(n * n), w: d.szz };
  } else {
    const invGam = solve(d.syy, d.gam, p, n); // Σ_yy⁻¹Γ, p×n
    const invSzyT = solve(d.syy, transpose(d.szy, n, p), p, n); // Σ_yy⁻¹Σ_zyᵀ, p×n
    const phi = multiply(d.szy, invGam, n, p, n);
    for (let i = 0; i < n * n; i++) phi[i] = d.phi[i] - phi[i];
    const w = multiply(d.szy, invSzyT, n, p, n);
    for (let i = 0; i < n * n; i++) w[i] = d.szz[i] - w[i];
    const gamma = multiply(transpose(d.gam, p, n), invGam, n, p, n);
    map = { phi, gamma: symmetrize(gamma, n), w: symmetrize(w, n) };
  }
  const limit = doublingLimit(map, n);
  return "failed" in limit ? undefined : limit.w;
}

export class KalmanFilter {
  /** The estimate ẑ (n), updated in place. */
  readonly zHat: Float64Array;
  /** The filter's covariance P (n×n), updated in place. */
  readonly cov: Float64Array;
  /** Counts the changes of `cov`, so a reader can tell whether P moved since it last looked. */
  revision = 0;
  /** The step from which P stays at its steady state, once it got there. */
  settledAt: number | undefined;
  private readonly steadyCov: Float64Array | undefined;
  private frozen = false;
  private atSteady = false;
  private readonly gain: Float64Array;
  // Work buffers.
  private readonly innovation: Float64Array;
  private readonly next: Float64Array;
  private readonly phiP: Float64Array;
  private readonly pGt: Float64Array;
  private readonly sMat: Float64Array;
  private readonly luWork: Float64Array;
  private readonly gainT: Float64Array;
  private readonly piv: Int32Array;
  private readonly nextCov: Float64Array;

  constructor(
    private readonly step: ExactStep,
    v0: ArrayLike<number>,
  ) {
    const { n, p } = step;
    this.steadyCov = filterSteadyState(step);
    this.zHat = new Float64Array(n);
    this.cov = Float64Array.from(v0);
    this.gain = new Float64Array(n * p);
    this.innovation = new Float64Array(p);
    this.next = new Float64Array(n);
    this.phiP = new Float64Array(n * n);
    this.pGt = new Float64Array(n * p);
    this.sMat = new Float64Array(p * p);
    this.luWork = new Float64Array(p * p);
    this.gainT = new Float64Array(p * n);
    this.piv = new Int32Array(p);
    this.nextCov = new Float64Array(n * n);
  }

  /** Step k → k + 1 with that step's record increments dy: the gain and P, then ẑ ← Φ ẑ + K (Δy − Γ ẑ). */
  update(dy: ArrayLike<number>, k: number): void {
    if (!this.frozen) this.updateCovariance(k);
    const { n, p, phi, gam } = this.step;
    const { zHat, innovation, next, gain } = this;
    for (let i = 0; i < p; i++) {
      let s = dy[i];
      for (let j = 0; j < n; j++) s -= gam[i * n + j] * zHat[j];
      innovation[i] = s;
    }
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += phi[i * n + j] * zHat[j];
      for (let l = 0; l < p; l++) s += gain[i * p + l] * innovation[l];
      next[i] = s;
    }
    zHat.set(next);
  }

  /** Gain K from the prior covariance, then P ← Φ P Φᵀ + Σ_zz − K S Kᵀ. */
  private updateCovariance(k: number): void {
    const { n, p, phi, gam, szz, szy, syy } = this.step;
    const { cov, phiP, pGt, sMat, luWork, piv, nextCov, gain } = this;
    // ΦP
    phiP.fill(0);
    for (let i = 0; i < n; i++) {
      for (let l = 0; l < n; l++) {
        const x = phi[i * n + l];
        if (x === 0) continue;
        for (let j = 0; j < n; j++) phiP[i * n + j] += x * cov[l * n + j];
      }
    }
    // ΦPΦᵀ + Σ_zz
    for (let i = 0; i < n; i++) {
      for (let j = i; j < n; j++) {
        let s = szz[i * n + j];
        for (let l = 0; l < n; l++) s += phiP[i * n + l] * phi[j * n + l];
        nextCov[i * n + j] = s;
      }
    }
    if (p > 0) {
      // PΓᵀ, S = Γ P Γᵀ + Σ_yy, and M = Φ P Γᵀ + Σ_zy (kept in `gain` until divided by S).
      for (let i = 0; i < n; i++) {
        for (let l = 0; l < p; l++) {
          let s = 0;
          for (let j = 0; j < n; j++) s += cov[i * n + j] * gam[l * n + j];
          pGt[i * p + l] = s;
        }
      }
      for (let a = 0; a < p; a++) {
        for (let b = 0; b < p; b++) {
          let s = syy[a * p + b];
          for (let j = 0; j < n; j++) s += gam[a * n + j] * pGt[j * p + b];
          sMat[a * p + b] = s;
        }
      }
      for (let a = 0; a < p; a++) for (let b = a + 1; b < p; b++) sMat[a * p + b] = sMat[b * p + a] = 0.5 * (sMat[a * p + b] + sMat[b * p + a]);
      for (let i = 0; i < n; i++) {
        for (let l = 0; l < p; l++) {
          let s = szy[i * p + l];
          for (let j = 0; j < n; j++) s += phi[i * n + j] * pGt[j * p + l];
          gain[i * p + l] = s;
        }
      }
      // K = M S⁻¹: solve S Kᵀ = Mᵀ (S symmetric).
      const lu = luWork;
      lu.set(sMat);
      realLuFactor(lu, p, piv);
      const mt = this.gainT;
      for (let i = 0; i < n; i++) for (let l = 0; l < p; l++) mt[l * n + i] = gain[i * p + l];
      realLuSolve(lu, p, piv, mt, n);
      for (let i = 0; i < n; i++) for (let l = 0; l < p; l++) gain[i * p + l] = mt[l * n + i];
      // − K S Kᵀ
      for (let i = 0; i < n; i++) {
        for (let j = i; j < n; j++) {
          let s = 0;
          for (let a = 0; a < p; a++) {
            let ks = 0;
            for (let b = 0; b < p; b++) ks += gain[i * p + a] * sMat[a * p + b] * gain[j * p + b];
            s += ks;
          }
          nextCov[i * n + j] -= s;
        }
      }
    }
    // P reached the steady state last step: the gain just computed from it is kept from now on.
    if (this.atSteady) {
      this.frozen = true;
      return;
    }
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) nextCov[j * n + i] = nextCov[i * n + j];
    this.revision++;
    cov.set(nextCov);
    if (this.steadyCov && relativeChange(this.steadyCov, nextCov, n) <= FILTER_SETTLED) {
      this.atSteady = true;
      this.settledAt = k + 1;
    }
  }
}
