/**
 * Reads a noise spectrum from CSV text: a header naming the two columns with their units in
 * brackets, e.g. `frequency [Hz], force ASD [N/√Hz]`, then one `frequency, ASD` pair per line.
 * Lines starting with # and blank lines are skipped. Pure text handling (no file access), so
 * the Node loader and tests share it; errors name the file and the line.
 */
import { QuietframeError } from "../errors";
import type { SpectrumDescription } from "./spectrum-table";

const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const HEADER_EXAMPLE = "frequency [Hz], ASD [N/√Hz]";

/** The unit of a header field: the text inside its last [...] or its outermost (...). */
function unitOfHeaderField(field: string): string | undefined {
  const bracket = /\[([^\]]*)\]\s*$/.exec(field);
  if (bracket) return bracket[1].trim() || undefined;
  const open = field.indexOf("(");
  const close = field.lastIndexOf(")");
  if (open >= 0 && close > open && field.slice(close + 1).trim() === "") return field.slice(open + 1, close).trim() || undefined;
  return undefined;
}

function splitFields(line: string): string[] {
  return line.split(",").map((s) => s.trim());
}

/** Parses the CSV text of `file`; the points are returned as written (units applied later). */
export function parseSpectrumCsv(text: string, file: string): SpectrumDescription {
  const lines = text.split(/\r\n|\n|\r/);
  const at = (n: number): string => `${JSON.stringify(file)}, line ${n}`;
  let header: { frequencyUnit: string; unit: string } | undefined;
  const points: [number, number][] = [];
  const pointLines: number[] = [];
  lines.forEach((raw, index) => {
    const n = index + 1;
    const line = raw.replace(/^\uFEFF/, "").trim();
    if (line === "" || line.startsWith("#")) return;
    const fields = splitFields(line);
    if (header === undefined) {
      if (fields.length !== 2) {
        throw new QuietframeError({ path: at(n), value: line, problem: "is not a header of two columns", allowed: `a header such as "${HEADER_EXAMPLE}"` });
      }
      const [fUnit, aUnit] = fields.map(unitOfHeaderField);
      if (fUnit === undefined || aUnit === undefined) {
        throw new QuietframeError({
          path: at(n),
          value: line,
          problem: `gives no unit for the ${fUnit === undefined ? "frequency" : "amplitude spectral density"} column`,
          allowed: `units in brackets after each column name, e.g. "${HEADER_EXAMPLE}"`,
        });
      }
      header = { frequencyUnit: fUnit, unit: aUnit };
      return;
    }
    if (fields.length !== 2) {
      throw new QuietframeError({
        path: at(n),
        value: line,
        problem: `has ${fields.length} field${fields.length === 1 ? "" : "s"}, not two`,
        allowed: "one frequency and one ASD per line, separated by a comma",
      });
    }
    const values = fields.map((field) => {
      if (!NUMBER.test(field)) {
        throw new QuietframeError({ path: at(n), value: field, problem: "is not a finite number", allowed: 'decimal numbers such as "12.5" or "3e-15" (no NaN, no Infinity)' });
      }
      return Number(field);
    });
    points.push([values[0], values[1]]);
    pointLines.push(n);
  });
  if (header === undefined) {
    throw new QuietframeError({ path: JSON.stringify(file), problem: "holds no header and no points", allowed: `a header such as "${HEADER_EXAMPLE}" followed by frequency, ASD lines` });
  }
  return { file, frequencyUnit: header.frequencyUnit, unit: header.unit, points, lines: pointLines };
}
