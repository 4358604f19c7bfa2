/**
 * A signal-recycling mirror at the dark port of an interferometer with arm cavities, in the
 * two-photon picture: what the arms' differential mode receives and what leaves the dark port.
 *
 * The signal-recycling cavity is short against c/Ω (its length enters only as the one-way
 * detuning phase φ), so the mirror closes an instantaneous loop around the arms:
 *   e = τ R(φ) a − ρ R(2φ) f      (light entering the arms: transmitted input, recycled output)
 *   f = e − k d                    (light leaving the arms; k = √(2γ_in), d the arm mode)
 *   b = τ R(φ) f + ρ a             (light leaving the dark port)
 * with ρ, τ the mirror's amplitude reflectivity and transmissivity (ρ² + τ² = 1; −ρ inside,
 * +ρ outside) and R(θ) the rotation of the quadratures by the carrier phase θ. Rotations
 * commute, so each acts as the complex number e^{iθ} on a quadrature pair (q1 + i q2), and
 *   e = α a + β d,  α = τe^{iφ}/(1 + ρe^{2iφ}),  β = ρk e^{2iφ}/(1 + ρe^{2iφ}),
 *   b = ρ' a + λ d, ρ' = (e^{2iφ} + ρ)/(1 + ρe^{2iφ}) (|ρ'| = 1),  λ = −τk e^{iφ}/(1 + ρe^{2iφ}).
 * The loop gain around the arms, ρe^{2iφ} times their reflection −e^{2iβ}, after the minus
 * sign inside the mirror, is +ρ e^{2i(β ± φ)}: that of Buonanno & Chen, Phys. Rev. D 64,
 * 042006 (2001), whose detuning φ this is. φ = 0 is tuned signal recycling (the signal band
 * narrows), φ = 90° tuned resonant sideband extraction (it widens); ρ = 0 is no mirror.
 */
import { unitPhasor } from "../network/linear-form";
import { hypot } from "../numeric/portable-math";

/** A complex number [re, im], acting on a quadrature pair (q1, q2) as the rotation-and-scale it is. */
export type QuadratureFactor = readonly [number, number];

export interface SignalRecyclingLoop {
  /** e = arrivingInput·a + recycled·d: light entering the arms. */
  readonly arrivingInput: QuadratureFactor;
  readonly recycled: QuadratureFactor;
  /** b = reflected·a + leaving·d: light leaving the dark port. */
  readonly reflected: QuadratureFactor;
  readonly leaving: QuadratureFactor;
}

/**
 * The loop's coefficients for a mirror of power transmission T (0 < T ≤ 1), one-way detuning
 * φ (rad) and arm coupling k = √(2γ_in) (√(rad/s)).
 */
export function signalRecyclingLoop(transmission: number, detuning: number, k: number): SignalRecyclingLoop {
  return loopOf(Math.sqrt(transmission), Math.sqrt(1 - transmission), unitPhasor(detuning), unitPhasor(2 * detuning), k);
}

/**
 * The same loop described by the arm mode it leaves behind: signal bandwidth ε and signal
 * detuning λ (rad/s, λ in the convention of a cavity's Δ), for arms of coupling half-width
 * γ_in and loss half-width γ_0. The arm mode's complex rate −γ_0 − γ_in(1 − ρe^{2iφ})/(1 + ρe^{2iφ})
 * equals −ε + iλ, so ρe^{2iφ} = (1 − w)/(1 + w) with w = (ε − γ_0 − iλ)/γ_in; equivalently
 * ε = γ_0 + γ_in(1 − ρ²)/D and λ = 2γ_in ρ sin 2φ/D, D = 1 + 2ρ cos 2φ + ρ² (the signal-recycled
 * interferometer as one detuned cavity, as Buonanno & Chen, Phys. Rev. D 65, 042001 (2002) describe
 * it; exact here, the recycling cavity being short). Needs ε > γ_0 (then ρ < 1).
 */
export function signalRecyclingLoopFromPole(bandwidth: number, detuningRate: number, gammaIn: number, gammaLoss: number): SignalRecyclingLoop {
  const w: QuadratureFactor = [(bandwidth - gammaLoss) / gammaIn, -detuningRate / gammaIn];
  const q = divide([1 - w[0], -w[1]], [1 + w[0], w[1]]);
  const rho = hypot(q[0], q[1]);
  const two: QuadratureFactor = rho === 0 ? [1, 0] : [q[0] / rho, q[1] / rho];
  // e^{iφ} as the principal square root of e^{2iφ} (φ and φ + π give the same spectra).
  const one: QuadratureFactor = [Math.sqrt((1 + two[0]) / 2), (two[1] < 0 ? -1 : 1) * Math.sqrt((1 - two[0]) / 2)];
  return loopOf(Math.sqrt(1 - rho * rho), rho, one, two, Math.sqrt(2 * gammaIn));
}

function loopOf(tau: number, rho: number, one: QuadratureFactor, two: QuadratureFactor, k: number): SignalRecyclingLoop {
  const denominator: QuadratureFactor = [1 + rho * two[0], rho * two[1]];
  return {
    arrivingInput: divide([tau * one[0], tau * one[1]], denominator),
    recycled: divide([rho * k * two[0], rho * k * two[1]], denominator),
    reflected: divide([two[0] + rho, two[1]], denominator),
    leaving: divide([-tau * k * one[0], -tau * k * one[1]], denominator),
  };
}

/**
 * Static rigidity sign of the optical spring: dP/dt = κ·X at Ω → 0 for the arm mode with loop
 * factor `recycled` (β), arm half-width γ and arm coupling k. With the arm block
 * A_o = −γ + kβ = u + iv, κ = −g² v/(u² + v²), so the sign of κ is that of −Im β:
 * negative (restoring, a spring) for 0 < φ < 90°, positive (anti-restoring) for 90° < φ < 180°.
 */
export function springIsRestoring(loop: SignalRecyclingLoop): boolean | undefined {
  const v = loop.recycled[1];
  if (v === 0) return undefined;
  return v > 0;
}

function divide(a: QuadratureFactor, b: QuadratureFactor): [number, number] {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
}
