/** The trajectory widget's browser side for the runtime. */
import type { WidgetView } from "../../core/kind";
import { bootNew, releaseWithin } from "../../core/browser/boot";
import { TRAJECTORY_CLASS, TRAJECTORY_STATE_CLASS } from "../names";
import { injectTrajectoryStyles, TrajectoryWidget } from "./trajectory-view";

const live: TrajectoryWidget[] = [];

export const trajectoryView: WidgetView = {
  className: TRAJECTORY_CLASS,
  stateScriptClass: TRAJECTORY_STATE_CLASS,
  boot(root) {
    injectTrajectoryStyles(document);
    return bootNew(root, TRAJECTORY_CLASS, live, (element) => new TrajectoryWidget(element));
  },
  live: () => [...live],
  release: (slot) => releaseWithin(live, slot),
  exposeAs: { window: "quietframeTrajectoryWidgets" },
};
