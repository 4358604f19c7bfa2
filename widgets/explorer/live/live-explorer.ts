/**
 * The explorer live in the kernel: standard controls and the chart model, recomputed on every
 * change.
 */
import { QuietframeError, QuietframeErrors } from "../../../src/index";
import { checkValue, resolveControls } from "../../core/controls/setup-controls";
import { computeExplorer, type ExplorerComputation } from "../model";
import type { MimeBundle } from "../../core/notebook/display";
import type { ExplorerState } from "../format";
import { ChangeListeners } from "../../core/notebook/change-listeners";
import { chartPatch, initialChartState } from "./chart-state";
import { controlWidget, type ControlWidget } from "./control-widgets";
import type { LiveModel, WidgetHost } from "./host";

/** Values keyed by control target, written as in a set-up ("6 K", "95 %", 1e6, "negative"). */
export type ControlValues = Record<string, string | number>;

/** What a change listener receives after every successful recomputation. */
export interface LiveChange {
  /** The values now shown (and computed). */
  readonly values: ControlValues;
  /** Which targets changed, and whether a front-end or a cell moved them. */
  readonly changed: readonly string[];
  readonly source: "front-end" | "kernel";
  readonly state: ExplorerState;
  readonly computation: ExplorerComputation;
}

export type LiveChangeListener = (change: LiveChange) => void;

interface BoundControl {
  readonly binding: ControlWidget;
  readonly model: LiveModel;
}

/**
 * A noise-budget explorer that lives in the kernel: standard controls and quietframe's chart
 * model in a VBox, kept in step over the Jupyter widget protocol. A control moved in a
 * front-end is recomputed here with the same model code as everywhere else, and the new
 * curves go to the chart. A cell reads and moves the controls through `values` and `set`.
 *
 * Values that cannot be computed (an unstable combination, a typed value out of range) put
 * the reason into the chart's error text; the chart keeps the last valid curves and `state`
 * stays the last valid state, so nothing the user had is lost.
 *
 * A value the kernel snaps to a slider position (or otherwise normalises) goes back to the
 * front-ends, so every control shows the value the chart is computed for. Under a burst of
 * front-end moves the recomputation is deferred through the host: only the newest values are
 * computed, once the waiting messages are handled; reading `state` computes at once.
 *
 * When a front-end closes any part (the chart, the box, a control), the explorer closes the
 * rest and refuses `setValues` with a QuietframeError: a chart that no longer listens must not
 * let the controls drift away from the state.
 */
export class LiveExplorer {
  readonly #host: WidgetHost;
  readonly #controls: Map<string, BoundControl> = new Map();
  readonly #chart: LiveModel;
  readonly #box: LiveModel;
  readonly #listeners = new ChangeListeners<LiveChange>();
  #state: ExplorerState;
  #computation: ExplorerComputation;
  #shown: ControlValues;
  #error = "";
  #revision = 1;
  // Set while the kernel itself writes control values, so its own writes are not taken as input.
  #writing = false;
  // Targets moved in a front-end whose recomputation is deferred (see settle()).
  #pending: Set<string> | undefined;
  #closedBecause: string | undefined;

