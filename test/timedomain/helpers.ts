import { assemble } from "../../src/setup/assemble";
import type { StateSpaceModel } from "../../src/network/model";
import { loadSetup } from "../../src/pipeline";

/** Row-major Float64Array → nested rows, for mathjs. */
export function toRows(a: ArrayLike<number>, n: number, c = n): number[][] {
  return Array.from({ length: n }, (_, i) => Array.from({ length: c }, (_, j) => a[i * c + j]));
}

export function fromRows(rows: number[][]): Float64Array {
  return Float64Array.from(rows.flat());
}

/** Largest |a − b| relative to the largest |b|. */
export function relativeMatrixError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let diff = 0;
  let size = 0;
  for (let i = 0; i < b.length; i++) {
    diff = Math.max(diff, Math.abs(a[i] - b[i]));
    size = Math.max(size, Math.abs(b[i]));
  }
  return diff / size;
}

/**
 * A hand-written model (no components): n states in conjugate pairs (x_k = 2k, p_k = 2k+1),
 * white inputs with one-sided noise N, outputs y = C z + D w. Used where a closed form is
 * easiest to state directly in A, B, C, D, N.
 */
export function handModel(o: { modes: string[]; A: number[][]; B: number[][]; N: number[][]; C?: number[][]; D?: number[][] }): StateSpaceModel {
  const n = o.A.length;
  const m = o.N.length;
  const p = o.C?.length ?? 0;
  return {
    nStates: n,
    nInputs: m,
    nOutputs: p,
    A: fromRows(o.A),
    B: fromRows(o.B),
    C: fromRows(o.C ?? []),
    D: fromRows(o.D ?? []),
    N: fromRows(o.N),
    signalB: new Float64Array(n),
    signalD: new Float64Array(p),
    modes: o.modes.map((owner, k) => ({ owner, kind: "mechanical" as const, label: `${owner} mode`, x: 2 * k, p: 2 * k + 1 })),
    inputs: Array.from({ length: m }, (_, i) => ({ owner: "bath", label: `input ${i}` })),
    groups: [],
    outputs: Array.from({ length: p }, (_, i) => ({ owner: `detector${i}`, label: `output ${i}` })),
  };
}

/**
 * A stiff set-up (invented for the tests): a Q = 1e7 oscillator behind a cavity whose field
 * decays in ~1e-8 s while the oscillator rings for ~16 s.
 */
export function stiffCavityBody(): StateSpaceModel {
  return assemble(
    loadSetup({
      format: "quietframe.setup",
      version: 1,
      components: [
        { name: "light", type: "coherent" },
        { name: "body", type: "oscillator", params: { mass: "10 ng", frequency: "100 kHz", Q: 1e7, temperature: "4 K", damping: "symmetric" } },
        { name: "cavity", type: "cavity", params: { linewidth: "16 MHz", inputCoupling: 0.9, g0: "100 Hz", photons: 1e5 } },
        { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: 0.8 } },
      ],
      connections: [
        ["light.out", "cavity.in"],
        ["cavity.out", "detector.in"],
        ["cavity.mechanics", "body.body"],
      ],
      readout: ["detector"],
      signal: { kind: "force", on: "body", referTo: "displacement" },
    }),
  ).model;
}
