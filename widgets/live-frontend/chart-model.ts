import { DOMWidgetModel } from "@jupyter-widgets/base";
import { chartModelIdentity } from "../live/names";

/**
 * quietframe's chart model in a front-end. The kernel computes and sends everything; the
 * model only holds it. The curves stay in their wire form (binary buffers) so that saving
 * the notebook's widget state writes them back as buffers without a serializer.
 */
export class QuietframeChartModel extends DOMWidgetModel {
  override defaults(): Record<string, unknown> {
    return {
      ...super.defaults(),
      ...chartModelIdentity(),
      spec: {},
      curves: null,
      quantity: "",
      title: "",
      headline: [],
      cautions: [],
      error: "",
      explorer_state: null,
      revision: 0,
    };
  }
}
