/** Front-end module "quietframe-live": the chart model. */
import { DOMWidgetModel, type ISerializers } from "@jupyter-widgets/base";
import { chartModelIdentity } from "../live/names";

/**
 * quietframe's chart model in a front-end. The kernel computes and sends everything; the
 * model only holds it. The curves stay in their wire form (binary buffers), and their
 * serializer keeps them binary, so a saved notebook's widget state stores them as buffers
 * (a key without a serializer is copied through JSON, which would turn them into {}).
 */
export class QuietframeChartModel extends DOMWidgetModel {
  static override serializers: ISerializers = {
    ...DOMWidgetModel.serializers,
    curves: { serialize: keepBinary },
  };

  override defaults(): Record<string, unknown> {
    return {
      ...super.defaults(),
      ...chartModelIdentity(),
      spec: {},
      curves: null,
      mechanism: null,
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

/** A deep copy of plain JSON that leaves binary values (DataView, typed arrays, ArrayBuffer) as they are. */
function keepBinary(value: unknown): unknown {
  if (value instanceof ArrayBuffer || ArrayBuffer.isView(value)) return value;
  if (Array.isArray(value)) return value.map(keepBinary);
  if (typeof value === "object" && value !== null) return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, keepBinary(v)]));
  return value;
}
