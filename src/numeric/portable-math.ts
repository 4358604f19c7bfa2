/**
 * Elementary functions written out in plain double arithmetic, so that they give the same
 * bits in every JavaScript engine.
 *
 * Why: a state's fingerprint promises bit-for-bit equal curves in the kernel (Node) and in
 * the browser, but engines do not agree on Math.exp, Math.pow, Math.sin, … (Chromium and
 * Node 20 round differently in a few per cent of arguments). The model therefore never calls
 * those: it calls these (a test forbids the platform versions in src/ and widgets/). They
 * are written to agree with Node 20's Math bit for bit (test/numeric/portable-math.test.ts),
 * and use only +, −, ×, ÷, sqrt and bit operations, which the language defines exactly.
 */

// Word access to doubles. Typed arrays use the platform's byte order; find which word is high.
const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);
f64[0] = 1;
const HI = u32[1] === 0x3ff00000 ? 1 : 0;
const LO = 1 - HI;

/** High 32 bits (sign, exponent, top of the mantissa) as a signed integer. */
function high(x: number): number {
  f64[0] = x;
  return u32[HI] | 0;
}

/** Low 32 bits as an unsigned integer. */
function low(x: number): number {
  f64[0] = x;
  return u32[LO];
}

function fromWords(hi: number, lo: number): number {
  u32[HI] = hi >>> 0;
  u32[LO] = lo >>> 0;
  return f64[0];
}

function withHigh(x: number, hi: number): number {
  f64[0] = x;
  u32[HI] = hi >>> 0;
  return f64[0];
}

function withLow(x: number, lo: number): number {
  f64[0] = x;
  u32[LO] = lo >>> 0;
  return f64[0];
}

const HUGE = 1.0e300;
const TINY = 1.0e-300;
const TWO54 = fromWords(0x43500000, 0); // 2^54
const TWOM1000 = fromWords(0x01700000, 0); // 2^-1000

// ln 2 split so that k·LN2_HI is exact for |k| < 2^11.
const LN2_HI = fromWords(0x3fe62e42, 0xfee00000);
const LN2_LO = fromWords(0x3dea39ef, 0x35793c76);
const INV_LN2 = fromWords(0x3ff71547, 0x652b82fe);

// Minimax coefficients of R(t) ≈ t·(e^t+1)/(e^t−1) − 2 on [−ln2/2, ln2/2] (t = r²).
const E1 = fromWords(0x3fc55555, 0x5555553e);
const E2 = fromWords(0xbf66c16c, 0x16bebd93);
const E3 = fromWords(0x3f11566a, 0xaf25de2c);
const E4 = fromWords(0xbebbbd41, 0xc5d26bf1);
const E5 = fromWords(0x3e663769, 0x72bea4d0);

const EXP_OVERFLOW = fromWords(0x40862e42, 0xfefa39ef); // ≈ 709.78
const EXP_UNDERFLOW = fromWords(0xc0874910, 0xd52d3051); // ≈ −745.13

const E = fromWords(0x4005bf0a, 0x8b145769);

/** e^x. */
export function exp(x: number): number {
  // The engine in Node returns the correctly rounded constant here (the series is one unit off).
  if (x === 1) return E;
  let hx = high(x);
  const negative = hx >>> 31;
  hx &= 0x7fffffff;
  let hi = 0;
  let lo = 0;
  let k = 0;
  if (hx >= 0x40862e42) {
    if (hx >= 0x7ff00000) {
      if (((hx & 0xfffff) | low(x)) !== 0) return x + x;
      return negative === 0 ? x : 0;
    }
    if (x > EXP_OVERFLOW) return HUGE * HUGE;
    if (x < EXP_UNDERFLOW) return TWOM1000 * TWOM1000;
  }
  if (hx > 0x3fd62e42) {
    // Reduce: x = k·ln2 + r with |r| ≤ ln2/2.
    if (hx < 0x3ff0a2b2) {
      hi = negative === 0 ? x - LN2_HI : x + LN2_HI;
      lo = negative === 0 ? LN2_LO : -LN2_LO;
      k = 1 - negative - negative;
    } else {
      k = (INV_LN2 * x + (negative === 0 ? 0.5 : -0.5)) | 0;
      hi = x - k * LN2_HI;
      lo = k * LN2_LO;
    }
    x = hi - lo;
  } else if (hx < 0x3e300000) {
    if (HUGE + x > 1) return 1 + x;
  } else {
    k = 0;
  }
  const t = x * x;
  const c = x - t * (E1 + t * (E2 + t * (E3 + t * (E4 + t * E5))));
  if (k === 0) return 1 - ((x * c) / (c - 2) - x);
  const y = 1 - (lo - (x * c) / (2 - c) - hi);
  if (k >= -1021) {
    if (k === 1024) return y * 2 * fromWords(0x7fe00000, 0);
    return y * fromWords((0x3ff00000 + (k << 20)) | 0, 0);
  }
  return y * fromWords((0x3ff00000 + ((k + 1000) << 20)) | 0, 0) * TWOM1000;
}

