import { cos, sin } from "../numeric/portable-math";
import { zeros } from "./number-blocks";
/**
 * A linear form over the network's unknowns: system states z, white inputs w and the
 * signal s. Every optical field quadrature, detector output and coupling term is one of
 * these, so components can pass light to each other without knowing the global layout.
 */
export interface LinearForm {
  readonly z: Float64Array;
  readonly w: Float64Array;
  s: number;
}

/** Two-photon quadratures of a travelling light field: amplitude (q1) and phase (q2). */
export interface Field {
  readonly amplitude: LinearForm;
  readonly phase: LinearForm;
}

export function zeroForm(nStates: number, nInputs: number): LinearForm {
  return { z: zeros(nStates), w: zeros(nInputs), s: 0 };
}

/** Returns a·x + b·y as a new form (inputs unchanged). */
export function combine(a: number, x: LinearForm, b: number, y: LinearForm): LinearForm {
  const z = zeros(x.z.length);
  const w = zeros(x.w.length);
  for (let i = 0; i < z.length; i++) z[i] = a * x.z[i] + b * y.z[i];
  for (let i = 0; i < w.length; i++) w[i] = a * x.w[i] + b * y.w[i];
  return { z, w, s: a * x.s + b * y.s };
}

export function scaleForm(a: number, x: LinearForm): LinearForm {
  const z = zeros(x.z.length);
  const w = zeros(x.w.length);
  for (let i = 0; i < z.length; i++) z[i] = a * x.z[i];
  for (let i = 0; i < w.length; i++) w[i] = a * x.w[i];
  return { z, w, s: a * x.s };
}

/** a·f + b·g quadrature by quadrature (beam splitters, losses). */
export function combineFields(a: number, f: Field, b: number, g: Field): Field {
  return { amplitude: combine(a, f.amplitude, b, g.amplitude), phase: combine(a, f.phase, b, g.phase) };
}

/**
 * [cos θ, sin θ] with exact zeros at multiples of 90°: cos(π/2) is 6e-17 in floating
 * point, and a phase readout must not leak that much of the (much larger) amplitude
 * quadrature into a signal that is tiny far from resonance.
 */
export function unitPhasor(theta: number): [number, number] {
  const quarterTurns = theta / (Math.PI / 2);
  const k = Math.round(quarterTurns);
  if (Math.abs(quarterTurns - k) < 1e-12) {
    const r = ((k % 4) + 4) % 4;
    return (
      [
        [1, 0],
        [0, 1],
        [-1, 0],
        [0, -1],
      ] as const
    )[r].slice() as [number, number];
  }
  return [cos(theta), sin(theta)];
}
