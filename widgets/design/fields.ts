/** Field checks of the design widget's strict reader: each returns a fresh value or names the field it refuses. */
import { QuietframeError } from "../../src/index";
import { expectArray, expectRecord, rejectUnknownKeys } from "../core/state/strict-read";
import type { PlainNumber } from "./format";

/** A record with exactly the known keys (each may be absent); `what` names it in messages. */
export function record(v: unknown, path: string, keys: readonly string[], what: string): Record<string, unknown> {
  const o = expectRecord(v, path, `${what} (an object with ${keys.join(", ")})`);
  rejectUnknownKeys(o, keys, path, what);
  return o;
}

export function finite(v: unknown, path: string): number {
  if (typeof v !== "number" || !Number.isFinite(v)) throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "must be a finite number", allowed: "a JSON number" });
  return v;
}

export function whole(v: unknown, path: string, min: number, max: number): number {
  if (typeof v !== "number" || !Number.isInteger(v) || v < min || v > max) {
    throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "is not a usable whole number", allowed: `an integer from ${min} to ${max}` });
  }
  return v;
}

/** A number of an answer: finite, null (no value) or "Infinity" / "-Infinity". */
export function plain(v: unknown, path: string): PlainNumber {
  if (v === null || v === "Infinity" || v === "-Infinity" || (typeof v === "number" && Number.isFinite(v))) return v;
  throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "is not a number of an answer", allowed: 'a finite number, null (no value), "Infinity" or "-Infinity"' });
}

export function plainList(v: unknown, path: string, length?: number): PlainNumber[] {
  const list = expectArray(v, path, "an array of numbers (null: no value)");
  if (length !== undefined && list.length !== length) throw new QuietframeError({ path, value: `${list.length} entries`, problem: "does not fit the other series", allowed: `${length} entries` });
  return list.map((x, i) => plain(x, `${path}[${i}]`));
}

export function finiteList(v: unknown, path: string): number[] {
  return expectArray(v, path, "an array of finite numbers").map((x, i) => finite(x, `${path}[${i}]`));
}

export function text(v: unknown, path: string, max = 10_000): string {
  if (typeof v !== "string" || v.length > max) throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "must be text", allowed: `text of at most ${max} characters` });
  return v;
}

export function textOrNull(v: unknown, path: string): string | null {
  return v === null ? null : text(v, path);
}

export function flag(v: unknown, path: string): boolean {
  if (typeof v !== "boolean") throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "must be true or false", allowed: "true or false" });
  return v;
}

export function word<W extends string>(v: unknown, words: readonly W[], path: string): W {
  if (typeof v !== "string" || !(words as readonly string[]).includes(v)) {
    throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "is not one of the choices", allowed: words.join(", ") });
  }
  return v as W;
}

/** A pair [low, high] of finite numbers. */
export function range(v: unknown, path: string): [number, number] {
  const list = finiteList(v, path);
  if (list.length !== 2) throw new QuietframeError({ path, value: v, problem: "is not a range", allowed: "[low, high]" });
  return [list[0], list[1]];
}
