/**
 * Typed arrays lent from one transfer solver to the next. A budget per trial (a search, a Monte
 * Carlo sample, a map cell) would otherwise allocate its solver's arrays each time, and an array
 * of more than a few values is allocated outside the JavaScript heap, which costs about as much
 * as solving a small model at tens of frequencies and burdens the garbage collector. A solver
 * takes a spare array when one is large enough and gives it back when done; one made while the
 * spares are taken gets its own. Whoever takes an array writes every value it reads, so what a
 * spare held before changes nothing.
 */

/** Spares kept of each kind: a block solver holds two arrays of each, its one-mode evaluator as many again. */
const KEPT = 4;

const spareFloats: Float64Array[] = [];
const spareInts: Int32Array[] = [];

function take<T extends Float64Array | Int32Array>(spares: T[], length: number, allocate: (length: number) => T): T {
  // The smallest spare that is large enough, so a small request leaves the large ones.
  let best = -1;
  for (let i = 0; i < spares.length; i++) {
    if (spares[i].length >= length && (best < 0 || spares[i].length < spares[best].length)) best = i;
  }
  if (best < 0) return allocate(length);
  const taken = spares[best];
  spares[best] = spares[spares.length - 1];
  spares.pop();
  return taken;
}

function giveBack<T extends Float64Array | Int32Array>(spares: T[], array: T): void {
  if (array.length === 0 || spares.includes(array)) return;
  if (spares.length < KEPT) {
    spares.push(array);
    return;
  }
  // Full: the new array replaces the smallest spare if it is larger.
  let smallest = 0;
  for (let i = 1; i < spares.length; i++) if (spares[i].length < spares[smallest].length) smallest = i;
  if (array.length > spares[smallest].length) spares[smallest] = array;
}

/** A Float64Array of at least `length` values (a spare, or a new one); its values are arbitrary. */
export function takeFloats(length: number): Float64Array {
  return take(spareFloats, length, (n) => new Float64Array(n));
}

/** An Int32Array of at least `length` values (a spare, or a new one); its values are arbitrary. */
export function takeInts(length: number): Int32Array {
  return take(spareInts, length, (n) => new Int32Array(n));
}

/** Gives arrays from takeFloats / takeInts back; their owner does not use them after. */
export function giveBackArrays(floats: Float64Array, ints: Int32Array): void {
  giveBack(spareFloats, floats);
  giveBack(spareInts, ints);
}
