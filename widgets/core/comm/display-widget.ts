/**
 * Displays a widget model in a notebook: the widget-view bundle with a kernel-free fallback
 * beside it.
 */
import { QuietframeError } from "../../../src/index";
import { displayBundle, type DisplayResult, type MimeBundle } from "../notebook/display";
import type { WidgetModel } from "./widget-model";

/**
 * Shows a widget model in the cell's output: display_data with the widget-view mime type
 * (messages.md, "Displaying widgets": model_id plus the protocol version), a text/plain
 * line, and optionally the kernel-free output (text/html, image/png, …) that front-ends
 * without a widget manager show instead.
 */

export const WIDGET_VIEW_MIME = "application/vnd.jupyter.widget-view+json";

export function widgetViewBundle(model: WidgetModel, fallback: MimeBundle = {}): MimeBundle {
  if (model.isClosed) throw new QuietframeError({ path: "model", value: model.id, problem: "is closed and cannot be displayed", allowed: "an open widget model" });
  const bundle: MimeBundle = { ...fallback };
  bundle[WIDGET_VIEW_MIME] = { model_id: model.id, version_major: 2, version_minor: 1 };
  if (typeof bundle["text/plain"] !== "string") bundle["text/plain"] = `${String(model.get("_model_name")).replace(/Model$/, "")}(model_id=${model.id})`;
  return bundle;
}

export function displayWidget(model: WidgetModel, fallback?: MimeBundle): DisplayResult {
  return displayBundle(widgetViewBundle(model, fallback));
}
