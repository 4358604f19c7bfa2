/** The entangled-light panel in the page: controls, three charts, numbers, download. */
import { widgetBaseCss } from "../../core/browser/styles";
import type { View } from "vega";
import { computeEntangled, entangledStateText, entangledSummary, loadEntangledState, SLIDER_STEPS, sliderPosition, sliderValue, type EntangledComputation, type EntangledState } from "../model";
import { ENTANGLED_CLASS, ENTANGLED_NUMBER_ATTRIBUTES, ENTANGLED_STATE_CLASS } from "../names";
import { ellipseSpec, eprSpec, spectrumSpec } from "../specs";
import { STATUS_ATTRIBUTE } from "../../core/page/names";
import { actionButton, downloadText, fileStem } from "../../core/browser/actions";
import { methodsButtons } from "../../core/browser/methods-buttons";
import { entangledMethods } from "../methods/methods";
import { messageOf } from "../../core/browser/boot";
import { el, injectStyleOnce } from "../../core/browser/dom";
import { replaceCanvasCharts } from "../../core/browser/canvas-charts";

const STYLE_ID = "quietframe-entangled-style";
const P = `.${ENTANGLED_CLASS}`;
const CSS = `${widgetBaseCss(P)}
${P} .qf-controls output{font-variant-numeric:tabular-nums;color:#333}
${P} .qf-charts{display:flex;flex-wrap:wrap;gap:1em;align-items:flex-start}
${P} .qf-readout dd{margin:0;font-variant-numeric:tabular-nums}
${P} .qf-actions button{font:inherit;font-size:13px;padding:.2em .7em;cursor:pointer}
`;

/** The panel's styles, added to the page once. */
export function injectEntangledStyles(doc: Document = document): void {
  injectStyleOnce(STYLE_ID, CSS, doc);
}

let panelCount = 0;

/**
 * One live entangled-light panel. The physics is computeEntangled, the code the kernel runs;
 * on every input the three charts are drawn again from the same specs.
 */
export class EntangledPanelView {
  readonly element: HTMLElement;
  readonly ready: Promise<void>;
  private state: EntangledState | undefined;
  private views: View[] = [];
  private readonly charts = el("div", { class: "qf-charts" });
  private readonly readout = el("dl", { class: "qf-readout", "aria-live": "polite" });
  private readonly alert = el("div", { class: "qf-alert", role: "alert", hidden: "" });
  private readonly outputs: Record<string, HTMLOutputElement> = {};
  private pending: EntangledState | undefined;
  private running = false;

  constructor(element: HTMLElement) {
    this.element = element;
    this.ready = this.start();
  }

  currentState(): EntangledState | undefined {
    return this.state && structuredClone(this.state);
  }

  dispose(): void {
    for (const v of this.views) v.finalize();
    this.views = [];
  }

  private async start(): Promise<void> {
    this.element.setAttribute(STATUS_ATTRIBUTE, "booting");
    this.element.prepend(this.alert);
    try {
      const script = this.element.querySelector<HTMLScriptElement>(`script.${ENTANGLED_STATE_CLASS}`);
      if (!script) throw new Error("this panel carries no state");
      const state = loadEntangledState(script.textContent ?? "", "state");
      const computation = computeEntangled(state);
      await this.draw(computation, state);
      this.state = state;
      const live = el("div", { class: "qf-live" }, [el("strong", { class: "qf-title" }, [state.title]), this.controls(state), this.alert, this.charts, this.readout, this.actions()]);
      this.element.querySelector<HTMLElement>(".qf-fallback")?.setAttribute("hidden", "");
      this.element.append(live);
      this.showNumbers(state, computation);
      this.element.setAttribute(STATUS_ATTRIBUTE, "ready");
    } catch (e) {
      this.alert.textContent = `The interactive view cannot start: ${messageOf(e)}`;
      this.alert.hidden = false;
      this.element.setAttribute(STATUS_ATTRIBUTE, "error");
    }
  }