  constructor(host: WidgetHost, state: ExplorerState, computation: ExplorerComputation) {
    this.#host = host;
    this.#state = structuredClone(state);
    this.#computation = computation;
    this.#shown = { ...state.values };
    for (const c of resolveControls(state.setup, state.controls)) {
      const binding = controlWidget(c);
      const model = host.control(binding.widget, binding.initialState(state.values[c.target]));
      model.on(`change:${binding.key}`, () => this.#fromFrontEnd(c.target));
      this.#controls.set(c.target, { binding, model });
    }
    this.#chart = host.custom(initialChartState(this.#state, computation));
    this.#box = host.vbox([...[...this.#controls.values()].map((b) => b.model), this.#chart]);
    this.#chart.on("close", () => this.#partClosed("chart"));
    this.#box.on("close", () => this.#partClosed("box"));
    for (const [target, { model }] of this.#controls) model.on("close", () => this.#partClosed(`control of ${target}`));
  }

  /** What the controls show now (which may be values that could not be computed: see `error`). */
  get values(): ControlValues {
    return { ...this.#shown };
  }

  /** The last valid state: the one whose curves the chart shows. */
  get state(): ExplorerState {
    this.settle();
    return structuredClone(this.#state);
  }

  get computation(): ExplorerComputation {
    this.settle();
    return this.#computation;
  }

  /** Why the values shown could not be computed, or undefined when the chart matches them. */
  get error(): string | undefined {
    this.settle();
    return this.#error || undefined;
  }

  /** Whether the widget was closed (by a front-end closing one of its parts, or by close()). */
  get isClosed(): boolean {
    return this.#closedBecause !== undefined;
  }

  /** The VBox holding the controls and the chart. */
  get widget(): LiveModel {
    return this.#box;
  }

  /** The chart model (quietframe's own). */
  get chart(): LiveModel {
    return this.#chart;
  }

  /** The model of one control, by target. */
  control(target: string): LiveModel | undefined {
    return this.#controls.get(target)?.model;
  }

  /**
   * Moves controls to new values (written as in a set-up) and recomputes. Values no control
   * can show (unknown target, wrong unit, out of range) are refused with a QuietframeError
   * before anything moves; a combination that cannot be computed shows its reason in the chart.
   */
  setValues(values: ControlValues): this {
    if (this.#closedBecause !== undefined) {
      throw new QuietframeError({
        path: "explorer",
        problem: `is closed (${this.#closedBecause}), so its controls and chart no longer move; its values and state stay those of the last chart`,
        allowed: "show it again (await w.show()) for a new live widget",
      });
    }
    if (typeof values !== "object" || values === null || Array.isArray(values)) {
      throw new QuietframeError({ path: "values", value: values, problem: "must be an object of control target → value", allowed: '{"membrane.temperature": "3 K", …}' });
    }
    const targets = Object.keys(values);
    const problems: QuietframeError[] = [];
    for (const target of targets) {
      const bound = this.#controls.get(target);
      if (!bound) {
        problems.push(new QuietframeError({ path: `values.${target}`, value: values[target], problem: "has no control", allowed: [...this.#controls.keys()].join(", ") || "no values" }));
        continue;
      }
      try {
        checkValue(bound.binding.control, values[target], `values.${target}`);
      } catch (e) {
        if (e instanceof QuietframeError) problems.push(e);
        else throw e;
      }
    }
    if (problems.length === 1) throw problems[0];
    if (problems.length > 1) throw new QuietframeErrors(problems);
    this.#asKernel(() => {
      for (const target of targets) {
        const { binding, model } = this.#controls.get(target)!;
        model.set({ [binding.key]: binding.toWidget(values[target]) });
      }
    });
    // Front-end moves still waiting are computed together with these values.
    const changed = [...new Set([...(this.#pending ?? []), ...targets])];
    this.#pending = undefined;
    this.#recompute({ ...this.#shown, ...values }, changed, "kernel");
    return this;
  }

  /** Calls `listener` after each successful recomputation; returns a function that stops it. */
  onChange(listener: LiveChangeListener): () => void {
    return this.#listeners.add(listener);
  }

  display(fallback: MimeBundle): void {
    this.#host.display(this.#box, fallback);
  }

  close(): void {
    this.#closeAll("it was closed with close()");
  }

  #partClosed(part: string): void {
    this.#closeAll(`its ${part} was closed by a front-end`);
  }

  #closeAll(reason: string): void {
    if (this.#closedBecause !== undefined) return;
    this.#closedBecause = reason;
    // Moves not yet computed are dropped: values go back to those of the state the chart last showed.
    this.#pending = undefined;
    this.#shown = { ...this.#state.values };
    for (const model of [this.#box, this.#chart, ...[...this.#controls.values()].map((b) => b.model)]) model.close();
    this.#listeners.clear();
  }

  #fromFrontEnd(target: string): void {
    if (this.#writing || this.#closedBecause !== undefined) return;
    const { binding, model } = this.#controls.get(target)!;
    const held = model.get(binding.key);
    let written: string | number;
    try {
      written = binding.fromWidget(held);
    } catch (e) {
      this.#showError(e);
      return;
    }
    // Snapped to another slider position (or normalised): the front-ends get the value that is computed.
    if (!binding.shows(held, written)) this.#asKernel(() => model.set({ [binding.key]: binding.toWidget(written) }));
    this.#shown = { ...this.#shown, [target]: written };
    this.#pending = new Set([...(this.#pending ?? []), target]);
    if (this.#host.defer) this.#host.defer(this, () => this.settle());
    else this.settle();
  }

  /** Computes now for the front-end moves whose recomputation is deferred, if any. */
  settle(): void {
    if (!this.#pending || this.#closedBecause !== undefined) return;
    const changed = [...this.#pending];
    this.#pending = undefined;
    this.#recompute(this.#shown, changed, "front-end");
  }

  #asKernel(write: () => void): void {
    this.#writing = true;
    try {
      write();
    } finally {
      this.#writing = false;
    }
  }

  #recompute(values: ControlValues, changed: readonly string[], source: LiveChange["source"]): void {
    this.#shown = values;
    const base = { ...this.#state, values: { ...values } };
    let computation: ExplorerComputation;
    try {
      computation = computeExplorer(base);
    } catch (e) {
      this.#showError(e);
      return;
    }
    this.#state = { ...base, fingerprint: computation.fingerprint };
    this.#computation = computation;
    this.#error = "";
    this.#revision += 1;
    this.#chart.set({ ...chartPatch(this.#state, computation, this.#revision), error: "" });
    const change: LiveChange = { values: { ...values }, changed, source, state: this.state, computation };
    this.#listeners.notify(change);
  }

  #showError(e: unknown): void {
    if (e instanceof QuietframeError || e instanceof QuietframeErrors) this.#error = e.message;
    else {
      // A defect of ours, not the user's input: say so plainly, and log the stack for a report.
      console.error(e);
      this.#error = `internal error (please report): ${e instanceof Error ? e.message : String(e)}`;
    }
    // Only the text changes: the chart keeps the last valid curves and state.
    this.#chart.set({ error: this.#error });
  }
}
