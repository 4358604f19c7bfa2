import type { NoiseBudget } from "./budget";
import { log10 } from "../numeric/portable-math";
import { formatQuantity } from "../units/format";

/** The figures a reader looks for first, computed from a budget on its grid. */
export interface HeadlineFigures {
  /** Largest margin of the total noise below the SQL, in dB of power (positive: below the SQL). */
  readonly bestMarginDb: number;
  /** Frequency (Hz) where that margin is reached. */
  readonly bestMarginAt: number;
  /** Frequency intervals (Hz, grid points inclusive) where the total noise is below the SQL. */
  readonly belowSqlBands: readonly (readonly [number, number])[];
  /** Contiguous frequency ranges and the budget term that is largest there. */
  readonly dominant: readonly { readonly from: number; readonly to: number; readonly term: string }[];
}

export function headlineFigures(budget: NoiseBudget): HeadlineFigures {
  const f = budget.frequencies;
  const sql = budget.references.find((r) => r.id === "sql")?.psd;
  const { bestMarginDb, bestMarginAt } = bestMargin(budget);
  const bands: [number, number][] = [];
  if (sql) {
    let open: number | undefined;
    for (let i = 0; i < f.length; i++) {
      const below = budget.total[i] < sql[i];
      if (below && open === undefined) open = i;
      if ((!below || i === f.length - 1) && open !== undefined) {
        bands.push([f[open], f[below ? i : i - 1]]);
        open = undefined;
      }
    }
  }
  const dominant: { from: number; to: number; term: string }[] = [];
  for (let i = 0; i < f.length; i++) {
    let best = "";
    let bestValue = -Infinity;
    for (const t of budget.terms) {
      if (t.psd[i] > bestValue) {
        bestValue = t.psd[i];
        best = t.label;
      }
    }
    const last = dominant[dominant.length - 1];
    if (last && last.term === best) last.to = f[i];
    else dominant.push({ from: f[i], to: f[i], term: best });
  }
  return { bestMarginDb, bestMarginAt, belowSqlBands: bands, dominant };
}

/**
 * The largest margin of the total noise below the SQL (dB of power) and its frequency, as
 * headlineFigures gives them (−∞ and NaN without an SQL): for a figure of merit, which needs
 * neither the bands nor the largest terms.
 */
export function bestMargin(budget: NoiseBudget): Pick<HeadlineFigures, "bestMarginDb" | "bestMarginAt"> {
  const f = budget.frequencies;
  const sql = budget.references.find((r) => r.id === "sql")?.psd;
  let bestMarginDb = -Infinity;
  let bestMarginAt = NaN;
  if (sql) {
    for (let i = 0; i < f.length; i++) {
      const margin = 10 * log10(sql[i] / budget.total[i]);
      if (margin > bestMarginDb) {
        bestMarginDb = margin;
        bestMarginAt = f[i];
      }
    }
  }
  return { bestMarginDb, bestMarginAt };
}

/** A few lines of plain text for terminals and notebook text/plain output. */
export function describeHeadline(h: HeadlineFigures, unit: string): string {
  // Frequencies as everywhere else: SI prefixes ("1.467 MHz"), four significant digits.
  const hz = (x: number): string => formatQuantity(x, "frequency", 4);
  const lines: string[] = [];
  if (Number.isFinite(h.bestMarginDb)) {
    lines.push(
      h.bestMarginDb > 0
        ? `best: ${h.bestMarginDb.toFixed(2)} dB below the SQL at ${hz(h.bestMarginAt)}`
        : `closest approach to the SQL: ${(-h.bestMarginDb).toFixed(2)} dB above it at ${hz(h.bestMarginAt)}`,
    );
  }
  lines.push(h.belowSqlBands.length ? `below the SQL in ${h.belowSqlBands.map(([a, b]) => `${hz(a)} – ${hz(b)}`).join(", ")}` : "never below the SQL on this grid");
  lines.push("largest term:");
  for (const d of h.dominant) lines.push(`  ${hz(d.from)} – ${hz(d.to)}: ${d.term}`);
  lines.push(`(noise referred to the signal, one-sided, in ${unit})`);
  return lines.join("\n");
}
