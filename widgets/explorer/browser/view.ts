/** The explorer's browser side for the runtime: boots explorers. */
import type { WidgetView } from "../../core/kind";
import { bootNew, pruneDisconnected, releaseWithin } from "../../core/browser/boot";
import { EXPLORER_CLASS, STATE_SCRIPT_CLASS } from "../names";
import { ExplorerWidget } from "./explorer-view";
import { injectStyles } from "./styles";

const live: ExplorerWidget[] = [];

export const explorerView: WidgetView = {
  className: EXPLORER_CLASS,
  stateScriptClass: STATE_SCRIPT_CLASS,
  boot(root) {
    injectStyles(document);
    return bootNew(root, EXPLORER_CLASS, live, (element) => new ExplorerWidget(element));
  },
  live() {
    pruneDisconnected(live);
    return [...live];
  },
  release: (slot) => releaseWithin(live, slot),
  exposeAs: { runtime: "widgets" },
};
