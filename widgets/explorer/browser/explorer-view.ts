/** The explorer in the page: controls, chart, figures, toolbar; recomputes in the browser. */
import { tableToCsv } from "../../../src/index";
import { explorerMechanismPanel, type CurveRow, type RatioRow } from "../budget-spec";
import { computeExplorer, type ExplorerComputation } from "../model";
import { DEFAULT_REACH_SOURCE, explorerReach, type ReachFigures } from "../reach";
import { FINGERPRINT_ATTRIBUTE, STATUS_ATTRIBUTE } from "../../core/page/names";
import { STATE_SCRIPT_CLASS } from "../names";
import { distanceText, headlineSummary, reachSummary } from "../summary";
import { CAUTION_HEADING } from "../../core/page/summary-line";
import { explorerMethods } from "../methods/methods";
import { loadExplorerState, stateDocumentText } from "../document";
import type { ExplorerState } from "../format";
import { actionButton, copyText, downloadText, downloadUrl, fileStem } from "../../core/browser/actions";
import { messageOf } from "../../core/browser/boot";
import { ChartView } from "./chart-view";
import { ControlsView } from "../../core/browser/controls-view";
import { FrequencyRangeView } from "../../core/browser/frequency-range-view";
import { methodsButtons } from "../../core/browser/methods-buttons";
import type { GridText } from "../../core/controls/frequency-range";
import { el, flashText } from "../../core/browser/dom";

export type WidgetStatus = "booting" | "ready" | "error";

/** Dispatched on the widget's element each time new curves are drawn (before the fingerprint is published). */
export const DRAWN_EVENT = "quietframe-drawn";

type StateBase = Omit<ExplorerState, "fingerprint" | "values">;

let widgetCount = 0;

/**
 * One live explorer. It owns no physics: every change goes through computeExplorer, the
 * same code the kernel and the CLI run. The state it keeps (and saves) is always the last
 * one that computed; values the model refuses are shown as an error next to that state.
 */
export class ExplorerWidget {
  readonly element: HTMLElement;
  /** Resolves when the first chart is drawn (or the widget has shown why it cannot be). */
  readonly ready: Promise<void>;
  private initial: ExplorerState | undefined;
  /** The loaded state without values and fingerprint; with `values` and `computation` it is the current state. */
  private base: StateBase | undefined;
  /** Values of the last state that computed (the curves on screen). */
  private values: Record<string, string | number> = {};
  private computation: ExplorerComputation | undefined;
  /** Values as the controls show them; may differ from `state.values` while refused. */
  private shown: Record<string, string | number> = {};
  private readonly chart = new ChartView();
  private controls: ControlsView | undefined;
  private range: FrequencyRangeView | undefined;
  /** Frequency range as its control shows it; the grid of `base` once it computed. */
  private shownGrid: GridText | undefined;
  private readonly alert = el("div", { class: "qf-alert", role: "alert", hidden: "" });
  /** Lasting notices about the loaded state (a fingerprint that does not match). */
  private readonly notice = el("div", { class: "qf-notice", role: "status", hidden: "" });
  /** Short confirmations ("copied"); kept apart so they never hide a notice. */
  private readonly flashNote = el("div", { class: "qf-flash", role: "status", hidden: "" });
  /** Safety cautions of the set-up at the current values; apart from errors, which refuse values. */
  private readonly cautionList = el("ul");
  private readonly caution = el("div", { class: "qf-caution", role: "note", "aria-live": "polite", hidden: "" }, [el("strong", {}, [CAUTION_HEADING]), this.cautionList]);
  private readonly readout = el("dl", { class: "qf-readout", "aria-live": "polite" });
  /** Bars of the current and the initial range, for strain budgets. */
  private readonly gauge = el("div", { class: "qf-reach-gauge", role: "img", hidden: "" });
  private readonly notes = el("ul", { class: "qf-notes" });
  private readonly copyHost = el("div", { hidden: "" });
  private scheduled = false;
  private running = false;
  private dirty = false;
  private disposed = false;
  /** Counts updates and refusals, so a fingerprint published late never overwrites a newer outcome. */
  private generation = 0;
  /** The computation whose fingerprint the element's attribute carries. */
  private published: ExplorerComputation | undefined;

  constructor(element: HTMLElement) {
    this.element = element;
    this.ready = this.start();
  }

  get status(): WidgetStatus {
    return (this.element.getAttribute(STATUS_ATTRIBUTE) as WidgetStatus | null) ?? "booting";
  }

