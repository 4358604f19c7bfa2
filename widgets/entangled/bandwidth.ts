/** The entangled panel's source linewidth as the user types it: a frequency with its unit, or empty for a white source. */
import { QuietframeError, formatQuantity, parseQuantity } from "../../src/index";

/**
 * "5 MHz" → 5e6; a bare number is hertz; empty text is a white (broadband) source. Anything
 * else is a QuietframeError naming the field, the text and what is allowed, never NaN.
 */
export function parseBandwidth(text: string, path: string): number | null {
  const trimmed = text.trim();
  if (trimmed === "") return null;
  const bare = /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(trimmed);
  const value = bare ? Number(trimmed) : parseQuantity(trimmed, "frequency", path);
  if (!(value > 0)) {
    throw new QuietframeError({ path, value: bare ? value : trimmed, problem: "is not a positive linewidth", allowed: 'a frequency above 0 such as "5 MHz", or empty for a white source' });
  }
  return value;
}

/** The linewidth as the field shows it (round-trips through parseBandwidth to the same value for stored states). */
export function bandwidthText(bandwidth: number | null): string {
  return bandwidth === null ? "" : `${String(bandwidth)} Hz`;
}

/** The linewidth as the panel's text shows it, with an SI prefix. */
export function bandwidthLabel(bandwidth: number): string {
  return formatQuantity(bandwidth, "frequency", 4);
}
