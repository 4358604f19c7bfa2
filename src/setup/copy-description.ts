/**
 * A deep copy of a set-up description, the same as structuredClone gives, made faster for
 * the JSON-shaped data a description is (plain objects, dense arrays, strings, numbers,
 * booleans, null). Anything else — another prototype, a sparse array, a function, a
 * bigint, a shared or cyclic reference — is handed to structuredClone whole, so the result
 * (or the error) is always structuredClone's.
 */

/** Nesting deeper than any description, where the plain copy gives up (cycles end here too). */
const MAX_DEPTH = 64;

/** structuredClone(value) for a description, without its serialisation cost on plain data. */
export function copyDescription<T>(value: T): T {
  const seen = new Set<object>();
  const copy = plainCopy(value, 0, seen);
  return copy === NOT_PLAIN ? structuredClone(value) : (copy as T);
}

const NOT_PLAIN = Symbol("not plain");

function plainCopy(value: unknown, depth: number, seen: Set<object>): unknown {
  if (value === null) return null;
  const type = typeof value;
  if (type === "string" || type === "number" || type === "boolean" || type === "undefined") return value;
  if (type !== "object" || depth > MAX_DEPTH) return NOT_PLAIN;
  const object = value as object;
  // structuredClone keeps one copy of an object reached twice; the plain copy would make two.
  if (seen.has(object)) return NOT_PLAIN;
  seen.add(object);
  if (Array.isArray(object)) {
    if (Object.getPrototypeOf(object) !== Array.prototype || Object.keys(object).length !== object.length) return NOT_PLAIN;
    const out: unknown[] = new Array(object.length);
    for (let i = 0; i < object.length; i++) {
      const item = plainCopy(object[i], depth + 1, seen);
      if (item === NOT_PLAIN) return NOT_PLAIN;
      out[i] = item;
    }
    return out;
  }
  const proto = Object.getPrototypeOf(object);
  if (proto !== Object.prototype && proto !== null) return NOT_PLAIN;
  const out: Record<string, unknown> = {};
  // Own enumerable string keys, read with [[Get]], in order: what structuredClone copies.
  for (const key of Object.keys(object)) {
    // An own "__proto__" key (JSON.parse makes one) would set the copy's prototype here.
    if (key === "__proto__") return NOT_PLAIN;
    const item = plainCopy((object as Record<string, unknown>)[key], depth + 1, seen);
    if (item === NOT_PLAIN) return NOT_PLAIN;
    out[key] = item;
  }
  return out;
}
