/** Names shared by the entangled panel's HTML writer (Node) and its browser view. */
export const ENTANGLED_CLASS = "quietframe-entangled";
export const ENTANGLED_STATE_CLASS = "quietframe-entangled-state";
/** Attributes carrying the current numbers in shortest round-trip form (for tests and tools). */
export const ENTANGLED_NUMBER_ATTRIBUTES = {
  duanSum: "data-duan-sum",
  eprX: "data-epr-x",
  eprP: "data-epr-p",
  logNegativity: "data-log-negativity",
  conditionalVariance: "data-conditional-variance",
} as const;
