/** The tolerance map in the page: heat map, keyboard cursor, a cell's explorer below. */
import type { View } from "vega";
import { vega } from "../../core/browser/vega";
import { CellStatus } from "../../../src/index";
import { STATUS_ATTRIBUTE } from "../../core/page/names";
import { EXPLORER_CLASS, STATE_SCRIPT_CLASS } from "../../explorer/names";
import { stateDocumentText } from "../../explorer/document";
import type { ExplorerState } from "../../explorer/format";
import { toleranceHeatmapSpec } from "../heatmap-spec";
import { cellExplorerState, heatmapCells, loadToleranceState, type HeatmapCell, type ToleranceWidgetState } from "../model";
import { SELECTED_CELL_ATTRIBUTE, TOLERANCE_STATE_CLASS } from "../names";
import { messageOf } from "../../core/browser/boot";
import { el } from "../../core/browser/dom";
import { actionButton, downloadText, fileStem } from "../../core/browser/actions";
import { toleranceCsv } from "../numbers";
import { methodsButtons } from "../../core/browser/methods-buttons";
import { toleranceMethods } from "../methods/methods";

export type BootFunction = (root: ParentNode) => unknown;

/**
 * One live tolerance map: the heat map drawn from the data it carries (nothing is
 * recomputed to draw it). Clicking a cell, or Enter on the keyboard cursor, opens that
 * cell's set-up in a noise-budget explorer below the map; another cell replaces it.
 */
export class ToleranceWidget {
  readonly element: HTMLElement;
  readonly ready: Promise<void>;
  private state: ToleranceWidgetState | undefined;
  private cells: HeatmapCell[] = [];
  private view: View | undefined;
  private readonly boot: BootFunction;
  private readonly alert = el("div", { class: "qf-alert", role: "alert", hidden: "" });
  private readonly canvasHost = el("div", { class: "qf-canvas qf-heatmap", tabindex: "0", role: "grid" });
  private readonly cursorNote = el("div", { class: "qf-cell-cursor", "aria-live": "polite" });
  private readonly cellNote = el("div", { class: "qf-cell-note", role: "status", hidden: "" });
  private readonly slot = el("div", { class: "qf-cell-explorer" });
  // A frame over the opened cell, drawn above the canvas so the map itself is never redrawn.
  private readonly highlight = el("div", { class: "qf-cell-highlight", "aria-hidden": "true", hidden: "" });
  private cursor = { i: 0, j: 0 };
  private disposed = false;

  constructor(element: HTMLElement, boot: BootFunction) {
    this.element = element;
    this.boot = boot;
    this.ready = this.start();
  }

  /** The cell whose explorer is shown, if any. */
  get selected(): { i: number; j: number } | undefined {
    const v = this.element.getAttribute(SELECTED_CELL_ATTRIBUTE);
    if (!v) return undefined;
    const [i, j] = v.split(",").map(Number);
    return { i, j };
  }

  /** Page coordinates (CSS pixels from the viewport) of the centre of cell (i, j), for tests and tools. */
  cellCenter(i: number, j: number): { x: number; y: number } {
    const view = this.requireView();
    const cell = this.cells.find((c) => c.i === i && c.j === j);
    if (!cell) throw new Error(`no cell (${i}, ${j})`);
    const canvas = this.canvasHost.querySelector("canvas");
    if (!canvas) throw new Error("the heat map is not drawn");
    const box = canvas.getBoundingClientRect();
    const [ox, oy] = view.origin();
    const sx = view.scale("x") as (v: number) => number;
    const sy = view.scale("y") as (v: number) => number;
    return { x: box.left + ox + (sx(cell.x0) + sx(cell.x1)) / 2, y: box.top + oy + (sy(cell.y0) + sy(cell.y1)) / 2 };
  }

  /** Opens cell (i, j) in the explorer below the map (replacing any other). */
  select(i: number, j: number): void {
    const state = this.state;
    if (!state || this.disposed) return;
    const nx = state.map.x.written.length;
    const status = state.map.status[j * nx + i];
    const cell = this.cells[j * nx + i];
    this.cursor = { i, j };
    this.element.setAttribute(SELECTED_CELL_ATTRIBUTE, `${i},${j}`);
    this.showCursor();
    this.showHighlight(i, j);
    if (status !== CellStatus.ok) {
      this.slot.replaceChildren();
      this.showNote(`No explorer for ${cell.xText}, ${cell.yText}: the cell is ${cell.status}. ${cell.message}`);
      return;
    }
    let explorer: ExplorerState;
    try {
      explorer = cellExplorerState(state, i, j);
    } catch (e) {
      this.slot.replaceChildren();
      this.showNote(`No explorer for ${cell.xText}, ${cell.yText}: ${messageOf(e)}`);
      return;
    }
    this.cellNote.hidden = true;
    const script = el("script", { type: "application/json", class: STATE_SCRIPT_CLASS });
    script.textContent = stateDocumentText(explorer);
    const host = el("div", { class: EXPLORER_CLASS }, [script]);
    // The old explorer leaves the page; the runtime drops it on this boot.
    this.slot.replaceChildren(host);
    this.boot(this.slot);
  }

  dispose(): void {
    this.disposed = true;
    this.view?.finalize();
    this.view = undefined;
  }

