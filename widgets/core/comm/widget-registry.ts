/** The widget models of the kernel, by id, and their state with binary buffers. */
import type { SplitState } from "./buffers";

/**
 * The widget models open in this kernel, by model id. The "jupyter.widget.control" target
 * answers request_states from it. Like the comms it sits on a global symbol, so models made
 * by a second copy of quietframe in the same kernel are listed too.
 */

export interface RegisteredModel {
  readonly id: string;
  /** The full state, binary values split out. */
  fullState(): SplitState;
}

const KEY = Symbol.for("quietframe.kernel.widgets");

export function widgetRegistry(): Map<string, RegisteredModel> {
  const g = globalThis as Record<symbol, Map<string, RegisteredModel> | undefined>;
  return (g[KEY] ??= new Map());
}
