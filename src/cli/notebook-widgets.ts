/**
 * The quietframe widgets of a saved notebook, for `quietframe render notebook.ipynb`: the
 * kernel-free outputs (their HTML carries the state in a JSON script element, see each kind's
 * fragment.ts) and the live charts of the saved widget state, in the order the notebook shows
 * them. Each is read through the widget registry; `--widget N` picks one.
 */
import { QuietframeError } from "../errors";
import { parseJsonText } from "../setup/parse-json";
import type { LoadedWidget, WidgetKind } from "../../widgets/core/kind";
import { isRecord } from "../../widgets/core/state/strict-read";
import { WIDGET_STATE_MIME } from "../../widgets/core/state/widget-state";
import { ENTANGLED_STATE_CLASS } from "../../widgets/entangled/names";
import { STATE_SCRIPT_CLASS } from "../../widgets/explorer/names";
import { CHART_MODEL_NAME, LIVE_MODULE } from "../../widgets/explorer/live/names";
import { TOLERANCE_STATE_CLASS } from "../../widgets/tolerance/names";
import { TRAJECTORY_STATE_CLASS } from "../../widgets/trajectory/names";
import { explorerKind } from "../../widgets/explorer/kind";
import { kindOf, loadWidgetState } from "../../widgets/registry";

/** Classes of the script elements that carry a kind's state in its fragment. */
const STATE_CLASSES = new Set([STATE_SCRIPT_CLASS, TRAJECTORY_STATE_CLASS, TOLERANCE_STATE_CLASS, ENTANGLED_STATE_CLASS]);
const STATE_SCRIPT = /<script type="application\/json" class="([^"]+)">([\s\S]*?)<\/script>/g;
const WIDGET_VIEW_MIME = "application/vnd.jupyter.widget-view+json";

/** One widget found in a notebook: where it is, what kind, and how to load it. */
export interface NotebookWidget {
  /** e.g. "cell 4, output 1: tolerance map output" */
  readonly where: string;
  load(): { kind: WidgetKind; loaded: LoadedWidget };
}

/** The widgets of `text` when it is a notebook; undefined for anything else (a state file). */
export function notebookWidgets(text: string, source: string): NotebookWidget[] | undefined {
  let doc: unknown;
  try {
    doc = parseJsonText(text, source);
  } catch {
    return undefined;
  }
  if (!isRecord(doc) || !Array.isArray(doc.cells) || !isRecord(doc.metadata)) return undefined;
  const charts = liveCharts(doc.metadata);
  const found: NotebookWidget[] = [];
  const shownCharts = new Set<string>();
  const chart = (id: string, where: string): NotebookWidget => ({
    where: `${where}live chart (saved widget state, model ${id})`,
    // The explorer's reader finds the chart's state in the notebook's widget state by its number.
    load: () => ({ kind: explorerKind, loaded: explorerKind.load(text, source, { widget: charts.indexOf(id) + 1 }) }),
  });
  doc.cells.forEach((cell, i) => {
    const outputs = isRecord(cell) && Array.isArray(cell.outputs) ? cell.outputs : [];
    outputs.forEach((output, j) => {
      const data = isRecord(output) && isRecord(output.data) ? output.data : {};
      const where = `cell ${i + 1}, output ${j + 1}: `;
      const view = data[WIDGET_VIEW_MIME];
      if (isRecord(view) && typeof view.model_id === "string" && charts.includes(view.model_id) && !shownCharts.has(view.model_id)) {
        shownCharts.add(view.model_id);
        found.push(chart(view.model_id, where));
        return;
      }
      const html = data["text/html"];
      const htmlText = typeof html === "string" ? html : Array.isArray(html) ? html.join("") : "";
      for (const [, cls, json] of htmlText.matchAll(STATE_SCRIPT)) {
        if (!STATE_CLASSES.has(cls)) continue;
        const path = `${source}.cells[${i}].outputs[${j}].data["text/html"] (script.${cls})`;
        const state = parseJsonText(json, path);
        found.push({ where: `${where}${kindOf(state).name} output`, load: () => loadWidgetState(state, path) });
      }
    });
  });
  for (const id of charts) if (!shownCharts.has(id)) found.push(chart(id, ""));
  return found;
}

/** The widget `which` (1-based) of those found; an error lists them when the choice is missing or wrong. */
export function pickNotebookWidget(found: readonly NotebookWidget[], source: string, which: number | undefined): NotebookWidget {
  const list = found.map((w, k) => `${k + 1}: ${w.where}`).join("; ");
  if (found.length === 0) {
    throw new QuietframeError({
      path: source,
      problem: "holds no quietframe widget: no widget output with its state and no live chart in the saved widget state",
      allowed: "a notebook saved after its quietframe widgets were shown (a live chart's state is saved with the notebook's widget state)",
    });
  }
  if (which === undefined) {
    if (found.length === 1) return found[0];
    throw new QuietframeError({ path: source, value: found.length, problem: `holds ${found.length} quietframe widgets (${list})`, allowed: `one of them by number, --widget 1 to ${found.length}` });
  }
  if (!Number.isInteger(which) || which < 1 || which > found.length) {
    throw new QuietframeError({ path: "--widget", value: which, problem: `is not the number of a widget in ${source} (${list})`, allowed: `1 to ${found.length}` });
  }
  return found[which - 1];
}

/** Ids of the live chart models in a notebook's saved widget state, in the order it lists them. */
function liveCharts(metadata: Record<string, unknown>): string[] {
  const widgets = metadata.widgets;
  const saved = isRecord(widgets) ? widgets[WIDGET_STATE_MIME] : undefined;
  const models = isRecord(saved) && isRecord(saved.state) ? saved.state : {};
  return Object.keys(models).filter((id) => {
    const m = models[id];
    return isRecord(m) && m.model_module === LIVE_MODULE && m.model_name === CHART_MODEL_NAME;
  });
}
