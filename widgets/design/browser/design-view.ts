/** The design widget in the page: the charts of the answer it carries, its summary, methods and downloads. */
import type { View } from "vega";
import { actionButton, downloadText, downloadUrl, fileStem } from "../../core/browser/actions";
import { methodsButtons } from "../../core/browser/methods-buttons";
import { designMethodsDocument } from "../methods/document";
import { messageOf } from "../../core/browser/boot";
import { replaceCanvasCharts } from "../../core/browser/canvas-charts";
import { el, injectStyleOnce } from "../../core/browser/dom";
import { widgetBaseCss } from "../../core/browser/styles";
import { CAUTION_HEADING } from "../../core/page/summary-line";
import { STATUS_ATTRIBUTE } from "../../core/page/names";
import { designCautions } from "../cautions";
import { designCsv } from "../csv";
import { designDocumentText, readDesignState } from "../document";
import { answerFingerprint } from "../fingerprint";
import type { DesignAnswer, DesignState } from "../format";
import { designMethods } from "../methods";
import { DESIGN_CLASS, DESIGN_DRAWN_ATTRIBUTE, DESIGN_PROVISIONAL_ATTRIBUTE, DESIGN_STATE_CLASS } from "../names";
import type { ProvisionalAnswer } from "../provisional";
import { answerSpecs } from "../specs";
import { answerSummary, designTitle } from "../summary";
import { PageRun } from "./page-run";

const STYLE_ID = "quietframe-design-style";
const D = `.${DESIGN_CLASS}`;
const CSS = `${widgetBaseCss(D)}
${D} .qf-charts{display:flex;flex-wrap:wrap;gap:1em;align-items:flex-start}
${D} .qf-answer{margin:0;padding-left:0;list-style:none;font-variant-numeric:tabular-nums}
${D} .qf-caution{border:2px solid #c77700;background:#fff6de;color:#3d2600;padding:.45em .7em}
${D} .qf-methods p{margin:.3em 0;max-width:60em}
${D} .qf-actions button{font:inherit;font-size:13px;padding:.2em .7em;cursor:pointer}
${D} .qf-run{display:flex;gap:.6em;align-items:center;margin:.4em 0}
${D} .qf-run button{font:inherit;font-size:13px;padding:.2em .7em;cursor:pointer}
`;

/** The widget's styles, added to the page once. */
export function injectDesignStyles(doc: Document = document): void {
  injectStyleOnce(STYLE_ID, CSS, doc);
}

/**
 * One live design widget: the answer is drawn from the state the page carries (checked against
 * its stored fingerprint), and "Compute in this page" computes the question again here in slices,
 * with progress and Stop (page-run.ts), drawing the new answer once it is whole.
 */
export class DesignWidgetView {
  readonly element: HTMLElement;
  readonly ready: Promise<void>;
  private state: DesignState | undefined;
  private views: View[] = [];
  private readonly alert = el("div", { class: "qf-alert", role: "alert", hidden: "" });
  private readonly charts = el("div", { class: "qf-charts" });
  private readonly summary = el("ul", { class: "qf-answer" });
  /** The page's own run of the question (absent until the view has started). */
  pageRun: PageRun | undefined;

  constructor(element: HTMLElement) {
    this.element = element;
    this.ready = this.start();
  }

  /** The state as the page read it. */
  currentState(): DesignState | undefined {
    return this.state && structuredClone(this.state);
  }

  /** The datasets each drawn chart holds, by name (for tests and page scripts). */
  plottedData(): Record<string, Record<string, unknown>[]>[] {
    const plain = (row: object): Record<string, unknown> => Object.fromEntries(Object.entries(row).filter(([, x]) => x === null || ["number", "string", "boolean"].includes(typeof x)));
    return this.views.map((v) => {
      const data = (v.getState({ data: () => true, signals: () => false }) as { data?: Record<string, unknown> }).data ?? {};
      return Object.fromEntries(Object.entries(data).flatMap(([name, rows]) => (Array.isArray(rows) ? [[name, rows.map(plain)]] : [])));
    });
  }

  dispose(): void {
    for (const v of this.views) v.finalize();
    this.views = [];
  }

