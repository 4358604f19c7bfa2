/**
 * Binary buffers in widget state (widget message protocol 2, "Instantiating a widget
 * object"): every binary value anywhere in the state travels as a separate buffer, with its
 * path in `buffer_paths`; in the JSON a value in a list becomes null and a value under a
 * key is left out. putBuffers puts them back on the receiving side.
 */
import { RESERVED_KEYS } from "../state/strict-read";
import { clip } from "./bounded-text";

export type BufferPath = (string | number)[];

export interface SplitState {
  state: Record<string, unknown>;
  buffer_paths: BufferPath[];
  buffers: Uint8Array[];
}

export function isBinary(v: unknown): v is ArrayBuffer | ArrayBufferView {
  return v instanceof ArrayBuffer || ArrayBuffer.isView(v);
}

/** The bytes of a binary value, without copying. */
export function bytesOf(v: ArrayBuffer | ArrayBufferView): Uint8Array {
  return v instanceof ArrayBuffer ? new Uint8Array(v) : new Uint8Array(v.buffer, v.byteOffset, v.byteLength);
}

/** Splits binary values out of a state (the input is not changed). */
export function removeBuffers(state: Record<string, unknown>): SplitState {
  const buffer_paths: BufferPath[] = [];
  const buffers: Uint8Array[] = [];
  const walk = (value: unknown, path: BufferPath): unknown => {
    if (Array.isArray(value)) {
      return value.map((item, i) => {
        if (isBinary(item)) {
          buffer_paths.push([...path, i]);
          buffers.push(bytesOf(item));
          return null;
        }
        return walk(item, [...path, i]);
      });
    }
    if (typeof value === "object" && value !== null && !isBinary(value)) {
      const out: Record<string, unknown> = {};
      for (const [k, item] of Object.entries(value)) {
        if (isBinary(item)) {
          buffer_paths.push([...path, k]);
          buffers.push(bytesOf(item));
        } else out[k] = walk(item, [...path, k]);
      }
      return out;
    }
    return value;
  };
  return { state: walk(state, []) as Record<string, unknown>, buffer_paths, buffers };
}

/**
 * Checks `buffer_paths` as a front-end sent it; returns a reason when it is unusable. A path
 * through `__proto__`, `constructor` or `prototype` is refused (the state-file readers refuse
 * the same keys): putting a buffer there would write onto a prototype shared by every object.
 */
export function checkBufferPaths(paths: unknown, count: number): string | undefined {
  if (paths === undefined) return count === 0 ? undefined : `${count} buffers came without buffer_paths`;
  if (!Array.isArray(paths)) return "buffer_paths must be a list of paths";
  if (paths.length !== count) return `buffer_paths names ${paths.length} buffers but ${count} arrived`;
  for (const [i, p] of paths.entries()) {
    if (!Array.isArray(p) || p.length === 0 || !p.every((s) => typeof s === "string" || (Number.isInteger(s) && s >= 0))) {
      return `each buffer path must be a non-empty list of keys and indices; buffer_paths[${i}] is not`;
    }
    const reserved = p.find((step) => typeof step === "string" && RESERVED_KEYS.has(step));
    if (reserved !== undefined) return `buffer_paths[${i}] goes through "${reserved}", a name reserved by JavaScript objects; allowed: keys of the model's state`;
  }
  return undefined;
}

/** Puts buffers back at their paths (mutates `state`); call checkBufferPaths first. */
export function putBuffers(state: Record<string, unknown>, paths: BufferPath[], buffers: readonly Uint8Array[]): void {
  paths.forEach((path, i) => {
    let node: Record<string | number, unknown> = state as Record<string | number, unknown>;
    for (const step of path.slice(0, -1)) {
      // Own keys only: a step must never lead onto a prototype.
      const next = Object.prototype.hasOwnProperty.call(node, step) ? node[step] : undefined;
      if (typeof next !== "object" || next === null) throw new Error(`buffer path ${clip(JSON.stringify(path))} does not lead into the state`);
      node = next as Record<string | number, unknown>;
    }
    const last = path[path.length - 1];
    if (typeof last === "string" && RESERVED_KEYS.has(last)) throw new Error(`buffer path ends in "${last}", a name reserved by JavaScript objects`);
    Object.defineProperty(node, last, { value: buffers[i], enumerable: true, writable: true, configurable: true });
  });
}
