/**
 * Names and the key shared by the kernel-free notebook output (Node) and the browser runtime:
 * the page output is wrapped in an element that names, by a key of its text, the PNG output
 * sent right after it, so that the page, once live, hides exactly that PNG and nothing else.
 */

/** The element around a kernel-free page output whose figure follows as a PNG output of its own. */
export const PAGE_OUTPUT_CLASS = "quietframe-output";
/** On that element: the key (pngOutputKey) of the PNG output that follows it. */
export const PNG_KEY_ATTRIBUTE = "data-quietframe-png";
/** Set by the runtime on the PNG output it hid (for readers of the page and tests). */
export const HIDDEN_PNG_ATTRIBUTE = "data-quietframe-hidden-png";
/** How a front-end writes an image/png output's picture: the base64 text after this prefix. */
export const PNG_DATA_URL_PREFIX = "data:image/png;base64,";

/**
 * A short key of the PNG's base64 text (whitespace removed, as a notebook may wrap it): its
 * length and its 32-bit FNV-1a hash. Not a security measure (the page trusts its own
 * notebook); it only tells our PNG from any other image beside the output.
 */
export function pngOutputKey(base64: string): string {
  const text = base64.replace(/\s+/g, "");
  // FNV-1a, 32 bit: offset basis 0x811c9dc5, prime 0x01000193 (common practice, no source).
  let hash = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    hash ^= text.charCodeAt(i);
    hash = Math.imul(hash, 0x01000193) >>> 0;
  }
  return `${text.length}-${hash.toString(16).padStart(8, "0")}`;
}
