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
  builder.drive(body.mode.p, amplitude, g);
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
 * One-sided force PSD of radiation-pressure shot noise on a mirror that reflects power P
 * at normal incidence: momentum 2ħk per photon and one-sided photon-flux PSD 2P/(ħω) give
 * S_F = 8 ħ ω P / c².
 */
export function reflectionForcePsd(power: number, wavelength: number): number {
  return (8 * HBAR * opticalAngularFrequency(wavelength) * power) / (SPEED_OF_LIGHT * SPEED_OF_LIGHT);
}
