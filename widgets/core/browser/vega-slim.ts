/**
 * The part of Vega a budget chart uses. The bundle maps "vega" here (see
 * scripts/build-runtime.js), so neither our code nor Vega-Lite pulls in the geo, force,
 * hierarchy, label, regression, voronoi, word-cloud and crossfilter transforms.
 * Missing exports fail the build; a missing transform fails the browser tests.
 */
import { extend } from "vega-util";
import { transforms } from "vega-dataflow";
import * as tx from "vega-transforms";
import * as vtx from "vega-view-transforms";
import * as encode from "vega-encode";

export * from "vega-util";
export { changeset, transforms } from "vega-dataflow";
export { View } from "vega-view";
export { parse } from "vega-parser";

extend(transforms, tx, vtx, encode);
