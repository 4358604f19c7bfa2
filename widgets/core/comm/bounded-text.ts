/** Names and values from front-ends, cut to a stated length before they go into an error or a log line. */

/**
 * Anything a front-end sends may be megabytes long (a method name, a key, a comm id). Errors
 * and kernel log lines echo such names so the user can see what was refused; they echo at
 * most MAX_ECHOED_CHARS characters of each and say how long the whole was.
 */

/** Longest name or value echoed in an error or a kernel log line, in UTF-16 characters. */
export const MAX_ECHOED_CHARS = 120;

/** `text` if short, else its first MAX_ECHOED_CHARS characters and the full length. */
export function clip(text: string): string {
  if (text.length <= MAX_ECHOED_CHARS) return text;
  return `${text.slice(0, MAX_ECHOED_CHARS)}… (${text.length} characters, cut to ${MAX_ECHOED_CHARS})`;
}

/** A value quoted for a message: strings clipped and JSON-quoted, binary data by its size, others by their type. */
export function describeSent(v: unknown): string {
  if (v === undefined) return "nothing";
  if (v === null) return "null";
  if (typeof v === "string") return JSON.stringify(clip(v));
  if (typeof v === "number" || typeof v === "boolean") return String(v);
  if (v instanceof ArrayBuffer || ArrayBuffer.isView(v)) return `${v.byteLength} bytes of binary data`;
  if (Array.isArray(v)) return `an array of ${v.length} items`;
  return typeof v;
}

/**
 * A value as an error may carry it (QuietframeError shows `value` in its text): short strings
 * and plain numbers as they are, anything long or binary as a short description.
 */
export function echoable(v: unknown): unknown {
  if (typeof v === "string") return clip(v);
  if (v === null || typeof v === "number" || typeof v === "boolean" || v === undefined) return v;
  if (v instanceof ArrayBuffer || ArrayBuffer.isView(v)) return describeSent(v);
  let json: string | undefined;
  try {
    json = JSON.stringify(v);
  } catch {
    return describeSent(v);
  }
  return json !== undefined && json.length <= MAX_ECHOED_CHARS ? v : describeSent(v);
}
