/**
 * quietframe's widget module for Jupyter front-ends ("quietframe-live"): the chart model and
 * its view. A widget manager loads it by module name (see scripts/build-live-frontend.js for
 * the ES module and the require.js module of the classic notebook).
 */
export { QuietframeChartModel } from "./chart-model";
export { QuietframeChartView } from "./chart-view";
export { LIVE_MODULE, LIVE_MODULE_VERSION as version } from "../live/names";
