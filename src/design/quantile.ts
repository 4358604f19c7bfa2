/**
 * Sample quantiles by linear interpolation between order statistics: for sorted x₁ ≤ … ≤ xₙ and
 * probability p, h = (n − 1)p and Q = x_⌊h⌋ + (h − ⌊h⌋)(x_⌊h⌋+1 − x_⌊h⌋) (0-based), definition 7
 * of R. J. Hyndman & Y. Fan, The American Statistician 50 (1996) 361, the default of R and NumPy.
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  if (lo >= n - 1) return sorted[n - 1];
  return sorted[lo] + (h - lo) * (sorted[lo + 1] - sorted[lo]);
}

/** Mean and sample standard deviation (n − 1 in the denominator) of finite values. */
export function meanAndDeviation(values: ArrayLike<number>): { mean: number; deviation: number } {
  const n = values.length;
  if (n === 0) return { mean: NaN, deviation: NaN };
  let mean = 0;
  for (let i = 0; i < n; i++) mean += values[i];
  mean /= n;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += (values[i] - mean) * (values[i] - mean);
  return { mean, deviation: n > 1 ? Math.sqrt(sum / (n - 1)) : NaN };
}
