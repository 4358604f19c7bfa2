/** The trajectory widget as a widget kind (see core/kind.ts): the registry's entry for it. */
import type { LoadedWidget, WidgetKind } from "../core/kind";
import { trajectoryView } from "./browser/view";
import { trajectoryCsv } from "./csv";
import { isTrajectoryInput, loadTrajectoryState, trajectoryDocumentText, trajectoryUncheckedFields } from "./document";
import { trajectoryFigureSpec } from "./specs";
import { TRAJECTORY_STATE_FORMAT, type TrajectoryState } from "./format";
import { trajectoryFragment, trajectoryPageDocument } from "./fragment";
import type { TrajectoryComputation } from "./model";

export interface LoadedTrajectory extends LoadedWidget<TrajectoryState> {
  readonly computation: TrajectoryComputation;
}

export const trajectoryKind: WidgetKind<LoadedTrajectory> = {
  name: "trajectory",
  stateFormat: TRAJECTORY_STATE_FORMAT,
  recognises: isTrajectoryInput,
  load(input, source) {
    // The simulation runs again from the state (seed, step, duration, stored points, stop).
    const { state, computation, path } = loadTrajectoryState(input, source);
    return {
      state,
      computation,
      fingerprint: { stored: state.fingerprint, recomputed: computation.fingerprint, writtenBy: state.quietframe },
      unchecked: trajectoryUncheckedFields(state, path),
      warnings: [],
      cautions: computation.cautions,
    };
  },
  figure: ({ state, computation }) => ({ spec: trajectoryFigureSpec(computation, state), csv: trajectoryCsv(computation.result, state.joint) }),
  stateText: ({ state }) => trajectoryDocumentText(state),
  fragment: ({ state, computation }, parts) => trajectoryFragment(state, computation, parts),
  page: ({ state, computation }, parts) => trajectoryPageDocument(state, computation, parts),
  view: trajectoryView,
};
