/** The entangled-light panel's notebook API: entangledPanel(...), show(), figures, saved state. */
import { inspect } from "node:util";
import { QuietframeError } from "../../src/index";
import { computeEntangled, createEntangledState, entangledSummary, loadEntangledState, type EntangledComputation, type EntangledOptions, type EntangledState } from "./model";
import { panelSpec } from "./specs";
import { entangledDocumentText } from "./document";
import { entangledHtml } from "./html";
import { renderPng, renderSvg, type RenderPngOptions } from "../core/render/static";
import type { MimeBundle } from "../core/notebook/display";
import { showWidgetOutput } from "../core/notebook/show-output";

export interface EntangledShowOptions {
  /** Carry the browser runtime in this output (default: only if no widget carried it yet in this kernel). */
  includeRuntime?: boolean;
  /** PNG fallback options (default scale 1). */
  png?: RenderPngOptions;
}

/** The panel's numbers and curves as plain values. */
export interface EntangledFigures {
  readonly r: number;
  readonly efficiency1: number;
  readonly efficiency2: number;
  /** Hz, or null for a white source. */
  readonly bandwidth: number | null;
  /** Var(X1 − X2), Var(P1 + P2): vacuum 1 (quadrature variance ½ each). */
  readonly eprVariances: { x: number; p: number };
  readonly duanSum: number;
  readonly duanBound: number;
  readonly entangledByDuan: boolean;
  /** ebits */
  readonly logNegativity: number;
  /** Var(X1 | X2), vacuum ½, and in dB relative to vacuum. */
  readonly conditionalVariance: number;
  readonly conditionalDb: number;
  /** Covariance over X1, P1, X2, P2 (row-major, vacuum ½). */
  readonly covariance: number[];
  readonly spectrum: { f: number; db: number; series: string }[];
  readonly ellipses: { x: number; y: number; i: number; series: string }[];
}

/**
 * A live entangled-light panel held by a notebook cell: `await p.show()` puts it in the
 * notebook; `p.state` / `p.stateText()` save it; `entangledPanel(saved)` reloads it.
 */
export class EntangledPanel {
  #state: EntangledState;
  #computation: EntangledComputation;

  constructor(state: EntangledState) {
    this.#state = state;
    this.#computation = computeEntangled(state);
  }

  get state(): EntangledState {
    return structuredClone(this.#state);
  }

  get computation(): EntangledComputation {
    return this.#computation;
  }

  get figures(): EntangledFigures {
    const c = this.#computation;
    return {
      r: c.r,
      efficiency1: this.#state.efficiency1,
      efficiency2: this.#state.efficiency2,
      bandwidth: this.#state.bandwidth,
      eprVariances: { x: c.eprX, p: c.eprP },
      duanSum: c.duanSum,
      duanBound: c.duanBound,
      entangledByDuan: c.duanSum < c.duanBound,
      logNegativity: c.logNegativity,
      conditionalVariance: c.conditionalVariance,
      conditionalDb: c.conditionalDb,
      covariance: Array.from(c.covariance),
      spectrum: c.spectrum.map((row) => ({ ...row })),
      ellipses: c.ellipses.map((row) => ({ ...row })),
    };
  }

  /** The saved form: a widget-state document (JSON text) with the fingerprint of the numbers; `quietframe render` and entangledPanel() read it. */
  stateText(): string {
    return entangledDocumentText(this.#state, this.#computation);
  }

  /** Changes values and recomputes (same checks as a loaded state). */
  set(options: EntangledOptions): this {
    const s = this.#state;
    const merged: EntangledOptions = {
      title: options.title ?? s.title,
      efficiency1: options.efficiency1 ?? s.efficiency1,
      efficiency2: options.efficiency2 ?? s.efficiency2,
      ...(options.bandwidth !== undefined ? { bandwidth: options.bandwidth } : s.bandwidth === null ? {} : { bandwidth: s.bandwidth }),
      ...(options.r !== undefined || options.squeezingDb !== undefined
        ? { r: options.r, squeezingDb: options.squeezingDb }
        : s.squeeze.unit === "r"
          ? { r: s.squeeze.value }
          : { squeezingDb: s.squeeze.value }),
    };
    this.#state = createEntangledState(merged);
    this.#computation = computeEntangled(this.#state);
    return this;
  }

  /** Static figure: Vega-Lite spec, SVG and PNG. */
  async staticFigures(options: RenderPngOptions = {}): Promise<{ spec: Record<string, unknown>; svg: string; png: Uint8Array }> {
    const spec = panelSpec(this.#computation, this.#state.title, this.#state.bandwidth === null);
    const svg = await renderSvg(spec);
    return { spec, svg, png: renderPng(svg, options) };
  }

  /** The mime bundle: live HTML (SVG inside), PNG fallback, text summary. */
  async bundle(options: EntangledShowOptions & { includeRuntime: boolean }): Promise<MimeBundle> {
    const figures = await this.staticFigures({ scale: 1, ...options.png });
    return {
      "text/html": entangledHtml(this.#state, { includeRuntime: options.includeRuntime, svg: figures.svg }, this.#computation),
      "image/png": figures.png,
      "text/plain": this.toString(),
    };
  }

  /** Displays the panel; write `await p.show()` (the fallback image is drawn asynchronously). */
  async show(options: EntangledShowOptions = {}): Promise<void> {
    await showWidgetOutput(options, (includeRuntime) => this.bundle({ ...options, includeRuntime }));
  }

  toString(): string {
    const lines = entangledSummary(this.#state, this.#computation).map((l) => `${l.label}: ${l.text}`);
    return [this.#state.title, ...lines].join("\n");
  }

  [inspect.custom](): string {
    return this.toString();
  }
}

/**
 * An entangled-light panel from options (squeezing in dB or r, η1, η2, optional bandwidth in
 * Hz) or from a saved state (object or JSON text).
 */
export function entangledPanel(input: EntangledOptions | EntangledState | string = {}): EntangledPanel {
  if (typeof input === "string") return new EntangledPanel(loadEntangledState(input, "state"));
  if (typeof input !== "object" || input === null || Array.isArray(input)) {
    throw new QuietframeError({ path: "options", value: input, problem: "must be an object", allowed: "{ squeezingDb | r, efficiency1, efficiency2, bandwidth?, title? } or a saved state" });
  }
  // Anything with a format field is a saved state; loading names what is wrong with it.
  if ("format" in input) return new EntangledPanel(loadEntangledState(input, "state"));
  const known = new Set(["squeezingDb", "r", "efficiency1", "efficiency2", "bandwidth", "title"]);
  for (const key of Object.keys(input)) if (!known.has(key)) throw new QuietframeError({ path: `options.${key}`, problem: "is not an option of entangledPanel", allowed: [...known].join(", ") });
  return new EntangledPanel(createEntangledState(input as EntangledOptions));
}