  /** The fingerprint of the curves on screen. */
  get fingerprint(): string | undefined {
    return this.computation?.fingerprint;
  }

  /** The current (last valid) state, as "Download state" saves it. */
  currentState(): ExplorerState | undefined {
    const state = this.state();
    return state && structuredClone(state);
  }

  /** The state of the curves on screen; its fingerprint is computed here, on first use. */
  private state(): ExplorerState | undefined {
    if (!this.base || !this.computation) return undefined;
    return { ...this.base, values: this.values, fingerprint: this.computation.fingerprint };
  }

  /** The rows the chart is plotting now (frequency, value, curve, kind). */
  plottedRows(): CurveRow[] {
    return this.chart.rows();
  }

  /** The rows of the panel relative to the SQL (frequency, total ÷ SQL, dB). */
  plottedRatio(): RatioRow[] {
    return this.chart.ratioRows();
  }

  /** The chart as SVG, drawn from the live view's scenegraph. */
  async chartSvg(): Promise<string> {
    return this.chart.svg();
  }

  /** Sets a control's value as a set-up writes it, as if the reader had changed it. */
  setValue(target: string, value: string | number): void {
    this.shown = { ...this.shown, [target]: value };
    this.controls?.show({ [target]: value });
    this.requestUpdate();
  }

  dispose(): void {
    this.disposed = true;
    this.chart.finalize();
  }

  private async start(): Promise<void> {
    this.element.setAttribute(STATUS_ATTRIBUTE, "booting");
    const script = this.element.querySelector<HTMLScriptElement>(`script.${STATE_SCRIPT_CLASS}`);
    // Until the live view stands, the static figure stays, with the problem shown above it.
    this.element.prepend(this.alert);
    let loaded;
    try {
      if (!script) throw new Error("this widget carries no state");
      loaded = loadExplorerState(script.textContent ?? "", "state");
    } catch (e) {
      this.fail(e);
      return;
    }
    const { state, computation, fingerprintMatches } = loaded;
    this.initial = state;
    // The state held (and downloaded) describes the curves on screen; a stored fingerprint
    // that differs is reported in the notice below, not carried forward.
    const { values: _values, fingerprint: _fingerprint, ...base } = state;
    this.base = base;
    this.values = { ...state.values };
    this.computation = computation;
    this.shown = { ...state.values };
    const id = `quietframe-w${++widgetCount}`;
    this.controls = new ControlsView(computation.controls, state.values, id, (target, value) => this.setValue(target, value));
    this.shownGrid = { ...state.settings.grid };
    this.range = new FrequencyRangeView(state.settings.grid, `${id}-range`, (grid) => {
      this.shownGrid = grid;
      this.requestUpdate();
    });
    const live = el("div", { class: "qf-live" }, [
      this.controls.element,
      this.range.element,
      this.alert,
      this.notice,
      this.caution,
      this.flashNote,
      this.chart.element,
      this.readout,
      this.gauge,
      this.notes,
      this.actions(),
      this.copyHost,
    ]);
    try {
      await this.chart.show(this.chartInput(state, computation));
    } catch (e) {
      this.fail(e);
      return;
    }
    if (!fingerprintMatches) {
      this.notice.textContent =
        `These curves differ from the ones stored with this state (computed by quietframe ${state.quietframe}); ` +
        `the stored fingerprint is ${state.fingerprint}, this quietframe computes ${computation.fingerprint}.`;
      this.notice.hidden = false;
    }
    this.element.querySelector<HTMLElement>(".qf-fallback")?.setAttribute("hidden", "");
    this.element.append(live);
    this.showFigures(state, computation);
    this.publishFingerprint(computation);
    this.element.setAttribute(STATUS_ATTRIBUTE, "ready");
  }

  private chartInput(state: Pick<ExplorerState, "settings">, computation: ExplorerComputation) {
    return {
      table: computation.table,
      quantity: computation.evaluation.budget.quantity.name,
      title: state.settings.title ?? computation.setup.name,
      mechanism: explorerMechanismPanel(computation),
      targetDb: state.settings.targetDb,
    };
  }

  /**
   * Input is handled at once when the widget is idle (a microtask, so values set together in
   * one event are computed once). While a computation or draw is under way, input only marks
   * the widget dirty; when the draw ends, one more update runs with the newest values, so the
   * last input always wins and a burst of input (a dragged slider) costs one update per draw.
   */
  private requestUpdate(): void {
    if (this.disposed) return;
    if (this.running) {
      this.dirty = true;
      return;
    }
    if (this.scheduled) return;
    this.scheduled = true;
    queueMicrotask(() => {
      this.scheduled = false;
      void this.update();
    });
  }