// Coefficients of the series for log((1+s)/(1−s)) in s², as used below.
const LG1 = fromWords(0x3fe55555, 0x55555593);
const LG2 = fromWords(0x3fd99999, 0x9997fa04);
const LG3 = fromWords(0x3fd24924, 0x94229359);
const LG4 = fromWords(0x3fcc71c5, 0x1d8e78af);
const LG5 = fromWords(0x3fc74664, 0x96cb03de);
const LG6 = fromWords(0x3fc39a09, 0xd078c69f);
const LG7 = fromWords(0x3fc2f112, 0xdf3e5244);

/** Natural logarithm. */
export function log(x: number): number {
  let hx = high(x);
  const lx = low(x);
  let k = 0;
  if (hx < 0x00100000) {
    if (((hx & 0x7fffffff) | lx) === 0) return -Infinity;
    if (hx < 0) return NaN;
    // Subnormal: scale into the normal range.
    k -= 54;
    x *= TWO54;
    hx = high(x);
  }
  if (hx >= 0x7ff00000) return x + x;
  k += (hx >> 20) - 1023;
  hx &= 0x000fffff;
  const i = (hx + 0x95f64) & 0x100000;
  // Normalise x or x/2 into [sqrt(2)/2, sqrt(2)).
  x = withHigh(x, hx | (i ^ 0x3ff00000));
  k += i >> 20;
  const f = x - 1;
  if ((0x000fffff & (2 + hx)) < 3) {
    if (f === 0) {
      if (k === 0) return 0;
      return k * LN2_HI + k * LN2_LO;
    }
    const r = f * f * (0.5 - 0.33333333333333333 * f);
    if (k === 0) return f - r;
    return k * LN2_HI - (r - k * LN2_LO - f);
  }
  const s = f / (2 + f);
  const dk = k;
  const z = s * s;
  let j = hx - 0x6147a;
  const w = z * z;
  const j2 = 0x6b851 - hx;
  const t1 = w * (LG2 + w * (LG4 + w * LG6));
  const t2 = z * (LG1 + w * (LG3 + w * (LG5 + w * LG7)));
  j |= j2;
  const r = t2 + t1;
  if (j > 0) {
    const hfsq = 0.5 * f * f;
    if (k === 0) return f - (hfsq - s * (hfsq + r));
    return dk * LN2_HI - (hfsq - (s * (hfsq + r) + dk * LN2_LO) - f);
  }
  if (k === 0) return f - s * (f - r);
  return dk * LN2_HI - (s * (f - r) - dk * LN2_LO - f);
}

const IVLN10 = fromWords(0x3fdbcb7b, 0x1526e50e);
const LOG10_2HI = fromWords(0x3fd34413, 0x509f6000);
const LOG10_2LO = fromWords(0x3d59fef3, 0x11f12b36);

/** Base-10 logarithm. */
export function log10(x: number): number {
  let hx = high(x);
  let lx = low(x);
  let k = 0;
  if (hx < 0x00100000) {
    if (((hx & 0x7fffffff) | lx) === 0) return -Infinity;
    if (hx < 0) return NaN;
    k -= 54;
    x *= TWO54;
    hx = high(x);
    lx = low(x);
  }
  if (hx >= 0x7ff00000) return x + x;
  if (hx === 0x3ff00000 && lx === 0) return 0;
  k += (hx >> 20) - 1023;
  const i = k < 0 ? 1 : 0;
  hx = (hx & 0x000fffff) | ((0x3ff - i) << 20);
  const y = k + i;
  x = fromWords(hx, lx);
  const z = y * LOG10_2LO + IVLN10 * log(x);
  return z + y * LOG10_2HI;
}

