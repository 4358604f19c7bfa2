/**
 * The JupyterLab 4 / Notebook 7 extension "quietframe-live": registers quietframe's chart
 * model and view with the ipywidgets 8 widget manager (the IJupyterWidgetRegistry token of
 * @jupyter-widgets/base). scripts/build-labextension.js bundles it with @jupyterlab/builder.
 *
 * The manager loads a module by its exact version. A kernel of another quietframe version
 * would otherwise get ipywidgets' generic error icon; so the plugin watches notebooks for
 * quietframe charts of other versions (opened by the kernel, sent to a reconnecting page, or
 * in saved widget state) and registers a view for that version which says what to install.
 */
import { IJupyterWidgetRegistry, type IWidgetRegistryData } from "@jupyter-widgets/base";
import { INotebookTracker, type NotebookPanelLike, type WidgetStateMetadata } from "@jupyterlab/notebook";
import type { IPlugin } from "@lumino/coreutils";
import { LIVE_MODULE, LIVE_MODULE_VERSION } from "../live/names";
import { QuietframeChartModel, QuietframeChartView } from "./index";
import { versionMismatchExports } from "./version-mismatch";

const WIDGET_COMM_TARGET = "jupyter.widget";
const WIDGET_STATE_KEY = "application/vnd.jupyter.widget-state+json";

/** Our module's version in a widget's state, or undefined for other modules' widgets. */
function liveModuleVersion(state: unknown): string | undefined {
  if (typeof state !== "object" || state === null) return undefined;
  const s = state as Record<string, unknown>;
  return s._model_module === LIVE_MODULE && typeof s._model_module_version === "string" ? s._model_module_version : undefined;
}

function activate(_app: unknown, registry: IJupyterWidgetRegistry, tracker: INotebookTracker | null): void {
  const registered = new Set<string>([LIVE_MODULE_VERSION]);
  const entry: IWidgetRegistryData = { name: LIVE_MODULE, version: LIVE_MODULE_VERSION, exports: { QuietframeChartModel, QuietframeChartView } };
  registry.registerWidget(entry);
  const registerForeign = (version: string | undefined): void => {
    if (version === undefined || registered.has(version)) return;
    registered.add(version);
    registry.registerWidget({ name: LIVE_MODULE, version, exports: versionMismatchExports(version) });
  };
  if (!tracker) return;
  tracker.widgetAdded.connect((_tracker, panel: NotebookPanelLike) => {
    // Saved widget state: registered once the file is read, before the manager restores it.
    void panel.context.ready.then(() => {
      const saved = panel.context.model.getMetadata("widgets") as WidgetStateMetadata | undefined;
      for (const model of Object.values(saved?.[WIDGET_STATE_KEY]?.state ?? {})) if (model.model_module === LIVE_MODULE) registerForeign(model.model_module_version);
    });
    // Live widgets: comm_open messages are seen on receipt, before the manager handles them.
    const watched = new WeakSet<object>();
    const watchKernel = (): void => {
      const kernel = panel.sessionContext.session?.kernel;
      if (!kernel || watched.has(kernel)) return;
      watched.add(kernel);
      kernel.anyMessage.connect((_kernel, { msg, direction }) => {
        if (direction !== "recv") return;
        if (msg.header.msg_type === "comm_open") {
          const content = msg.content as { target_name?: string; data?: { state?: unknown } };
          if (content.target_name === WIDGET_COMM_TARGET) registerForeign(liveModuleVersion(content.data?.state));
        } else if (msg.header.msg_type === "comm_msg") {
          // A page that reconnects to a running kernel gets every model at once (update_states).
          const data = (msg.content as { data?: { method?: string; states?: Record<string, { state?: unknown }> } }).data;
          if (data?.method === "update_states") for (const model of Object.values(data.states ?? {})) registerForeign(liveModuleVersion(model.state));
        }
      });
    };
    panel.sessionContext.kernelChanged.connect(watchKernel);
    watchKernel();
  });
}

const plugin: IPlugin<unknown, void> = {
  id: "quietframe-live:widgets",
  description: "quietframe's live chart for the ipywidgets widget manager",
  requires: [IJupyterWidgetRegistry],
  optional: [INotebookTracker],
  autoStart: true,
  activate: activate as IPlugin<unknown, void>["activate"],
};

export default plugin;
