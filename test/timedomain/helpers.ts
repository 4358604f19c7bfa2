import type { StateSpaceModel } from "../../src/network/model";

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
export function handModel(o: {
  modes: string[];
  A: number[][];
  B: number[][];
  N: number[][];
  C?: number[][];
  D?: number[][];
}): StateSpaceModel {
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
