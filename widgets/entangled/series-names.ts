/** Names of the entangled panel's curves: chart legends, CSV headers and fingerprint labels use them. */
export const SPECTRUM_SERIES = { conditional: "Var(X1 | X2), arm 1 given arm 2", epr: "Var(X1 − X2)" } as const;
export const ELLIPSE_SERIES = { vacuum: "vacuum", arm1: "arm 1 alone", arm2: "arm 2 alone", conditional: "arm 1 given X2 of arm 2" } as const;
