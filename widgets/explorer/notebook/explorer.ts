/** The explorer's notebook API: explorer(...), show() (live or kernel-free), set(), onChange. */
import { inspect } from "node:util";
import { QuietframeError, parseJsonText, type SetupDescription } from "../../../src/index";
import { computeExplorer, createExplorerState, type ExplorerComputation, type ExplorerOptions } from "../model";
import { explorerHtml } from "../html";
import type { RenderPngOptions } from "../../core/render/static";
import { explorerFigures } from "../figures";
import { loadExplorerState, stateDocumentText } from "../document";
import { EXPLORER_STATE_FORMAT, type ExplorerState } from "../format";
import type { MimeBundle } from "../../core/notebook/display";
import { notebookFigures, summaryText, type NotebookFigures } from "./figures";
import { NOTEBOOK_PNG_SCALE, showWidgetOutput } from "../../core/notebook/show-output";
import { ChangeListeners } from "../../core/notebook/change-listeners";
import { kernelWidgetHost } from "../live/kernel-host";
import { LiveExplorer, type ControlValues, type LiveChange } from "../live/live-explorer";
import { liveRuntimeCarried, markLiveRuntimeCarried } from "../live/live-session";

export interface ShowOptions {
  /** Carry the browser runtime in this output (default: only if no widget carried it yet in this kernel). */
  includeRuntime?: boolean;
  /** PNG fallback resolution (default scale 1: one image pixel per chart pixel) and fonts. */
  png?: RenderPngOptions;
  /**
   * Under the quietframe kernel the widget is live (standard controls and quietframe's chart
   * over the Jupyter widget protocol, with the kernel-free output as the fallback); false
   * shows the kernel-free output there too. Elsewhere the output is always kernel-free.
   */
  live?: boolean;
}

/**
 * A noise-budget explorer held by a notebook cell: the state (set-up + controls + current
 * values), what it computes, and `show()` to put the live widget in the notebook.
 */
export class NotebookExplorer {
  #state: ExplorerState;
  #computation: ExplorerComputation;
  #fingerprintMatches: boolean;
  #live: LiveExplorer | undefined;
  readonly #listeners = new ChangeListeners<LiveChange>();

  constructor(state: ExplorerState, computation: ExplorerComputation, fingerprintMatches = true) {
    this.#state = state;
    this.#computation = computation;
    this.#fingerprintMatches = fingerprintMatches;
  }

