/**
 * Linearized radiation-pressure coupling in the project's quadratures. With a cavity
 * frequency ω_c(x) = ω_c − G x and a real mean intracavity amplitude ā, the interaction
 * −ħ G ā √2 x δa1 becomes −ħ g X δa1 with g = √2 G ā x_s, so that
 *   dP/dt += g·δa1  (radiation-pressure force)   and   dδa2/dt += g·X  (phase readout).
 * A travelling-wave QND probe has the same structure with δa1 the incoming amplitude quadrature.
 */
import { HBAR, SPEED_OF_LIGHT } from "../constants";
import type { NetworkBuilder } from "../network/builder";
import type { LinearForm } from "../network/linear-form";
import type { MechanicalBody } from "./mechanical-body";
export function pushOnBody(builder: NetworkBuilder, body: MechanicalBody, amplitude: LinearForm, g: number): void {
  builder.pushByLight(body.mode.p, amplitude, g);
}

/** Zero-point displacement √(ħ/(2mΩ_m)) of an oscillator body. */
export function zeroPointDisplacement(body: MechanicalBody): number {
  return Math.sqrt(HBAR / (2 * body.mass * body.omega));
}

/** Angular frequency of light of the given vacuum wavelength. */
export function opticalAngularFrequency(wavelength: number): number {
  return (2 * Math.PI * SPEED_OF_LIGHT) / wavelength;
}

/**
 * Mean intracavity photon number of a cavity driven through its coupling mirror with power P:
 * n = κ_in P / (ħ ω_L (κ²/4 + Δ²)), from the steady state ā = √κ_in ā_in/(κ/2 − iΔ) with
 * |ā_in|² = P/(ħω_L) (Aspelmeyer, Kippenberg & Marquardt, Rev. Mod. Phys. 86, 1391 (2014), Sec. II.B).
 * κ is the full linewidth and κ_in its coupling-mirror part, both in rad/s; Δ in rad/s.
 */
export function intracavityPhotons(power: number, wavelength: number, kappa: number, delta: number, kIn: number): number {
  return (kIn * power) / (HBAR * opticalAngularFrequency(wavelength) * ((kappa * kappa) / 4 + delta * delta));
}

/** The input power that holds `photons` in the cavity: the same relation solved for P. */
export function cavityInputPower(photons: number, wavelength: number, kappa: number, delta: number, kIn: number): number {
  return (photons * HBAR * opticalAngularFrequency(wavelength) * ((kappa * kappa) / 4 + delta * delta)) / kIn;
}

/**
 * One-sided force PSD of radiation-pressure shot noise on a mirror that reflects power P
 * at normal incidence: momentum 2ħk per photon and one-sided photon-flux PSD 2P/(ħω) give
 * S_F = 8 ħ ω P / c².
 */
export function reflectionForcePsd(power: number, wavelength: number): number {
  return (8 * HBAR * opticalAngularFrequency(wavelength) * power) / (SPEED_OF_LIGHT * SPEED_OF_LIGHT);
}

/**
 * Reflected power of a travelling-wave position probe that reaches the measurement rate Γ
 * (rad/s) on an oscillator of mass m and angular frequency Ω_m. The rate is defined as
 * Γ = x_zpf² S̄_FF/ħ² with the double-sided S̄_FF = S_F/2 and x_zpf² = ħ/(2mΩ_m) (Clerk et al.,
 * Rev. Mod. Phys. 82, 1155 (2010)), so S_F = 4mΩ_mħΓ; with S_F = 8ħωP/c² (reflectionForcePsd)
 * the power is P = mΩ_mΓc²/(2ω) = mΩ_mΓcλ/(4π).
 */
export function probePowerForMeasurementRate(rate: number, wavelength: number, mass: number, omega: number): number {
  return (mass * omega * rate * SPEED_OF_LIGHT * SPEED_OF_LIGHT) / (2 * opticalAngularFrequency(wavelength));
}