  private async update(): Promise<void> {
    const base = this.base;
    if (!base || this.disposed) return;
    if (this.running) {
      this.dirty = true;
      return;
    }
    const generation = ++this.generation;
    const values = { ...this.shown };
    // The frequency range control moves the grid: the curves, the headline and the saved state follow it.
    const settings = this.shownGrid ? { ...base.settings, grid: { ...this.shownGrid } } : base.settings;
    let computation: ExplorerComputation;
    try {
      computation = computeExplorer({ ...base, settings, values });
    } catch (e) {
      this.refuse(e);
      return;
    }
    this.running = true;
    let drawError: { error: unknown } | undefined;
    try {
      await this.chart.show(this.chartInput(base, computation));
    } catch (error) {
      drawError = { error };
    }
    this.running = false;
    if (drawError) return this.refuse(drawError.error);
    this.base = { ...base, settings };
    this.values = values;
    this.computation = computation;
    this.showFigures({ ...base, values }, computation);
    this.alert.hidden = true;
    this.alert.textContent = "";
    // New values, new curves: a notice about the state as loaded no longer applies.
    this.notice.hidden = true;
    this.notice.textContent = "";
    this.controls?.markInvalid([]);
    this.element.dispatchEvent(new CustomEvent(DRAWN_EVENT));
    if (this.dirty) {
      this.dirty = false;
      this.requestUpdate();
    } else {
      this.publishWhenPainted(generation, computation);
    }
  }

  /**
   * Sets the fingerprint attribute and the "ready" status together once the new chart has
   * been painted (a task after the next frame), so the SHA-256 of the curves never delays
   * the chart. Skipped when a newer update or refusal came first: the attribute always names
   * the curves on screen, and "ready" with it means both are settled.
   */
  private publishWhenPainted(generation: number, computation: ExplorerComputation): void {
    const publish = (): void => {
      if (this.disposed || generation !== this.generation || this.running || this.scheduled) return;
      this.publishFingerprint(computation);
      this.element.setAttribute(STATUS_ATTRIBUTE, "ready");
    };
    const later = (): void => void setTimeout(publish, 0);
    if (typeof requestAnimationFrame === "function" && document.visibilityState === "visible") requestAnimationFrame(later);
    else later();
  }

  /** A value the model refuses: say why, keep the last valid state and chart. */
  private publishFingerprint(computation: ExplorerComputation): void {
    this.element.setAttribute(FINGERPRINT_ATTRIBUTE, computation.fingerprint);
    this.published = computation;
  }

  private refuse(e: unknown): void {
    this.generation++;
    // Curves drawn but not yet published are the ones on screen: name them before refusing.
    if (this.computation && this.published !== this.computation) this.publishFingerprint(this.computation);
    this.alert.textContent = `Not applied: ${messageOf(e)}\nThe chart and saved state keep the last valid values.`;
    this.alert.hidden = false;
    const changed = Object.keys(this.shown).filter((t) => this.shown[t] !== this.values[t]);
    this.controls?.markInvalid(changed);
    this.element.setAttribute(STATUS_ATTRIBUTE, "error");
    if (this.dirty) {
      this.dirty = false;
      this.requestUpdate();
    }
  }

  /** The widget cannot start: the static figure stays, with the reason above it. */
  private fail(e: unknown): void {
    this.alert.textContent = `The interactive view cannot start: ${messageOf(e)}`;
    this.alert.hidden = false;
    this.element.setAttribute(STATUS_ATTRIBUTE, "error");
  }

  private showFigures(state: Omit<ExplorerState, "fingerprint">, computation: ExplorerComputation): void {
    const reach = this.reachOf(state, computation);
    this.readout.replaceChildren(
      ...headlineSummary(computation.headline).flatMap((line) => [el("dt", {}, [line.label]), el("dd", {}, [line.text])]),
      ...(reach ? reachSummary(reach) : []).flatMap((line) => [el("dt", { class: "qf-reach" }, [line.label]), el("dd", { class: "qf-reach" }, [line.text])]),
    );
    this.showGauge(reach);
    const cautions = computation.evaluation.cautions;
    this.cautionList.replaceChildren(...cautions.map((c) => el("li", {}, [c])));
    this.caution.hidden = cautions.length === 0;
    const notes = computation.evaluation.warnings.map((w) => `warning: ${w}`);
    this.notes.replaceChildren(...notes.map((n) => el("li", {}, [n])));
    this.notes.hidden = notes.length === 0;
  }