  /** A copy of the state, plain JSON: save it, share it, or pass it to explorer() again. */
  get state(): ExplorerState {
    this.#live?.settle();
    return structuredClone(this.#state);
  }

  get computation(): ExplorerComputation {
    this.#live?.settle();
    return this.#computation;
  }

  /** Headline figures and the plotted table as plain arrays. */
  get figures(): NotebookFigures {
    this.#live?.settle();
    return notebookFigures(this.#computation, this.#state);
  }

  /** False when the state came from a file whose recorded curves this version does not reproduce bit for bit. */
  get fingerprintMatches(): boolean {
    return this.#fingerprintMatches;
  }

  /** What the controls show now, keyed by target (written as in a set-up, e.g. "3 K"). */
  get values(): ControlValues {
    return this.#live ? this.#live.values : { ...this.#state.values };
  }

  /** Moves the controls (in a live widget, the front-end's too); see set(). */
  set values(values: ControlValues) {
    this.set(values);
  }

  /** In a live widget: why the controls' values could not be computed (undefined when the chart matches them). */
  get error(): string | undefined {
    return this.#live?.error;
  }

  /**
   * Moves controls to new values (written as in a set-up, e.g. "3 K") and recomputes:
   * `w.set({"membrane.temperature": "3 K"})` or `w.set("membrane.temperature", "3 K")`.
   */
  set(values: ControlValues): this;
  set(target: string, value: string | number): this;
  set(values: ControlValues | string, value?: string | number): this {
    const patch: ControlValues = typeof values === "string" ? { [values]: value as string | number } : values;
    if (this.#live) {
      this.#live.setValues(patch);
      return this;
    }
    const base = { ...this.#state, values: { ...this.#state.values, ...patch } };
    const computation = computeExplorer(base);
    this.#accept({ ...base, fingerprint: computation.fingerprint }, computation);
    this.#notify({ values: { ...base.values }, changed: Object.keys(patch), source: "kernel", state: this.state, computation });
    return this;
  }

  /**
   * Calls `listener` after every recomputation (a control moved in the notebook, or set()
   * from a cell) with the values, the state and the computation; returns a function that
   * stops it. A listener that throws is reported and the widget carries on.
   */
  onChange(listener: (change: LiveChange) => void): () => void {
    return this.#listeners.add(listener);
  }

  #accept(state: ExplorerState, computation: ExplorerComputation): void {
    this.#state = state;
    this.#computation = computation;
    this.#fingerprintMatches = true;
  }

  #notify(change: LiveChange): void {
    this.#listeners.notify(change);
  }

  /** The widget-state document (Jupyter widget state 2.0) as text: the shareable form of this widget. */
  stateDocument(): string {
    this.#live?.settle();
    return stateDocumentText(this.#state);
  }

  /**
   * The widget's mime bundle: live HTML (SVG fallback inside), the PNG at scale 1 (what an
   * untrusted notebook shows; show() sends it as an output of its own), text summary.
   */
  async bundle(options: ShowOptions & { includeRuntime: boolean }): Promise<MimeBundle> {
    this.#live?.settle();
    const figures = await explorerFigures(this.#computation, this.#state, { scale: NOTEBOOK_PNG_SCALE, ...options.png });
    return {
      "text/html": explorerHtml(this.#state, this.#computation, { includeRuntime: options.includeRuntime, svg: figures.svg }),
      "image/png": figures.png,
      "text/plain": summaryText(this.#computation, this.#state),
    };
  }

  /**
   * Displays the widget. Rendering the fallback image is asynchronous, so write
   * `await w.show()`: otherwise the cell ends before the output exists.
   */
  async show(options: ShowOptions = {}): Promise<void> {
    const host = options.live === false ? undefined : kernelWidgetHost();
    if (host) {
      // The fallback (kernel-free output) carries the runtime once per kernel for viewers without widgets.
      const carry = options.includeRuntime ?? !liveRuntimeCarried();
      const bundle = await this.bundle({ ...options, includeRuntime: carry });
      // One live explorer per object: showing it again adds another view of the same models,
      // or, once a front-end closed it, opens a new one from the last computed state.
      if (!this.#live || this.#live.isClosed) {
        this.#live = new LiveExplorer(host, this.#state, this.#computation);
        this.#live.onChange((change) => {
          this.#accept(change.state, change.computation);
          this.#notify(change);
        });
      }
      this.#live.display(bundle);
      if (carry) markLiveRuntimeCarried();
      return;
    }
    await showWidgetOutput(options, (includeRuntime) => this.bundle({ ...options, includeRuntime }));
  }

  toString(): string {
    this.#live?.settle();
    return summaryText(this.#computation, this.#state);
  }

  // tslab prints a cell's last value with console.log; show the summary, not the internals.
  [inspect.custom](): string {
    return this.toString();
  }
}

/** A state object, a widget-state document, or either as JSON text. */
export type ExplorerInput = SetupDescription | ExplorerState | Record<string, unknown> | string;

/**
 * An explorer for a set-up (with controls from `options`), or for a saved state: a bare
 * explorer state or a widget-state document, as an object or as JSON text.
 */
export function explorer(input: ExplorerInput, options: ExplorerOptions = {}): NotebookExplorer {
  const value: unknown = typeof input === "string" ? parseJsonText(input, "explorer input") : input;
  if (isSavedState(value)) {
    if (options.controls !== undefined || options.settings !== undefined) {
      throw new QuietframeError({ path: "options", problem: "cannot change a saved state's controls or settings", allowed: "explorer(state) alone; then .set({...}) to move controls" });
    }
    const loaded = loadExplorerState(value);
    return new NotebookExplorer(loaded.state, loaded.computation, loaded.fingerprintMatches);
  }
  const state = createExplorerState(value as SetupDescription, options);
  return new NotebookExplorer(state, computeExplorer(state));
}

function isSavedState(v: unknown): boolean {
  if (typeof v !== "object" || v === null) return false;
  const o = v as Record<string, unknown>;
  return o.format === EXPLORER_STATE_FORMAT || "version_major" in o;
}
