/**
 * Reusable zeroed work arrays for routines whose work arrays never outlive the call. A typed
 * array over more than a few numbers is otherwise an allocation of its own (and garbage to
 * collect), and searches call these routines once per value set. Each routine owns its
 * WorkArray, so no two routines share numbers; none of them calls itself.
 */

/** Work arrays up to this many numbers are kept between calls; larger ones are allocated each time. */
const MAX_KEPT = 1 << 16;

export class WorkArray {
  private kept: Float64Array<ArrayBuffer> = new Float64Array(0);

  /** `length` zeros, valid until this WorkArray's next `zeros`. */
  zeros(length: number): Float64Array<ArrayBuffer> {
    if (length > MAX_KEPT) return new Float64Array(length);
    if (this.kept.length < length) {
      this.kept = new Float64Array(length);
      return this.kept;
    }
    this.kept.fill(0, 0, length);
    return this.kept.length === length ? this.kept : this.kept.subarray(0, length);
  }
}
