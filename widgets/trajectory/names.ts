/** Names shared by the trajectory widget's HTML writer (Node) and its browser view. */
export const TRAJECTORY_CLASS = "quietframe-trajectory";
export const TRAJECTORY_STATE_CLASS = "quietframe-trajectory-state";
/** Attributes the live view keeps current (read by tests and tools). */
export const TRAJECTORY_ATTRIBUTES = {
  /** "0" … "1": fraction of the planned steps done by the run on screen or in progress. */
  progress: "data-progress",
  /** Steps taken by the run whose curves are shown. */
  stepsTaken: "data-steps-taken",
  /** "true" while a run is going. */
  running: "data-running",
  /** "true" when the curves shown are those of a stopped run. */
  stopped: "data-stopped",
} as const;
