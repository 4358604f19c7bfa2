import { describe, expect, it } from "vitest";
import { SPEED_OF_LIGHT } from "../../src/constants";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { ASTRONOMICAL_UNIT, chirpMass, HORIZON_TO_RANGE, inspiralHorizon, inspiralRange, iscoFrequency, MEGAPARSEC, PARSEC, strainCurve, volumeGain } from "../../src/reach";
import { quietframeErrorOf } from "../helpers/errors";
import { setup } from "../helpers/setups";

/**
 * Inspiral reach against closed forms.
 *
 * Matched-filter SNR of an optimally oriented binary (Cutler & Flanagan, Phys. Rev. D 49, 2658
 * (1994); Allen et al., Phys. Rev. D 85, 122006 (2012)), leading-order amplitude
 *   |h(f)| = (1/D) √(5/24) π^(−2/3) c (G Mc/c³)^(5/6) f^(−7/6),  f ≤ f_ISCO = c³/(6^(3/2) π G M),
 *   SNR² = 4 ∫ |h|²/S_h df.
 * For S_h = S0 on [f1, f2] (and infinite outside) the integral is elementary:
 *   ∫ f^(−7/3) df = (3/4)(f1^(−4/3) − f2^(−4/3)),  so  D = (2A/ρ) √((3/4)(f1^(−4/3) − f2^(−4/3))/S0).
 * Range = horizon/2.2648 (Finn & Chernoff, Phys. Rev. D 47, 2198 (1993); Allen et al. 2012).
 *
 * Tolerance 1e-12 on these: the library integrates the power law through each pair of grid
 * points exactly, and a flat PSD makes the integrand exactly f^(−7/3) between grid points,
 * so the only error left is rounding (a few ulps per segment over a few hundred segments).
 */
const c = SPEED_OF_LIGHT;
/** G·M☉: the nominal solar mass parameter GM☉ = 1.327 124 4e20 m³ s⁻² (IAU 2015 Resolution B3), used directly. */
const GM_SUN = 1.3271244e20;

function amplitude(m1: number, m2: number): number {
  const mc = Math.pow(m1 * m2, 0.6) / Math.pow(m1 + m2, 0.2);
  return Math.sqrt(5 / 24) * Math.pow(Math.PI, -2 / 3) * c * Math.pow((mc * GM_SUN) / c ** 3, 5 / 6);
}

function flatBandHorizon(f1: number, f2: number, s0: number, m1 = 1.4, m2 = 1.4, snr = 8): number {
  const integral = 0.75 * (Math.pow(f1, -4 / 3) - Math.pow(f2, -4 / 3));
  return ((2 * amplitude(m1, m2)) / snr) * Math.sqrt(integral / s0);
}

function logGrid(f1: number, f2: number, n: number): Float64Array {
  const g = Float64Array.from({ length: n }, (_, i) => f1 * Math.pow(f2 / f1, i / (n - 1)));
  g[0] = f1;
  g[n - 1] = f2;
  return g;
}

function rel(a: number, b: number): number {
  return Math.abs(a / b - 1);
}

const S0 = 1e-46; // (1e-23 /√Hz)²

describe("astronomical units", () => {
  it("1 pc = 648000/π au with au = 149 597 870 700 m (IAU 2012 B2, IAU 2015 B2): 3.085 677 581 491 367e16 m (value from memory)", () => {
    expect(ASTRONOMICAL_UNIT).toBe(149597870700);
    expect(rel(PARSEC, 3.085677581491367e16)).toBeLessThan(1e-15);
    expect(MEGAPARSEC).toBe(1e6 * PARSEC);
  });
});

describe("binary parameters", () => {
  it("f_ISCO for 1.4 + 1.4 M☉ ≈ 1570 Hz (from memory; to 1 %) and equals c³/(6^(3/2)πGM)", () => {
    expect(rel(iscoFrequency(2.8), 1570)).toBeLessThan(0.01);
    expect(rel(iscoFrequency(2.8), c ** 3 / (Math.pow(6, 1.5) * Math.PI * 2.8 * GM_SUN))).toBeLessThan(1e-14);
  });

  it("chirp mass of equal masses m is m·2^(−1/5) (1.2188 M☉ for 1.4 + 1.4)", () => {
    expect(rel(chirpMass(1.4, 1.4), 1.4 * Math.pow(2, -0.2))).toBeLessThan(1e-14);
    expect(chirpMass(1.4, 1.4)).toBeCloseTo(1.2188, 4);
    expect(rel(chirpMass(10, 1.4), Math.pow(14, 0.6) / Math.pow(11.4, 0.2))).toBeLessThan(1e-14);
  });
});

