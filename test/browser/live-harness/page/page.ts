/**
 * Test page: a real widget manager (ManagerBase of @jupyter-widgets/base-manager with the
 * views of @jupyter-widgets/base and @jupyter-widgets/controls), connected through
 * @jupyterlab/services to a Jupyter server. quietframe's chart module is loaded the way
 * the classic notebook loads widget modules: the built require.js module, through define().
 */
import * as base from "@jupyter-widgets/base";
import { ManagerBase } from "@jupyter-widgets/base-manager";
import * as controls from "@jupyter-widgets/controls";
import { KernelManager, ServerConnection, type Kernel, type KernelMessage } from "@jupyterlab/services";
import { Widget } from "@lumino/widgets";
import "@jupyter-widgets/controls/css/widgets.css";

const WIDGET_VIEW_MIME = "application/vnd.jupyter.widget-view+json";
type ModuleExports = Record<string, unknown>;

/** Loads an anonymous require.js module whose dependencies this page provides. */
function loadAmdModule(url: string, provided: Record<string, unknown>): Promise<ModuleExports> {
  return new Promise((resolve, reject) => {
    const w = window as unknown as { define?: unknown };
    const define = (deps: string[], factory: (...args: unknown[]) => ModuleExports): void => {
      try {
        resolve(
          factory(
            ...deps.map((d) => {
              if (!(d in provided)) throw new Error(`the module asks for ${d}, which this page does not provide`);
              return provided[d];
            }),
          ),
        );
      } catch (e) {
        reject(e);
      }
    };
    (define as unknown as { amd: object }).amd = {};
    w.define = define;
    const script = document.createElement("script");
    script.src = url;
    script.onerror = () => reject(new Error(`could not load ${url}`));
    script.onload = () => delete w.define;
    document.head.append(script);
  });
}

class HarnessManager extends ManagerBase {
  private liveModule: Promise<ModuleExports> | undefined;

  constructor(
    private readonly kernel: Kernel.IKernelConnection | undefined,
    private readonly liveModuleUrl: string,
  ) {
    super();
    kernel?.registerCommTarget(this.comm_target_name, async (comm, msg) => {
      await this.handle_comm_open(new base.shims.services.Comm(comm), msg as KernelMessage.ICommOpenMsg);
    });
  }

  protected async loadClass(className: string, moduleName: string, moduleVersion: string): Promise<typeof base.WidgetModel | typeof base.WidgetView> {
    let mod: ModuleExports | undefined;
    if (moduleName === "@jupyter-widgets/base") mod = base as unknown as ModuleExports;
    else if (moduleName === "@jupyter-widgets/controls") mod = controls as unknown as ModuleExports;
    else if (moduleName === "quietframe-live") mod = await (this.liveModule ??= loadAmdModule(this.liveModuleUrl, { "@jupyter-widgets/base": base }));
    const cls = mod?.[className];
    if (!cls) throw new Error(`class ${className} not found in module ${moduleName}@${moduleVersion}`);
    return cls as typeof base.WidgetModel;
  }

  protected async _create_comm(target: string, modelId?: string, data?: any, metadata?: any, buffers?: ArrayBuffer[] | ArrayBufferView[]): Promise<base.IClassicComm> {
    if (!this.kernel) throw new Error("no kernel");
    const comm = this.kernel.createComm(target, modelId);
    if (data || metadata) comm.open(data, metadata, buffers);
    return new base.shims.services.Comm(comm);
  }

  protected async _get_comm_info(): Promise<{}> {
    if (!this.kernel) return {};
    const reply = await this.kernel.requestCommInfo({ target_name: this.comm_target_name });
    return reply.content.status === "ok" ? reply.content.comms : {};
  }

  /** Renders a model's view into a new output area. */
  async show(modelId: string): Promise<HTMLElement> {
    const model = await this.get_model(modelId);
    const view = await this.create_view(model);
    const area = document.createElement("div");
    area.className = "harness-output";
    area.dataset.modelId = modelId;
    document.getElementById("outputs")!.append(area);
    Widget.attach(view.luminoWidget, area);
    return area;
  }
}

interface ExecuteResult {
  status: string;
  stdout: string;
  stderr: string;
  error?: string;
  /** Widget views displayed by the cell (model ids). */
  widgets: string[];
}

let manager: HarnessManager | undefined;
let kernel: Kernel.IKernelConnection | undefined;

const harness = {
  /** Starts a kernel of `kernelName` on the Jupyter server named in the query (?server=<origin>&token=…). */
  async connect(kernelName: string, liveModuleUrl: string): Promise<string> {
    const query = new URLSearchParams(location.search);
    const token = query.get("token") ?? "";
    const server = new URL(query.get("server") ?? location.origin);
    const serverSettings = ServerConnection.makeSettings({ baseUrl: `${server.origin}/`, wsUrl: `ws://${server.host}/`, token, appendToken: true });
    const kernels = new KernelManager({ serverSettings });
    kernel = await kernels.startNew({ name: kernelName });
    manager = new HarnessManager(kernel, liveModuleUrl);
    const info = await kernel.info;
    return info.implementation;
  },

  /** A manager without a kernel, for saved widget state. */
  offline(liveModuleUrl: string): void {
    manager = new HarnessManager(undefined, liveModuleUrl);
  },

  /** Runs a cell; widget views it displays are rendered below the others. */
  async execute(code: string): Promise<ExecuteResult> {
    if (!kernel || !manager) throw new Error("not connected");
    const result: ExecuteResult = { status: "", stdout: "", stderr: "", widgets: [] };
    const shown: Promise<unknown>[] = [];
    const future = kernel.requestExecute({ code, store_history: false });
    future.onIOPub = (msg) => {
      const content = msg.content as Record<string, any>;
      if (msg.header.msg_type === "stream") result[content.name === "stderr" ? "stderr" : "stdout"] += content.text;
      if (msg.header.msg_type === "error") result.error = `${content.ename}: ${content.evalue}`;
      if (msg.header.msg_type === "display_data" && content.data?.[WIDGET_VIEW_MIME]) {
        const id = content.data[WIDGET_VIEW_MIME].model_id as string;
        result.widgets.push(id);
        shown.push(manager!.show(id));
      }
    };
    const reply = await future.done;
    result.status = (reply.content as { status: string }).status;
    await Promise.all(shown);
    return result;
  },

  /** The widget state a notebook saves (what the classic notebook writes into metadata). */
  async savedState(): Promise<unknown> {
    return manager!.get_state({ drop_defaults: false });
  },

  /** Restores saved widget state and renders the given model's view. */
  async restore(state: any, modelId: string): Promise<void> {
    await manager!.set_state(state);
    await manager!.show(modelId);
  },

  async shutdown(): Promise<void> {
    await kernel?.shutdown();
  },
};

(window as unknown as { harness: typeof harness }).harness = harness;
document.body.dataset.ready = "true";
