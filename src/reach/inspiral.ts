import { SOLAR_MASS_PARAMETER, SPEED_OF_LIGHT } from "../constants";
import type { NoiseBudget } from "../engine/budget";
import { QuietframeError } from "../errors";
import { exp, expm1, log, pow } from "../numeric/portable-math";
import { MEGAPARSEC } from "./astronomy";

/**
 * How far a strain sensitivity sees a compact-binary inspiral.
 *
 * Matched-filter signal-to-noise ratio of an optimally oriented source (overhead, face-on)
 * at distance D, with the leading-order (Newtonian, stationary-phase) inspiral amplitude
 *   |h(f)| = (1/D) √(5/24) π^(−2/3) c (G Mc/c³)^(5/6) f^(−7/6)   up to f_ISCO = c³/(6^(3/2) π G M),
 *   SNR² = 4 ∫ |h(f)|²/S_h(f) df,
 * S_h one-sided. The horizon is the D at which SNR equals the threshold (8 by default); the
 * range, averaged over sky position and orientation, is the horizon divided by 2.2648.
 *
 * Integration rule: between neighbouring grid points the integrand f^(−7/3)/S_h(f) is taken
 * as the power law through its two values (S_h a straight line on a log-log plot, which is
 * how noise curves on log-spaced grids are drawn), and each piece is integrated exactly:
 *   ∫_{x0}^{x1} g0 (f/x0)^k df = x0 g0 ln(x1/x0) · (e^u − 1)/u,   u = (k + 1) ln(x1/x0),
 * written with expm1 so that k = −1 loses nothing. A noise curve that is a power law between
 * grid points (flat, or any f^p) is integrated exactly; for smooth curves the error falls
 * with the square of the log-spacing. Trapezoids in f are exact only for straight pieces: the
 * steep f^(−7/3) makes them overestimate even a flat noise band (by about 3 % at 10 grid
 * points per decade, 0.03 % at 100).
 * The band is clipped to [fMin, f_ISCO] inside segments with the same power law. Where S_h is
 * infinite (a blind point of a budget) the integrand is 0 and both adjacent segments count
 * nothing (the power-law limit); outside the grid the noise is unknown and counts as infinite.
 */

/** Horizon distance divided by this is the orientation- and sky-averaged range. */
export const HORIZON_TO_RANGE = 2.2648;

export interface InspiralOptions {
  /** First component mass in solar masses; default 1.4, must be > 0. */
  readonly m1?: number;
  /** Second component mass in solar masses; default 1.4, must be > 0. */
  readonly m2?: number;
  /** Detection threshold on the optimal matched-filter SNR; default 8, must be > 0. */
  readonly snr?: number;
  /** Lower end of the integral in Hz; default the first grid frequency, must be > 0. */
  readonly fMin?: number;
}

/** A one-sided strain PSD (1/Hz) on a grid of frequencies (Hz). */
export interface StrainCurve {
  readonly frequencies: ArrayLike<number>;
  readonly strainPsd: ArrayLike<number>;
}

export interface InspiralDistance {
  /** Distance in metres. */
  readonly metres: number;
  /** Distance in megaparsecs (1 pc = 648000/π au exactly). */
  readonly megaparsecs: number;
  /** Chirp mass (m1 m2)^(3/5)/(m1 + m2)^(1/5) in solar masses. */
  readonly chirpMass: number;
  /** Upper end of the inspiral, c³/(6^(3/2) π G M), in Hz. */
  readonly fIsco: number;
  /** The band actually integrated, [from, to] in Hz (fMin and f_ISCO clipped to the grid). */
  readonly band: readonly [number, number];
}

/** Chirp mass (m1 m2)^(3/5)/(m1 + m2)^(1/5), in the unit of the masses. */
export function chirpMass(m1: number, m2: number): number {
  return pow(m1 * m2, 3 / 5) / pow(m1 + m2, 1 / 5);
}