describe("horizon of a flat noise band against the closed form", () => {
  it("grid exactly [f1, f2] below f_ISCO: D = (2A/ρ)√((3/4)(f1^(−4/3) − f2^(−4/3))/S0), to 1e-12", () => {
    const f = logGrid(10, 1000, 200);
    const h = inspiralHorizon(f, new Float64Array(f.length).fill(S0));
    expect(rel(h.metres, flatBandHorizon(10, 1000, S0))).toBeLessThan(1e-12);
    expect(rel(h.megaparsecs, h.metres / MEGAPARSEC)).toBeLessThan(1e-15);
    expect(h.band).toEqual([10, 1000]);
  });

  it("infinite noise outside [f1, f2] on a wider grid counts nothing there", () => {
    const f = logGrid(1, 1e4, 401); // 100 points per decade: 10 Hz and 1 kHz are grid points
    const i1 = 100;
    const i2 = 300;
    expect(rel(f[i1], 10)).toBeLessThan(1e-14);
    expect(rel(f[i2], 1000)).toBeLessThan(1e-14);
    const s = Float64Array.from(f, (_, i) => (i >= i1 && i <= i2 ? S0 : Infinity));
    const h = inspiralHorizon(f, s);
    expect(rel(h.metres, flatBandHorizon(f[i1], f[i2], S0))).toBeLessThan(1e-12);
  });

  it("fMin between grid points and f_ISCO inside the grid: the band is [fMin, f_ISCO], to 1e-12", () => {
    const f = logGrid(5, 5000, 157);
    const fIsco = c ** 3 / (Math.pow(6, 1.5) * Math.PI * 2.8 * GM_SUN);
    const h = inspiralHorizon(f, new Float64Array(f.length).fill(S0), { fMin: 12.345 });
    expect(rel(h.band[1], fIsco)).toBeLessThan(1e-14);
    expect(h.band[0]).toBe(12.345);
    expect(rel(h.metres, flatBandHorizon(12.345, fIsco, S0))).toBeLessThan(1e-12);
  });

  it("other masses and thresholds: 10 + 1.4 M☉ at SNR 12", () => {
    const f = logGrid(20, 300, 90);
    const h = inspiralHorizon(f, new Float64Array(f.length).fill(S0), { m1: 10, m2: 1.4, snr: 12 });
    expect(rel(h.metres, flatBandHorizon(20, 300, S0, 10, 1.4, 12))).toBeLessThan(1e-12);
  });

  it("a blind point (infinite PSD) removes exactly its two neighbouring segments", () => {
    const f = logGrid(10, 1000, 201);
    const k = 120;
    const s = Float64Array.from(f, (_, i) => (i === k ? Infinity : S0));
    const I = 0.75 * (Math.pow(f[0], -4 / 3) - Math.pow(f[k - 1], -4 / 3) + Math.pow(f[k + 1], -4 / 3) - Math.pow(f[200], -4 / 3));
    const want = ((2 * amplitude(1.4, 1.4)) / 8) * Math.sqrt(I / S0);
    expect(rel(inspiralHorizon(f, s).metres, want)).toBeLessThan(1e-12);
  });
});

describe("range and volume", () => {
  const f = logGrid(10, 3000, 300);
  // A bucket-shaped curve (seismic wall, flat floor, shot-noise rise), not a power law.
  const bucket = Float64Array.from(f, (x) => S0 * (Math.pow(30 / x, 8) + 1 + Math.pow(x / 200, 2)));

  it("range = horizon / 2.2648 (Finn & Chernoff 1993; Allen et al. 2012)", () => {
    expect(HORIZON_TO_RANGE).toBe(2.2648);
    const h = inspiralHorizon(f, bucket);
    const r = inspiralRange(f, bucket);
    expect(r.metres).toBe(h.metres / 2.2648);
    expect(r.megaparsecs).toBe(r.metres / MEGAPARSEC);
  });

  it("halving the ASD doubles the range and multiplies the surveyed volume by 8 (range ∝ 1/ASD; exact here)", () => {
    const better = bucket.map((v) => v / 4);
    expect(rel(inspiralRange(f, better).metres, 2 * inspiralRange(f, bucket).metres)).toBeLessThan(1e-14);
    expect(rel(volumeGain({ frequencies: f, strainPsd: better }, { frequencies: f, strainPsd: bucket }), 8)).toBeLessThan(1e-14);
  });

  it("band-limited (band below both f_ISCO): horizon ∝ Mc^(5/6)", () => {
    const g = logGrid(10, 200, 120); // f_ISCO(20 M☉) ≈ 220 Hz
    const s = Float64Array.from(g, (x) => S0 * (1 + Math.pow(40 / x, 4)));
    const light = inspiralHorizon(g, s, { m1: 1.4, m2: 1.4 });
    const heavy = inspiralHorizon(g, s, { m1: 10, m2: 10 });
    expect(heavy.fIsco).toBeGreaterThan(200);
    expect(rel(heavy.metres / light.metres, Math.pow(chirpMass(10, 10) / chirpMass(1.4, 1.4), 5 / 6))).toBeLessThan(1e-12);
  });
});

