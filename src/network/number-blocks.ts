/**
 * Zeroed Float64Arrays cut from shared blocks, for the many small arrays one assembly makes
 * (linear forms, the model's matrices): a typed array over more than a few numbers is
 * otherwise an allocation of its own, and searches assemble a model per value set. A block is
 * never reused, so every cut starts as zeros and no two cuts overlap; an array that outlives
 * the assembly keeps its block alive (at most BLOCK_LENGTH numbers). Nothing may transfer or
 * detach such an array's buffer: it holds other arrays too.
 */

const BLOCK_LENGTH = 8192;
/** Longer arrays get a buffer of their own. */
const LONGEST_CUT = BLOCK_LENGTH / 8;

let block = new ArrayBuffer(8 * BLOCK_LENGTH);
let used = 0;

/** `length` zeros: a cut of the current block, or an array of its own when long. */
export function zeros(length: number): Float64Array {
  if (length > LONGEST_CUT) return new Float64Array(length);
  if (used + length > BLOCK_LENGTH) {
    block = new ArrayBuffer(8 * BLOCK_LENGTH);
    used = 0;
  }
  // A view by constructor: subarray would look up a species constructor on every call.
  const cut = new Float64Array(block, 8 * used, length);
  used += length;
  return cut;
}
