/** Equal-width bins of a sample of figures (the histogram the spread chart draws and the CSV lists). */

export interface HistogramBin {
  /** Left and right edge; a value on an inner edge counts in the bin to its right, the largest value in the last bin. */
  readonly x0: number;
  readonly x1: number;
  readonly count: number;
}

/** Fewest and most bins, whatever the sample size. */
const MIN_BINS = 5;
const MAX_BINS = 60;

/**
 * Bins of the finite values: √n bins (the square-root choice, common practice, no source),
 * between MIN_BINS and MAX_BINS, spanning the smallest to the largest value. Every finite value
 * is counted exactly once; an empty sample has no bins, a sample of one value one narrow bin.
 */
export function histogramBins(values: readonly number[]): HistogramBin[] {
  const finite = values.filter((v) => Number.isFinite(v));
  if (finite.length === 0) return [];
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of finite) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo === hi) {
    const half = lo === 0 ? 0.5 : Math.abs(lo) * 1e-6;
    return [{ x0: lo - half, x1: hi + half, count: finite.length }];
  }
  const n = Math.min(MAX_BINS, Math.max(MIN_BINS, Math.ceil(Math.sqrt(finite.length))));
  const width = (hi - lo) / n;
  const counts = new Array<number>(n).fill(0);
  for (const v of finite) counts[Math.min(n - 1, Math.floor((v - lo) / width))]++;
  return counts.map((count, i) => ({ x0: lo + i * width, x1: i === n - 1 ? hi : lo + (i + 1) * width, count }));
}
