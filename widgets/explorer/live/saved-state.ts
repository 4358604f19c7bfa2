/** Explorer states that live charts left in a saved notebook's widget state. */
import { QuietframeError, parseJsonText } from "../../../src/index";
import { WIDGET_STATE_MIME } from "../../core/state/widget-state";
import { CHART_MODEL_NAME, LIVE_MODULE } from "./names";

/**
 * Finds the explorer states that live widgets left in a saved notebook. A front-end saves
 * its widget state (Jupyter widget-state format 2.0) under the notebook's
 * metadata.widgets["application/vnd.jupyter.widget-state+json"]; each quietframe chart model
 * there carries `explorer_state`, the same explorer state as a state file. Text that is
 * neither a notebook nor a widget-state document holding chart models is returned as it
 * came, for the ordinary state-file reader.
 */
/** Largest notebook read for its widget state (UTF-16 units); notebooks with many widgets reach tens of MB. */
export const MAX_NOTEBOOK_TEXT_CHARS = 256 * 1024 * 1024;

export interface StateSource {
  /** The explorer state (parsed) or the original text. */
  readonly value: unknown;
  /** Where it came from, for error paths: e.g. "figure.ipynb.metadata.widgets…state.<id>.state.explorer_state". */
  readonly source: string;
}

/**
 * @param which 1-based choice among several live charts (in the order the document lists
 *   them); needed only when there is more than one.
 */
export function liveStateSource(text: string, source: string, which?: number): StateSource {
  // Notebooks carry outputs beside their widget state, so they may be larger than a state file;
  // beyond this the state-file reader refuses the text with its own size message.
  if (text.length > MAX_NOTEBOOK_TEXT_CHARS) return { value: text, source };
  let doc: unknown;
  try {
    doc = parseJsonText(text, source);
  } catch {
    // Not JSON at all: let the state-file reader give its own, more specific message.
    return { value: text, source };
  }
  if (!isRecord(doc)) return { value: text, source };
  const isNotebook = Array.isArray(doc.cells) && isRecord(doc.metadata);
  let documentPath = source;
  let widgetState: unknown = doc;
  if (isNotebook) {
    const widgets = (doc.metadata as Record<string, unknown>).widgets;
    documentPath = `${source}.metadata.widgets["${WIDGET_STATE_MIME}"]`;
    widgetState = isRecord(widgets) ? widgets[WIDGET_STATE_MIME] : undefined;
    if (!isRecord(widgetState)) {
      throw new QuietframeError({
        path: `${source}.metadata.widgets`,
        problem: "holds no saved widget state",
        allowed: "a notebook saved with its widget state (in the classic notebook: Widgets → Save Notebook Widget State; in JupyterLab: Settings → Save Widget State Automatically, then save)",
      });
    }
  }
  const models = isRecord(widgetState) && isRecord(widgetState.state) ? (widgetState.state as Record<string, unknown>) : undefined;
  const charts = models
    ? Object.keys(models).filter((id) => {
        const m = models[id];
        return isRecord(m) && m.model_module === LIVE_MODULE && m.model_name === CHART_MODEL_NAME;
      })
    : [];
  if (charts.length === 0) {
    if (!isNotebook) return { value: text, source };
    throw new QuietframeError({ path: `${documentPath}.state`, problem: "holds no quietframe live chart", allowed: `a model with model_module "${LIVE_MODULE}" and model_name "${CHART_MODEL_NAME}"` });
  }
  if (which === undefined && charts.length > 1) {
    throw new QuietframeError({
      path: `${documentPath}.state`,
      value: charts.length,
      problem: `holds ${charts.length} quietframe live charts`,
      allowed: `one of them by number, 1 to ${charts.length} (render --widget N)`,
    });
  }
  const n = which ?? 1;
  if (!Number.isInteger(n) || n < 1 || n > charts.length) {
    throw new QuietframeError({ path: "--widget", value: which, problem: "is not the number of a live chart in this document", allowed: `1 to ${charts.length}` });
  }
  const id = charts[n - 1];
  const model = models![id] as Record<string, unknown>;
  const modelPath = `${documentPath}.state${/^[A-Za-z0-9_-]+$/.test(id) ? `.${id}` : `[${JSON.stringify(id)}]`}`;
  const state = isRecord(model.state) ? model.state.explorer_state : undefined;
  if (!isRecord(state)) {
    throw new QuietframeError({ path: `${modelPath}.state.explorer_state`, problem: "is missing", allowed: "an explorer state (as in a state file)" });
  }
  return { value: state, source: `${modelPath}.state.explorer_state` };
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}
