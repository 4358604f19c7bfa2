/**
 * The live Vega view of a budget chart, shared by the explorer's page view and the live chart
 * front-end.
 */
import type { Changeset, View } from "vega";
import { vega } from "../../core/browser/vega";
import { log, type BudgetTable } from "../../../src/index";
import { budgetSpec, chartCurves, curveRows, CURVES_DATASET, MECHANISM_DATASET, RATIO_DATASET, sqlRatioRows, type CurveRow, type MechanismPanel, type RatioRow } from "../budget-spec";
import { el } from "../../core/browser/dom";
import { FIGURE } from "../../core/look/layout";

/** What the chart needs from a computation. */
export interface ChartInput {
  readonly table: BudgetTable;
  readonly quantity: string;
  readonly title: string;
  /** A light source's term by mechanism, when the engine splits one. */
  readonly mechanism?: MechanismPanel;
  /** The target line on the ratio panel, dB relative to the SQL. */
  readonly targetDb?: number;
}

/**
 * The live Vega view of a budget. The spec is compiled once; new numbers go in through a
 * changeset on the `curves` and `ratio` datasets. Only when the set of curves itself changes
 * (a budget term splits or merges, e.g. squeezing turned to a pure quadrature) or the band
 * does (its ticks and unit are in the spec) is the spec rebuilt.
 */
export class ChartView {
  readonly element: HTMLElement;
  private readonly canvasHost: HTMLElement;
  private readonly pointer: HTMLElement;
  private view: View | undefined;
  private layoutKey = "";
  /** Panels under the budget in the drawn spec: the ratio to the SQL, the mechanisms. */
  private lowerPanels = { ratio: false, mechanism: false };
  private table: BudgetTable | undefined;
  private plotted: CurveRow[] = [];

  constructor() {
    this.canvasHost = el("div", { class: "qf-canvas" });
    this.pointer = el("div", { class: "qf-pointer", hidden: "" });
    this.element = el("div", { class: "qf-chart" }, [this.canvasHost, this.pointer]);
  }

  /** Shows new curves; resolves once they are drawn. */
  async show(input: ChartInput): Promise<void> {
    const f = input.table.frequencies;
    const ratioRows = sqlRatioRows(input.table);
    const key = JSON.stringify([
      input.title,
      input.quantity,
      input.table.unit,
      input.table.spectralDensity,
      chartCurves(input.table).map((c) => c.series),
      f[0],
      f[f.length - 1],
      ratioRows.length > 0,
      input.mechanism && input.mechanism.rows.length > 0 ? input.mechanism.source : null,
      input.targetDb ?? null,
    ]);
    if (this.view && key === this.layoutKey) {
      // The ratio panel has one point per frequency: replaced whole, before the curves run the dataflow.
      this.view.change(
        RATIO_DATASET,
        vega()
          .changeset()
          .remove(() => true)
          .insert(ratioRows),
      );
      if (this.lowerPanels.mechanism && input.mechanism) {
        this.view.change(
          MECHANISM_DATASET,
          vega()
            .changeset()
            .remove(() => true)
            .insert(input.mechanism.rows),
        );
      }
      const rows = curveRows(input.table);
      const current = this.plotted;
      if (sameCurvePoints(current, rows)) {
        // Same curves at the same frequencies (the usual case): the values are written into
        // the rows Vega holds, and one changeset names the field and passes every row on
        // (reflow). That spares Vega both a teardown of thousands of scenegraph items and
        // a per-row entry in the changeset.
        let first = -1;
        for (let i = 0; i < rows.length; i++) {
          if (Object.is(current[i].value, rows[i].value)) continue;
          current[i].value = rows[i].value;
          if (first < 0) first = i;
        }
        if (first >= 0) this.view.change(CURVES_DATASET, reflowing().modify(current[first], "value", current[first].value));
        await this.view.runAsync();
      } else {
        await this.view
          .change(
            CURVES_DATASET,
            vega()
              .changeset()
              .remove(() => true)
              .insert(rows),
          )
          .runAsync();
        this.plotted = rows;
      }
    } else {
      const spec = liveSpec(budgetSpec(input.table, input.quantity, { title: input.title, mechanism: input.mechanism, targetDb: input.targetDb }));
      const { View, parse, compile } = vega();
      const vgSpec = compile(spec as unknown as Parameters<typeof compile>[0]).spec;
      const view = new View(parse(vgSpec), { renderer: "canvas", hover: false });
      // Vega's own tooltip would show the first point of a hovered line; the pointer panel reads every curve at the cursor instead.
      view.tooltip(() => undefined);
      view.addEventListener("pointermove", (event) => this.onPointer(event as PointerEvent));
      view.addEventListener("pointerout", () => this.hidePointer());
      this.view?.finalize();
      this.canvasHost.replaceChildren();
      this.view = view;
      this.layoutKey = key;
      this.lowerPanels = { ratio: ratioRows.length > 0, mechanism: input.mechanism !== undefined && input.mechanism.rows.length > 0 };
      await view.initialize(this.canvasHost).runAsync();
      // Vega keeps the very row objects it was given; they are updated in place later.
      this.plotted = view.data(CURVES_DATASET) as CurveRow[];
    }
    this.table = input.table;
  }

