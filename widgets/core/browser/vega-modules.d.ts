// Vega's sub-packages ship no types; only vega-slim.ts imports them, and re-exports them
// under the names the "vega" package types describe.
declare module "vega-dataflow";
declare module "vega-transforms";
declare module "vega-view-transforms";
declare module "vega-encode";
declare module "vega-view";
declare module "vega-parser";
