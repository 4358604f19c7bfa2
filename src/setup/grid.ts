/**
 * The frequency grid of a set-up: read from its JSON with units, checked, and laid out
 * log-spaced with exact bounds. Every frequency-domain result is evaluated on one.
 */
import { QuietframeError } from "../errors";
import { parseQuantity } from "../units";
import { log10, pow } from "../numeric/portable-math";

/** A log-spaced frequency grid, bounds in Hz. */
export interface FrequencyGridSpec {
  readonly from: number;
  readonly to: number;
  readonly points: number;
}

export const MAX_GRID_POINTS = 100_000;
export const DEFAULT_GRID_POINTS = 400;

/** Parses {from: "10 Hz", to: "10 kHz", points: 400} and checks it is a usable grid. */
export function parseGrid(raw: unknown, path: string): FrequencyGridSpec {
  if (typeof raw !== "object" || raw === null || Array.isArray(raw)) {
    throw new QuietframeError({ path, value: raw, problem: "must be an object", allowed: '{"from": "10 Hz", "to": "10 kHz", "points": 400}' });
  }
  const obj = raw as Record<string, unknown>;
  for (const key of Object.keys(obj)) {
    if (!["from", "to", "points"].includes(key)) {
      throw new QuietframeError({ path: `${path}.${key}`, problem: "is not a field of a grid", allowed: "from, to, points" });
    }
  }
  const from = parseQuantity(obj.from, "frequency", `${path}.from`);
  const to = parseQuantity(obj.to, "frequency", `${path}.to`);
  const points = obj.points === undefined ? DEFAULT_GRID_POINTS : obj.points;
  return checkGrid({ from, to, points: points as number }, path, obj);
}

/** Checks bounds and point count of a grid given in SI numbers. */
export function checkGrid(
  spec: { from: number; to: number; points: number },
  path: string,
  raw?: Record<string, unknown>,
  fieldPath: (field: "from" | "to" | "points") => string = (field) => `${path}.${field}`,
): FrequencyGridSpec {
  const shown = (k: "from" | "to" | "points"): unknown => (raw ? raw[k] : spec[k]);
  if (!(spec.from > 0) || !Number.isFinite(spec.from)) {
    throw new QuietframeError({ path: fieldPath("from"), value: shown("from"), problem: "must be a positive frequency", allowed: "from > 0 Hz" });
  }
  if (!(spec.to > spec.from) || !Number.isFinite(spec.to)) {
    throw new QuietframeError({ path: fieldPath("to"), value: shown("to"), problem: `must be above from (${spec.from} Hz)`, allowed: "to > from" });
  }
  if (!Number.isInteger(spec.points) || spec.points < 2 || spec.points > MAX_GRID_POINTS) {
    throw new QuietframeError({ path: fieldPath("points"), value: shown("points"), problem: "is not a usable number of points", allowed: `an integer from 2 to ${MAX_GRID_POINTS}` });
  }
  return { from: spec.from, to: spec.to, points: spec.points };
}

/** Log-spaced frequencies in Hz, first and last exactly at the bounds. A fresh array on every call. */
export function logGrid(spec: FrequencyGridSpec): Float64Array {
  // The portable pow costs about 90 ns a point, so the last grids laid out are kept and copied:
  // the same spec gives the same bits either way.
  const kept = keptGrids.find((k) => k.from === spec.from && k.to === spec.to && k.points === spec.points);
  if (kept) return kept.frequencies.slice();
  const f = layOutGrid(spec);
  keptGrids.unshift({ from: spec.from, to: spec.to, points: spec.points, frequencies: f.slice() });
  if (keptGrids.length > KEPT_GRIDS) keptGrids.pop();
  return f;
}

/** How many recent grids logGrid keeps (a figure's grid, a curve's grid and a few more). */
const KEPT_GRIDS = 4;
const keptGrids: { from: number; to: number; points: number; frequencies: Float64Array }[] = [];

function layOutGrid(spec: FrequencyGridSpec): Float64Array {
  const f = new Float64Array(spec.points);
  // Powers of ten in log10 keep decade points exact (pow(10, 1) === 10).
  const a = log10(spec.from);
  const b = log10(spec.to);
  for (let i = 0; i < spec.points; i++) f[i] = pow(10, a + ((b - a) * i) / (spec.points - 1));
  f[0] = spec.from;
  f[spec.points - 1] = spec.to;
  return f;
}
