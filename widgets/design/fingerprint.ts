/** The design widget's fingerprint: SHA-256 over every number (and word) of an answer. */
import { seriesFingerprint, type FingerprintWriter } from "../core/state/series-fingerprint";
import type { DesignAnswer } from "./format";

/**
 * Fingerprint of an answer: its fields in sorted key order, each number as its exact IEEE-754
 * double (arrays as one series, "no value" as NaN, infinities as themselves), each text as a
 * labelled line. The answer computed in the kernel and the same answer read back from a page's
 * JSON give the same fingerprint; any changed number changes it.
 */
export function answerFingerprint(answer: DesignAnswer): string {
  return seriesFingerprint((w) => walk(w, "answer", answer));
}

function walk(w: FingerprintWriter, path: string, value: unknown): void {
  if (typeof value === "number" || isNumberWord(value)) {
    w.series(path, [numberOf(value)]);
  } else if (value === null || typeof value === "string" || typeof value === "boolean") {
    w.label(`${path} = ${JSON.stringify(value)}`);
  } else if (Array.isArray(value)) {
    if (value.length > 0 && value.every((v) => v === null || typeof v === "number" || isNumberWord(v))) w.series(path, value.map(numberOf));
    else {
      w.label(`${path} [${value.length}]`);
      value.forEach((v, i) => walk(w, `${path}[${i}]`, v));
    }
  } else if (typeof value === "object" && value !== undefined) {
    const record = value as Record<string, unknown>;
    for (const key of Object.keys(record).sort()) if (record[key] !== undefined) walk(w, `${path}.${key}`, record[key]);
  }
}

function isNumberWord(v: unknown): v is "Infinity" | "-Infinity" {
  return v === "Infinity" || v === "-Infinity";
}

// JSON writes −0 as 0, so a zero is hashed as +0: a page's copy must give the kernel's fingerprint.
function numberOf(v: unknown): number {
  if (v === null) return NaN;
  if (v === "Infinity") return Infinity;
  if (v === "-Infinity") return -Infinity;
  const x = v as number;
  return x === 0 ? 0 : x;
}
