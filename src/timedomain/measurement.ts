/**
 * Noise matrices of continuous homodyne measurement of all the model's detector outputs.
 * With white inputs of symmetrized correlation (N/2)δ(t − t'):
 *   Q = B (N/2) Bᵀ  (state diffusion),  R = D (N/2) Dᵀ  (record noise),  S = B (N/2) Dᵀ  (their correlation).
 */
import { QuietframeError } from "../errors";
import { diffusionMatrix } from "../engine/covariance";
import type { StateSpaceModel } from "../network/model";
import { multiply, transpose } from "../linalg/real-matrix";

export interface MeasurementNoise {
  readonly n: number;
  readonly p: number;
  readonly q: Float64Array;
  /** p×p */
  readonly r: Float64Array;
  /** n×p */
  readonly s: Float64Array;
}

export function measurementNoise(model: StateSpaceModel): MeasurementNoise {
  const n = model.nStates;
  const m = model.nInputs;
  const p = model.nOutputs;
  const halfN = model.N.map((x) => 0.5 * x);
  const dn = multiply(model.D, halfN, p, m, m);
  const r = multiply(dn, transpose(model.D, p, m), p, m, p);
  const s = multiply(multiply(model.B, halfN, n, m, m), transpose(model.D, p, m), n, m, p);
  for (let i = 0; i < p; i++) {
    for (let j = i + 1; j < p; j++) {
      const x = 0.5 * (r[i * p + j] + r[j * p + i]);
      r[i * p + j] = x;
      r[j * p + i] = x;
    }
  }
  checkRecordNoise(model, r, p);
  return { n, p, q: diffusionMatrix(model), r, s };
}

/** R below this fraction of an output's own noise counts as singular (rounding level). */
const SINGULAR_FRACTION = 1e-12;

/**
 * The Kalman–Bucy filter needs R⁻¹: every output must carry white noise that no other
 * output shares. Pivoted Cholesky finds the outputs that do not; they are named.
 */
function checkRecordNoise(model: StateSpaceModel, r: Float64Array, p: number): void {
  const a = Float64Array.from(r);
  const done = new Array<boolean>(p).fill(false);
  const bad: number[] = [];
  for (let step = 0; step < p; step++) {
    let pick = -1;
    for (let i = 0; i < p; i++) if (!done[i] && (pick < 0 || a[i * p + i] > a[pick * p + pick])) pick = i;
    done[pick] = true;
    const d = a[pick * p + pick];
    if (!(d > SINGULAR_FRACTION * r[pick * p + pick]) || !(d > 0)) {
      for (let i = 0; i < p; i++) if (i === pick || !done[i]) if (!(a[i * p + i] > SINGULAR_FRACTION * r[i * p + i])) bad.push(i);
      break;
    }
    for (let i = 0; i < p; i++) {
      if (done[i]) continue;
      const f = a[i * p + pick] / d;
      for (let j = 0; j < p; j++) if (!done[j]) a[i * p + j] -= f * a[pick * p + j];
    }
  }
  if (bad.length === 0) return;
  const names = [...new Set(bad.map((i) => model.outputs[i].owner))];
  throw new QuietframeError({
    path: "readout",
    value: names,
    problem:
      `the record noise R = D(N/2)Dᵀ of the detector output(s) ${names.map((x) => `'${x}'`).join(", ")} is singular: ` +
      "an output without white noise of its own would be a noiseless measurement, for which the filter is not defined",
    allowed: "detector outputs that each see independent vacuum or technical noise (e.g. efficiency < 100 %, or distinct beams)",
  });
}
