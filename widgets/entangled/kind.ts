/** The entangled-light panel as a widget kind (see core/kind.ts): the registry's entry for it. */
import type { LoadedWidget, WidgetKind } from "../core/kind";
import { entangledView } from "./browser/view";
import { entangledCsv, entangledFingerprint } from "./csv";
import { entangledDocumentText, isEntangledInput } from "./document";
import { entangledFragment, entangledPageDocument } from "./fragment";
import { computeEntangled, ENTANGLED_STATE_FORMAT, readEntangledState, type EntangledComputation, type EntangledState } from "./model";
import { panelSpec } from "./specs";

export interface LoadedEntangled extends LoadedWidget<EntangledState> {
  readonly computation: EntangledComputation;
}

export const entangledKind: WidgetKind<LoadedEntangled> = {
  name: "entangled",
  stateFormat: ENTANGLED_STATE_FORMAT,
  recognises: isEntangledInput,
  load(input, source) {
    // The numbers are recomputed from the state and compared with the stored fingerprint (none in version-1 states).
    const { state, fingerprint, path } = readEntangledState(input, source);
    const computation = computeEntangled(state);
    return {
      state,
      computation,
      fingerprint: { stored: fingerprint, recomputed: entangledFingerprint(computation), writtenBy: state.quietframe },
      unchecked: [{ path: `${path}.title`, reason: "the panel's title, text only" }],
      warnings: [],
      cautions: [],
    };
  },
  figure: ({ state, computation }) => ({ spec: panelSpec(computation, state.title, state.bandwidth === null), csv: entangledCsv(computation) }),
  stateText: ({ state, computation }) => entangledDocumentText(state, computation),
  fragment: ({ state, computation }, parts) => entangledFragment(state, parts, computation),
  page: ({ state, computation }, parts) => entangledPageDocument(state, parts, computation),
  view: entangledView,
};
