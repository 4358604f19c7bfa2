/**
 * The frequency range of a budget widget as its control edits it: the two ends as a user types
 * them ("10 Hz", "2.5 kHz"; a bare number is in Hz), checked like a set-up's grid, with the
 * number of points kept. Pure, so the page and the tests run the same checks.
 */
import { parseGrid } from "../../../src/index";
import { BARE_NUMBER } from "./setup-controls";

export interface GridText {
  from: string;
  to: string;
  points: number;
}

/** A typed end: trimmed, a bare number taken in Hz. */
function typedFrequency(text: string): string {
  const t = text.trim();
  return BARE_NUMBER.test(t) ? `${t} Hz` : t;
}

/**
 * The grid for typed ends, or a QuietframeError naming the end ("frequency range.from"), the
 * value as typed and what is allowed (a frequency above 0, to above from).
 */
export function frequencyRange(from: string, to: string, points: number): GridText {
  const grid = { from: typedFrequency(from), to: typedFrequency(to), points };
  parseGrid(grid, "frequency range");
  return grid;
}
