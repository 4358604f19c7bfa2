import { brentMinimum } from "./brent-minimum";
import { fromUnit, toUnit, type SearchRange } from "./search-range";

/**
 * The best value of one parameter over a range: a scan at evenly spaced positions of the range
 * (equal ratios on a log range) to find the best region, then Brent's minimization on the
 * interval between the best sample's neighbours. A peak narrower than the scan's spacing can be
 * missed; the scan's size is the caller's choice.
 */

export interface LineSample {
  readonly x: number;
  /** Higher is better; −Infinity where the figure has no value. */
  readonly merit: number;
}

export interface LineMaximum {
  readonly x: number;
  readonly merit: number;
  /** Where the maximum sits: at the low or high end of the range, or inside it. */
  readonly at: "inside" | "low-end" | "high-end";
  readonly evaluations: number;
  /** The scan (sorted by x), for callers that look for crossings too. */
  readonly samples: readonly LineSample[];
}

/** `points` ≥ 2 positions from the low to the high end, plus the extra values given (e.g. the current value). */
export function scanLine(meritAt: (x: number) => number, range: SearchRange, points: number, extra: readonly { x: number; merit: number }[] = []): LineSample[] {
  const samples: LineSample[] = [...extra];
  const extraAt = extra.map((s) => toUnit(range, s.x));
  // Half a scan step: a position that close to a given sample would only repeat it.
  const near = 0.5 / (points - 1);
  for (let k = 0; k < points; k++) {
    const u = k / (points - 1);
    const x = fromUnit(range, u);
    if (extraAt.some((e) => Math.abs(e - u) < near && k > 0 && k < points - 1)) continue;
    if (samples.some((s) => s.x === x)) continue;
    samples.push({ x, merit: meritAt(x) });
  }
  return samples.sort((a, b) => a.x - b.x);
}

/** Maximizes merit over the range; `current` is a known sample (not evaluated again). */
export function maximizeOnLine(meritAt: (x: number) => number, range: SearchRange, points: number, current?: LineSample): LineMaximum {
  const samples = scanLine(meritAt, range, points, current ? [current] : []);
  let evaluations = samples.length - (current ? 1 : 0);
  // Ties go to the current value (an angle a half turn away reads the same quadrature).
  let best = current ? samples.indexOf(current) : 0;
  for (let i = 0; i < samples.length; i++) if (samples[i].merit > samples[best].merit) best = i;
  if (samples[best].merit === -Infinity) return { x: samples[best].x, merit: -Infinity, at: "inside", evaluations, samples };
  const lo = toUnit(range, samples[Math.max(0, best - 1)].x);
  const hi = toUnit(range, samples[Math.min(samples.length - 1, best + 1)].x);
  const u0 = toUnit(range, samples[best].x);
  const cost = (u: number): number => -meritAt(fromUnit(range, u));
  const refined = brentMinimum(cost, Math.max(0, lo), Math.min(1, hi), Math.min(Math.max(u0, lo), hi), -samples[best].merit, 1e-9, 1e-12);
  evaluations += refined.evaluations;
  const x = refined.fx < -samples[best].merit ? fromUnit(range, refined.x) : samples[best].x;
  const m = Math.max(-refined.fx, samples[best].merit);
  const at = x <= range.lo ? "low-end" : x >= range.hi ? "high-end" : "inside";
  return { x, merit: m, at, evaluations, samples };
}
