/**
 * Raised by the LU factorisations when elimination meets a pivot that is exactly zero
 * (or not finite), i.e. no row exchange can make the current column usable.
 */
export class SingularMatrixError extends Error {
  /** Zero-based elimination step at which the pivot vanished. */
  readonly pivotIndex: number;

  constructor(pivotIndex: number, detail = "pivot is exactly zero") {
    super(`matrix is singular at pivot ${pivotIndex} (${detail})`);
    this.name = "SingularMatrixError";
    this.pivotIndex = pivotIndex;
  }
}
