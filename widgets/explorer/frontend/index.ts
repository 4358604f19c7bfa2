/**
 * quietframe's widget module for Jupyter front-ends ("quietframe-live"): the chart model and
 * its view. A widget manager loads it by module name (see scripts/build-live-frontend.js for
 * the ES module and the require.js module of the classic notebook).
 */
import { changeset, parse, View } from "vega";
import { compile } from "vega-lite";
import { provideVega } from "../../core/browser/vega";

// The chart view draws with this bundle's Vega (the trimmed one of core/browser/vega-slim.ts).
provideVega({ parse, View, changeset, compile });

export { QuietframeChartModel } from "./chart-model";
export { QuietframeChartView } from "./chart-view";
export { LIVE_MODULE, LIVE_MODULE_VERSION as version } from "../live/names";
