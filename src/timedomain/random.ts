/**
 * Seeded pseudo-random numbers with the same bits everywhere: xoshiro128** (32-bit
 * integer operations only) seeded through splitmix32, and standard normal pairs by the
 * polar form of the Box–Muller transform (Marsaglia & Bray, SIAM Rev. 6, 260 (1964)) with
 * the portable log: it needs no sine or cosine, which are the slow part of the plain form.
 */
import { log } from "../numeric/portable-math";

const TWO_POW_MINUS_53 = 1 / 9007199254740992;
const TWO_POW_26 = 67108864;

export class GaussianSource {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spare = 0;
  private hasSpare = false;

  /** seed: an integer 0 … 2³²−1. */
  constructor(seed: number) {
    let x = seed >>> 0;
    const next = (): number => {
      // splitmix32: spreads one 32-bit seed over the four words of state.
      x = (x + 0x9e3779b9) | 0;
      let z = x;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
      return (z ^ (z >>> 16)) >>> 0;
    };
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next();
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1;
  }

  /** Next 32-bit unsigned integer (xoshiro128**). */
  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5), 7), 9) >>> 0;
    const t = this.s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** Uniform on [0, 1) with 53 random bits. */
  uniform(): number {
    const a = this.nextUint32() >>> 5;
    const b = this.nextUint32() >>> 6;
    return (a * TWO_POW_26 + b) * TWO_POW_MINUS_53;
  }

  /** Standard normal deviate. */
  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    // A point uniform in the unit disc (accepted with probability π/4), then radial rescaling.
    let u = 0;
    let v = 0;
    let s = 0;
    do {
      u = 2 * this.uniform() - 1;
      v = 2 * this.uniform() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const factor = Math.sqrt((-2 * log(s)) / s);
    this.spare = v * factor;
    this.hasSpare = true;
    return u * factor;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}
