import { QUIETFRAME_VERSION } from "../../src/version";
import { EXPLORER_CLASS, RUNTIME_READY_EVENT } from "../core/page/names";
import { ExplorerWidget } from "../explorer/browser/explorer-view";
import { bootNew } from "../core/browser/boot";
import { bootLoaders } from "../explorer/browser/loader";
import { bootEntangledPanels } from "../entangled/browser/entangled-view";
import { injectStyles } from "../explorer/browser/styles";
import { bootTolerance, type ToleranceWidget } from "../tolerance/browser/tolerance-view";
import { bootTrajectoryWidgets } from "../trajectory/browser/trajectory-view";

/**
 * The browser runtime: boots every explorer element on the page that has not booted yet.
 * Notebooks call `boot()` again from each later output's bootstrap, so one copy of the
 * runtime serves every widget on the page.
 */
export interface QuietframeRuntime {
  readonly version: string;
  /** Boots new explorer elements (and loader panels) under root; returns the widgets started. */
  boot(root?: ParentNode): ExplorerWidget[];
  /** Live widgets, in boot order; widgets whose element left the page are dropped. */
  readonly widgets: readonly ExplorerWidget[];
  /** Live tolerance maps, in boot order. */
  readonly toleranceMaps: readonly ToleranceWidget[];
}

function install(): QuietframeRuntime {
  const live: ExplorerWidget[] = [];
  const toleranceMaps: ToleranceWidget[] = [];
  const prune = (): void => {
    for (let i = live.length - 1; i >= 0; i--) {
      if (!live[i].element.isConnected) live.splice(i, 1)[0].dispose();
    }
  };
  const release = (slot: Element): void => {
    for (let i = live.length - 1; i >= 0; i--) {
      if (slot.contains(live[i].element)) live.splice(i, 1)[0].dispose();
    }
  };
  const boot = (root: ParentNode = document): ExplorerWidget[] => {
    injectStyles(document);
    const started = bootNew(root, EXPLORER_CLASS, live, (element) => new ExplorerWidget(element));
    bootLoaders(root, boot, release);
    bootTolerance(root, boot, toleranceMaps);
    bootEntangledPanels(root);
    bootTrajectoryWidgets(root);
    return started;
  };
  return {
    version: QUIETFRAME_VERSION,
    boot,
    get widgets() {
      prune();
      return [...live];
    },
    get toleranceMaps() {
      return [...toleranceMaps];
    },
  };
}

declare global {
  interface Window {
    quietframeRuntime?: QuietframeRuntime;
  }
}

// A notebook may carry the runtime more than once (a re-run cell); the first copy stays in charge.
const runtime = window.quietframeRuntime ?? install();
window.quietframeRuntime = runtime;
if (document.readyState === "loading") document.addEventListener("DOMContentLoaded", () => runtime.boot(), { once: true });
else runtime.boot();
window.dispatchEvent(new Event(RUNTIME_READY_EVENT));