  /** The map's numbers (the CSV `quietframe render` writes) and its methods text (Markdown, LaTeX, BibTeX). */
  private actions(): HTMLElement {
    const button = (label: string, title: string, action: () => unknown): HTMLButtonElement => actionButton(label, title, action, this.alert);
    const state = (): ToleranceWidgetState => {
      if (!this.state) throw new Error("the map has no valid state");
      return this.state;
    };
    const stem = (): string => fileStem(this.state?.settings.title ?? "tolerance-map");
    return el("div", { class: "qf-actions" }, [
      button("CSV", "Save the map's numbers: axes, figure and status of every cell (shortest round-trip form)", () => downloadText(toleranceCsv(state().map), `${stem()}.csv`, "text/csv")),
      ...methodsButtons(button, stem, (options) => toleranceMethods(state(), options)),
    ]);
  }

  private async start(): Promise<void> {
    this.element.setAttribute(STATUS_ATTRIBUTE, "booting");
    this.element.prepend(this.alert);
    try {
      const script = this.element.querySelector<HTMLScriptElement>(`script.${TOLERANCE_STATE_CLASS}`);
      if (!script) throw new Error("this widget carries no state");
      const state = loadToleranceState(script.textContent ?? "");
      this.state = state;
      this.cells = heatmapCells(state);
      const spec = toleranceHeatmapSpec(state);
      const { View, parse, compile } = vega();
      const vgSpec = compile(spec as unknown as Parameters<typeof compile>[0]).spec;
      const view = new View(parse(vgSpec), { renderer: "canvas", hover: false });
      view.addEventListener("click", (_event, item) => {
        const datum = (item as { datum?: { i?: unknown; j?: unknown } } | null | undefined)?.datum;
        if (datum && typeof datum.i === "number" && typeof datum.j === "number") this.select(datum.i, datum.j);
      });
      this.view = view;
      await view.initialize(this.canvasHost).runAsync();
    } catch (e) {
      this.alert.textContent = `The interactive map cannot start: ${messageOf(e)}`;
      this.alert.hidden = false;
      this.element.setAttribute(STATUS_ATTRIBUTE, "error");
      return;
    }
    this.canvasHost.setAttribute("aria-label", "tolerance map: arrow keys move between cells, Enter opens the cell in an explorer");
    this.canvasHost.addEventListener("keydown", (e) => this.onKey(e));
    this.element.querySelector<HTMLElement>(".qf-fallback")?.setAttribute("hidden", "");
    this.canvasHost.style.position = "relative";
    this.canvasHost.append(this.highlight);
    this.element.append(el("div", { class: "qf-live" }, [this.canvasHost, this.cursorNote, this.cellNote, this.actions(), this.slot]));
    this.showCursor();
    this.element.setAttribute(STATUS_ATTRIBUTE, "ready");
  }

  private onKey(e: KeyboardEvent): void {
    const state = this.state;
    if (!state) return;
    const nx = state.map.x.written.length;
    const ny = state.map.y.written.length;
    const moves: Record<string, [number, number]> = { ArrowLeft: [-1, 0], ArrowRight: [1, 0], ArrowUp: [0, 1], ArrowDown: [0, -1] };
    const move = moves[e.key];
    if (move) {
      this.cursor = { i: Math.min(nx - 1, Math.max(0, this.cursor.i + move[0])), j: Math.min(ny - 1, Math.max(0, this.cursor.j + move[1])) };
      this.showCursor();
      e.preventDefault();
    } else if (e.key === "Enter" || e.key === " ") {
      this.select(this.cursor.i, this.cursor.j);
      e.preventDefault();
    }
  }

  private showCursor(): void {
    const state = this.state;
    if (!state) return;
    const cell = this.cells[this.cursor.j * state.map.x.written.length + this.cursor.i];
    this.cursorNote.textContent = `${state.map.x.target} = ${cell.xText}, ${state.map.y.target} = ${cell.yText}: ${cell.figureText}${cell.status === "ok" ? "" : ` (${cell.status})`}`;
  }

  /** Frames cell (i, j) where the view's own scales draw it (dark outline with a light rim: visible on every colour). */
  private showHighlight(i: number, j: number): void {
    const view = this.view;
    const canvas = this.canvasHost.querySelector("canvas");
    const cell = this.cells.find((c) => c.i === i && c.j === j);
    if (!view || !canvas || !cell) return;
    const [ox, oy] = view.origin();
    const sx = view.scale("x") as (v: number) => number;
    const sy = view.scale("y") as (v: number) => number;
    const left = canvas.offsetLeft + ox + Math.min(sx(cell.x0), sx(cell.x1));
    const top = canvas.offsetTop + oy + Math.min(sy(cell.y0), sy(cell.y1));
    const h = this.highlight;
    h.style.cssText =
      `position:absolute;pointer-events:none;box-sizing:border-box;border:2px solid #111;box-shadow:0 0 0 1px #fff,inset 0 0 0 1px #fff;` +
      `left:${left}px;top:${top}px;width:${Math.abs(sx(cell.x1) - sx(cell.x0))}px;height:${Math.abs(sy(cell.y1) - sy(cell.y0))}px`;
    h.setAttribute("data-cell", `${i},${j}`);
    h.hidden = false;
  }

  private showNote(text: string): void {
    this.cellNote.textContent = text;
    this.cellNote.hidden = false;
  }

  private requireView(): View {
    if (!this.view) throw new Error("the heat map is not drawn yet");
    return this.view;
  }
}
