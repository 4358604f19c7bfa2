/** Front-end module "quietframe-live": the chart view. */
import { DOMWidgetView } from "@jupyter-widgets/base";
import { ChartView } from "../browser/chart-view";
import type { MechanismPanel } from "../budget-spec";
import { el } from "../../core/browser/dom";
import { CAUTION_HEADING, type SummaryLine } from "../../core/page/summary-line";
import { curvesFromWire, type BinaryLike } from "../live/chart-wire";
import { CHART_VIEW_CLASS } from "../live/names";
import { injectLiveStyles } from "./styles";

type WireState = Parameters<typeof curvesFromWire>[0] & { frequencies: BinaryLike };

/**
 * The chart model's view: safety cautions first, then the error text (when the controls'
 * values could not be computed), the Vega chart and the headline figures. Drawing goes
 * through the same ChartView as the kernel-free page, so both modes show the same chart.
 *
 * The root element carries data-revision = the revision of the curves drawn, set once they
 * are on the canvas, so scripts and tests can wait for a given computation.
 */
export class QuietframeChartView extends DOMWidgetView {
  private chart: ChartView | undefined;
  private alert!: HTMLElement;
  private caution!: HTMLElement;
  private readout!: HTMLElement;
  private drawn = -1;
  private drawing: Promise<void> | undefined;

  override render(): void {
    injectLiveStyles(document);
    this.chart = new ChartView();
    this.alert = el("div", { class: "qf-alert", role: "alert", hidden: "" });
    this.caution = el("div", { class: "qf-caution", role: "note", hidden: "" });
    this.readout = el("dl", { class: "qf-readout" });
    this.el.classList.add(CHART_VIEW_CLASS);
    this.el.append(this.caution, this.alert, this.chart.element, this.readout);
    // The ChartView is reachable from the element, so a page script can read what is plotted.
    (this.el as HTMLElement & { quietframeChart?: ChartView }).quietframeChart = this.chart;
    this.listenTo(this.model, "change", () => this.update());
    this.update();
  }

  override update(): void {
    const error = String(this.model.get("error") ?? "");
    this.alert.textContent = error;
    this.alert.hidden = error === "";
    const cautions = (this.model.get("cautions") ?? []) as string[];
    this.caution.hidden = cautions.length === 0;
    this.caution.replaceChildren(
      el("strong", {}, [CAUTION_HEADING]),
      el(
        "ul",
        {},
        cautions.map((c) => el("li", {}, [c])),
      ),
    );
    const lines = (this.model.get("headline") ?? []) as SummaryLine[];
    this.readout.replaceChildren(...lines.flatMap((line) => [el("dt", {}, [line.label]), el("dd", {}, [line.text])]));
    void this.draw();
  }

  override remove(): unknown {
    this.chart?.finalize();
    this.chart = undefined;
    return super.remove();
  }

  /** Draws the newest curves; updates that arrive during a draw are folded into one more draw. */
  private async draw(): Promise<void> {
    if (this.drawing) return this.drawing;
    this.drawing = (async () => {
      try {
        for (;;) {
          const revision = Number(this.model.get("revision"));
          const wire = this.model.get("curves") as WireState | null;
          if (!this.chart || !wire || revision === this.drawn) break;
          const mechanism = (this.model.get("mechanism") ?? undefined) as MechanismPanel | undefined;
          await this.chart.show({ table: curvesFromWire(wire), quantity: String(this.model.get("quantity")), title: String(this.model.get("title")), mechanism });
          this.drawn = revision;
          this.el.dataset.revision = String(revision);
        }
      } catch (e) {
        this.alert.textContent = `The chart could not be drawn: ${e instanceof Error ? e.message : String(e)}`;
        this.alert.hidden = false;
      } finally {
        this.drawing = undefined;
      }
    })();
    return this.drawing;
  }
}
