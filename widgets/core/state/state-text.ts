/** State text from files, pages and notebooks: size limit, then plain JSON data. */
import { QuietframeError, parseJsonText } from "../../../src/index";
import { copyJson } from "./strict-read";

/**
 * State text as it arrives from a file, a page or a notebook: a size limit checked before
 * parsing, and a parse into plain JSON data for the strict readers of every kind.
 */

/** Largest state text accepted (UTF-8 bytes); real states are a few kilobytes. */
export const MAX_STATE_TEXT_BYTES = 5 * 1024 * 1024;

/**
 * JSON text of any quietframe state read from a file or a page (tolerance maps, panels): the
 * same size limit as state documents, and a copy that holds only JSON data, refusing
 * `__proto__`, `constructor` and `prototype` keys anywhere with their path.
 */
export function parseUntrustedJson(text: string, source = "state"): unknown {
  return copyJson(parseStateText(text, source), source, -MAX_UNTRUSTED_EXTRA_DEPTH);
}
// Tolerance-map states nest a set-up inside a few levels of their own.
const MAX_UNTRUSTED_EXTRA_DEPTH = 8;

/** JSON text of a state document, refused beyond MAX_STATE_TEXT_BYTES before it is parsed. */
export function parseStateText(text: string, source: string): unknown {
  // Each UTF-16 unit is at least one UTF-8 byte, so long text is refused before counting.
  const bytes = text.length > MAX_STATE_TEXT_BYTES ? text.length : utf8Length(text);
  if (bytes > MAX_STATE_TEXT_BYTES) {
    throw new QuietframeError({
      path: source,
      problem: `is ${text.length > MAX_STATE_TEXT_BYTES ? "at least " : ""}${bytes} bytes of text, more than the ${MAX_STATE_TEXT_BYTES}-byte limit`,
      allowed: `a state document of at most ${MAX_STATE_TEXT_BYTES} bytes (5 MiB)`,
    });
  }
  return parseJsonText(text, source);
}

function utf8Length(text: string): number {
  let n = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c < 0x80) n += 1;
    else if (c < 0x800) n += 2;
    else if (c >= 0xd800 && c <= 0xdbff && i + 1 < text.length && (text.charCodeAt(i + 1) & 0xfc00) === 0xdc00) {
      n += 4;
      i++;
    } else n += 3;
  }
  return n;
}