// Coefficients of the rational approximation behind e^x − 1 near zero.
const Q1 = fromWords(0xbfa11111, 0x111110f4);
const Q2 = fromWords(0x3f5a01a0, 0x19fe5585);
const Q3 = fromWords(0xbf14ce19, 0x9eaadbb7);
const Q4 = fromWords(0x3ed0cfca, 0x86e65239);
const Q5 = fromWords(0xbe8afdb7, 0x6e09c32d);

/** e^x − 1, accurate for small x. */
export function expm1(x: number): number {
  let hx = high(x);
  const negative = hx < 0;
  hx &= 0x7fffffff;
  let k = 0;
  let c = 0;
  if (hx >= 0x4043687a) {
    if (hx >= 0x40862e42) {
      if (hx >= 0x7ff00000) {
        if (((hx & 0xfffff) | low(x)) !== 0) return x + x;
        return negative ? -1 : x;
      }
      if (x > EXP_OVERFLOW) return HUGE * HUGE;
    }
    if (negative && x + TINY < 0) return TINY - 1;
  }
  if (hx > 0x3fd62e42) {
    let hi: number;
    let lo: number;
    if (hx < 0x3ff0a2b2) {
      if (!negative) {
        hi = x - LN2_HI;
        lo = LN2_LO;
        k = 1;
      } else {
        hi = x + LN2_HI;
        lo = -LN2_LO;
        k = -1;
      }
    } else {
      k = (INV_LN2 * x + (negative ? -0.5 : 0.5)) | 0;
      hi = x - k * LN2_HI;
      lo = k * LN2_LO;
    }
    x = hi - lo;
    c = hi - x - lo;
  } else if (hx < 0x3c900000) {
    return x;
  } else {
    k = 0;
  }
  const hfx = 0.5 * x;
  const hxs = x * hfx;
  const r1 = 1 + hxs * (Q1 + hxs * (Q2 + hxs * (Q3 + hxs * (Q4 + hxs * Q5))));
  const t = 3 - r1 * hfx;
  let e = hxs * ((r1 - t) / (6 - x * t));
  if (k === 0) return x - (x * e - hxs);
  e = x * (e - c) - c;
  e -= hxs;
  if (k === -1) return 0.5 * (x - e) - 0.5;
  if (k === 1) {
    if (x < -0.25) return -2 * (e - (x + 0.5));
    return 1 + 2 * (x - e);
  }
  if (k <= -2 || k > 56) {
    let y = 1 - (e - x);
    if (k === 1024) y = y * 2 * fromWords(0x7fe00000, 0);
    else y = y * fromWords((0x3ff00000 + (k << 20)) | 0, 0);
    return y - 1;
  }
  let y: number;
  if (k < 20) {
    const t1 = fromWords((0x3ff00000 - (0x200000 >> k)) | 0, 0); // 1 − 2^−k
    y = t1 - (e - x);
  } else {
    const t1 = fromWords((0x3ff - k) << 20, 0); // 2^−k
    y = x - (e + t1);
    y += 1;
  }
  return y * fromWords((0x3ff00000 + (k << 20)) | 0, 0);
}

/** Hyperbolic tangent. */
export function tanh(x: number): number {
  const jx = high(x);
  const ix = jx & 0x7fffffff;
  if (ix >= 0x7ff00000) return jx >= 0 ? 1 / x + 1 : 1 / x - 1;
  let z: number;
  if (ix < 0x40360000) {
    if (ix < 0x3e300000) {
      if (HUGE + x > 1) return x;
    }
    if (ix >= 0x3ff00000) {
      const t = expm1(2 * Math.abs(x));
      z = 1 - 2 / (t + 2);
    } else {
      const t = expm1(-2 * Math.abs(x));
      z = -t / (t + 2);
    }
  } else {
    z = 1 - TINY;
  }
  return jx >= 0 ? z : -z;
}

