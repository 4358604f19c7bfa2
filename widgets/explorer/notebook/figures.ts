/** An explorer's figures as plain numbers and its text summary, for notebook cells. */
import { describeHeadline, type HeadlineFigures } from "../../../src/index";
import type { ExplorerComputation } from "../model";
import { explorerReach, type ReachFigures } from "../reach";
import { reachSummary } from "../summary";
import type { ExplorerState } from "../format";

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
  /**
   * Reach of a budget referred to strain (absent otherwise): a 1.4 + 1.4 M☉ inspiral at SNR 8,
   * against the initial set-up (every control at the set-up's own value).
   */
  readonly reach?: NotebookReach;
  readonly warnings: string[];
  /** Safety cautions the components raise (e.g. laser power). */
  readonly cautions: string[];
  /** Fingerprint of the exact curves. */
  readonly fingerprint: string;
}

/** The reach gauge as plain numbers; distances in Mpc. */
export interface NotebookReach {
  /** Component masses (solar masses) and the SNR threshold. */
  readonly source: { m1: number; m2: number; snr: number };
  /** Horizon of an optimally oriented source, Mpc; null when the curve misses the inspiral band. */
  readonly horizonMpc: number | null;
  /** Sky- and orientation-averaged range, Mpc; null when the curve misses the inspiral band. */
  readonly rangeMpc: number | null;
  /** The band integrated, Hz; null when the curve misses the inspiral band. */
  readonly band: [number, number] | null;
  /** Why there is no reach (or no comparison), when that is so. */
  readonly problem?: string;
  /** Against the initial set-up: its range (Mpc), range ratio and volume gain (range ratio³). */
  readonly vsInitial?: { rangeMpc: number; rangeRatio: number; volumeGain: number };
}

export function plainReach(reach: ReachFigures): NotebookReach {
  const source = { m1: reach.source.m1, m2: reach.source.m2, snr: reach.source.snr };
  if (!reach.available) return { source, horizonMpc: null, rangeMpc: null, band: null, problem: reach.problem };
  const c = reach.comparison;
  return {
    source,
    horizonMpc: reach.horizon.megaparsecs,
    rangeMpc: reach.range.megaparsecs,
    band: [reach.range.band[0], reach.range.band[1]],
    ...(reach.comparisonProblem !== undefined ? { problem: reach.comparisonProblem } : {}),
    ...(c ? { vsInitial: { rangeMpc: c.referenceRange.megaparsecs, rangeRatio: c.rangeRatio, volumeGain: c.volumeGain } } : {}),
  };
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
  const reach = explorerReach(state, computation);
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
    ...(reach ? { reach: plainReach(reach) } : {}),
    warnings: [...evaluation.warnings],
    cautions: [...evaluation.cautions],
    fingerprint: computation.fingerprint,
  };
}

/**
 * The text/plain representation: name, current values, safety cautions (before any figure,
 * so they are read), key figures, the reach of a strain budget, warnings, fingerprint.
 */
export function summaryText(computation: ExplorerComputation, state: ExplorerState): string {
  const lines: string[] = [];
  const name = state.settings.title ?? computation.setup.name;
  if (name) lines.push(name);
  const values = Object.entries(state.values);
  if (values.length) lines.push(`values: ${values.map(([k, v]) => `${k} = ${v}`).join(", ")}`);
  for (const c of computation.evaluation.cautions) lines.push(`caution: ${c}`);
  lines.push(describeHeadline(computation.headline, computation.table.unit));
  const reach = explorerReach(state, computation);
  if (reach) for (const line of reachSummary(reach)) lines.push(`${line.label}: ${line.text}`);
  for (const w of computation.evaluation.warnings) lines.push(`warning: ${w}`);
  lines.push(`fingerprint: ${computation.fingerprint}`);
  return lines.join("\n");
}
