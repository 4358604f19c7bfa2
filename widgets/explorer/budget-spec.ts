/** Vega-Lite spec of a noise budget (the explorer's chart, live and static). */
import { log10, type BudgetTable, type MechanismBudget } from "../../src/index";
import { curveStyle, termRole } from "../core/look/encoding";
import { FIGURE, figureConfig, frequencyAxis, frequencyX, keyPanel, leftAxis } from "../core/look/layout";
import { INK, ROLE_COLOURS } from "../core/look/palette";
import type { ExplorerState } from "./format";
import type { ExplorerComputation } from "./model";

/**
 * Vega-Lite (v5) chart of a noise budget in quietframe's look (docs/widgets.md, "Visual
 * identity"): the absolute budget on log–log axes with the band below the SQL shaded, under
 * it the total relative to the SQL in dB, then a key of line samples. The data sit in the
 * named datasets `curves` and `ratio`, so a live view can swap the numbers (view.change)
 * without compiling or embedding the chart again.
 */
export const CURVES_DATASET = "curves";
export const RATIO_DATASET = "ratio";
export const MECHANISM_DATASET = "mechanism";

export interface CurveRow {
  /** Frequency in Hz. */
  f: number;
  /** Spectral density in the table's unit. */
  value: number;
  series: string;
  kind: "total" | "term" | "reference";
}

/** One row of the ratio panel. */
export interface RatioRow {
  /** Frequency in Hz. */
  f: number;
  /** Total ÷ SQL as the table holds them (amplitudes for an ASD table, powers for a PSD table). */
  ratio: number;
  /** The same in dB of power: negative below the SQL, positive above it. */
  db: number;
}

/** A column the chart draws: its name in the key and scales, and whether it is the total, a term or a reference. */
export interface ChartCurve {
  readonly column: BudgetTable["columns"][number];
  readonly series: string;
  readonly kind: CurveRow["kind"];
}

/**
 * The columns the chart draws, in the table's order. The quantum-FDT thermal reference is
 * left out when the budget has a thermal term: the term is the thermal force the model
 * computed, and the reference would be drawn on top of it. The CSV keeps every column.
 */
export function chartCurves(table: BudgetTable): ChartCurve[] {
  const hasThermalTerm = table.columns.some((c, k) => k > 0 && c.id !== "thermal" && termRole(c) === "thermal");
  const curves: ChartCurve[] = [];
  table.columns.forEach((column, k) => {
    const kind: CurveRow["kind"] = k === 0 ? "total" : column.id === "sql" || column.id === "zero-point" || column.id === "thermal" ? "reference" : "term";
    if (kind === "reference" && column.id === "thermal" && hasThermalTerm) return;
    curves.push({ column, series: k === 0 ? "total" : column.label, kind });
  });
  return curves;
}

/** Long-format rows; points that are not finite and positive are left out (a log axis cannot show them). */
export function curveRows(table: BudgetTable): CurveRow[] {
  const rows: CurveRow[] = [];
  for (const { column, series, kind } of chartCurves(table)) {
    for (let i = 0; i < table.frequencies.length; i++) {
      const v = column.values[i];
      if (Number.isFinite(v) && v > 0) rows.push({ f: table.frequencies[i], value: v, series, kind });
    }
  }
  return rows;
}

/**
 * The total relative to the SQL at each frequency where both are finite and positive; empty
 * without an SQL reference. dB of power: 20 log₁₀ of an amplitude ratio, 10 log₁₀ of a power ratio.
 */
export function sqlRatioRows(table: BudgetTable): RatioRow[] {
  const total = table.columns[0]?.values;
  const sql = table.columns.find((c) => c.id === "sql")?.values;
  if (!total || !sql) return [];
  const perDecade = table.spectralDensity === "amplitude" ? 20 : 10;
  const rows: RatioRow[] = [];
  for (let i = 0; i < table.frequencies.length; i++) {
    const ratio = total[i] / sql[i];
    if (Number.isFinite(ratio) && ratio > 0) rows.push({ f: table.frequencies[i], ratio, db: perDecade * log10(ratio) });
  }
  return rows;
}

