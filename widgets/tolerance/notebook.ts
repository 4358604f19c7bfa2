/** The tolerance map in a notebook (kernel side): computes the map on the worker pool and shows the heat map. */
import { inspect } from "node:util";
import { logGrid, CellStatus, evaluateCell, resolveToleranceSpec, type SetupDescription, type CellMessage, type ToleranceMap, type ToleranceMapOptions, type ToleranceMapSpec } from "../../src/index";
import { toleranceMap } from "../../src/node";
import { computeExplorer } from "../explorer/model";
import { toleranceHtml } from "./html";
import { renderPng, renderSvg, type RenderPngOptions } from "../core/render/static";
import { toleranceHeatmapSpec } from "./heatmap-spec";
import { cellExplorerState, toleranceSummary, toleranceSummaryText, toleranceWidgetState, type ToleranceSettings, type ToleranceSummary, type ToleranceWidgetState } from "./model";
import type { MimeBundle } from "../core/notebook/display";
import { NotebookExplorer } from "../explorer/notebook/explorer";
import { showWidgetOutput } from "../core/notebook/show-output";

export interface ToleranceWidgetOptions extends ToleranceMapOptions, ToleranceSettings {}

export interface ToleranceShowOptions {
  /** Carry the browser runtime in this output (default: only if no widget carried it yet in this kernel). */
  includeRuntime?: boolean;
  /** PNG fallback resolution and fonts (default scale 1). */
  png?: RenderPngOptions;
}

/**
 * Failed cells whose reason the page can show; beyond this, a failed cell's tooltip gives
 * only its status (the reasons are recomputed in the kernel, one cell set-up each).
 */
export const MAX_WIDGET_MESSAGES = 2000;

/**
 * A computed tolerance map held by a notebook cell. `show()` displays the heat map; a click
 * on a cell opens that cell's set-up in an explorer below it, computed in the page.
 */
export class NotebookTolerance {
  readonly map: ToleranceMap;
  #state: ToleranceWidgetState;

  constructor(map: ToleranceMap, state: ToleranceWidgetState) {
    this.map = map;
    this.#state = state;
  }

  /** The widget's state: base set-up, spec and the map's data, plain JSON. */
  get state(): ToleranceWidgetState {
    return structuredClone(this.#state);
  }

  /** Best cell and the fraction of cells meeting 0 dB (1 for gains) and the target. */
  get summary(): ToleranceSummary {
    return toleranceSummary(this.#state);
  }

  /** The explorer the page opens for cell (i, j), here in the kernel. */
  cellExplorer(i: number, j: number): NotebookExplorer {
    const state = cellExplorerState(this.#state, i, j);
    return new NotebookExplorer(state, computeExplorer(state));
  }

  /** The Vega-Lite spec of the heat map (data inline). */
  spec(): Record<string, unknown> {
    return toleranceHeatmapSpec(this.#state);
  }

  async bundle(options: ToleranceShowOptions & { includeRuntime: boolean }): Promise<MimeBundle> {
    const svg = await renderSvg(this.spec());
    const png = renderPng(svg, { scale: 1, ...options.png });
    return {
      "text/html": toleranceHtml(this.#state, { includeRuntime: options.includeRuntime, svg }),
      "image/png": png,
      "text/plain": toleranceSummaryText(this.#state),
    };
  }

  /** Displays the map; write `await w.show()`. */
  async show(options: ToleranceShowOptions = {}): Promise<void> {
    await showWidgetOutput(options, (includeRuntime) => this.bundle({ ...options, includeRuntime }));
  }

  toString(): string {
    return toleranceSummaryText(this.#state);
  }

  [inspect.custom](): string {
    return this.toString();
  }
}

/**
 * Computes a tolerance map (on every core unless `workers` says otherwise) and wraps it as
 * a widget. Options: those of toleranceMap, plus `title`, `target` (a figure the summary
 * counts cells against, e.g. 3 for 3 dB) and `labels` (axis labels by target).
 */
export async function toleranceWidget(setup: SetupDescription, spec: ToleranceMapSpec, options: ToleranceWidgetOptions = {}): Promise<NotebookTolerance> {
  const { title, target, labels, ...mapOptions } = options;
  const map = await toleranceMap(setup, spec, mapOptions);
  const settings: ToleranceSettings = {};
  if (title !== undefined) settings.title = title;
  if (target !== undefined) settings.target = target;
  if (labels !== undefined) settings.labels = labels;
  return new NotebookTolerance(map, toleranceWidgetState(setup, spec, map, settings, failedCellMessages(setup, spec, map)));
}

/** The reasons of failed cells (up to MAX_WIDGET_MESSAGES), beyond the few the map keeps. */
function failedCellMessages(setup: SetupDescription, spec: ToleranceMapSpec, map: ToleranceMap): CellMessage[] {
  const failed = map.counts.unstable + map.counts.invalid;
  if (failed <= map.messages.length) return [...map.messages];
  const { plan } = resolveToleranceSpec(setup, spec);
  const frequencies = logGrid(plan.grid);
  const nx = map.x.written.length;
  const messages: CellMessage[] = [];
  for (let k = 0; k < map.status.length && messages.length < MAX_WIDGET_MESSAGES; k++) {
    if (map.status[k] === CellStatus.ok) continue;
    const i = k % nx;
    const j = (k - i) / nx;
    const cell = evaluateCell(plan, frequencies, i, j);
    messages.push({
      x: i,
      y: j,
      status: map.status[k] as CellMessage["status"],
      setting: { [map.x.target]: map.x.written[i], [map.y.target]: map.y.written[j] },
      message: cell.message ?? "",
    });
  }
  return messages;
}
