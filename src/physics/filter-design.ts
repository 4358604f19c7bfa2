/**
 * Filter cavities for a tuned interferometer with arm cavities (no signal recycling): the
 * ideal pair that makes frequency-dependent squeezing (input) or a variational readout
 * (output), and how far lossy filters of that design fall short of the ideal.
 *
 * Design (the approach of Kimble et al., Phys. Rev. D 65, 022002 (2001), Sec. V, in the
 * engine's conventions). A filter cavity with half-width γ_f and detuning Δ (engine
 * convention, src/physics/optical-mode.ts) reflects the sideband pair ±Ω as e^{iψ}R(θ) with
 *   θ(Ω) = −arg D(Ω),   D(Ω) = (γ_f − iΔ)² + Ω²,
 * a quadrature rotation R(θ) when lossless. Squeezed light at angle θ0 meets the noise
 *   S_h = (h_SQL²/2)(K + 1/K)[cosh 2r − cos 2(θ + Φ) sinh 2r],   cot Φ = K(Ω),
 * so the ideal rotation is θ0 + Σθ_j = −Φ (mod π), and −Φ = −arg(K + i). With
 * K = κ0γ⁴/(Ω²(γ² + Ω²)), κ0 = 2I0/I_SQL = 16ω0P_arm/(mLcγ³), K + i is a positive multiple of
 *   κ0γ⁴ + iΩ²(γ² + Ω²) = i(Ω² + z1)(Ω² + z2),   z1,2 = (γ²/2)(1 ± √(1 + 4iκ0)),
 * so two filters with (γ_j − iΔ_j)² = z_j (γ_j > 0) and θ0 = 90° (phase squeezed) give
 * θ = −Φ exactly: S_h = e^{−2r}(h_SQL²/2)(K + 1/K). On the output the same pair before a phase
 * homodyne reads the quadrature ζ(Ω) = 90° − Σθ_j = Φ, i.e. cot ζ = K, and S_h = h_SQL²/(2K).
 *
 * Loss (Khalili, Phys. Rev. D 81, 122002 (2010); Evans et al., Phys. Rev. D 88, 022002 (2013)):
 * the filters keep the ideal half-widths, so an input mirror of T = 4Lγ_j/c − ε; each sideband
 * is then reflected with r(ω) = (γ_0 − γ_in − iω)/(γ − iω) (ω its offset from the cavity's
 * resonance) and picks up loss vacuum 2√(γ_in γ_0)/(γ − iω); the shortfall is computed from
 * these two-photon transfers in closed form.
 */
import { HBAR, SPEED_OF_LIGHT } from "../constants";
import { QuietframeError } from "../errors";
import { exp, hypot, log10 } from "../numeric/portable-math";
import type { OpticalModeRates } from "./optical-mode";
import { opticalAngularFrequency } from "./optomechanics";

/** The interferometer a design is for, in SI units (frequencies in Hz). */
export interface FilteredInterferometer {
  /** Mass of each test mass, kg. */
  readonly mass: number;
  /** Arm length, m. */
  readonly armLength: number;
  /** Arm-cavity half-width γ/2π, Hz. */
  readonly armBandwidth: number;
  /** Circulating power in each arm, W. */
  readonly power: number;
  /** Laser wavelength, m (default 1064 nm). */
  readonly wavelength?: number;
}

/** One filter cavity as built (the parameters of the `filter-cavity` component, in SI units). */
export interface FilterCavityDesign {
  /** m */
  readonly length: number;
  /** Δ/2π in Hz (engine convention: ω_carrier − ω_cavity). */
  readonly detuning: number;
  /** Amplitude half-width γ_f/2π in Hz. */
  readonly halfWidth: number;
  readonly inputTransmission: number;
  readonly roundTripLoss: number;
}

export interface FilterDesign {
  /** Both filters, light meets filters[0] first. */
  readonly filters: readonly [FilterCavityDesign, FilterCavityDesign];
  /** Squeezing angle of the source for input filtering (rad from the amplitude quadrature): 90°. */
  readonly squeezeAngle: number;
  /** Homodyne angle after output filters (rad from the amplitude quadrature): 90°. */
  readonly readoutAngle: number;
  /** Where K = 1, Hz. */
  readonly sqlFrequency: number;
}

export interface FilterOptions {
  /** Length of each filter cavity, m. */
  readonly length: number;
  /** Round-trip loss of each filter besides its input mirror (default 0). */
  readonly roundTripLoss?: number;
}