// sin and cos: reduction by multiples of π/2, then polynomials on [−π/4, π/4].
const S1 = fromWords(0xbfc55555, 0x55555549);
const S2 = fromWords(0x3f811111, 0x1110f8a6);
const S3 = fromWords(0xbf2a01a0, 0x19c161d5);
const S4 = fromWords(0x3ec71de3, 0x57b1fe7d);
const S5 = fromWords(0xbe5ae5e6, 0x8a2b9ceb);
const S6 = fromWords(0x3de5d93a, 0x5acfd57c);
const C1 = fromWords(0x3fa55555, 0x5555554c);
const C2 = fromWords(0xbf56c16c, 0x16c15177);
const C3 = fromWords(0x3efa01a0, 0x19cb1590);
const C4 = fromWords(0xbe927e4f, 0x809c52ad);
const C5 = fromWords(0x3e21ee9e, 0xbdb4b1c4);
const C6 = fromWords(0xbda8fae9, 0xbe8838d4);

function kernelSin(x: number, y: number, iy: number): number {
  const ix = high(x) & 0x7fffffff;
  if (ix < 0x3e400000 && (x | 0) === 0) return x;
  const z = x * x;
  const v = z * x;
  const r = S2 + z * (S3 + z * (S4 + z * (S5 + z * S6)));
  if (iy === 0) return x + v * (S1 + z * r);
  return x - (z * (0.5 * y - v * r) - y - v * S1);
}

function kernelCos(x: number, y: number): number {
  const ix = high(x) & 0x7fffffff;
  if (ix < 0x3e400000 && (x | 0) === 0) return 1;
  const z = x * x;
  const r = z * (C1 + z * (C2 + z * (C3 + z * (C4 + z * (C5 + z * C6)))));
  if (ix < 0x3fd33333) return 1 - (0.5 * z - (z * r - x * y));
  const qx = ix > 0x3fe90000 ? 0.28125 : fromWords(ix - 0x00200000, 0);
  const iz = 0.5 * z - qx;
  const a = 1 - qx;
  return a - (iz - (z * r - x * y));
}

const INV_PIO2 = fromWords(0x3fe45f30, 0x6dc9c883);
const PIO2_1 = fromWords(0x3ff921fb, 0x54400000);
const PIO2_1T = fromWords(0x3dd0b461, 0x1a626331);
const PIO2_2 = fromWords(0x3dd0b461, 0x1a600000);
const PIO2_2T = fromWords(0x3ba3198a, 0x2e037073);
const PIO2_3 = fromWords(0x3ba3198a, 0x2e000000);
const PIO2_3T = fromWords(0x397b839a, 0x252049c1);

// High words of n·π/2 for n = 1 … 32: arguments this close to a multiple need the careful path.
const NPIO2_HW = [
  0x3ff921fb, 0x400921fb, 0x4012d97c, 0x401921fb, 0x401f6a7a, 0x4022d97c, 0x4025fdbb, 0x402921fb, 0x402c463a, 0x402f6a7a, 0x4031475c, 0x4032d97c, 0x40346b9c, 0x4035fdbb, 0x40378fdb, 0x403921fb,
  0x403ab41b, 0x403c463a, 0x403dd85a, 0x403f6a7a, 0x40407e4c, 0x4041475c, 0x4042106c, 0x4042d97c, 0x4043a28c, 0x40446b9c, 0x404534ac, 0x4045fdbb, 0x4046c6cb, 0x40478fdb, 0x404858eb, 0x404921fb,
];

/** Largest |x| reduced here (about 8.2e5); beyond it the platform's functions are used. */
const MEDIUM_LIMIT_HIGH = 0x413921fb;

const reduced = [0, 0];

