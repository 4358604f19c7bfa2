/** Names shared by the design widget's HTML writer (Node) and its browser view. */
export const DESIGN_CLASS = "quietframe-design";
export const DESIGN_STATE_CLASS = "quietframe-design-state";
/** Set on the widget element once the charts are drawn: the answer's fingerprint as the page computed it. */
export const DESIGN_DRAWN_ATTRIBUTE = "data-quietframe-drawn";
/** Set while the page draws an optimization's best so far ("best of 2 of 4 starts (provisional)"); removed when a whole answer is drawn. */
export const DESIGN_PROVISIONAL_ATTRIBUTE = "data-quietframe-provisional";