/** Gravitational-wave frequency at the innermost stable circular orbit, c³/(6^(3/2) π G M) in Hz; M in solar masses, G M☉ the IAU nominal GM☉. */
export function iscoFrequency(totalMass: number): number {
  const c = SPEED_OF_LIGHT;
  return (c * c * c) / (6 * Math.sqrt(6) * Math.PI * totalMass * SOLAR_MASS_PARAMETER);
}

/** A in |h(f)| = A f^(−7/6)/D: √(5/24) π^(−2/3) c (G Mc/c³)^(5/6), in m·s^(−1/6); Mc in solar masses, G M☉ the IAU nominal GM☉. */
export function inspiralAmplitude(chirpMassSolar: number): number {
  const c = SPEED_OF_LIGHT;
  const timeScale = (chirpMassSolar * SOLAR_MASS_PARAMETER) / (c * c * c);
  return Math.sqrt(5 / 24) * pow(Math.PI, -2 / 3) * c * pow(timeScale, 5 / 6);
}

/** Horizon distance: where an optimally oriented inspiral reaches the SNR threshold. */
export function inspiralHorizon(frequencies: ArrayLike<number>, strainPsd: ArrayLike<number>, options: InspiralOptions = {}): InspiralDistance {
  checkCurve(frequencies, strainPsd);
  const m1 = positive(options.m1, 1.4, "options.m1", "a mass in solar masses above 0, e.g. 1.4");
  const m2 = positive(options.m2, 1.4, "options.m2", "a mass in solar masses above 0, e.g. 1.4");
  const snr = positive(options.snr, 8, "options.snr", "an SNR threshold above 0, e.g. 8");
  const first = frequencies[0];
  const last = frequencies[frequencies.length - 1];
  const fMin = positive(options.fMin, first, "options.fMin", "a frequency in Hz above 0");
  const mc = chirpMass(m1, m2);
  const fIsco = iscoFrequency(m1 + m2);
  if (options.fMin !== undefined && !(fMin < fIsco)) {
    throw new QuietframeError({
      path: "options.fMin",
      value: options.fMin,
      problem: `is not below the end of the inspiral for these masses (f_ISCO = ${fIsco.toPrecision(5)} Hz)`,
      allowed: `0 < fMin < ${fIsco.toPrecision(5)} Hz`,
    });
  }
  const from = Math.max(fMin, first);
  const to = Math.min(fIsco, last);
  if (!(from < to)) {
    throw new QuietframeError({
      path: "frequencies",
      value: `${first} … ${last} Hz`,
      problem: `the grid does not overlap the inspiral band ${fMin.toPrecision(5)} … ${fIsco.toPrecision(5)} Hz`,
      allowed: "a grid that reaches into the band between fMin and f_ISCO",
    });
  }
  const integral = inspiralIntegral(frequencies, strainPsd, from, to);
  // SNR² = 4 A² I / D²  →  D = 2 A √I / SNR
  const metres = (2 * inspiralAmplitude(mc) * Math.sqrt(integral)) / snr;
  return { metres, megaparsecs: metres / MEGAPARSEC, chirpMass: mc, fIsco, band: [from, to] };
}

/** Orientation- and sky-averaged range: the horizon divided by 2.2648. */
export function inspiralRange(frequencies: ArrayLike<number>, strainPsd: ArrayLike<number>, options: InspiralOptions = {}): InspiralDistance {
  const h = inspiralHorizon(frequencies, strainPsd, options);
  const metres = h.metres / HORIZON_TO_RANGE;
  return { ...h, metres, megaparsecs: metres / MEGAPARSEC };
}

/** Ratio of surveyed volumes, (range A / range B)³, for the same source and threshold. */
export function volumeGain(a: StrainCurve, b: StrainCurve, options: InspiralOptions = {}): number {
  const ra = inspiralRange(a.frequencies, a.strainPsd, options).metres;
  const rb = inspiralRange(b.frequencies, b.strainPsd, options).metres;
  const ratio = ra / rb;
  return ratio * ratio * ratio;
}