/** x = n·π/2 + (reduced[0] + reduced[1]); returns n, or undefined when |x| is too large. */
function remPio2(x: number): number | undefined {
  const hx = high(x);
  const ix = hx & 0x7fffffff;
  if (ix <= 0x3fe921fb) {
    reduced[0] = x;
    reduced[1] = 0;
    return 0;
  }
  if (ix < 0x4002d97c) {
    // |x| < 3π/4: n = ±1.
    if (hx > 0) {
      let z = x - PIO2_1;
      if (ix !== 0x3ff921fb) {
        reduced[0] = z - PIO2_1T;
        reduced[1] = z - reduced[0] - PIO2_1T;
      } else {
        z -= PIO2_2;
        reduced[0] = z - PIO2_2T;
        reduced[1] = z - reduced[0] - PIO2_2T;
      }
      return 1;
    }
    let z = x + PIO2_1;
    if (ix !== 0x3ff921fb) {
      reduced[0] = z + PIO2_1T;
      reduced[1] = z - reduced[0] + PIO2_1T;
    } else {
      z += PIO2_2;
      reduced[0] = z + PIO2_2T;
      reduced[1] = z - reduced[0] + PIO2_2T;
    }
    return -1;
  }
  if (ix > MEDIUM_LIMIT_HIGH) return undefined;
  let t = Math.abs(x);
  const n = (t * INV_PIO2 + 0.5) | 0;
  const fn = n;
  let r = t - fn * PIO2_1;
  let w = fn * PIO2_1T;
  if (n < 32 && ix !== NPIO2_HW[n - 1]) {
    reduced[0] = r - w;
  } else {
    // Cancellation possible: subtract further terms of π/2 while bits are lost.
    const j = ix >> 20;
    reduced[0] = r - w;
    let i = j - ((high(reduced[0]) >> 20) & 0x7ff);
    if (i > 16) {
      t = r;
      w = fn * PIO2_2;
      r = t - w;
      w = fn * PIO2_2T - (t - r - w);
      reduced[0] = r - w;
      i = j - ((high(reduced[0]) >> 20) & 0x7ff);
      if (i > 49) {
        t = r;
        w = fn * PIO2_3;
        r = t - w;
        w = fn * PIO2_3T - (t - r - w);
        reduced[0] = r - w;
      }
    }
  }
  reduced[1] = r - reduced[0] - w;
  if (hx < 0) {
    reduced[0] = -reduced[0];
    reduced[1] = -reduced[1];
    return -n;
  }
  return n;
}

/** Sine of x radians. */
export function sin(x: number): number {
  const ix = high(x) & 0x7fffffff;
  if (ix <= 0x3fe921fb) return kernelSin(x, 0, 0);
  if (ix >= 0x7ff00000) return x - x;
  const n = remPio2(x);
  if (n === undefined) return Math.sin(x);
  switch (n & 3) {
    case 0:
      return kernelSin(reduced[0], reduced[1], 1);
    case 1:
      return kernelCos(reduced[0], reduced[1]);
    case 2:
      return -kernelSin(reduced[0], reduced[1], 1);
    default:
      return -kernelCos(reduced[0], reduced[1]);
  }
}

/** Cosine of x radians. */
export function cos(x: number): number {
  const ix = high(x) & 0x7fffffff;
  if (ix <= 0x3fe921fb) return kernelCos(x, 0);
  if (ix >= 0x7ff00000) return x - x;
  const n = remPio2(x);
  if (n === undefined) return Math.cos(x);
  switch (n & 3) {
    case 0:
      return kernelCos(reduced[0], reduced[1]);
    case 1:
      return -kernelSin(reduced[0], reduced[1], 1);
    case 2:
      return -kernelCos(reduced[0], reduced[1]);
    default:
      return kernelSin(reduced[0], reduced[1], 1);
  }
}

// pow: log2(x) in extra precision, times y, then 2^(·).
const BP = [1, 1.5];
const DP_H = [0, fromWords(0x3fe2b803, 0x40000000)];
const DP_L = [0, fromWords(0x3e4cfdeb, 0x43cfd006)];
const TWO53 = fromWords(0x43400000, 0);
const L1 = fromWords(0x3fe33333, 0x33333303);
const L2 = fromWords(0x3fdb6db6, 0xdb6fabff);
const L3 = fromWords(0x3fd55555, 0x518f264d);
const L4 = fromWords(0x3fd17460, 0xa91d4101);
const L5 = fromWords(0x3fcd864a, 0x93c9db65);
const L6 = fromWords(0x3fca7e28, 0x4a454eef);
const LG2_FULL = fromWords(0x3fe62e42, 0xfefa39ef);
const LG2_H = fromWords(0x3fe62e43, 0x00000000);
const LG2_L = fromWords(0xbe205c61, 0x0ca86c39);
const OVT = 8.0085662595372944372e-17; // −(1024 − log2(ovfl + 0.5ulp))
const CP = fromWords(0x3feec709, 0xdc3a03fd); // 2/(3 ln 2)
const CP_H = fromWords(0x3feec709, 0xe0000000);
const CP_L = fromWords(0xbe3e2fe0, 0x145b01f5);
const IVLN2 = fromWords(0x3ff71547, 0x652b82fe);
const IVLN2_H = fromWords(0x3ff71547, 0x60000000);
const IVLN2_L = fromWords(0x3e54ae0b, 0xf85ddf44);

