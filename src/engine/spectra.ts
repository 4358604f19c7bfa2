import type { StateSpaceModel } from "../network/model";
import { TransferEvaluator } from "./transfer";

/** Complex values at each frequency: entry [f][k] of an array of p×p (or p) row-major blocks. */
export interface ComplexSeries {
  readonly frequencies: Float64Array;
  /** Size of one block (p·p for spectra, p for responses). */
  readonly blockSize: number;
  readonly re: Float64Array;
  readonly im: Float64Array;
}

/**
 * One-sided symmetrized cross-spectral densities of the chosen outputs,
 * S_y(Ω) = H N H† (p×p Hermitian per frequency; vacuum at a detector gives 1).
 */
export function outputSpectra(model: StateSpaceModel, rows: readonly number[], frequencies: Float64Array): ComplexSeries {
  const p = rows.length;
  const m = model.nInputs;
  const ev = new TransferEvaluator(model, rows);
  const re = new Float64Array(frequencies.length * p * p);
  const im = new Float64Array(frequencies.length * p * p);
  const classical = model.classicalInputs ?? [];
  for (const input of classical) input.requireCovers(frequencies);
  // With classical inputs, N at each frequency is a copy with their PSDs in place of the placeholder.
  const noise = classical.length ? model.N.slice() : model.N;
  for (let f = 0; f < frequencies.length; f++) {
    ev.at(2 * Math.PI * frequencies[f]);
    for (const input of classical) noise[input.column * m + input.column] = input.psdAt(frequencies[f]);
    for (let a = 0; a < p; a++) {
      for (let b = 0; b < p; b++) {
        let sr = 0;
        let si = 0;
        for (let i = 0; i < m; i++) {
          const ar = ev.hRe[a * m + i];
          const ai = ev.hIm[a * m + i];
          if (ar === 0 && ai === 0) continue;
          for (let j = 0; j < m; j++) {
            const nij = noise[i * m + j];
            if (nij === 0) continue;
            const br = ev.hRe[b * m + j];
            const bi = -ev.hIm[b * m + j];
            sr += nij * (ar * br - ai * bi);
            si += nij * (ar * bi + ai * br);
          }
        }
        re[(f * p + a) * p + b] = sr;
        im[(f * p + a) * p + b] = a === b ? 0 : si;
      }
    }
  }
  return { frequencies, blockSize: p * p, re, im };
}

/** Response of the chosen outputs to the signal, h(Ω) = C (−iΩ − A)⁻¹ b_s + d_s (output units per signal unit). */
export function signalResponse(model: StateSpaceModel, rows: readonly number[], frequencies: Float64Array): ComplexSeries {
  return collect(model, rows, frequencies, rows.length, (ev) => [ev.sRe, ev.sIm]);
}

/** Transfer matrix H(Ω) from every white input to the chosen outputs (p×m per frequency). */
export function inputTransfer(model: StateSpaceModel, rows: readonly number[], frequencies: Float64Array): ComplexSeries {
  return collect(model, rows, frequencies, rows.length * model.nInputs, (ev) => [ev.hRe, ev.hIm]);
}

function collect(model: StateSpaceModel, rows: readonly number[], frequencies: Float64Array, blockSize: number, pick: (ev: TransferEvaluator) => [Float64Array, Float64Array]): ComplexSeries {
  const ev = new TransferEvaluator(model, rows);
  const re = new Float64Array(frequencies.length * blockSize);
  const im = new Float64Array(frequencies.length * blockSize);
  for (let f = 0; f < frequencies.length; f++) {
    ev.at(2 * Math.PI * frequencies[f]);
    const [r, i] = pick(ev);
    re.set(r, f * blockSize);
    im.set(i, f * blockSize);
  }
  return { frequencies, blockSize, re, im };
}