/** The parts of a light source's term. */
export const MECHANISM_PARTS = ["imprecision", "back-action", "correlation"] as const;
export type MechanismPart = (typeof MECHANISM_PARTS)[number];

/** One row of the mechanism panel: a part's PSD divided by the term's (signed: the correlation may be negative). */
export interface MechanismRow {
  /** Frequency in Hz. */
  f: number;
  part: MechanismPart;
  value: number;
}

/** What the mechanism panel draws: one light source's term split by mechanism. */
export interface MechanismPanel {
  /** The source's name, e.g. "laser". */
  readonly source: string;
  readonly rows: MechanismRow[];
}

/**
 * The mechanism panel of a budget: the light source whose term is largest (summed over the
 * grid) split into imprecision, back-action and correlation, each as a share of the term, so
 * at every frequency the three add up to 1. None without a split.
 */
export function mechanismPanel(mechanisms: MechanismBudget): MechanismPanel | undefined {
  if (mechanisms.terms.length === 0) return undefined;
  const weight = (psd: Float64Array): number => psd.reduce((sum, v) => (Number.isFinite(v) ? sum + v : sum), 0);
  const term = mechanisms.terms.reduce((best, t) => (weight(t.psd) > weight(best.psd) ? t : best));
  const parts: [MechanismPart, Float64Array][] = [
    ["imprecision", term.imprecision],
    ["back-action", term.backAction],
    ["correlation", term.correlation],
  ];
  const rows: MechanismRow[] = [];
  for (const [part, psd] of parts) {
    for (let i = 0; i < mechanisms.frequencies.length; i++) {
      const value = psd[i] / term.psd[i];
      if (Number.isFinite(value)) rows.push({ f: mechanisms.frequencies[i], part, value });
    }
  }
  return { source: term.owner, rows };
}

export interface BudgetSpecOptions {
  title?: string;
  /** A target level of the ratio panel, in dB relative to the SQL (e.g. -3); drawn as a line. */
  targetDb?: number;
  /** A light source's term by mechanism (mechanismPanel); drawn as a signed panel under the ratio. */
  mechanism?: MechanismPanel;
}