/** The strain curve of a budget referred to strain (total noise, one-sided PSD in 1/Hz). */
export function strainCurve(budget: NoiseBudget): StrainCurve {
  if (budget.quantity.name !== "strain") {
    throw new QuietframeError({
      path: "signal.referTo",
      value: budget.quantity.name,
      problem: "the budget is not referred to strain, so it has no astrophysical reach",
      allowed: 'a budget of an interferometer\'s strain signal referred to "strain"',
    });
  }
  return { frequencies: budget.frequencies, strainPsd: budget.total };
}

/**
 * ∫_{from}^{to} f^(−7/3)/S(f) df with S piecewise a power law between grid points (see above).
 * Values are scaled by the smallest finite S so that tiny PSDs (1e-48/Hz) stay far from overflow.
 */
function inspiralIntegral(f: ArrayLike<number>, s: ArrayLike<number>, from: number, to: number): number {
  let sRef = Infinity;
  for (let i = 0; i < s.length; i++) if (s[i] < sRef) sRef = s[i];
  if (sRef === Infinity) return 0;
  const g = new Float64Array(f.length);
  for (let i = 0; i < f.length; i++) g[i] = s[i] === Infinity ? 0 : pow(f[i], -7 / 3) * (sRef / s[i]);
  let sum = 0;
  let compensation = 0;
  for (let i = 0; i + 1 < f.length; i++) {
    const x0 = Math.max(f[i], from);
    const x1 = Math.min(f[i + 1], to);
    if (!(x1 > x0)) continue;
    const piece = powerLawPiece(f[i], g[i], f[i + 1], g[i + 1], x0, x1);
    // Neumaier summation: the pieces span many orders of magnitude.
    const t = sum + piece;
    compensation += Math.abs(sum) >= Math.abs(piece) ? sum - t + piece : piece - t + sum;
    sum = t;
  }
  return (sum + compensation) / sRef;
}

/** ∫_{x0}^{x1} of the power law through (a, ga) and (b, gb), a ≤ x0 < x1 ≤ b. */
function powerLawPiece(a: number, ga: number, b: number, gb: number, x0: number, x1: number): number {
  if (ga === 0 || gb === 0) return 0;
  const k = log(gb / ga) / log(b / a);
  const g0 = x0 === a ? ga : ga * exp(k * log(x0 / a));
  const span = log(x1 / x0);
  const u = (k + 1) * span;
  return x0 * g0 * span * (u === 0 ? 1 : expm1(u) / u);
}

function checkCurve(f: ArrayLike<number>, s: ArrayLike<number>): void {
  if (f.length < 2) {
    throw new QuietframeError({ path: "frequencies", value: f.length, problem: "needs at least two frequencies", allowed: "an increasing grid of at least 2 frequencies in Hz" });
  }
  if (s.length !== f.length) {
    throw new QuietframeError({
      path: "strainPsd",
      value: s.length,
      problem: `has a different length from frequencies (${f.length})`,
      allowed: "one PSD value per frequency",
    });
  }
  for (let i = 0; i < f.length; i++) {
    if (!(Number.isFinite(f[i]) && f[i] > 0 && (i === 0 || f[i] > f[i - 1]))) {
      throw new QuietframeError({
        path: `frequencies[${i}]`,
        value: f[i],
        problem: "is not a finite frequency above 0 and above the one before",
        allowed: "strictly increasing finite frequencies in Hz above 0",
      });
    }
    if (!(s[i] > 0)) {
      throw new QuietframeError({
        path: `strainPsd[${i}]`,
        value: s[i],
        problem: "is not a PSD above 0",
        allowed: "one-sided strain PSD values in 1/Hz above 0 (Infinity where the detector is blind)",
      });
    }
  }
}

function positive(value: number | undefined, fallback: number, path: string, allowed: string): number {
  if (value === undefined) return fallback;
  if (!(typeof value === "number" && Number.isFinite(value) && value > 0)) {
    throw new QuietframeError({ path, value, problem: "must be a finite number above 0", allowed });
  }
  return value;
}
