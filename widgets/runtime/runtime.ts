/**
 * The browser runtime (bundled by scripts/build-runtime.js into dist/widgets/runtime.js): boots
 * the view of every kind in the registry on each widget element that has not booted yet.
 * Notebooks call `boot()` again from each later output's bootstrap, so one copy of the runtime
 * serves every widget on the page.
 */
import { changeset, parse, View } from "vega";
import { compile } from "vega-lite";
import { QUIETFRAME_VERSION } from "../../src/index";
import { provideVega } from "../core/browser/vega";
import type { BootContext, LiveWidget } from "../core/kind";
import { RUNTIME_READY_EVENT } from "../core/page/names";
import { loadWidgetState, WIDGET_KINDS } from "../registry";
import { bootStateLoaders } from "../core/browser/state-loader";
import { hidePngOutputsOnceLive } from "../core/browser/png-output";

export interface QuietframeRuntime {
  readonly version: string;
  /** Boots the new widgets of every kind under root; returns the widgets started. */
  boot(root?: ParentNode): LiveWidget[];
  /** The live widgets of one kind (by its name in the registry), in boot order. */
  live(kind: string): readonly LiveWidget[];
  /** Each kind's live widgets also appear under the name its view gives (e.g. `widgets` for explorers). */
  readonly [list: string]: unknown;
}

function install(): QuietframeRuntime {
  const views = WIDGET_KINDS.map((k) => k.view);
  const context: BootContext = {
    boot: (root) => void boot(root),
    release: (slot) => {
      for (const view of views) view.release(slot);
    },
    open: (text, source) => {
      const { kind, loaded } = loadWidgetState(text, source);
      return { className: kind.view.className, stateScriptClass: kind.view.stateScriptClass, stateText: kind.stateText(loaded) };
    },
  };
  const boot = (root: ParentNode = document): LiveWidget[] => {
    const started = views.flatMap((view) => [...view.boot(root, context)]);
    // The standalone page's panel opens a saved state of any kind in place of its widget.
    bootStateLoaders(root, context);
    // A trusted notebook's kernel-free output shows the live page, not its PNG output as well.
    hidePngOutputsOnceLive(root);
    return started;
  };
  const runtime: Record<string, unknown> = {
    version: QUIETFRAME_VERSION,
    boot,
    live: (name: string) => [...(WIDGET_KINDS.find((k) => k.name === name)?.view.live() ?? [])],
  };
  for (const view of views) {
    const exposed = view.exposeAs;
    if (exposed?.runtime) Object.defineProperty(runtime, exposed.runtime, { get: () => [...view.live()], enumerable: true });
    // A second runtime copy on the page never installs; the first copy's lists stay the ones to read.
    if (exposed?.window) (window as unknown as Record<string, unknown>)[exposed.window] ??= () => [...view.live()];
  }
  return runtime as QuietframeRuntime;
}

declare global {
  interface Window {
    quietframeRuntime?: QuietframeRuntime;
  }
}

// The views draw with this bundle's Vega (the trimmed one of core/browser/vega-slim.ts).
provideVega({ parse, View, changeset, compile });

// A notebook may carry the runtime more than once (a re-run cell); the first copy stays in charge.
const runtime = window.quietframeRuntime ?? install();
window.quietframeRuntime = runtime;
if (document.readyState === "loading") document.addEventListener("DOMContentLoaded", () => runtime.boot(), { once: true });
else runtime.boot();
window.dispatchEvent(new Event(RUNTIME_READY_EVENT));
