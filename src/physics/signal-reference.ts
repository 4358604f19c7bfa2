/**
 * How a signal is referred and compared: the quantities its noise can be expressed in
 * (force, displacement, strain) and the reference curves drawn beside every budget.
 */

/** Curves that stand beside every budget, as one-sided PSDs in the signal's own unit. */
export interface ReferenceCurve {
  readonly id: string;
  readonly label: string;
  readonly psd: (omega: number) => number;
}

/** A quantity the signal-referred noise can be expressed in (force, displacement, strain...). */
export interface ReferredQuantity {
  readonly name: string;
  /** SI unit of the amplitude, e.g. "m" (so the ASD is m/√Hz). */
  readonly unit: string;
  /** Multiplies a PSD in signal units to give the PSD of this quantity. */
  readonly psdFactor: (omega: number) => number;
}

export interface SignalReference {
  /** Unit of the signal itself (what b_s multiplies), e.g. "N". */
  readonly signalUnit: string;
  /** The first is the default when a set-up does not say `referTo`. */
  readonly quantities: readonly ReferredQuantity[];
  readonly curves: readonly ReferenceCurve[];
}
