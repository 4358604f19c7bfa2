/**
 * One detuned optical mode driven through a coupling mirror, with internal loss: the
 * dynamics of a cavity (with or without a body) and of a filter cavity, in the quadratures of
 * the carrier's frame (Gardiner & Collett input-output relation):
 *   da1/dt = −γ a1 − Δ a2 + k_in q1 + k_0 v1,   da2/dt = −γ a2 + Δ a1 + k_in q2 + k_0 v2,
 *   out = in − k_in a,
 * γ the amplitude half-width (κ/2), Δ = ω_carrier − ω_cavity, k_in = √(2γ_in), k_0 = √(2γ_0).
 */
import type { NetworkBuilder } from "../network/builder";
import { combine, type Field } from "../network/linear-form";
import type { ModeInfo } from "../network/model";

export interface OpticalModeRates {
  /** Amplitude half-width γ in rad/s. */
  readonly halfWidth: number;
  /** Δ in rad/s. */
  readonly detuning: number;
  /** √(2γ_in) and √(2γ_0), in √(rad/s). */
  readonly inputCoupling: number;
  readonly lossCoupling: number;
}

/** Writes the mode's dynamics, driven by `input` and by the loss inputs at `lossColumn`; returns the reflected light. */
export function wireOpticalMode(builder: NetworkBuilder, mode: ModeInfo, rates: OpticalModeRates, input: Field, lossColumn: number): Field {
  const { x: a1, p: a2 } = mode;
  const { halfWidth, detuning, inputCoupling: kIn, lossCoupling: k0 } = rates;
  builder.couple(a1, a1, -halfWidth);
  builder.couple(a2, a2, -halfWidth);
  builder.couple(a1, a2, -detuning);
  builder.couple(a2, a1, detuning);
  builder.drive(a1, input.amplitude, kIn);
  builder.drive(a2, input.phase, kIn);
  builder.drive(a1, builder.input(lossColumn), k0);
  builder.drive(a2, builder.input(lossColumn + 1), k0);
  return {
    amplitude: combine(1, input.amplitude, -kIn, builder.state(a1)),
    phase: combine(1, input.phase, -kIn, builder.state(a2)),
  };
}
