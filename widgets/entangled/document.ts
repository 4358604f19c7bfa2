/** The entangled-light panel's state file: a Jupyter widget-state document holding one panel model. */
import { holdsSingleModelState } from "../core/state/single-model-read";
import { modelIdOf, singleModelDocument } from "../core/state/strict-read";
import type { JupyterWidgetStateDocument } from "../core/state/widget-state";
import { ENTANGLED_MODEL_NAME, ENTANGLED_STATE_FORMAT, savedEntangledState, type EntangledComputation, type EntangledState } from "./model";

/**
 * What "Download state" and `stateText()` save: a widget-state document (format 2.0) whose one
 * model holds the panel's state with the fingerprint of its numbers, like every other kind.
 * `loadEntangledState` reads it back (and bare states, and version-1 states without a fingerprint).
 */
export function toEntangledDocument(state: EntangledState, computation?: EntangledComputation): JupyterWidgetStateDocument {
  const saved = savedEntangledState(state, computation);
  return singleModelDocument(modelIdOf("quietframe-entangled-", saved.fingerprint), ENTANGLED_MODEL_NAME, saved);
}

/** The state file's text: two-space JSON and a final newline. */
export function entangledDocumentText(state: EntangledState, computation?: EntangledComputation): string {
  return `${JSON.stringify(toEntangledDocument(state, computation), null, 2)}\n`;
}

/** True when the input (text or parsed) is a panel state or a document holding one; never throws. */
export function isEntangledInput(input: unknown): boolean {
  return holdsSingleModelState(input, { format: ENTANGLED_STATE_FORMAT, modelName: ENTANGLED_MODEL_NAME });
}