  private async start(): Promise<void> {
    this.element.setAttribute(STATUS_ATTRIBUTE, "booting");
    this.element.prepend(this.alert);
    let state: DesignState;
    try {
      const script = this.element.querySelector<HTMLScriptElement>(`script.${DESIGN_STATE_CLASS}`);
      if (!script) throw new Error("this widget carries no state");
      state = readDesignState(script.textContent ?? "", "state");
      this.views = await replaceCanvasCharts(this.charts, answerSpecs(state.answer), []);
    } catch (e) {
      // The static figure stays: only the live view could not start.
      this.showAlert(`The interactive view cannot start: ${messageOf(e)}`);
      this.element.setAttribute(STATUS_ATTRIBUTE, "error");
      return;
    }
    this.state = state;
    const drawn = answerFingerprint(state.answer);
    if (drawn !== state.fingerprint) {
      this.showAlert(
        `The numbers in this page do not match the fingerprint they were saved with (${state.fingerprint}; drawn ${drawn}): the state was edited or damaged. Compute it again with quietframe render.`,
      );
    }
    this.summary.replaceChildren(...answerSummary(state.answer).map((line) => el("li", {}, [line])));
    this.pageRun = new PageRun(
      state,
      this.element,
      (answer) => this.showAnswer(answer),
      (best) => this.showBestSoFar(best),
    );
    const cautions = designCautions(state);
    const live = el("div", { class: "qf-live" }, [
      el("strong", { class: "qf-title" }, [designTitle(state)]),
      cautions.length
        ? el("div", { class: "qf-caution", role: "note" }, [
            el("strong", {}, [CAUTION_HEADING]),
            el(
              "ul",
              {},
              cautions.map((c) => el("li", {}, [c])),
            ),
          ])
        : null,
      this.alert,
      this.charts,
      this.pageRun.element,
      this.summary,
      el("details", { class: "qf-methods" }, [el("summary", {}, ["Methods"]), el("p", {}, [designMethods(state)])]),
      this.actions(state),
    ]);
    this.element.querySelector<HTMLElement>(".qf-fallback")?.setAttribute("hidden", "");
    this.element.append(live);
    this.element.setAttribute(DESIGN_DRAWN_ATTRIBUTE, drawn);
    this.element.setAttribute(STATUS_ATTRIBUTE, "ready");
  }

  /** Draws a whole answer (computed in the page, or the last one again after a stop): its charts, its summary and the fingerprint of what is drawn. */
  private async showAnswer(answer: DesignAnswer): Promise<void> {
    this.views = await replaceCanvasCharts(this.charts, answerSpecs(answer), this.views);
    this.summary.replaceChildren(...answerSummary(answer).map((line) => el("li", {}, [line])));
    this.element.setAttribute(DESIGN_DRAWN_ATTRIBUTE, answerFingerprint(answer));
    this.element.removeAttribute(DESIGN_PROVISIONAL_ATTRIBUTE);
  }

  /** Draws an optimization's best so far, marked provisional in the chart's title, the summary and an attribute. */
  private async showBestSoFar(best: ProvisionalAnswer): Promise<void> {
    this.views = await replaceCanvasCharts(this.charts, answerSpecs(best.answer, best.label), this.views);
    this.summary.replaceChildren(...[`${best.label[0].toUpperCase()}${best.label.slice(1)}:`, ...answerSummary(best.answer)].map((line) => el("li", {}, [line])));
    this.element.setAttribute(DESIGN_DRAWN_ATTRIBUTE, answerFingerprint(best.answer));
    this.element.setAttribute(DESIGN_PROVISIONAL_ATTRIBUTE, best.label);
  }

  private actions(state: DesignState): HTMLElement {
    const stem = fileStem(designTitle(state));
    const button = (label: string, title: string, action: () => unknown): HTMLButtonElement => actionButton(label, title, action, this.alert);
    const each = (suffix: string, save: (view: View, name: string) => Promise<void>) => async (): Promise<void> => {
      for (const [i, view] of this.views.entries()) await save(view, `${stem}${this.views.length > 1 ? `-${i + 1}` : ""}.${suffix}`);
    };
    return el("div", { class: "qf-actions" }, [
      button("Download state", "Save the widget-state JSON; quietframe render computes it again and checks its fingerprint", () =>
        downloadText(designDocumentText(state), `${stem}.json`, "application/json"),
      ),
      button(
        "SVG",
        "Save the charts as SVG",
        each("svg", async (view, name) => downloadText(await view.toSVG(), name, "image/svg+xml")),
      ),
      button(
        "PNG",
        "Save the charts as PNG (twice the screen size)",
        each("png", async (view, name) => downloadUrl(await view.toImageURL("png", 2), name)),
      ),
      button("CSV", "Save the plotted numbers (shortest round-trip form)", () => downloadText(designCsv(state.answer), `${stem}.csv`, "text/csv")),
      ...methodsButtons(
        button,
        () => stem,
        (options) => designMethodsDocument(state, options),
      ),
    ]);
  }

  private showAlert(text: string): void {
    this.alert.textContent = text;
    this.alert.hidden = false;
  }
}
