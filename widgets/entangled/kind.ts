/** The entangled-light panel as a widget kind (see core/kind.ts): the registry's entry for it. */
import type { LoadedWidget, WidgetKind } from "../core/kind";
import { isRecord } from "../core/state/strict-read";
import { entangledView } from "./browser/view";
import { entangledFragment, entangledPageDocument } from "./fragment";
import { computeEntangled, ENTANGLED_STATE_FORMAT, loadEntangledState, type EntangledComputation, type EntangledState } from "./model";
import { panelSpec } from "./specs";

export interface LoadedEntangled extends LoadedWidget<EntangledState> {
  readonly computation: EntangledComputation;
}

export const entangledKind: WidgetKind<LoadedEntangled> = {
  name: "entangled",
  stateFormat: ENTANGLED_STATE_FORMAT,
  recognises: (value) => isRecord(value) && value.format === ENTANGLED_STATE_FORMAT,
  load(input, source) {
    // The panel's state holds no fingerprint: its numbers are recomputed and shown, not compared.
    const state = loadEntangledState(input, source);
    return { state, computation: computeEntangled(state), warnings: [], cautions: [] };
  },
  figure: ({ state, computation }) => ({ spec: panelSpec(computation, state.title, state.bandwidth === null) }),
  fragment: ({ state, computation }, parts) => entangledFragment(state, parts, computation),
  page: ({ state, computation }, parts) => entangledPageDocument(state, parts, computation),
  view: entangledView,
};
