/** Names shared by the tolerance widget's HTML writer (Node) and its browser view. */
export const TOLERANCE_CLASS = "quietframe-tolerance";
export const TOLERANCE_STATE_CLASS = "quietframe-tolerance-state";
/** Set on the widget element to "i,j" once a cell's explorer is shown (read by tests and pages). */
export const SELECTED_CELL_ATTRIBUTE = "data-quietframe-cell";
