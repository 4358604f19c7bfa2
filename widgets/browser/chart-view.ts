import { changeset, parse, View } from "vega";
import { compile } from "vega-lite";
import type { BudgetTable } from "../../src/engine/tabulate";
import { budgetSpec, curveRows, CURVES_DATASET, type CurveRow } from "../chart/budget-spec";
import { el } from "./dom";
import { log } from "../../src/numeric/portable-math";

/** What the chart needs from a computation. */
export interface ChartInput {
  readonly table: BudgetTable;
  readonly quantity: string;
  readonly title: string;
}

/**
 * The live Vega view of a budget. The spec is compiled once; new numbers go in through a
 * changeset on the `curves` dataset. Only when the set of curves itself changes (a budget
 * term splits or merges, e.g. squeezing turned to a pure quadrature) is the spec rebuilt,
 * since its colour domain lists the curves.
 */
export class ChartView {
  readonly element: HTMLElement;
  private readonly canvasHost: HTMLElement;
  private readonly pointer: HTMLElement;
  private view: View | undefined;
  private layoutKey = "";
  private table: BudgetTable | undefined;
  private plotted: CurveRow[] = [];

  constructor() {
    this.canvasHost = el("div", { class: "qf-canvas" });
    this.pointer = el("div", { class: "qf-pointer", hidden: "" });
    this.element = el("div", { class: "qf-chart" }, [this.canvasHost, this.pointer]);
  }

  /** Shows new curves; resolves once they are drawn. */
  async show(input: ChartInput): Promise<void> {
    const key = JSON.stringify([input.title, input.quantity, input.table.unit, input.table.spectralDensity, input.table.columns.map((c) => c.label)]);
    if (this.view && key === this.layoutKey) {
      const rows = curveRows(input.table);
      const current = this.plotted;
      const change = changeset();
      if (sameCurvePoints(current, rows)) {
        // Same curves at the same frequencies (the usual case): update values in place, which
        // spares Vega from tearing down and rebuilding thousands of scenegraph items.
        for (let i = 0; i < rows.length; i++) if (!Object.is(current[i].value, rows[i].value)) change.modify(current[i], "value", rows[i].value);
      } else {
        change.remove(() => true).insert(rows);
        this.plotted = rows;
      }
      await this.view.change(CURVES_DATASET, change).runAsync();
    } else {
      const spec = withoutTooltipEncoding(budgetSpec(input.table, input.quantity, { title: input.title }));
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
    if (x < 0 || y < 0 || x > view.width() || y > view.height()) return this.hidePointer();
    const f = view.scale("x").invert(x) as number;
    const i = nearestIndex(table.frequencies, f);
    const rows = table.columns.map((c) => el("tr", {}, [el("td", {}, [c.label]), el("td", {}, [formatNumber(c.values[i])])]));
    this.pointer.replaceChildren(
      el("div", {}, [`${formatNumber(table.frequencies[i], 6)} Hz · ${table.unit}`]),
      el("table", {}, [el("tbody", {}, rows)]),
    );
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

function sameCurvePoints(current: readonly CurveRow[], next: readonly CurveRow[]): boolean {
  if (current.length !== next.length) return false;
  for (let i = 0; i < next.length; i++) if (current[i].f !== next[i].f || current[i].series !== next[i].series) return false;
  return true;
}

/**
 * The live chart reads values through its pointer panel, so the per-point tooltip
 * encoding (thousands of formatted strings on every update) is dropped here.
 */
function withoutTooltipEncoding(spec: Record<string, unknown>): Record<string, unknown> {
  const encoding = { ...(spec.encoding as Record<string, unknown>) };
  delete encoding.tooltip;
  return { ...spec, encoding };
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
