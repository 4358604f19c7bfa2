/** The tolerance map's browser side for the runtime. */
import type { WidgetView } from "../../core/kind";
import { bootNew, releaseWithin } from "../../core/browser/boot";
import { TOLERANCE_CLASS, TOLERANCE_STATE_CLASS } from "../names";
import { injectToleranceStyles } from "./styles";
import { ToleranceWidget } from "./tolerance-view";

const live: ToleranceWidget[] = [];

export const toleranceView: WidgetView = {
  className: TOLERANCE_CLASS,
  stateScriptClass: TOLERANCE_STATE_CLASS,
  boot(root, context) {
    injectToleranceStyles(document);
    return bootNew(root, TOLERANCE_CLASS, live, (element) => new ToleranceWidget(element, context.boot));
  },
  live: () => [...live],
  release: (slot) => releaseWithin(live, slot),
  exposeAs: { runtime: "toleranceMaps" },
};
