/** The tolerance map as a widget kind (see core/kind.ts): the registry's entry for it. */
import type { LoadedWidget, WidgetKind } from "../core/kind";
import { isRecord } from "../core/state/strict-read";
import { toleranceView } from "./browser/view";
import { toleranceFragment, tolerancePageDocument } from "./fragment";
import { toleranceHeatmapSpec } from "./heatmap-spec";
import { loadToleranceState, TOLERANCE_STATE_FORMAT, type ToleranceWidgetState } from "./model";

export const toleranceKind: WidgetKind<LoadedWidget<ToleranceWidgetState>> = {
  name: "tolerance",
  stateFormat: TOLERANCE_STATE_FORMAT,
  recognises: (value) => isRecord(value) && value.format === TOLERANCE_STATE_FORMAT,
  load(input) {
    // A map carries its data: nothing is recomputed, so there is no fingerprint to compare.
    const state = loadToleranceState(typeof input === "string" ? input : JSON.stringify(input));
    return { state, warnings: [], cautions: [] };
  },
  figure: ({ state }) => ({ spec: toleranceHeatmapSpec(state) }),
  // A map is saved as its bare state, as the fragment carries it.
  stateText: ({ state }) => JSON.stringify(state),
  fragment: ({ state }, parts) => toleranceFragment(state, parts),
  page: ({ state }, parts) => tolerancePageDocument(state, parts),
  view: toleranceView,
};
