/** The entangled-light panel's browser side for the runtime. */
import type { WidgetView } from "../../core/kind";
import { bootNew, releaseWithin } from "../../core/browser/boot";
import { ENTANGLED_CLASS, ENTANGLED_STATE_CLASS } from "../names";
import { EntangledPanelView, injectEntangledStyles } from "./entangled-view";

const live: EntangledPanelView[] = [];

export const entangledView: WidgetView = {
  className: ENTANGLED_CLASS,
  stateScriptClass: ENTANGLED_STATE_CLASS,
  boot(root) {
    injectEntangledStyles(document);
    return bootNew(root, ENTANGLED_CLASS, live, (element) => new EntangledPanelView(element));
  },
  live: () => [...live],
  release: (slot) => releaseWithin(live, slot),
  exposeAs: { window: "quietframeEntangledPanels" },
};
