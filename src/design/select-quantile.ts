/**
 * Sample quantiles of unsorted data by selection (Hoare's quickselect, expected linear time)
 * instead of a full sort: the noise bands of a 100,000-sample Monte Carlo take a few quantiles
 * of each of hundreds of columns. The result is quantileSorted of the sorted data, bit for bit:
 * the same two order statistics, interpolated by the same expression.
 */
import { quantileSorted } from "./quantile";

/**
 * quantileSorted(sorted copy of `values`, p) for each p. Reorders `values` in place. Data with
 * NaN or −0 (which a numeric sort places by rules of its own) is sorted instead.
 */
export function quantilesBySelection(values: Float64Array, ps: readonly number[]): number[] {
  const n = values.length;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (v !== v || (v === 0 && 1 / v < 0)) {
      values.sort();
      return ps.map((p) => quantileSorted(values, p));
    }
  }
  // Every selection leaves its order statistic in place with nothing larger left of it, so a
  // later, higher one is selected right of it only (the quantiles come in rising order).
  let selected = 0;
  return ps.map((p) => {
    if (n === 0) return NaN;
    const h = (n - 1) * p;
    const lo = Math.floor(h);
    const k = lo >= n - 1 ? n - 1 : lo;
    const a = orderStatistic(values, k, k >= selected ? selected : 0);
    selected = k;
    if (lo >= n - 1) return a;
    // After selecting lo, everything right of it is ≥ it: the next order statistic is their minimum.
    let b = values[lo + 1];
    for (let i = lo + 2; i < n; i++) if (values[i] < b) b = values[i];
    return a + (h - lo) * (b - a);
  });
}

/**
 * The k-th smallest (0-based) of values; on return values[k] holds it, smaller ones lie left and
 * larger ones right. `from` ≤ k: the first index that can hold it (none left of it is larger).
 */
function orderStatistic(values: Float64Array, k: number, from: number): number {
  let left = from;
  let right = values.length - 1;
  while (right > left) {
    // Median of three as the pivot, so sorted or reversed data cost no more than random data.
    const mid = (left + right) >> 1;
    const pivot = medianOfThree(values[left], values[mid], values[right]);
    let i = left;
    let j = right;
    while (i <= j) {
      while (values[i] < pivot) i++;
      while (values[j] > pivot) j--;
      if (i <= j) {
        const t = values[i];
        values[i] = values[j];
        values[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else return values[k];
  }
  return values[k];
}

function medianOfThree(a: number, b: number, c: number): number {
  if (a < b) return b < c ? b : a < c ? c : a;
  return a < c ? a : b < c ? c : b;
}