  /** The gauge never stops the widget: a failure to compute it is shown in its place. */
  private reachOf(state: Omit<ExplorerState, "fingerprint">, computation: ExplorerComputation): ReachFigures | undefined {
    try {
      return explorerReach(state, computation);
    } catch (e) {
      return { available: false, source: DEFAULT_REACH_SOURCE, problem: messageOf(e) };
    }
  }

  /**
   * Two bars, the current range and the initial set-up's, scaled to the longer one. The exact
   * numbers ride along as data attributes (shortest round-trip form) for tests and tools.
   */
  private showGauge(reach: ReachFigures | undefined): void {
    const c = reach?.available ? reach.comparison : undefined;
    if (!reach?.available || !c) {
      this.gauge.replaceChildren();
      for (const a of GAUGE_ATTRIBUTES) this.gauge.removeAttribute(a);
      this.gauge.removeAttribute("aria-label");
      this.gauge.hidden = true;
      return;
    }
    const now = reach.range.megaparsecs;
    const then = c.referenceRange.megaparsecs;
    const longest = Math.max(now, then);
    const bar = (name: string, mpc: number, kind: string): HTMLElement =>
      el("div", { class: `qf-gauge-row qf-gauge-${kind}` }, [
        el("span", { class: "qf-gauge-name" }, [name]),
        el("span", { class: "qf-gauge-track" }, [el("span", { class: "qf-gauge-bar", style: `width:${longest > 0 ? ((100 * mpc) / longest).toFixed(1) : "0"}%` })]),
        el("span", { class: "qf-gauge-value" }, [distanceText(mpc)]),
      ]);
    this.gauge.replaceChildren(bar("range now", now, "now"), bar(`range, ${c.against}`, then, "initial"));
    this.gauge.setAttribute("aria-label", `inspiral range ${distanceText(now)} now, ${distanceText(then)} for ${c.against}`);
    this.gauge.setAttribute("data-range-mpc", String(now));
    this.gauge.setAttribute("data-horizon-mpc", String(reach.horizon.megaparsecs));
    this.gauge.setAttribute("data-reference-range-mpc", String(then));
    this.gauge.setAttribute("data-range-ratio", String(c.rangeRatio));
    this.gauge.setAttribute("data-volume-gain", String(c.volumeGain));
    this.gauge.hidden = false;
  }

  private actions(): HTMLElement {
    const button = (label: string, title: string, action: () => unknown): HTMLButtonElement => actionButton(label, title, action, this.alert);
    const stem = (): string => fileStem(this.base?.settings.title ?? this.computation?.setup.name ?? "");
    return el("div", { class: "qf-actions" }, [
      button("Copy state", "Copy the widget-state JSON (set-up, controls, values, fingerprint)", async () => {
        const how = await copyText(stateDocumentText(this.requireState()), this.copyHost);
        if (how === "copied") this.flash("State copied to the clipboard.");
      }),
      button("Download state", "Save the widget-state JSON; the CLI and the standalone page read it", () => downloadText(stateDocumentText(this.requireState()), `${stem()}.json`, "application/json")),
      button("SVG", "Save the chart as SVG", async () => downloadText(await this.chart.svg(), `${stem()}.svg`, "image/svg+xml")),
      button("PNG", "Save the chart as PNG", async () => downloadUrl(await this.chart.pngDataUrl(2), `${stem()}.png`)),
      button("CSV", "Save the plotted numbers (shortest round-trip form)", () => downloadText(tableToCsv(this.requireComputation().table), `${stem()}.csv`, "text/csv")),
      ...methodsButtons(button, stem, (options) => explorerMethods(this.requireState(), this.requireComputation(), options)),
      button("Reset", "Back to the values this widget was created with", () => this.reset()),
    ]);
  }

  private reset(): void {
    if (!this.initial) return;
    this.shown = { ...this.initial.values };
    this.controls?.show(this.shown);
    this.shownGrid = { ...this.initial.settings.grid };
    this.range?.show(this.shownGrid);
    this.requestUpdate();
  }

  private flash(text: string): void {
    flashText(this.flashNote, text);
  }

  private requireState(): ExplorerState {
    const state = this.state();
    if (!state) throw new Error("the widget has no valid state");
    return state;
  }

  private requireComputation(): ExplorerComputation {
    if (!this.computation) throw new Error("the widget has no valid state");
    return this.computation;
  }
}

const GAUGE_ATTRIBUTES = ["data-range-mpc", "data-horizon-mpc", "data-reference-range-mpc", "data-range-ratio", "data-volume-gain"] as const;