/**
 * The ideal pair of filter cavities for a tuned interferometer without signal recycling (arm
 * loss ignored: the design uses the lossless K), built with the given length and loss.
 * Throws QuietframeError naming the field when a value is unusable or the loss alone makes a
 * filter wider than the design needs.
 */
export function designFilterCavities(ifo: FilteredInterferometer, options: FilterOptions): FilterDesign {
  const { gamma, kappa0 } = interferometerScales(ifo);
  const length = positive(options.length, "options.length", "m", "a filter length above 0 m, e.g. 300");
  const loss = options.roundTripLoss ?? 0;
  if (!(loss >= 0 && loss < 1)) {
    throw new QuietframeError({ path: "options.roundTripLoss", value: options.roundTripLoss, problem: "is not a round-trip loss", allowed: "a fraction 0 ≤ roundTripLoss < 1, e.g. 1e-6" });
  }
  // z = (γ²/2)(1 ± √(1 + 4iκ0)); each filter has γ_j − iΔ_j = √z_j with γ_j > 0.
  const [wr, wi] = complexSqrt(1, 4 * kappa0);
  const g2 = (gamma * gamma) / 2;
  const filters = [
    [g2 * (1 + wr), g2 * wi],
    [g2 * (1 - wr), -g2 * wi],
  ].map(([zr, zi], j) => {
    let [sr, si] = complexSqrt(zr, zi);
    if (sr < 0) [sr, si] = [-sr, -si];
    return buildFilter(length, loss, sr, -si, j);
  }) as [FilterCavityDesign, FilterCavityDesign];
  // K(Ω) = 1 at Ω² = (γ²/2)(√(1 + 4κ0) − 1).
  const sqlOmega = Math.sqrt(g2 * (Math.sqrt(1 + 4 * kappa0) - 1));
  return { filters, squeezeAngle: Math.PI / 2, readoutAngle: Math.PI / 2, sqlFrequency: sqlOmega / (2 * Math.PI) };
}

/** Rates of a filter cavity of length L, input transmission T, round-trip loss ε and detuning Δ (rad/s). */
export function filterCavityRates(length: number, inputTransmission: number, roundTripLoss: number, detuning: number): OpticalModeRates {
  const gammaIn = (SPEED_OF_LIGHT * inputTransmission) / (4 * length);
  const gammaLoss = (SPEED_OF_LIGHT * roundTripLoss) / (4 * length);
  return { halfWidth: gammaIn + gammaLoss, detuning, inputCoupling: Math.sqrt(2 * gammaIn), lossCoupling: Math.sqrt(2 * gammaLoss) };
}

export interface FilterShortfall {
  readonly frequencies: Float64Array;
  /** Strain noise PSD with lossless filters (the closed forms above), 1/Hz. */
  readonly ideal: Float64Array;
  /** With the design's filters as built (their loss), 1/Hz. */
  readonly actual: Float64Array;
  /** 10 log10(actual/ideal), dB (≥ 0: how far the lossy filters fall short). */
  readonly shortfallDb: Float64Array;
}

/**
 * Strain noise of the interferometer with the design's filters, against the lossless ideal,
 * on the given frequencies (Hz): as frequency-dependent squeezing of squeeze factor r
 * (`{ use: "input", r }`, phase-squeezed source) or as a variational readout of vacuum
 * (`{ use: "output" }`, phase homodyne after the filters). Lossless arms and detection.
 */
