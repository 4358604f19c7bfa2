/** SHA-256 over labelled series of doubles: the fingerprint of a widget's numbers. */
import { sha256Hex, utf8 } from "./sha256";

/** What a fingerprint is written from: labels (one line of text each) and series of doubles. */
export interface FingerprintWriter {
  label(text: string): void;
  series(name: string, values: ArrayLike<number>): void;
}

/**
 * SHA-256 over what `write` adds, in order: each label as UTF-8 text and a newline, each series
 * as its label then its exact IEEE-754 doubles (little-endian). Equal only when every number
 * agrees bit for bit.
 */
export function seriesFingerprint(write: (w: FingerprintWriter) => void): string {
  const parts: Uint8Array[] = [];
  const label = (text: string): void => {
    parts.push(utf8(`${text}\n`));
  };
  const series = (name: string, values: ArrayLike<number>): void => {
    label(name);
    const bytes = new Uint8Array(values.length * 8);
    const view = new DataView(bytes.buffer);
    for (let i = 0; i < values.length; i++) view.setFloat64(8 * i, values[i], true);
    parts.push(bytes);
  };
  write({ label, series });
  const all = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let offset = 0;
  for (const p of parts) {
    all.set(p, offset);
    offset += p.length;
  }
  return `sha256:${sha256Hex(all)}`;
}
