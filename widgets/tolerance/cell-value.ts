/** A tolerance map's figure as JSON stores it (JSON has no NaN or infinity), and back. */

/** A figure in JSON: a number, null (no value: see the status) or an infinite value as text. */
export type CellValue = number | null | "Infinity" | "-Infinity";

/** Encodes a figure for JSON. */
export function encodeValue(v: number): CellValue {
  if (Number.isNaN(v)) return null;
  if (v === Infinity) return "Infinity";
  if (v === -Infinity) return "-Infinity";
  return v;
}

export function decodeValue(v: CellValue): number {
  if (v === null) return NaN;
  if (v === "Infinity") return Infinity;
  if (v === "-Infinity") return -Infinity;
  return v;
}