export function filterShortfall(
  ifo: FilteredInterferometer,
  design: FilterDesign,
  frequencies: ArrayLike<number>,
  use: { readonly use: "input"; readonly r: number } | { readonly use: "output" },
): FilterShortfall {
  const { gamma, kappa0, mass, armLength } = interferometerScales(ifo);
  if (use.use === "input" && !(use.r >= 0 && use.r <= 10)) {
    throw new QuietframeError({ path: "use.r", value: use.r, problem: "is not a squeeze factor", allowed: "0 ≤ r ≤ 10" });
  }
  const n = frequencies.length;
  const out = { frequencies: Float64Array.from(frequencies), ideal: new Float64Array(n), actual: new Float64Array(n), shortfallDb: new Float64Array(n) };
  for (let f = 0; f < n; f++) {
    const omega = 2 * Math.PI * frequencies[f];
    if (!(omega > 0) || !Number.isFinite(omega)) {
      throw new QuietframeError({ path: `frequencies[${f}]`, value: frequencies[f], problem: "is not a usable frequency", allowed: "a finite frequency above 0 Hz" });
    }
    const K = (kappa0 * gamma * gamma * gamma * gamma) / (omega * omega * (gamma * gamma + omega * omega));
    const hSql2 = (8 * HBAR) / (mass * omega * omega * armLength * armLength);
    // The readout row, carried back from the detector through the filters (last first): each
    // filter's loss port adds |r·L|², then r ← r·T. Rows, not covariances: the cancellation the
    // filters make stays at the amplitude level, where it costs digits ∝ K rather than K².
    const transfers = design.filters.map((d) => filterTransfer(d, omega));
    let row: Vector2 = use.use === "input" ? { re: [-K, 1], im: [0, 0] } : { re: [0, 1], im: [0, 0] };
    let noise = 0;
    for (let j = transfers.length - 1; j >= 0; j--) {
      const leak = rowTimes(row, transfers[j].loss);
      noise += abs2(leak, 0) + abs2(leak, 1);
      row = rowTimes(row, transfers[j].pass);
    }
    if (use.use === "input") {
      // Phase-squeezed source: amplitude quadrature e^{2r}, phase quadrature e^{−2r}; then b2 ∝ a2 − K a1.
      const s = exp(2 * use.r);
      noise += abs2(row, 0) * s + abs2(row, 1) / s;
      out.ideal[f] = (1 / s) * (hSql2 / 2) * (K + 1 / K);
      out.actual[f] = (hSql2 / (2 * K)) * noise;
    } else {
      // The interferometer's output b = (a1, a2 − K a1) for vacuum a, signal (0, √(2K)/h_SQL).
      const a1: [number, number] = [row.re[0] - K * row.re[1], row.im[0] - K * row.im[1]];
      noise += a1[0] * a1[0] + a1[1] * a1[1] + abs2(row, 1);
      out.ideal[f] = hSql2 / (2 * K);
      out.actual[f] = (hSql2 * noise) / (2 * K * abs2(row, 1));
    }
    out.shortfallDb[f] = 10 * log10(out.actual[f] / out.ideal[f]);
  }
  return out;
}

// ---- closed-form two-photon algebra -------------------------------------------------

/** A complex 2×2 matrix, row-major. */
interface Matrix2 {
  readonly re: readonly number[];
  readonly im: readonly number[];
}
interface Vector2 {
  readonly re: readonly number[];
  readonly im: readonly number[];
}

/**
 * The filter's reflection (pass) and loss-port transfer as 2×2 matrices α I + β J (they
 * commute with the rotation generator J): on q1 + iq2 they act as r(Ω + Δ), on q1 − iq2 as
 * r(Ω − Δ), with r(ω) = (γ_0 − γ_in − iω)/(γ − iω) and loss l(ω) = −2√(γ_in γ_0)/(γ − iω).
 */
function filterTransfer(d: FilterCavityDesign, omega: number): { pass: Matrix2; loss: Matrix2 } {
  const rates = filterCavityRates(d.length, d.inputTransmission, d.roundTripLoss, 2 * Math.PI * d.detuning);
  const gIn = (rates.inputCoupling * rates.inputCoupling) / 2;
  const g0 = (rates.lossCoupling * rates.lossCoupling) / 2;
  const g = rates.halfWidth;
  const delta = rates.detuning;
  const reflect = (w: number): [number, number] => divide([g0 - gIn, -w], [g, -w]);
  const leak = (w: number): [number, number] => divide([-2 * Math.sqrt(gIn * g0), 0], [g, -w]);
  return { pass: commuting(reflect(omega + delta), reflect(omega - delta)), loss: commuting(leak(omega + delta), leak(omega - delta)) };
}

/** α I + β J with α + iβ = u and α − iβ = w, J = [[0, −1], [1, 0]]. */
function commuting(u: [number, number], w: [number, number]): Matrix2 {
  const ar = (u[0] + w[0]) / 2;
  const ai = (u[1] + w[1]) / 2;
  // β = (u − w)/(2i)
  const br = (u[1] - w[1]) / 2;
  const bi = -(u[0] - w[0]) / 2;
  return { re: [ar, -br, br, ar], im: [ai, -bi, bi, ai] };
}

/** The row vector r·M. */
function rowTimes(r: Vector2, m: Matrix2): Vector2 {
  const re = [0, 0];
  const im = [0, 0];
  for (let j = 0; j < 2; j++) {
    for (let k = 0; k < 2; k++) {
      re[j] += r.re[k] * m.re[k * 2 + j] - r.im[k] * m.im[k * 2 + j];
      im[j] += r.re[k] * m.im[k * 2 + j] + r.im[k] * m.re[k * 2 + j];
    }
  }
  return { re, im };
}

