/** Every number of a tolerance map, as the labelled series its CSV and its fingerprint are written from. */
import { csvField } from "../../src/index";
import { seriesFingerprint } from "../core/state/series-fingerprint";
import { decodeValue } from "./cell-value";
import type { ToleranceAxisData, ToleranceMapData } from "./model";

/**
 * The map's numbers in one order and with one set of names, shared by the CSV and the
 * fingerprint (docs/fingerprint.md), so that a reader recomputes the fingerprint from the CSV:
 * each series' label is a column header of the CSV.
 */
interface Series {
  readonly label: string;
  readonly values: readonly number[];
}

/** Heading of the fingerprint, naming its layout so that a later layout cannot be mistaken for this one. */
export const TOLERANCE_FINGERPRINT_HEADING = "quietframe tolerance-map fingerprint 1";
const STATUS_LABEL = "status [0 ok, 1 unstable, 2 invalid]";

const axisLabel = (name: "x" | "y", axis: Pick<ToleranceAxisData, "target">): string => `${name}: ${axis.target} [SI]`;
const figureLabel = (map: Pick<ToleranceMapData, "figure">): string => `figure [${map.figure.unit || "ratio"}]`;

/** −0 as +0: JSON cannot keep −0, so a map computed in memory and its saved copy give the same fingerprint. */
const positiveZero = (v: number): number => (v === 0 ? 0 : v);

/** A cell without a value (JSON null: an unstable or invalid cell) is hashed as +0; its status tells it apart. */
function cellFigures(map: ToleranceMapData): number[] {
  return map.values.map((v) => (v === null ? 0 : positiveZero(decodeValue(v))));
}

function mapSeries(map: ToleranceMapData): Series[] {
  return [
    { label: axisLabel("x", map.x), values: map.x.values.map(positiveZero) },
    { label: axisLabel("y", map.y), values: map.y.values.map(positiveZero) },
    { label: figureLabel(map), values: cellFigures(map) },
    { label: STATUS_LABEL, values: map.status },
  ];
}

/** Fingerprint of a map's numbers: both axes (SI), then every cell's figure and status, row-major with y outer. */
export function toleranceFingerprint(map: ToleranceMapData): string {
  return seriesFingerprint(({ label, series }) => {
    label(TOLERANCE_FINGERPRINT_HEADING);
    for (const s of mapSeries(map)) series(s.label, s.values);
  });
}

/**
 * The map as CSV, numbers in shortest round-trip form so the file gives the doubles back
 * exactly. Two tables separated by an empty line: the axes (one column each, the shorter one
 * padded with empty fields), then one row per cell in fingerprint order with its figure (empty
 * where the cell has no value) and status code.
 */
export function toleranceCsv(map: ToleranceMapData): string {
  const [x, y, figure, status] = mapSeries(map);
  const lines = [[x.label, y.label].map(csvField).join(",")];
  for (let k = 0; k < Math.max(x.values.length, y.values.length); k++) lines.push([x.values[k], y.values[k]].map((v) => (v === undefined ? "" : String(v))).join(","));
  lines.push("", ["x index", "y index", figure.label, status.label].map(csvField).join(","));
  const nx = x.values.length;
  map.values.forEach((v, k) => lines.push([k % nx, Math.floor(k / nx), v === null ? "" : String(figure.values[k]), String(status.values[k])].join(",")));
  return `${lines.join("\n")}\n`;
}
