import { QuietframeError } from "../errors";
import { unitPhasor } from "../network/linear-form";
import { num, type ComponentKind } from "./types";
import { exp, pow } from "../numeric/portable-math";

/**
 * Light sources emit only fluctuations: in the linearized picture the carrier is a
 * classical drive that the coupler (cavity, probe) takes as a power parameter, and what
 * travels between components are the amplitude and phase quadratures (vacuum PSD = 1).
 */

interface SourceHandle {
  column: number;
}

const sourcePort = [{ name: "out", kind: "optical-out", doc: "The emitted field." }] as const;

/** Unexcited port: vacuum fluctuations only. */
export const vacuum: ComponentKind<SourceHandle> = {
  type: "vacuum",
  summary: "Vacuum input (closes an open port of a beam splitter).",
  params: [],
  ports: sourcePort,
  allocate: (b, c) => ({ column: b.addInputs(c.name, ["amplitude quadrature", "phase quadrature"], [1, 0, 0, 1], "quantum-light") }),
  wire: ({ builder, handle }) => ({ out: builder.inputField(handle.column) }),
};

/** Largest squeeze factor accepted (e^{2r} ≈ 4.9e8): beyond it the anti-squeezed noise swamps any double-precision budget. */
export const MAX_SQUEEZE_FACTOR = 10;
/** The same limit in dB, 10·log10 e^{−2·MAX_SQUEEZE_FACTOR} ≈ −86.86 dB, so "squeezing" and "r" accept the same states. */
export const STRONGEST_SQUEEZING_DB = (-20 * MAX_SQUEEZE_FACTOR) / Math.LN10;
/** Largest classical excess noise accepted (1e10 × shot noise): far above any laser, and its square stays well inside double range. */
export const MAX_EXCESS_NOISE_DB = 100;

/** Laser light: shot-noise-limited by default, with optional classical excess noise. */
export const coherent: ComponentKind<SourceHandle> = {
  type: "coherent",
  summary: "Coherent laser light (quantum noise of a coherent state, optional excess noise).",
  params: [
    {
      name: "amplitudeExcess",
      kind: "decibel",
      doc: "Amplitude-quadrature noise above shot noise in dB (0 dB = shot-noise limited).",
      default: "0 dB",
      min: 0,
      max: MAX_EXCESS_NOISE_DB,
      rangeReason: "excess noise is at or above shot noise (≥ 0 dB) and at most 1e10 times it",
    },
    {
      name: "phaseExcess",
      kind: "decibel",
      doc: "Phase-quadrature noise above shot noise in dB (0 dB = shot-noise limited).",
      default: "0 dB",
      min: 0,
      max: MAX_EXCESS_NOISE_DB,
      rangeReason: "excess noise is at or above shot noise (≥ 0 dB) and at most 1e10 times it",
    },
  ],
  ports: sourcePort,
  allocate: (b, c) => {
    const a = pow(10, num(c, "amplitudeExcess") / 10);
    const p = pow(10, num(c, "phaseExcess") / 10);
    return { column: b.addInputs(c.name, ["amplitude quadrature", "phase quadrature"], [a, 0, 0, p], "quantum-light") };
  },
  wire: ({ builder, handle }) => ({ out: builder.inputField(handle.column) }),
};

/** Squeeze factor r from a squeezing level in dB (10·log10 e^{-2r}, negative for squeezing). */
export function squeezeFactorFromDb(db: number): number {
  return (-db * Math.LN10) / 20;
}

/**
 * Pure squeezed vacuum: noise e^{-2r} along the quadrature at `angle` from the amplitude
 * quadrature and e^{+2r} orthogonal to it (angle 0: amplitude squeezed; 90°: phase squeezed).
 */
export const squeezed: ComponentKind<SourceHandle> = {
  type: "squeezed",
  summary: "Squeezed vacuum (level in dB or squeeze factor r, squeezing angle).",
  params: [
    {
      name: "squeezing",
      kind: "decibel",
      doc: 'Noise of the squeezed quadrature relative to vacuum, e.g. "-10 dB" (give this or r).',
      optional: true,
      min: STRONGEST_SQUEEZING_DB,
      max: 0,
      rangeReason: "squeezing must be a level at or below vacuum (≤ 0 dB), and at most that of r = 10 (e^{2r} ≈ 4.9e8 anti-squeezing, beyond which the budget leaves double-precision range)",
    },
    { name: "r", kind: "number", doc: "Squeeze factor r ≥ 0 (give this or squeezing).", optional: true, min: 0, max: MAX_SQUEEZE_FACTOR },
    {
      name: "angle",
      kind: "angle",
      doc: "Angle of the squeezed quadrature from the amplitude quadrature (0 = amplitude, 90 deg = phase).",
      default: "0 deg",
    },
  ],
  ports: sourcePort,
  crossCheck: (c) => {
    const hasDb = c.given.has("squeezing");
    const hasR = c.given.has("r");
    if (hasDb === hasR) {
      throw squeezingChoiceError(c.path, hasDb);
    }
  },
  allocate: (b, c) => {
    const r = c.given.has("r") ? num(c, "r") : squeezeFactorFromDb(num(c, "squeezing"));
    const [cs, sn] = unitPhasor(num(c, "angle"));
    const vs = exp(-2 * r);
    const va = exp(2 * r);
    // R(θ) diag(e^{-2r}, e^{2r}) R(θ)ᵀ; exact zeros off-diagonal at 0/90° keep the quadratures as separate budget terms.
    const off = (vs - va) * cs * sn;
    const n11 = vs * cs * cs + va * sn * sn;
    const n22 = vs * sn * sn + va * cs * cs;
    return {
      column: b.addInputs(c.name, ["amplitude quadrature", "phase quadrature"], [n11, off, off, n22], "quantum-light", `${c.name}: squeezed light`),
    };
  },
  wire: ({ builder, handle }) => ({ out: builder.inputField(handle.column) }),
};

function squeezingChoiceError(path: string, both: boolean): QuietframeError {
  return new QuietframeError({
    path: `${path}.squeezing`,
    problem: both ? "both squeezing and r are given" : "neither squeezing nor r is given",
    allowed: 'exactly one of squeezing (e.g. "-10 dB") or r (e.g. 1.15)',
  });
}
