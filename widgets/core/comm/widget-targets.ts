/** The comm targets the kernel serves for widgets ("jupyter.widget", "jupyter.widget.control"). */
import type { Comm, CommMessage } from "./comm";
import type { CommManager } from "./comm-manager";
import { WIDGET_TARGET } from "./widget-model";
import { widgetRegistry } from "./widget-registry";

/**
 * The widget protocol's comm targets in this kernel:
 * - "jupyter.widget": models are created by the kernel; a front-end that opens one itself
 *   is told no (comm closed with the reason), as this kernel has no class registry to build
 *   a model from a front-end's state.
 * - "jupyter.widget.control" (messages.md, "Control Widget messaging protocol, version 1.0"):
 *   `request_states` → `update_states` with every open model as widget managers read it:
 *   {model_name, model_module, model_module_version, state}, the form of saved widget state
 *   (ipywidgets' ManagerBase._loadFromKernel, which JupyterLab and Notebook 7 use when a page
 *   reconnects to a running kernel), buffer paths running through "state".
 */

export const CONTROL_TARGET = "jupyter.widget.control";

export function registerWidgetTargets(comms: CommManager): void {
  comms.registerTarget(WIDGET_TARGET, (comm) => {
    const why = "this kernel creates widget models itself; front-end-created models are not supported";
    comms.log(`comm_open ${comm.id} on ${WIDGET_TARGET} refused: ${why}`);
    comm.close({ error: why });
  });
  comms.registerTarget(CONTROL_TARGET, (comm) => {
    comm.onMessage((msg) => answerControl(comms, comm, msg));
  });
}

function answerControl(comms: CommManager, comm: Comm, msg: CommMessage): void {
  if (msg.data.method !== "request_states") {
    const why = `unknown method ${JSON.stringify(msg.data.method ?? null)} on ${CONTROL_TARGET}; allowed: request_states`;
    comms.log(`comm ${comm.id}: ${why}`);
    comm.send({ method: "custom", content: { error: { method: String(msg.data.method), message: why } } });
    return;
  }
  const states: Record<string, unknown> = {};
  const buffer_paths: (string | number)[][] = [];
  const buffers: Uint8Array[] = [];
  for (const model of widgetRegistry().values()) {
    const split = model.fullState();
    const state = split.state;
    states[model.id] = { model_name: state._model_name, model_module: state._model_module, model_module_version: state._model_module_version, state };
    split.buffer_paths.forEach((p, i) => {
      buffer_paths.push([model.id, "state", ...p]);
      buffers.push(split.buffers[i]);
    });
  }
  comm.send({ method: "update_states", states, buffer_paths }, {}, buffers);
}
