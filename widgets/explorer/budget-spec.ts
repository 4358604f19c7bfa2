/** Vega-Lite spec of a noise budget (the explorer's chart, live and static). */
import type { BudgetTable } from "../../src/index";
import type { ExplorerState } from "./format";
import type { ExplorerComputation } from "./model";

/**
 * Vega-Lite (v5) chart of a noise budget: log–log lines of the total, each budget term and
 * the reference curves. The data sit in the named dataset `curves`, so a live view can swap
 * the numbers (view.change) without compiling or embedding the chart again.
 */
export const CURVES_DATASET = "curves";

export interface CurveRow {
  /** Frequency in Hz. */
  f: number;
  /** Spectral density in the table's unit. */
  value: number;
  series: string;
  kind: "total" | "term" | "reference";
}

/** Long-format rows; points that are not finite and positive are left out (a log axis cannot show them). */
export function curveRows(table: BudgetTable): CurveRow[] {
  const rows: CurveRow[] = [];
  table.columns.forEach((c, k) => {
    const kind: CurveRow["kind"] = k === 0 ? "total" : c.id === "sql" || c.id === "zero-point" || c.id === "thermal" ? "reference" : "term";
    const series = k === 0 ? "total" : c.label;
    for (let i = 0; i < table.frequencies.length; i++) {
      const v = c.values[i];
      if (Number.isFinite(v) && v > 0) rows.push({ f: table.frequencies[i], value: v, series, kind });
    }
  });
  return rows;
}

/** A palette of our own: dark total, distinct hues for terms, greys for references. */
const TERM_COLOURS = ["#c2452d", "#2f7f9e", "#7a5cb8", "#3c9a52", "#d08a1a", "#b8467c", "#5a6b1f", "#1f4f7a", "#a35a2a", "#4aa3a3"];
const REFERENCE_COLOURS: Record<string, string> = { sql: "#303030", "zero-point": "#8a8a8a", thermal: "#b0a070" };

export interface BudgetSpecOptions {
  title?: string;
  width?: number;
  height?: number;
}

export function budgetSpec(table: BudgetTable, quantity: string, options: BudgetSpecOptions = {}): Record<string, unknown> {
  const series = table.columns.map((c, k) => (k === 0 ? "total" : c.label));
  const colours = table.columns.map((c, k) => {
    if (k === 0) return "#111111";
    return REFERENCE_COLOURS[c.id] ?? TERM_COLOURS[(k - 1) % TERM_COLOURS.length];
  });
  const density = table.spectralDensity === "amplitude" ? "ASD" : "PSD";
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v5.json",
    title: options.title ?? "",
    width: options.width ?? 560,
    height: options.height ?? 340,
    data: { name: CURVES_DATASET, values: curveRows(table) },
    mark: { type: "line", clip: true, interpolate: "linear" },
    encoding: {
      x: {
        field: "f",
        type: "quantitative",
        // nice: false keeps a narrow band (1.1–1.3 MHz) from being stretched to whole decades.
        scale: { type: "log", nice: false },
        axis: { title: "frequency [Hz]", format: "~s", grid: true },
      },
      y: {
        field: "value",
        type: "quantitative",
        scale: { type: "log", nice: false },
        axis: { title: `${quantity} ${density} [${table.unit}]`, format: ".0e", grid: true },
      },
      color: {
        field: "series",
        type: "nominal",
        scale: { domain: series, range: colours },
        legend: { title: null, orient: "right", labelLimit: 260 },
      },
      strokeDash: {
        field: "kind",
        type: "nominal",
        scale: {
          domain: ["total", "term", "reference"],
          range: [
            [1, 0],
            [1, 0],
            [6, 4],
          ],
        },
        legend: null,
      },
      strokeWidth: {
        field: "kind",
        type: "ordinal",
        sort: ["total", "term", "reference"],
        scale: { domain: ["total", "term", "reference"], range: [2.6, 1.4, 1.4] },
        legend: null,
      },
      detail: { field: "series", type: "nominal" },
      tooltip: [
        { field: "series", type: "nominal", title: "curve" },
        { field: "f", type: "quantitative", title: "frequency [Hz]", format: ".4~s" },
        { field: "value", type: "quantitative", title: `${density} [${table.unit}]`, format: ".4e" },
      ],
    },
    config: { font: "sans-serif", view: { stroke: "#cccccc" }, line: { strokeCap: "round" } },
  };
}

/** The Vega-Lite spec of an explorer's chart; the title is the state's, or the set-up's name. */
export function explorerFigureSpec(computation: ExplorerComputation, state: Pick<ExplorerState, "settings">): Record<string, unknown> {
  return budgetSpec(computation.table, computation.evaluation.budget.quantity.name, { title: state.settings.title ?? computation.setup.name });
}
