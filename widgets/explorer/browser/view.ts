/** The explorer's browser side for the runtime: boots explorers and the standalone page's loader panel. */
import type { WidgetView } from "../../core/kind";
import { bootNew, pruneDisconnected, releaseWithin } from "../../core/browser/boot";
import { EXPLORER_CLASS } from "../names";
import { ExplorerWidget } from "./explorer-view";
import { bootLoaders } from "./loader";
import { injectStyles } from "./styles";

const live: ExplorerWidget[] = [];

export const explorerView: WidgetView = {
  className: EXPLORER_CLASS,
  boot(root, context) {
    injectStyles(document);
    const started = bootNew(root, EXPLORER_CLASS, live, (element) => new ExplorerWidget(element));
    bootLoaders(root, context.boot, context.release);
    return started;
  },
  live() {
    pruneDisconnected(live);
    return [...live];
  },
  release: (slot) => releaseWithin(live, slot),
  exposeAs: { runtime: "widgets" },
};
