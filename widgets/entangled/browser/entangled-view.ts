/** The entangled-light panel in the page: controls, three charts, numbers, download. */
import { widgetBaseCss } from "../../core/browser/styles";
import type { View } from "vega";
import { computeEntangled, entangledSummary, loadEntangledState, SLIDER_STEPS, sliderPosition, sliderValue, type EntangledComputation, type EntangledState } from "../model";
import { entangledDocumentText } from "../document";
import { entangledCsv } from "../csv";
import { bandwidthText, parseBandwidth } from "../bandwidth";
import { ENTANGLED_CLASS, ENTANGLED_NUMBER_ATTRIBUTES, ENTANGLED_STATE_CLASS } from "../names";
import { ellipseSpec, eprSpec, panelSpec, spectrumSpec } from "../specs";
import { STATUS_ATTRIBUTE } from "../../core/page/names";
import { actionButton, downloadText, downloadUrl, fileStem } from "../../core/browser/actions";
import { vega } from "../../core/browser/vega";
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
    const bw = el("input", { type: "text", id: `${id}-bandwidth`, value: bandwidthText(state.bandwidth), placeholder: "white", "data-target": "bandwidth" });
    bw.addEventListener("change", () => {
      try {
        // "5 MHz", "5e6 Hz" or a bare number of hertz; empty for a white source.
        const v = parseBandwidth(bw.value, "state.bandwidth");
        this.request((s) => ({ ...s, bandwidth: v }));
      } catch (e) {
        this.refuse(e);
      }
    });
    rows.push(el("label", { for: `${id}-bandwidth` }, ["source linewidth κ/2π"]), bw, el("output", {}, ["e.g. 5 MHz; empty: white source"]));
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
        this.refuse(e);
      }
    }
    this.running = false;
  }

  /** A value the model refuses: say why and keep the last valid state and charts. */
  private refuse(e: unknown): void {
    this.alert.textContent = `Not applied: ${messageOf(e)}\nThe panel keeps the last valid values.`;
    this.alert.hidden = false;
    this.element.setAttribute(STATUS_ATTRIBUTE, "error");
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
    const button = (label: string, title: string, action: (state: EntangledState) => unknown): HTMLButtonElement =>
      actionButton(label, title, () => (this.state ? action(this.state) : undefined), this.alert);
    const stem = (state: EntangledState): string => fileStem(state.title || "entangled light");
    return el("div", { class: "qf-actions" }, [
      button("Download state", "Save the widget-state JSON with the fingerprint of the numbers; quietframe render and entangledPanel() read it", (s) =>
        downloadText(entangledDocumentText(s), `${stem(s)}.json`, "application/json"),
      ),
      button("SVG", "Save the three charts as SVG", async (s) => downloadText(await this.withPanelView(s, (v) => v.toSVG()), `${stem(s)}.svg`, "image/svg+xml")),
      button("PNG", "Save the three charts as PNG", async (s) => downloadUrl(await this.withPanelView(s, (v) => v.toImageURL("png", 2)), `${stem(s)}.png`)),
      button("CSV", "Save every plotted number (shortest round-trip form)", (s) => downloadText(entangledCsv(computeEntangled(s)), `${stem(s)}.csv`, "text/csv")),
      ...methodsButtons(
        (label, title, action) => actionButton(label, title, action, this.alert),
        () => fileStem(this.state?.title || "entangled light"),
        (options) => {
          const state = this.current();
          return entangledMethods(state, computeEntangled(state), options);
        },
      ),
    ]);
  }

  /** The state the buttons act on; a panel that never started has none to export. */
  private current(): EntangledState {
    if (!this.state) throw new Error("the panel has no valid state");
    return this.state;
  }

  /** The whole figure as `quietframe render` draws it, off-screen, for an export. */
  private async withPanelView<T>(state: EntangledState, use: (view: View) => Promise<T>): Promise<T> {
    const { View: VegaView, parse, compile } = vega();
    const spec = panelSpec(computeEntangled(state), state.title, state.bandwidth === null);
    const view = new VegaView(parse(compile(spec as unknown as Parameters<typeof compile>[0]).spec), { renderer: "none" });
    try {
      await view.runAsync();
      return await use(view);
    } finally {
      view.finalize();
    }
  }
}

function formatValue(kind: "dB" | "r" | "efficiency", v: number): string {
  if (kind === "dB") return `${v.toFixed(1)} dB`;
  return v.toFixed(2);
}