export function budgetSpec(table: BudgetTable, quantity: string, options: BudgetSpecOptions = {}): Record<string, unknown> {
  const curves = chartCurves(table);
  const styles = curves.map((c) => curveStyle(c.column));
  const domain = curves.map((c) => c.series);
  const scale = (range: unknown[]) => ({ domain, range });
  const series = {
    color: { field: "series", type: "nominal", scale: scale(styles.map((s) => s.colour)), legend: null },
    strokeDash: { field: "series", type: "nominal", scale: scale(styles.map((s) => [...s.dash])), legend: null },
    // An ordinal scale maps each name to its own width (a nominal or point scale would interpolate).
    strokeWidth: { field: "series", type: "ordinal", sort: null, scale: { type: "ordinal", ...scale(styles.map((s) => s.width)) }, legend: null },
  };
  const density = table.spectralDensity === "amplitude" ? "ASD" : "PSD";
  const axis = frequencyAxis(table.frequencies[0], table.frequencies[table.frequencies.length - 1]);
  const sql = curves.find((c) => c.column.id === "sql");
  const ratioRows = sqlRatioRows(table);
  const hasRatio = sql !== undefined && ratioRows.length > 0;
  const mechanism = options.mechanism && options.mechanism.rows.length > 0 ? options.mechanism : undefined;
  // Frequency labels go under the lowest plot panel only.
  const labelsOnMain = !hasRatio && !mechanism;
  const y = {
    field: "value",
    type: "quantitative",
    scale: { type: "log", nice: false },
    // Five ticks: decades only on a budget spanning more than five decades (no crowd of 2…9 ticks).
    axis: leftAxis(`${quantity} ${density} [${table.unit}]`, { format: ".0e", grid: true, tickCount: 5 }),
  };
  const tooltip = [
    { field: "series", type: "nominal", title: "curve" },
    { field: "f", type: "quantitative", title: "frequency [Hz]", format: ".4~s" },
    { field: "value", type: "quantitative", title: `${density} [${table.unit}]`, format: ".4e" },
  ];
  const isTotal = { field: "kind", equal: "total" };
  const layers: Record<string, unknown>[] = [];
  if (sql) {
    layers.push({
      transform: [{ filter: { field: "series", equal: sql.series } }],
      mark: { type: "area", color: INK.belowSqlBand, opacity: 1, clip: true, aria: false },
      encoding: { x: frequencyX(axis, labelsOnMain), y: { ...y, stack: null }, y2: { value: "height" } },
    });
  }
  layers.push(
    {
      transform: [{ filter: { not: isTotal } }],
      mark: { type: "line", clip: true, interpolate: "linear" },
      encoding: { x: frequencyX(axis, labelsOnMain), y, ...series, detail: { field: "series", type: "nominal" }, tooltip },
    },
    {
      // A white casing under the total, so it reads over the terms without being heavy.
      transform: [{ filter: isTotal }],
      mark: { type: "line", clip: true, interpolate: "linear", color: INK.halo, strokeWidth: 5.5, aria: false },
      encoding: { x: frequencyX(axis, labelsOnMain), y },
    },
    {
      transform: [{ filter: isTotal }],
      mark: { type: "line", clip: true, interpolate: "linear" },
      encoding: { x: frequencyX(axis, labelsOnMain), y, ...series, tooltip },
    },
  );
  const panels: Record<string, unknown>[] = [{ width: FIGURE.plotWidth, height: FIGURE.plotHeight, data: { name: CURVES_DATASET }, layer: layers }];
  if (hasRatio) panels.push(ratioPanel(axis, options.targetDb, !mechanism));
  if (mechanism) panels.push(mechanismPanelSpec(axis, mechanism.source));
  panels.push(keyPanel(curves.map((c) => ({ series: c.series }))));
  // The key draws with the plot's series scales; its own data carry only the names.
  const key = panels[panels.length - 1] as { layer: Record<string, unknown>[] };
  key.layer[0] = { ...key.layer[0], encoding: { ...(key.layer[0].encoding as Record<string, unknown>), ...series } };
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v5.json",
    title: options.title ?? "",
    datasets: { [CURVES_DATASET]: curveRows(table), [RATIO_DATASET]: ratioRows, ...(mechanism ? { [MECHANISM_DATASET]: mechanism.rows } : {}) },
    bounds: "flush",
    vconcat: panels,
    resolve: { scale: { x: "shared", color: "shared", strokeDash: "shared", strokeWidth: "shared" } },
    config: figureConfig(),
  };
}

/** Total ÷ SQL in dB: the band below the SQL shaded, the 0 dB line, an optional target line. */
function ratioPanel(axis: ReturnType<typeof frequencyAxis>, targetDb: number | undefined, labels: boolean): Record<string, unknown> {
  const x = frequencyX(axis, labels);
  const y = {
    field: "db",
    type: "quantitative",
    // 0 dB and a few dB either side are always in view, so the band below the SQL shows.
    scale: { domain: { unionWith: [-3, 3, ...(targetDb !== undefined && Number.isFinite(targetDb) ? [targetDb] : [])] }, nice: true },
    axis: leftAxis("total ÷ SQL [dB]", { grid: true, tickCount: 4 }),
  };
  const level = (db: number) => ({ datum: db, type: "quantitative" });
  const layers: Record<string, unknown>[] = [
    { mark: { type: "rect", color: INK.belowSqlBand, aria: false }, encoding: { x: { value: 0 }, x2: { value: "width" }, y: level(0), y2: { value: "height" } } },
    { mark: { type: "rule", color: INK.reference, strokeWidth: 1, aria: false }, encoding: { y: level(0) } },
  ];
  if (targetDb !== undefined && Number.isFinite(targetDb)) {
    layers.push({ mark: { type: "rule", color: INK.target, strokeWidth: 1.2, strokeDash: [5, 3], aria: false }, encoding: { y: level(targetDb) } });
  }
  layers.push({
    mark: { type: "line", clip: true, interpolate: "linear", color: ROLE_COLOURS.total, strokeWidth: 1.8 },
    encoding: {
      x,
      y,
      tooltip: [
        { field: "f", type: "quantitative", title: "frequency [Hz]", format: ".4~s" },
        { field: "db", type: "quantitative", title: "total ÷ SQL [dB]", format: ".3f" },
      ],
    },
  });
  return { width: FIGURE.plotWidth, height: FIGURE.panelHeight, data: { name: RATIO_DATASET }, layer: layers };
}