  /** The rows the view is plotting now. */
  rows(): CurveRow[] {
    if (!this.view) return [];
    return (this.view.data(CURVES_DATASET) as CurveRow[]).map((r) => ({ f: r.f, value: r.value, series: r.series, kind: r.kind }));
  }

  /** The rows of the panel relative to the SQL that the view is plotting now. */
  ratioRows(): RatioRow[] {
    if (!this.view || !this.lowerPanels.ratio) return [];
    return (this.view.data(RATIO_DATASET) as RatioRow[]).map((r) => ({ f: r.f, ratio: r.ratio, db: r.db }));
  }

  async svg(): Promise<string> {
    return this.requireView().toSVG();
  }

  async pngDataUrl(scale = 2): Promise<string> {
    return this.requireView().toImageURL("png", scale);
  }

  finalize(): void {
    this.view?.finalize();
    this.view = undefined;
  }

  private requireView(): View {
    if (!this.view) throw new Error("the chart is not drawn yet");
    return this.view;
  }

  private hidePointer(): void {
    this.pointer.hidden = true;
  }

  /** Values of every curve at the grid frequency nearest the cursor. */
  private onPointer(event: PointerEvent): void {
    const view = this.view;
    const table = this.table;
    const canvas = this.canvasHost.querySelector("canvas");
    if (!view || !table || !canvas) return;
    const box = canvas.getBoundingClientRect();
    const [ox, oy] = view.origin();
    const x = event.clientX - box.left - ox;
    const y = event.clientY - box.top - oy;
    // Over the plot panels (the budget and, below it, the ratio to the SQL and the mechanisms), not the key.
    const panels = Number(this.lowerPanels.ratio) + Number(this.lowerPanels.mechanism);
    if (x < 0 || y < 0 || x > FIGURE.plotWidth || y > FIGURE.plotHeight + panels * (FIGURE.spacing + FIGURE.panelHeight)) return this.hidePointer();
    const f = view.scale("x").invert(x) as number;
    const i = nearestIndex(table.frequencies, f);
    const rows = table.columns.map((c) => el("tr", {}, [el("td", {}, [c.label]), el("td", {}, [formatNumber(c.values[i])])]));
    this.pointer.replaceChildren(el("div", {}, [`${formatNumber(table.frequencies[i], 6)} Hz · ${table.unit}`]), el("table", {}, [el("tbody", {}, rows)]));
    const host = this.element.getBoundingClientRect();
    this.pointer.hidden = false;
    // Beside the cursor, flipped to the other side near the right or bottom edge of the chart.
    const left = event.clientX - host.left + 14;
    const top = event.clientY - host.top + 10;
    const { offsetWidth: w, offsetHeight: h } = this.pointer;
    this.pointer.style.left = `${left + w > host.width ? Math.max(0, left - w - 28) : left}px`;
    this.pointer.style.top = `${top + h > host.height ? Math.max(0, top - h - 20) : top}px`;
  }
}

/** A changeset that passes every row of the dataset on as modified (Vega's `reflow`, missing from its type declarations). */
function reflowing(): Changeset {
  return (vega().changeset() as Changeset & { reflow(): Changeset }).reflow();
}

function sameCurvePoints(current: readonly CurveRow[], next: readonly CurveRow[]): boolean {
  if (current.length !== next.length) return false;
  for (let i = 0; i < next.length; i++) if (current[i].f !== next[i].f || current[i].series !== next[i].series) return false;
  return true;
}

/**
 * The budget chart as the live view draws it, with the same panels, curves, scales, colours
 * and axes, minus per-point work that every slider move would redo for each of thousands of
 * points:
 *  - the tooltip encodings and the per-point ARIA descriptions (two formatted strings per
 *    point): the pointer panel reads the values at the cursor instead;
 *  - type parsing of the rows (`f`, `value` and `db` are numbers already);
 *  - sorting each line's points by x: the rows come in frequency order (curveRows and
 *    sqlRatioRows walk the ascending grid), so the lines join the same points in the same order.
 */
export function liveSpec(spec: Record<string, unknown>): Record<string, unknown> {
  const panels = (spec.vconcat as Record<string, unknown>[]).map((panel) => {
    const data = panel.data as Record<string, unknown>;
    const named = typeof data.name === "string";
    const layer = (panel.layer as Record<string, unknown>[]).map((l) => {
      const encoding = { ...(l.encoding as Record<string, unknown>) };
      delete encoding.tooltip;
      const mark: Record<string, unknown> = { ...(l.mark as Record<string, unknown>), aria: false };
      if (named && mark.type === "line") encoding.order = { value: null };
      return { ...l, mark, encoding };
    });
    return { ...panel, data: named ? { ...data, format: { parse: null } } : data, layer };
  });
  return { ...spec, vconcat: panels };
}

function nearestIndex(sorted: Float64Array, x: number): number {
  let lo = 0;
  let hi = sorted.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid] <= x) lo = mid;
    else hi = mid;
  }
  // Nearest on the log axis the chart uses.
  return Math.abs(log(x / sorted[lo])) <= Math.abs(log(sorted[hi] / x)) ? lo : hi;
}

function formatNumber(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return String(x);
  return Math.abs(x) >= 1e-3 && Math.abs(x) < 1e7 ? String(Number(x.toPrecision(digits))) : x.toExponential(digits - 1);
}
