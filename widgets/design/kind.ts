/** The design widget as a widget kind (see core/kind.ts): the registry's entry for it. */
import type { LoadedWidget, WidgetKind } from "../core/kind";
import { designView } from "./browser/view";
import { designCautions } from "./cautions";
import { designCsv } from "./csv";
import { designUncheckedFields, isDesignInput, loadDesignState } from "./document";
import { DESIGN_STATE_FORMAT, type DesignState } from "./format";
import { designFragment, designPageDocument } from "./fragment";
import { designFigureSpec } from "./specs";

export const designKind: WidgetKind<LoadedWidget<DesignState>> = {
  name: "design",
  stateFormat: DESIGN_STATE_FORMAT,
  recognises: isDesignInput,
  load(input, source) {
    // The question is computed again (its seeds make that exact); the state keeps the stored fingerprint, so a page can tell a mismatch.
    const { state, recomputedFingerprint, path } = loadDesignState(input, source);
    return {
      state,
      fingerprint: { stored: state.fingerprint, recomputed: recomputedFingerprint, writtenBy: state.quietframe },
      unchecked: designUncheckedFields(state, path),
      warnings: [],
      cautions: designCautions(state),
    };
  },
  figure: ({ state }) => ({ spec: designFigureSpec(state.answer), csv: designCsv(state.answer) }),
  // The fragment carries the bare state; the view reads it (and documents) with the same reader.
  stateText: ({ state }) => JSON.stringify(state),
  fragment: ({ state }, parts) => designFragment(state, parts),
  page: ({ state }, parts) => designPageDocument(state, parts),
  view: designView,
};
