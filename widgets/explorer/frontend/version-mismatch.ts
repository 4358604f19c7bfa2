/** Front-end module "quietframe-live": what a front-end shows when the kernel's chart comes from another quietframe version. */
import { DOMWidgetView, type ExportMap } from "@jupyter-widgets/base";
import { el } from "../../core/browser/dom";
import { CHART_MODEL_NAME, CHART_VIEW_CLASS, CHART_VIEW_NAME } from "../live/names";
import { QuietframeChartModel } from "./chart-model";
import { injectLiveStyles } from "./styles";
import { VERSION_MISMATCH_CLASS, versionMismatchText } from "./mismatch-text";

/**
 * The exports registered under a version other than ours: the same chart model (so the
 * kernel's state, buffers included, is kept and saved as it came), and a view that says
 * which versions disagree instead of drawing curves whose format may have changed.
 */
export function versionMismatchExports(kernelVersion: string): ExportMap {
  class QuietframeVersionMismatchView extends DOMWidgetView {
    override render(): void {
      injectLiveStyles(document);
      this.el.classList.add(CHART_VIEW_CLASS, VERSION_MISMATCH_CLASS);
      this.el.append(el("div", { class: "qf-alert", role: "alert" }, [versionMismatchText(kernelVersion)]));
    }
  }
  return { [CHART_MODEL_NAME]: QuietframeChartModel, [CHART_VIEW_NAME]: QuietframeVersionMismatchView };
}
