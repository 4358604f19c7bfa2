import { describeHeadline, type HeadlineFigures } from "../../src/engine/headline";
import type { ExplorerComputation } from "../explorer/model";
import type { ExplorerState } from "../state/format";

/**
 * What a notebook cell reads back from a widget: the headline figures and the plotted table
 * as plain arrays and numbers, so they print, serialise and compare without typed arrays.
 */
export interface NotebookFigures {
  /** Set-up name (or the state's title). */
  readonly name: string;
  /** Quantity the noise is referred to, e.g. "displacement". */
  readonly quantity: string;
  readonly spectralDensity: "amplitude" | "power";
  /** Unit of every noise value in `table`, e.g. "m/√Hz". */
  readonly unit: string;
  readonly headline: {
    /** dB of power below the SQL (negative: above it); -Infinity without an SQL reference. */
    readonly bestMarginDb: number;
    /** Hz; NaN without an SQL reference. */
    readonly bestMarginAt: number;
    readonly belowSqlBands: [number, number][];
    readonly dominant: { from: number; to: number; term: string }[];
  };
  readonly table: {
    /** Hz. */
    readonly frequencies: number[];
    /** Total first, then the budget terms, then the references (SQL, zero-point, thermal). */
    readonly columns: { id: string; label: string; values: number[] }[];
  };
  readonly warnings: string[];
  /** Safety cautions the components raise (e.g. laser power). */
  readonly cautions: string[];
  /** Fingerprint of the exact curves. */
  readonly fingerprint: string;
}

export function plainHeadline(h: HeadlineFigures): NotebookFigures["headline"] {
  return {
    bestMarginDb: h.bestMarginDb,
    bestMarginAt: h.bestMarginAt,
    belowSqlBands: h.belowSqlBands.map(([a, b]) => [a, b]),
    dominant: h.dominant.map((d) => ({ from: d.from, to: d.to, term: d.term })),
  };
}

export function notebookFigures(computation: ExplorerComputation, state: ExplorerState): NotebookFigures {
  const { table, evaluation } = computation;
  return {
    name: state.settings.title ?? computation.setup.name ?? "",
    quantity: evaluation.budget.quantity.name,
    spectralDensity: table.spectralDensity,
    unit: table.unit,
    headline: plainHeadline(computation.headline),
    table: {
      frequencies: Array.from(table.frequencies),
      columns: table.columns.map((c) => ({ id: c.id, label: c.label, values: Array.from(c.values) })),
    },
    warnings: [...evaluation.warnings],
    cautions: [...evaluation.cautions],
    fingerprint: computation.fingerprint,
  };
}

/** The text/plain representation: name, current values, key figures, cautions. */
export function summaryText(computation: ExplorerComputation, state: ExplorerState): string {
  const lines: string[] = [];
  const name = state.settings.title ?? computation.setup.name;
  if (name) lines.push(name);
  const values = Object.entries(state.values);
  if (values.length) lines.push(`values: ${values.map(([k, v]) => `${k} = ${v}`).join(", ")}`);
  lines.push(describeHeadline(computation.headline, computation.table.unit));
  for (const w of computation.evaluation.warnings) lines.push(`warning: ${w}`);
  for (const c of computation.evaluation.cautions) lines.push(`caution: ${c}`);
  lines.push(`fingerprint: ${computation.fingerprint}`);
  return lines.join("\n");
}
