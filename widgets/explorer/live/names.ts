/** Names of the live chart model and view on the widget protocol (module "quietframe-live"). */
import { QUIETFRAME_VERSION } from "../../../src/index";

/**
 * Names of quietframe's own widget model and view on the Jupyter widget protocol. Saved
 * notebooks record them, and a front-end loads the view's code by the module name, so they
 * never change without a new module version.
 */
export const LIVE_MODULE = "quietframe-live";
export const LIVE_MODULE_VERSION = QUIETFRAME_VERSION;
export const CHART_MODEL_NAME = "QuietframeChartModel";
export const CHART_VIEW_NAME = "QuietframeChartView";

/** Class on the view's root element; test harnesses and styles find the chart by it. */
export const CHART_VIEW_CLASS = "quietframe-live-chart";

/** Keys of the protocol itself: which module and classes make the chart model and its view. */
export function chartModelIdentity(): Record<string, unknown> {
  return {
    _model_module: LIVE_MODULE,
    _model_module_version: LIVE_MODULE_VERSION,
    _model_name: CHART_MODEL_NAME,
    _view_module: LIVE_MODULE,
    _view_module_version: LIVE_MODULE_VERSION,
    _view_name: CHART_VIEW_NAME,
    _view_count: null,
    _dom_classes: [],
    tabbable: null,
    tooltip: null,
  };
}
