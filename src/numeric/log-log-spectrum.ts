/**
 * A tabulated amplitude spectral density read between its points by straight lines in
 * log-log coordinates (exact for a power law), and beyond its ends only in the way the
 * caller chose: not at all, holding the end values, or continuing the end segments' power laws.
 */
import { log, pow } from "./portable-math";

/** How a tabulated spectrum is read outside its first and last frequency. */
export const SPECTRUM_EXTENSIONS = ["refuse", "hold", "power-law"] as const;
export type SpectrumExtension = (typeof SPECTRUM_EXTENSIONS)[number];

/** Values kept per spectrum: a few grids' worth; past it the memory starts again. */
const REMEMBERED = 1 << 14;

export class LogLogSpectrum {
  /** Each segment's exponent, computed when the segment is first read (the same expression each time, so the same bits). */
  readonly #slopes: Float64Array;
  /**
   * The ASD at frequencies read before: a search or a Monte Carlo run reads the same grid for
   * every trial, and the portable pow is most of a tabulated spectrum's cost.
   */
  readonly #known = new Map<number, number>();

  /**
   * `frequencies` (Hz) strictly increasing and positive, `asd` positive and finite, at least
   * two points; the caller has checked them (with messages that name the user's input).
   */
  constructor(
    readonly frequencies: Float64Array,
    readonly asd: Float64Array,
    readonly extension: SpectrumExtension,
  ) {
    if (frequencies.length < 2 || frequencies.length !== asd.length) throw new Error("internal: a spectrum needs at least two (frequency, ASD) points");
    this.#slopes = new Float64Array(frequencies.length - 1).fill(Number.NaN);
  }

  get lowest(): number {
    return this.frequencies[0];
  }

  get highest(): number {
    return this.frequencies[this.frequencies.length - 1];
  }

  /** True when the spectrum has a value at f (inside the table, or any f when it is extended). */
  covers(f: number): boolean {
    return this.extension !== "refuse" || (f >= this.lowest && f <= this.highest);
  }

  /** Amplitude spectral density at f (Hz); NaN outside the table when it is not extended. */
  asdAt(f: number): number {
    const known = this.#known.get(f);
    if (known !== undefined) return known;
    const a = this.#computed(f);
    if (this.#known.size >= REMEMBERED) this.#known.clear();
    this.#known.set(f, a);
    return a;
  }

  #computed(f: number): number {
    const fs = this.frequencies;
    const last = fs.length - 1;
    if (f < fs[0] || f > fs[last]) {
      if (this.extension === "refuse") return Number.NaN;
      if (this.extension === "hold") return f < fs[0] ? this.asd[0] : this.asd[last];
      return f < fs[0] ? this.onSegment(0, f) : this.onSegment(last - 1, f);
    }
    // Largest i with fs[i] <= f (binary search), so a tabulated frequency returns its own value.
    let lo = 0;
    let hi = last;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (fs[mid] <= f) lo = mid;
      else hi = mid;
    }
    if (fs[lo] === f) return this.asd[lo];
    if (fs[hi] === f) return this.asd[hi];
    return this.onSegment(lo, f);
  }

  /** One-sided power spectral density at f: the ASD squared. */
  psdAt(f: number): number {
    const a = this.asdAt(f);
    return a * a;
  }

  /** The power law through points i and i+1, a_i (f/f_i)^k with k = ln(a_{i+1}/a_i)/ln(f_{i+1}/f_i). */
  private onSegment(i: number, f: number): number {
    const fs = this.frequencies;
    const as = this.asd;
    let slope = this.#slopes[i];
    if (Number.isNaN(slope)) slope = this.#slopes[i] = log(as[i + 1] / as[i]) / log(fs[i + 1] / fs[i]);
    return as[i] * pow(f / fs[i], slope);
  }
}