/** x^y with the special cases of the ** operator. */
export function pow(x: number, y: number): number {
  const hx = high(x);
  const lx = low(x);
  const hy = high(y);
  const ly = low(y);
  let ix = hx & 0x7fffffff;
  const iy = hy & 0x7fffffff;

  if ((iy | ly) === 0) return 1;
  if (ix > 0x7ff00000 || (ix === 0x7ff00000 && lx !== 0) || iy > 0x7ff00000 || (iy === 0x7ff00000 && ly !== 0)) return x + y;

  // For x < 0: is y an odd integer (1), an even integer (2) or not an integer (0)?
  let yisint = 0;
  if (hx < 0) {
    if (iy >= 0x43400000) yisint = 2;
    else if (iy >= 0x3ff00000) {
      const k = (iy >> 20) - 0x3ff;
      if (k > 20) {
        const j = ly >>> (52 - k);
        if ((j << (52 - k)) >>> 0 === ly) yisint = 2 - (j & 1);
      } else if (ly === 0) {
        const j = iy >> (20 - k);
        if (j << (20 - k) === iy) yisint = 2 - (j & 1);
      }
    }
  }

  if (ly === 0) {
    if (iy === 0x7ff00000) {
      if (((ix - 0x3ff00000) | lx) === 0) return y - y; // (±1)^±∞ is NaN
      if (ix >= 0x3ff00000) return hy >= 0 ? y : 0;
      return hy < 0 ? -y : 0;
    }
    if (iy === 0x3ff00000) return hy < 0 ? 1 / x : x;
    if (hy === 0x40000000) return x * x;
    if (hy === 0x3fe00000 && hx >= 0) return Math.sqrt(x);
  }

  let ax = Math.abs(x);
  if (lx === 0 && (ix === 0x7ff00000 || ix === 0 || ix === 0x3ff00000)) {
    let z = ax;
    if (hy < 0) z = 1 / z;
    if (hx < 0) {
      if (((ix - 0x3ff00000) | yisint) === 0) z = NaN;
      else if (yisint === 1) z = -z;
    }
    return z;
  }

  let n = (hx >> 31) + 1;
  if ((n | yisint) === 0) return NaN; // negative x to a non-integer power
  let s = 1;
  if ((n | (yisint - 1)) === 0) s = -1; // negative x to an odd integer power

  let t1: number;
  let t2: number;
  if (iy > 0x41e00000) {
    // |y| > 2^31
    if (iy > 0x43f00000) {
      if (ix <= 0x3fefffff) return hy < 0 ? HUGE * HUGE : TINY * TINY;
      if (ix >= 0x3ff00000) return hy > 0 ? HUGE * HUGE : TINY * TINY;
    }
    if (ix < 0x3fefffff) return hy < 0 ? s * HUGE * HUGE : s * TINY * TINY;
    if (ix > 0x3ff00000) return hy > 0 ? s * HUGE * HUGE : s * TINY * TINY;
    // |1 − x| ≤ 2^−20: log(x) from its series.
    const t = ax - 1;
    const w = t * t * (0.5 - t * (0.3333333333333333333333 - t * 0.25));
    const u = IVLN2_H * t;
    const v = t * IVLN2_L - w * IVLN2;
    t1 = withLow(u + v, 0);
    t2 = v - (t1 - u);
  } else {
    n = 0;
    if (ix < 0x00100000) {
      ax *= TWO53;
      n -= 53;
      ix = high(ax);
    }
    n += (ix >> 20) - 0x3ff;
    const j = ix & 0x000fffff;
    ix = j | 0x3ff00000;
    let k: number;
    if (j <= 0x3988e) k = 0;
    else if (j < 0xbb67a) k = 1;
    else {
      k = 0;
      n += 1;
      ix -= 0x00100000;
    }
    ax = withHigh(ax, ix);

    // ss = (ax − bp)/(ax + bp) in two parts.
    let u = ax - BP[k];
    let v = 1 / (ax + BP[k]);
    const ss = u * v;
    const sH = withLow(ss, 0);
    let tH = fromWords(((ix >> 1) | 0x20000000) + 0x00080000 + (k << 18), 0);
    let tL = ax - (tH - BP[k]);
    const sL = v * (u - sH * tH - sH * tL);
    let s2 = ss * ss;
    let r = s2 * s2 * (L1 + s2 * (L2 + s2 * (L3 + s2 * (L4 + s2 * (L5 + s2 * L6)))));
    r += sL * (sH + ss);
    s2 = sH * sH;
    tH = withLow(3 + s2 + r, 0);
    tL = r - (tH - 3 - s2);
    u = sH * tH;
    v = sL * tH + tL * ss;
    const pH = withLow(u + v, 0);
    const pL = v - (pH - u);
    const zH = CP_H * pH;
    const zL = CP_L * pH + pL * CP + DP_L[k];
    const t = n;
    t1 = withLow(zH + zL + DP_H[k] + t, 0);
    t2 = zL - (t1 - t - DP_H[k] - zH);
  }

  // (y1 + y2)·(t1 + t2) with y1 = y rounded to 32 bits.
  const y1 = withLow(y, 0);
  const pL = (y - y1) * t1 + y * t2;
  let pH = y1 * t1;
  let z = pL + pH;
  let j = high(z);
  let i = low(z) | 0;
  if (j >= 0x40900000) {
    if (((j - 0x40900000) | i) !== 0) return s * HUGE * HUGE;
    if (pL + OVT > z - pH) return s * HUGE * HUGE;
  } else if ((j & 0x7fffffff) >= 0x4090cc00) {
    if (((j - 0xc090cc00) | i) !== 0) return s * TINY * TINY;
    if (pL <= z - pH) return s * TINY * TINY;
  }

  // 2^(pH + pL) = 2^n · 2^r with |r| ≤ 1/2.
  i = j & 0x7fffffff;
  let k = (i >> 20) - 0x3ff;
  n = 0;
  if (i > 0x3fe00000) {
    n = (j + (0x00100000 >> (k + 1))) | 0;
    k = ((n & 0x7fffffff) >> 20) - 0x3ff;
    const t = fromWords(n & ~(0x000fffff >> k), 0);
    n = ((n & 0x000fffff) | 0x00100000) >> (20 - k);
    if (j < 0) n = -n;
    pH -= t;
  }
  const t = withLow(pL + pH, 0);
  const u = t * LG2_H;
  const v = (pL - (t - pH)) * LG2_FULL + t * LG2_L;
  z = u + v;
  const w = v - (z - u);
  const tt = z * z;
  const tz = z - tt * (E1 + tt * (E2 + tt * (E3 + tt * (E4 + tt * E5))));
  // This grouping of the correction (inside the divisor) is what Node's engine computes.
  const r = (z * tz) / (tz - 2 - (w + z * w));
  z = 1 - (r - z);
  j = (high(z) + (n << 20)) | 0;
  if (j >> 20 <= 0) z = scale(z, n);
  else z = withHigh(z, j);
  return s * z;
}

/** x·2^n for results that may be subnormal, rounded once. */
function scale(x: number, n: number): number {
  if (n < -1022) {
    // Two steps: the first is exact, so only the last multiplication rounds.
    return x * fromWords((0x3ff00000 + ((n + 54) << 20)) | 0, 0) * fromWords(0x3c900000, 0);
  }
  return x * fromWords((0x3ff00000 + (n << 20)) | 0, 0);
}

/** sqrt(Σ xᵢ²) without overflow, summed with compensation in the order given. */
export function hypot(...values: number[]): number {
  let max = 0;
  let nan = false;
  const abs: number[] = [];
  for (const value of values) {
    const a = Math.abs(Number(value));
    if (Number.isNaN(a)) nan = true;
    else if (a > max) max = a;
    abs.push(a);
  }
  if (max === Infinity) return Infinity;
  if (nan) return NaN;
  if (max === 0) return 0;
  let sum = 0;
  let compensation = 0;
  for (const a of abs) {
    const q = a / max;
    const summand = q * q - compensation;
    const preliminary = sum + summand;
    compensation = preliminary - sum - summand;
    sum = preliminary;
  }
  return Math.sqrt(sum) * max;
}
