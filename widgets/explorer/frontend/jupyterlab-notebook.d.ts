/**
 * The part of @jupyterlab/notebook the lab extension uses, declared here: JupyterLab provides
 * the package at run time as a shared module, so it is not installed for the build.
 */
declare module "@jupyterlab/notebook" {
  import type { Token } from "@lumino/coreutils";
  import type { ISignal } from "@lumino/signaling";

  interface KernelMessageLike {
    header: { msg_type: string };
    content: unknown;
  }
  interface KernelConnectionLike {
    anyMessage: ISignal<KernelConnectionLike, { msg: KernelMessageLike; direction: "send" | "recv" }>;
  }
  /** One model of saved widget state (Jupyter widget state schema v2). */
  interface SavedWidgetModel {
    model_module: string;
    model_module_version: string;
    state: unknown;
  }
  type WidgetStateMetadata = Record<string, { state?: Record<string, SavedWidgetModel> } | undefined>;
  interface NotebookPanelLike {
    context: { ready: Promise<void>; model: { getMetadata(key: string): unknown } };
    sessionContext: { session: { kernel: KernelConnectionLike | null } | null; kernelChanged: ISignal<unknown, unknown> };
  }
  interface INotebookTracker {
    widgetAdded: ISignal<INotebookTracker, NotebookPanelLike>;
  }
  const INotebookTracker: Token<INotebookTracker>;
}
