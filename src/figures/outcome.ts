/**
 * What evaluating a figure of merit at one setting gives: a value, or a status that says why
 * there is none. Tolerance-map cells and design searches (rankings, solves, optimizations,
 * Monte Carlo samples) share these codes, so a set-up is refused the same way everywhere.
 */

/** Status codes of an evaluated figure (a tolerance map stores them per cell). */
export const CellStatus = {
  /** The figure was computed. */
  ok: 0,
  /** The set-up has a growing mode: its spectra mean nothing. */
  unstable: 1,
  /**
   * The set-up is rejected (a value outside its range, a blind readout, …), its stationary
   * state breaks the uncertainty relation (the model is outside its validity range), or the
   * figure is undefined there.
   */
  invalid: 2,
} as const;
export type CellStatusCode = (typeof CellStatus)[keyof typeof CellStatus];

/** Value and status of one setting; a failure carries the message any caller gets for that set-up. */
export interface FigureOutcome {
  /** NaN exactly when status is not ok. */
  readonly value: number;
  readonly status: CellStatusCode;
  readonly message?: string;
}
