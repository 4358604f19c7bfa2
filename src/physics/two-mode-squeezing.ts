/**
 * Noise of two-mode squeezed (EPR) light, shared by the entangled-source component and the
 * entanglement measures. Quadrature order: X1, P1, X2, P2 (amplitude and phase of arm 1,
 * then of arm 2). One-sided spectral densities with vacuum = 1; the covariance of a mode with
 * a flat spectrum over a band is half of these (vacuum variance 1/2).
 *
 * Lossless and white: S = [[c, 0, s, 0], [0, c, 0, −s], [s, 0, c, 0], [0, −s, 0, c]] with
 * c = cosh 2r, s = sinh 2r: amplitude quadratures correlated, phase quadratures
 * anti-correlated, so X1 − X2 and P1 + P2 each have 2e^{−2r} (variance e^{−2r}).
 * Power transmission η_j of arm j mixes in vacuum: c → η_j c + 1 − η_j on arm j's diagonal,
 * s → √(η1 η2) s off the diagonal.
 */
import { expm1, tanh } from "../numeric/portable-math";

export interface TwoModeSqueezing {
  /** Squeeze factor r ≥ 0 (at zero sideband frequency when a bandwidth is given). */
  readonly r: number;
  /** Power transmission of arm 1 (0…1). */
  readonly efficiency1: number;
  /** Power transmission of arm 2 (0…1). */
  readonly efficiency2: number;
  /**
   * Linewidth κ/2π (Hz, FWHM) of each of the two equal cavity modes of a non-degenerate
   * parametric oscillator below threshold; absent or Infinity for a white source.
   */
  readonly bandwidth?: number;
}

/** [cosh 2r, sinh 2r] without cancellation at small r. */
export function coshSinh2r(r: number): [number, number] {
  const up = expm1(2 * r);
  const down = expm1(-2 * r);
  return [1 + 0.5 * (up + down), 0.5 * (up - down)];
}

/** The 4×4 one-sided noise matrix (row-major) of the symmetric form [[a1,0,x,0],[0,a1,0,−x],[x,0,a2,0],[0,−x,0,a2]]. */
function epForm(c: number, s: number, eta1: number, eta2: number): Float64Array {
  const a1 = eta1 * c + (1 - eta1);
  const a2 = eta2 * c + (1 - eta2);
  const x = Math.sqrt(eta1 * eta2) * s;
  return Float64Array.of(a1, 0, x, 0, 0, a1, 0, -x, x, 0, a2, 0, 0, -x, 0, a2);
}

/** White two-mode squeezed light after the arm losses (no bandwidth). */
export function whiteTwoModeNoise(p: TwoModeSqueezing): Float64Array {
  const [c, s] = coshSinh2r(p.r);
  return epForm(c, s, p.efficiency1, p.efficiency2);
}

/**
 * Pump parameter ε of the parametric oscillator (rad/s) that gives squeeze factor r at zero
 * sideband frequency: the sum and difference modes decay at κ/2 ∓ ε, and
 * ((κ/2 − ε)/(κ/2 + ε))² = e^{−2r} ⇔ ε = (κ/2) tanh(r/2). Threshold is ε = κ/2 (r → ∞).
 */
export function parametricPump(kappa: number, r: number): number {
  return (kappa / 2) * tanh(r / 2);
}

/**
 * One-sided noise matrix at angular sideband frequency Ω. With a bandwidth, each pair of
 * output combinations is filtered by the cavity: the squeezed one has
 * |H₋|² = ((κ/2 − ε)² + Ω²)/((κ/2 + ε)² + Ω²) and the anti-squeezed one |H₊|² = 1/|H₋|², so
 * c(Ω) = (|H₊|² + |H₋|²)/2 and s(Ω) = (|H₊|² − |H₋|²)/2: a pure two-mode squeezed state at
 * every frequency, with e^{−2r(Ω)} = |H₋(Ω)|².
 */
export function twoModeSpectrum(p: TwoModeSqueezing, omega: number): Float64Array {
  if (p.bandwidth === undefined || p.bandwidth === Infinity) return whiteTwoModeNoise(p);
  const kappa = 2 * Math.PI * p.bandwidth;
  const eps = parametricPump(kappa, p.r);
  const w2 = omega * omega;
  const slow = kappa / 2 - eps;
  const fast = kappa / 2 + eps;
  // |H₊|² = 1 + 2κε/((κ/2 − ε)² + Ω²), |H₋|² = 1 − 2κε/((κ/2 + ε)² + Ω²).
  const plus = (2 * kappa * eps) / (slow * slow + w2);
  const minus = (2 * kappa * eps) / (fast * fast + w2);
  return epForm(1 + 0.5 * (plus - minus), 0.5 * (plus + minus), p.efficiency1, p.efficiency2);
}
