/**
 * A square-root factor F (n×r, Σ = F Fᵀ) of a symmetric positive semi-definite matrix, for
 * drawing correlated Gaussian vectors F·g. Cholesky with diagonal pivoting: directions whose
 * remaining variance is at rounding level of their own variance are dropped, so the
 * singular noise covariances of the model (a free mass has no noise on its position) factor
 * without failing.
 */
const DROP = 1e-13;

export interface Factor {
  readonly n: number;
  /** Rank kept. */
  readonly r: number;
  /** n×r, row-major. */
  readonly f: Float64Array;
}

export function psdFactor(sigma: ArrayLike<number>, n: number): Factor {
  const a = Float64Array.from(sigma);
  const original = Float64Array.from({ length: n }, (_, i) => sigma[i * n + i]);
  const cols: Float64Array[] = [];
  const done = new Array<boolean>(n).fill(false);
  for (let step = 0; step < n; step++) {
    let pick = -1;
    let best = 0;
    for (let i = 0; i < n; i++) {
      if (done[i]) continue;
      const d = a[i * n + i];
      if (d > DROP * original[i] && d > best) {
        best = d;
        pick = i;
      }
    }
    if (pick < 0) break;
    done[pick] = true;
    const root = Math.sqrt(best);
    const col = new Float64Array(n);
    col[pick] = root;
    for (let i = 0; i < n; i++) if (!done[i]) col[i] = a[i * n + pick] / root;
    for (let i = 0; i < n; i++) {
      if (done[i] || col[i] === 0) continue;
      for (let j = 0; j < n; j++) if (!done[j]) a[i * n + j] -= col[i] * col[j];
    }
    cols.push(col);
  }
  const r = cols.length;
  const f = new Float64Array(n * r);
  for (let k = 0; k < r; k++) for (let i = 0; i < n; i++) f[i * r + k] = cols[k][i];
  return { n, r, f };
}

/** out = F g (g of length r). */
export function applyFactor(factor: Factor, g: ArrayLike<number>, out: Float64Array): void {
  const { n, r, f } = factor;
  for (let i = 0; i < n; i++) {
    let s = 0;
    const row = i * r;
    for (let k = 0; k < r; k++) s += f[row + k] * g[k];
    out[i] = s;
  }
}