function abs2(v: Vector2, i: number): number {
  return v.re[i] * v.re[i] + v.im[i] * v.im[i];
}

function divide(a: [number, number], b: [number, number]): [number, number] {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
}

/** Principal square root of a + ib. */
function complexSqrt(a: number, b: number): [number, number] {
  const r = hypot(a, b);
  const re = Math.sqrt((r + a) / 2);
  const im = Math.sqrt((r - a) / 2);
  return [re, b < 0 ? -im : im];
}

// ---- inputs -------------------------------------------------------------------------

function interferometerScales(ifo: FilteredInterferometer): { gamma: number; kappa0: number; mass: number; armLength: number } {
  if (typeof ifo !== "object" || ifo === null) {
    throw new QuietframeError({
      path: "interferometer",
      value: ifo,
      problem: "is not an interferometer description",
      allowed: "{ mass, armLength, armBandwidth, power, wavelength? } in kg, m, Hz, W, m",
    });
  }
  const mass = positive(ifo.mass, "interferometer.mass", "kg", "a mass above 0 kg, e.g. 40");
  const armLength = positive(ifo.armLength, "interferometer.armLength", "m", "a length above 0 m, e.g. 4000");
  const gamma = 2 * Math.PI * positive(ifo.armBandwidth, "interferometer.armBandwidth", "Hz", "a half-width above 0 Hz, e.g. 100");
  const power = positive(ifo.power, "interferometer.power", "W", "a circulating arm power above 0 W, e.g. 8e5");
  const wavelength = positive(ifo.wavelength ?? 1064e-9, "interferometer.wavelength", "m", "a wavelength above 0 m, e.g. 1.064e-6");
  // κ0 = 2 I0/I_SQL with I0 = 2LγP_arm/c and I_SQL = mL²γ⁴/(4ω0).
  const kappa0 = (16 * opticalAngularFrequency(wavelength) * power) / (mass * armLength * SPEED_OF_LIGHT * gamma * gamma * gamma);
  return { gamma, kappa0, mass, armLength };
}

function buildFilter(length: number, loss: number, halfWidth: number, detuning: number, index: number): FilterCavityDesign {
  const total = (4 * length * halfWidth) / SPEED_OF_LIGHT;
  const transmission = total - loss;
  if (!(transmission > 0)) {
    throw new QuietframeError({
      path: "options.roundTripLoss",
      value: loss,
      problem: `alone makes filter ${index + 1} wider than the design's half-width ${(halfWidth / (2 * Math.PI)).toPrecision(4)} Hz (it needs a round-trip loss plus transmission of ${total.toPrecision(4)})`,
      allowed: `roundTripLoss < ${total.toPrecision(4)}, or a longer filter`,
    });
  }
  if (!(total < 1)) {
    throw new QuietframeError({
      path: "options.length",
      value: length,
      problem: `is too long for filter ${index + 1}: its half-width ${(halfWidth / (2 * Math.PI)).toPrecision(4)} Hz needs T + ε = 4Lγ/c = ${total.toPrecision(4)} ≥ 1`,
      allowed: `a length below ${(SPEED_OF_LIGHT / (4 * halfWidth)).toPrecision(4)} m`,
    });
  }
  const fsr = SPEED_OF_LIGHT / (2 * length);
  if (!(Math.abs(detuning) / (2 * Math.PI) < fsr / 2)) {
    throw new QuietframeError({
      path: "options.length",
      value: length,
      problem: `is too long for filter ${index + 1}: its detuning ${(detuning / (2 * Math.PI)).toPrecision(4)} Hz is beyond half the free spectral range`,
      allowed: `a length below ${(SPEED_OF_LIGHT / (2 * Math.abs(detuning / Math.PI))).toPrecision(4)} m`,
    });
  }
  return { length, detuning: detuning / (2 * Math.PI), halfWidth: halfWidth / (2 * Math.PI), inputTransmission: transmission, roundTripLoss: loss };
}

function positive(value: unknown, path: string, unit: string, allowed: string): number {
  if (typeof value !== "number" || !(value > 0) || !Number.isFinite(value)) {
    throw new QuietframeError({ path, value, problem: `is not a positive number in ${unit}`, allowed });
  }
  return value;
}
