/**
 * Matrix exponential by scaling and squaring with a diagonal Padé approximant of degree
 * 3, 5, 7, 9 or 13, chosen from the 1-norm (Higham, SIAM J. Matrix Anal. Appl. 26, 1179
 * (2005), Algorithm 2.3). Only + − × ÷ and an LU solve, so the result has the same bits in
 * every JavaScript engine.
 */
import { identity, mul, norm1 } from "./real-matrix";
import { solve } from "./real-lu";

/** Largest 1-norm for which degree m is accurate to double precision without scaling. */
const THETA: readonly [number, number][] = [
  [3, 1.495585217958292e-2],
  [5, 2.53939833006323e-1],
  [7, 9.504178996162932e-1],
  [9, 2.097847961257068],
];
const THETA_13 = 5.371920351148152;

const PADE: Record<number, readonly number[]> = {
  3: [120, 60, 12, 1],
  5: [30240, 15120, 3360, 420, 30, 1],
  7: [17297280, 8648640, 1995840, 277200, 25200, 1512, 56, 1],
  9: [17643225600, 8821612800, 2075673600, 302702400, 30270240, 2162160, 110880, 3960, 90, 1],
  13: [64764752532480000, 32382376266240000, 7771770303897600, 1187353796428800, 129060195264000, 10559470521600, 670442572800, 33522128640, 1323241920, 40840800, 960960, 16380, 182, 1],
};

/** e^A for a real n×n row-major A. */
export function expm(a: ArrayLike<number>, n: number): Float64Array {
  for (let i = 0; i < n * n; i++) {
    if (!Number.isFinite(a[i])) throw new RangeError(`expm: entry ${i} is ${a[i]}, expected finite`);
  }
  if (n === 0) return new Float64Array(0);
  const norm = norm1(a, n);
  for (const [m, theta] of THETA) if (norm <= theta) return pade(Float64Array.from(a), n, m);
  // Halve until the norm is within the degree-13 range, then square back.
  let s = 0;
  let scaled = norm;
  while (scaled > THETA_13) {
    scaled *= 0.5;
    s++;
  }
  let factor = 1;
  for (let i = 0; i < s; i++) factor *= 0.5;
  const as = new Float64Array(n * n);
  for (let i = 0; i < n * n; i++) as[i] = a[i] * factor;
  let r = pade(as, n, 13);
  for (let i = 0; i < s; i++) r = mul(r, r, n);
  return r;
}

/** r_m(A) = (V − U)⁻¹(V + U) with U the odd and V the even part of the Padé numerator. */
function pade(a: Float64Array, n: number, m: number): Float64Array {
  const b = PADE[m];
  const nn = n * n;
  const eye = identity(n);
  const a2 = mul(a, a, n);
  const u = new Float64Array(nn);
  const v = new Float64Array(nn);
  if (m === 13) {
    const a4 = mul(a2, a2, n);
    const a6 = mul(a4, a2, n);
    const t1 = new Float64Array(nn);
    const t2 = new Float64Array(nn);
    for (let i = 0; i < nn; i++) {
      t1[i] = b[13] * a6[i] + b[11] * a4[i] + b[9] * a2[i];
      t2[i] = b[12] * a6[i] + b[10] * a4[i] + b[8] * a2[i];
    }
    const w1 = mul(a6, t1, n);
    const w2 = mul(a6, t2, n);
    const inner = new Float64Array(nn);
    for (let i = 0; i < nn; i++) {
      inner[i] = w1[i] + b[7] * a6[i] + b[5] * a4[i] + b[3] * a2[i] + b[1] * eye[i];
      v[i] = w2[i] + b[6] * a6[i] + b[4] * a4[i] + b[2] * a2[i] + b[0] * eye[i];
    }
    u.set(mul(a, inner, n));
  } else {
    // Powers A^0, A^2, A^4, … up to A^(m−1).
    const powers: Float64Array[] = [eye, a2];
    while (2 * powers.length <= m) powers.push(mul(powers[powers.length - 1], a2, n));
    const odd = new Float64Array(nn);
    for (let k = 0; k < powers.length; k++) {
      const p = powers[k];
      for (let i = 0; i < nn; i++) {
        odd[i] += b[2 * k + 1] * p[i];
        v[i] += b[2 * k] * p[i];
      }
    }
    u.set(mul(a, odd, n));
  }
  const den = new Float64Array(nn);
  const num = new Float64Array(nn);
  for (let i = 0; i < nn; i++) {
    den[i] = v[i] - u[i];
    num[i] = v[i] + u[i];
  }
  return solve(den, num, n, n);
}
