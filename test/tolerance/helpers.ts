import { readFileSync } from "node:fs";
import { join } from "node:path";
import { expect } from "vitest";
import { QuietframeError } from "../../src/errors";
import type { SetupDescription } from "../../src/setup/format";

export function example(name: string): SetupDescription {
  return JSON.parse(readFileSync(join(__dirname, "..", "..", "examples", name), "utf8")) as SetupDescription;
}

/** True when both arrays hold the same bytes (NaN payloads, signed zeros and all). */
export function sameBits(a: Float64Array | Uint8Array, b: Float64Array | Uint8Array): boolean {
  const x = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  const y = new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  return x.length === y.length && x.every((v, i) => v === y[i]);
}

/** Index of the first cell whose bits differ, or -1. */
export function firstDifference(a: Float64Array, b: Float64Array): number {
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return i;
  return a.length === b.length ? -1 : Math.min(a.length, b.length);
}

/** The QuietframeError a promise rejects with. */
export async function rejection(p: Promise<unknown>): Promise<QuietframeError> {
  try {
    await p;
  } catch (e) {
    expect(e).toBeInstanceOf(QuietframeError);
    return e as QuietframeError;
  }
  throw new Error("expected a rejection with a QuietframeError");
}