/** How each part is drawn: imprecision and back-action in their role colours, the signed correlation dashed. */
const PART_LOOKS: Readonly<Record<MechanismPart, { colour: string; dash: number[]; width: number }>> = {
  imprecision: { colour: ROLE_COLOURS.imprecision, dash: [1, 0], width: 1.5 },
  "back-action": { colour: ROLE_COLOURS["back-action"], dash: [1, 0], width: 1.5 },
  correlation: { colour: ROLE_COLOURS["quantum-light"], dash: [5, 2.5], width: 1.5 },
};

/**
 * A light source's term by mechanism, as shares of the term on a linear signed axis: a
 * negative correlation shows below the zero line, and the parts add up to the line at 1.
 * Its own small key names the source and the parts in their colours.
 */
function mechanismPanelSpec(axis: ReturnType<typeof frequencyAxis>, source: string): Record<string, unknown> {
  const x = frequencyX(axis, true);
  const y = {
    field: "value",
    type: "quantitative",
    scale: { nice: true },
    axis: leftAxis("share of term", { grid: true, tickCount: 4, format: "~r" }),
  };
  const level = (v: number) => ({ y: { datum: v, type: "quantitative" } });
  const layers: Record<string, unknown>[] = [
    { mark: { type: "rule", color: INK.reference, strokeWidth: 1, aria: false }, encoding: level(0) },
    { mark: { type: "rule", color: ROLE_COLOURS.total, strokeWidth: 1, strokeDash: [2, 2], aria: false }, encoding: level(1) },
    {
      data: { values: [{ source }] },
      mark: { type: "text", align: "left", baseline: "top", color: INK.text, fontSize: FIGURE.fontSize - 1, aria: false },
      encoding: { x: { value: 4 }, y: { value: 2 }, text: { field: "source" } },
    },
  ];
  MECHANISM_PARTS.forEach((part, k) => {
    const look = PART_LOOKS[part];
    layers.push({
      transform: [{ filter: { field: "part", equal: part } }],
      mark: { type: "line", clip: true, interpolate: "linear", color: look.colour, strokeDash: look.dash, strokeWidth: look.width },
      encoding: {
        x,
        y,
        tooltip: [
          { field: "f", type: "quantitative", title: "frequency [Hz]", format: ".4~s" },
          { field: "value", type: "quantitative", title: `${part} ÷ term`, format: ".4~g" },
        ],
      },
    });
    layers.push({
      data: { values: [{ part }] },
      mark: { type: "text", text: part, align: "left", baseline: "top", color: look.colour, fontSize: FIGURE.fontSize - 1, aria: false },
      encoding: { x: { value: 4 + 78 * (k + 1) }, y: { value: 2 } },
    });
  });
  return { width: FIGURE.plotWidth, height: FIGURE.panelHeight, data: { name: MECHANISM_DATASET }, layer: layers };
}

/** The Vega-Lite spec of an explorer's chart; the title is the state's, or the set-up's name. */
export function explorerFigureSpec(computation: ExplorerComputation, state: Pick<ExplorerState, "settings">): Record<string, unknown> {
  return budgetSpec(computation.table, computation.evaluation.budget.quantity.name, {
    title: state.settings.title ?? computation.setup.name,
    mechanism: explorerMechanismPanel(computation),
    targetDb: state.settings.targetDb,
  });
}

/** The mechanism panel of an explorer's computation (none without a split). */
export function explorerMechanismPanel(computation: ExplorerComputation): MechanismPanel | undefined {
  return mechanismPanel(computation.mechanisms);
}