  private controls(state: EntangledState): HTMLElement {
    const id = `quietframe-e${++panelCount}`;
    const rows: HTMLElement[] = [];
    const slider = (target: string, label: string, kind: "dB" | "r" | "efficiency", value: number, apply: (s: EntangledState, v: number) => EntangledState): void => {
      const input = el("input", { type: "range", id: `${id}-${target}`, min: "0", max: String(SLIDER_STEPS[kind]), step: "1", value: String(sliderPosition(kind, value)), "data-target": target });
      const output = el("output", { for: `${id}-${target}` }, [formatValue(kind, value)]);
      this.outputs[target] = output;
      input.addEventListener("input", () => {
        const v = sliderValue(kind, Number(input.value));
        output.textContent = formatValue(kind, v);
        this.request((s) => apply(s, v));
      });
      rows.push(el("label", { for: `${id}-${target}` }, [label]), input, output);
    };
    const unit = state.squeeze.unit;
    slider("squeeze", unit === "dB" ? "two-mode squeezing" : "squeeze factor r", unit, state.squeeze.value, (s, v) => ({ ...s, squeeze: { unit, value: v } }));
    slider("efficiency1", "arm 1 efficiency η1", "efficiency", state.efficiency1, (s, v) => ({ ...s, efficiency1: v }));
    slider("efficiency2", "arm 2 efficiency η2", "efficiency", state.efficiency2, (s, v) => ({ ...s, efficiency2: v }));
    const bw = el("input", { type: "text", id: `${id}-bandwidth`, value: state.bandwidth === null ? "" : String(state.bandwidth), placeholder: "white", "data-target": "bandwidth" });
    bw.addEventListener("change", () => {
      const text = bw.value.trim();
      // Text that is not a number becomes NaN, which the state check refuses with a message.
      const v = text === "" ? null : Number(text);
      this.request((s) => ({ ...s, bandwidth: v }));
    });
    rows.push(el("label", { for: `${id}-bandwidth` }, ["source bandwidth (Hz)"]), bw, el("output", {}, ["empty: white source"]));
    return el("div", { class: "qf-controls" }, rows);
  }

  /** Applies a change to the last valid state; refused values leave that state in place. */
  private request(change: (s: EntangledState) => EntangledState): void {
    const base = this.pending ?? this.state;
    if (!base) return;
    this.pending = change(base);
    if (!this.running) void this.run();
  }

  private async run(): Promise<void> {
    this.running = true;
    while (this.pending) {
      const next = this.pending;
      this.pending = undefined;
      try {
        const state = loadEntangledState(next, "state");
        const computation = computeEntangled(state);
        await this.draw(computation, state);
        this.state = state;
        this.showNumbers(state, computation);
        this.alert.hidden = true;
        this.alert.textContent = "";
        this.element.setAttribute(STATUS_ATTRIBUTE, "ready");
      } catch (e) {
        this.alert.textContent = `Not applied: ${messageOf(e)}\nThe panel keeps the last valid values.`;
        this.alert.hidden = false;
        this.element.setAttribute(STATUS_ATTRIBUTE, "error");
      }
    }
    this.running = false;
  }

  private async draw(c: EntangledComputation, state: EntangledState): Promise<void> {
    const specs = [spectrumSpec(c, state.bandwidth === null), eprSpec(c), ellipseSpec(c)];
    this.views = await replaceCanvasCharts(this.charts, specs, this.views);
  }

  private showNumbers(state: EntangledState, c: EntangledComputation): void {
    this.readout.replaceChildren(...entangledSummary(state, c).flatMap((l) => [el("dt", {}, [l.label]), el("dd", {}, [l.text])]));
    for (const [key, attr] of Object.entries(ENTANGLED_NUMBER_ATTRIBUTES)) this.element.setAttribute(attr, String(c[key as keyof typeof ENTANGLED_NUMBER_ATTRIBUTES]));
  }

  private actions(): HTMLElement {
    const b = el("button", { type: "button", title: "Save the panel's state as JSON (entangledPanel() reads it back)" }, ["Download state"]);
    b.addEventListener("click", () => {
      if (this.state) downloadText(entangledStateText(this.state), "entangled-panel.json", "application/json");
    });
    const button = (label: string, title: string, action: () => unknown): HTMLButtonElement => actionButton(label, title, action, this.alert);
    const current = (): EntangledState => {
      if (!this.state) throw new Error("the panel has no valid state");
      return this.state;
    };
    const stem = (): string => fileStem(this.state?.title ?? "entangled-panel");
    return el("div", { class: "qf-actions" }, [b, ...methodsButtons(button, stem, (options) => entangledMethods(current(), computeEntangled(current()), options))]);
  }
}

function formatValue(kind: "dB" | "r" | "efficiency", v: number): string {
  if (kind === "dB") return `${v.toFixed(1)} dB`;
  return v.toFixed(2);
}