describe("integration rule on a smooth curve", () => {
  /*
   * The rule interpolates ψ = ln g linearly in t = ln f. Linear interpolation over a step h is
   * off by at most (h²/8) max|ψ''|, so the integral's relative error is below that bound.
   * For S = S0[(f0/f)⁴ + 2 + (f/f0)²], ψ'' = −(ln S)'' is minus the variance of the exponents
   * {−4, 0, 2} under weights proportional to the three terms: |ψ''| ≤ 9. The error is second
   * order, so doubling the resolution divides it by about 4. Reference: composite Simpson in
   * t on 2^16 intervals (its error, ~h⁴, is far below the tolerances here).
   */
  const f0 = 100;
  const S = (x: number) => S0 * (Math.pow(f0 / x, 4) + 2 + Math.pow(x / f0, 2));
  const [fa, fb] = [10, 1000];

  function simpsonReference(): number {
    const n = 1 << 16;
    const t0 = Math.log(fa);
    const dt = (Math.log(fb) - t0) / n;
    let sum = 0;
    for (let i = 0; i <= n; i++) {
      const x = Math.exp(t0 + i * dt);
      const y = (Math.pow(x, -7 / 3) / S(x)) * x; // df = f dt
      sum += (i === 0 || i === n ? 1 : i % 2 ? 4 : 2) * y;
    }
    const I = (sum * dt) / 3;
    return ((2 * amplitude(1.4, 1.4)) / 8) * Math.sqrt(I);
  }

  it("error within (h²/8)·9 and falling as h²", () => {
    const want = simpsonReference();
    const err = (n: number) => {
      const f = logGrid(fa, fb, n);
      return Math.abs(inspiralHorizon(f, Float64Array.from(f, S)).metres / want - 1);
    };
    const h = Math.log(fb / fa) / 99;
    const e100 = err(100);
    const e199 = err(199); // half the step
    // The horizon is √I, so its relative error is half that of I.
    expect(e100).toBeLessThan(((h * h) / 8) * 9 * 0.5);
    expect(e100 / e199).toBeGreaterThan(3.5);
    expect(e100 / e199).toBeLessThan(4.5);
  });
});

describe("bad input names the field, the value and what is allowed", () => {
  const f = logGrid(10, 1000, 20);
  const s = new Float64Array(20).fill(S0);
  it.each([
    [
      "frequencies[3]",
      () =>
        inspiralHorizon(
          Float64Array.from(f, (x, i) => (i === 3 ? f[2] : x)),
          s,
        ),
    ],
    [
      "frequencies[0]",
      () =>
        inspiralHorizon(
          Float64Array.from(f, (x, i) => (i === 0 ? -1 : x)),
          s,
        ),
    ],
    [
      "strainPsd[5]",
      () =>
        inspiralHorizon(
          f,
          Float64Array.from(s, (x, i) => (i === 5 ? -x : x)),
        ),
    ],
    [
      "strainPsd[7]",
      () =>
        inspiralHorizon(
          f,
          Float64Array.from(s, (x, i) => (i === 7 ? NaN : x)),
        ),
    ],
    ["strainPsd", () => inspiralHorizon(f, s.subarray(1))],
    ["options.m1", () => inspiralHorizon(f, s, { m1: 0 })],
    ["options.snr", () => inspiralHorizon(f, s, { snr: -8 })],
    ["options.fMin", () => inspiralHorizon(f, s, { fMin: 2000 })],
    ["frequencies", () => inspiralHorizon(logGrid(2000, 3000, 5), new Float64Array(5).fill(S0))],
  ])("%s", (path, fn) => {
    const e = quietframeErrorOf(fn);
    expect(e.path).toBe(path);
    expect(e.allowed).toBeTruthy();
  });
});

describe("reach of an evaluated interferometer budget", () => {
  const ifo = (referTo?: string) =>
    loadSetup(
      setup(
        [
          { name: "light", type: "vacuum" },
          { name: "ifo", type: "interferometer", params: { mass: "40 kg", armLength: "4 km", armBandwidth: "100 Hz", power: "800 kW" } },
          { name: "detector", type: "homodyne", params: { angle: "90 deg" } },
        ],
        [
          ["light.out", "ifo.in"],
          ["ifo.out", "detector.in"],
        ],
        { signal: referTo ? { kind: "strain", on: "ifo", referTo } : { kind: "strain", on: "ifo" } },
      ),
    );

  it("takes the total strain PSD of a budget and gives a finite range", () => {
    const budget = evaluateSetup(ifo(), { from: 10, to: 5000, points: 300 }).budget;
    const curve = strainCurve(budget);
    expect(curve.strainPsd).toBe(budget.total);
    const r = inspiralRange(curve.frequencies, curve.strainPsd);
    expect(Number.isFinite(r.megaparsecs) && r.megaparsecs > 0).toBe(true);
  });

  it("refuses a budget referred to displacement", () => {
    const budget = evaluateSetup(ifo("displacement"), { from: 10, to: 5000, points: 20 }).budget;
    const e = quietframeErrorOf(() => strainCurve(budget));
    expect(e.path).toBe("signal.referTo");
    expect(e.value).toBe("displacement");
  });
});
