import type { NoiseBudget } from "../engine/budget";
import { evaluate } from "../evaluate";
import { exp, log, log10 } from "../numeric/portable-math";
import type { PreparedSetup } from "../prepare";
import { brentMinimum } from "./brent-minimum";
import { brentRoot } from "./brent-root";

/**
 * Headline figures that do not depend on the grid: the grid locates the peaks of the margin
 * below the SQL and the grid intervals where it changes sign; Brent's methods then find each
 * peak and each band edge between grid points by evaluating the prepared set-up at single
 * frequencies (in log f). The grid's own headline (engine/headline.ts) is left as it is.
 */

export interface RefinedBand {
  readonly from: number;
  readonly to: number;
  /** "crossing": the margin passes 0 dB there; "grid-end": the band runs to the end of the grid. */
  readonly fromKind: "crossing" | "grid-end";
  readonly toKind: "crossing" | "grid-end";
  /** A band found between two grid points, none of which lies in it. */
  readonly betweenGridPoints: boolean;
}

export interface RefinedHeadline {
  /** Largest margin below the SQL (dB of power; positive: below the SQL) and where (Hz). */
  readonly bestMarginDb: number;
  readonly bestMarginAt: number;
  /** The same on the grid alone, for comparison. */
  readonly gridBestMarginDb: number;
  readonly gridBestMarginAt: number;
  /** Frequency intervals (Hz) where the total noise is below the SQL, edges refined. */
  readonly belowSqlBands: readonly RefinedBand[];
  /** Frequencies evaluated beyond the grid. */
  readonly evaluations: number;
}

/** Peaks refined: the highest local maxima of the grid margin (a limit so that a ragged curve stays affordable). */
export const MAX_REFINED_PEAKS = 50;
/** A peak between grid points above the SQL by less than this (dB) touches it within rounding: no band of its own. */
export const TOUCHING_DB = 1e-9;
/** Width in log f at which a peak or an edge counts as found (relative frequency 1e-12). */
const LOG_TOLERANCE = 1e-12;

/**
 * The refined headline of a budget of `prepared` (on any grid). A budget without an SQL
 * reference has no margin: bestMarginDb is −Infinity and there are no bands.
 */
export function refinedHeadline(prepared: PreparedSetup, budget: NoiseBudget): RefinedHeadline {
  const f = budget.frequencies;
  const n = f.length;
  const sql = budget.references.find((r) => r.id === "sql")?.psd;
  if (!sql || n === 0) return { bestMarginDb: -Infinity, bestMarginAt: NaN, gridBestMarginDb: -Infinity, gridBestMarginAt: NaN, belowSqlBands: [], evaluations: 0 };
  const grid = new Float64Array(n);
  // The same expression as the grid's headline margin.
  for (let i = 0; i < n; i++) grid[i] = 10 * log10(sql[i] / budget.total[i]);
  let evaluations = 0;
  const marginAtLog = (x: number): number => {
    evaluations++;
    const b = evaluate(prepared, Float64Array.of(exp(x))).budget;
    const s = b.references.find((r) => r.id === "sql")!.psd[0];
    const m = 10 * log10(s / b.total[0]);
    return Number.isNaN(m) ? -Infinity : m;
  };

  let gridBest = 0;
  for (let i = 1; i < n; i++) if (grid[i] > grid[gridBest]) gridBest = i;
  const peaks: number[] = [];
  for (let i = 0; i < n; i++) {
    if ((i === 0 || grid[i] >= grid[i - 1]) && (i === n - 1 || grid[i] >= grid[i + 1]) && Number.isFinite(grid[i])) peaks.push(i);
  }
  peaks.sort((a, b) => grid[b] - grid[a] || a - b);
  let best = { margin: grid[gridBest], at: f[gridBest] };
  const extraBands: RefinedBand[] = [];
  for (const i of peaks.slice(0, MAX_REFINED_PEAKS)) {
    if (n < 2) break;
    const lo = log(f[Math.max(0, i - 1)]);
    const hi = log(f[Math.min(n - 1, i + 1)]);
    const x0 = log(f[i]);
    const peak = brentMinimum((x) => -marginAtLog(x), lo, hi, x0, -grid[i], 0, LOG_TOLERANCE);
    const margin = -peak.fx;
    if (margin > best.margin) best = { margin, at: exp(peak.x) };
    // A peak above 0 dB whose grid point is not below the SQL: a band no grid point sees.
    if (margin > TOUCHING_DB && !(grid[i] > 0)) {
      const left = edge(marginAtLog, lo, peak.x, i > 0 ? grid[i - 1] : NaN, margin);
      const right = edge(marginAtLog, peak.x, hi, margin, i < n - 1 ? grid[i + 1] : NaN);
      if (left !== undefined && right !== undefined) extraBands.push({ from: exp(left), to: exp(right), fromKind: "crossing", toKind: "crossing", betweenGridPoints: true });
    }
  }

  const bands: RefinedBand[] = [];
  let open: number | undefined;
  for (let i = 0; i < n; i++) {
    const below = budget.total[i] < sql[i];
    if (below && open === undefined) open = i;
    if ((!below || i === n - 1) && open !== undefined) {
      const last = below ? i : i - 1;
      const from = open === 0 ? f[0] : exp(edge(marginAtLog, log(f[open - 1]), log(f[open]), grid[open - 1], grid[open]) ?? log(f[open]));
      const to = last === n - 1 ? f[n - 1] : exp(edge(marginAtLog, log(f[last]), log(f[last + 1]), grid[last], grid[last + 1]) ?? log(f[last]));
      bands.push({ from, to, fromKind: open === 0 ? "grid-end" : "crossing", toKind: last === n - 1 ? "grid-end" : "crossing", betweenGridPoints: false });
      open = undefined;
    }
  }
  const belowSqlBands = [...bands, ...extraBands].sort((a, b) => a.from - b.from);
  return { bestMarginDb: best.margin, bestMarginAt: best.at, gridBestMarginDb: grid[gridBest], gridBestMarginAt: f[gridBest], belowSqlBands, evaluations };
}

/** Where the margin crosses 0 dB between log frequencies a and b (margins ma, mb; NaN: evaluate). */
function edge(marginAtLog: (x: number) => number, a: number, b: number, ma: number, mb: number): number | undefined {
  const fa = Number.isNaN(ma) ? marginAtLog(a) : ma;
  const fb = Number.isNaN(mb) ? marginAtLog(b) : mb;
  if (!(fa <= 0 && fb >= 0) && !(fa >= 0 && fb <= 0)) return undefined;
  return brentRoot(marginAtLog, a, b, fa, fb, LOG_TOLERANCE).x;
}
