/** Curves as float64 bytes on the widget protocol, and back. */
import type { BudgetTable } from "../../../src/index";

/**
 * How the curves travel between kernel and front-end: each curve's values are the bytes of a
 * Float64Array (little-endian, the byte order of every platform Node and browsers run on),
 * sent as binary buffers of the widget protocol instead of JSON numbers. That keeps every
 * bit (JSON has no Infinity and would round-trip NaN as null) and is about a third of the size.
 */
export interface WireColumn {
  id: string;
  label: string;
  /** Float64 values, one per frequency. */
  values: Uint8Array;
}

export interface WireCurves {
  spectral_density: "amplitude" | "power";
  /** Unit of every column, e.g. "m/√Hz". */
  unit: string;
  /** Hz, Float64. */
  frequencies: Uint8Array;
  columns: WireColumn[];
}

/** The table as wire state (the bytes are shared with the table, not copied). */
export function curvesToWire(table: BudgetTable): WireCurves {
  return {
    spectral_density: table.spectralDensity,
    unit: table.unit,
    frequencies: float64Bytes(table.frequencies),
    columns: table.columns.map((c) => ({ id: c.id, label: c.label, values: float64Bytes(c.values) })),
  };
}

/** Bytes as received (Uint8Array, DataView or ArrayBuffer, any alignment) back into a table. */
export function curvesFromWire(wire: {
  spectral_density: "amplitude" | "power";
  unit: string;
  frequencies: BinaryLike;
  columns: readonly { id: string; label: string; values: BinaryLike }[];
}): BudgetTable {
  const frequencies = float64FromBytes(wire.frequencies, "frequencies");
  return {
    spectralDensity: wire.spectral_density,
    unit: wire.unit,
    frequencies,
    columns: wire.columns.map((c) => {
      const values = float64FromBytes(c.values, `columns.${c.id}`);
      if (values.length !== frequencies.length) throw new Error(`curve ${c.id} has ${values.length} values for ${frequencies.length} frequencies`);
      return { id: c.id, label: c.label, values };
    }),
  };
}

export type BinaryLike = Uint8Array | DataView | ArrayBuffer;

function float64Bytes(values: Float64Array): Uint8Array {
  return new Uint8Array(values.buffer, values.byteOffset, values.byteLength);
}

function float64FromBytes(data: BinaryLike, what: string): Float64Array {
  const bytes = data instanceof ArrayBuffer ? new Uint8Array(data) : new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
  if (bytes.byteLength % 8 !== 0) throw new Error(`${what}: ${bytes.byteLength} bytes is not a whole number of float64 values`);
  // A copy: the received bytes may sit at an offset that a Float64Array cannot view.
  const out = new Float64Array(bytes.byteLength / 8);
  new Uint8Array(out.buffer).set(bytes);
  return out;
}
