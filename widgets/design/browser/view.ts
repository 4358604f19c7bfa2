/** The design widget's browser side for the runtime. */
import type { WidgetView } from "../../core/kind";
import { bootNew, releaseWithin } from "../../core/browser/boot";
import { DESIGN_CLASS, DESIGN_STATE_CLASS } from "../names";
import { DesignWidgetView, injectDesignStyles } from "./design-view";

const live: DesignWidgetView[] = [];

export const designView: WidgetView = {
  className: DESIGN_CLASS,
  stateScriptClass: DESIGN_STATE_CLASS,
  boot(root) {
    injectDesignStyles(document);
    return bootNew(root, DESIGN_CLASS, live, (element) => new DesignWidgetView(element));
  },
  live: () => [...live],
  release: (slot) => releaseWithin(live, slot),
  exposeAs: { runtime: "designWidgets" },
};
