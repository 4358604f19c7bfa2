/**
 * Escaping for text that ends up in HTML or SVG markup. Every user-written string (set-up
 * names, titles, labels, error messages) goes through one of these before it is joined into
 * markup; nothing from a state is ever markup itself.
 */

const HTML_ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };

/** Text content or a double- or single-quoted attribute value. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]);
}

/**
 * JSON for a `<script type="application/json">` element. `<` becomes `\u003c` so that no
 * string inside can close the element or open a comment; U+2028/U+2029 are escaped so the
 * text is also valid JavaScript should anyone paste it into code. JSON.parse restores them.
 */
export function jsonForScript(value: unknown): string {
  return jsonTextForScript(JSON.stringify(value));
}

/** As jsonForScript, for JSON that is already text. */
export function jsonTextForScript(json: string): string {
  return json
    .replace(/</g, "\\u003c")
    .replace(/\u2028/g, "\\u2028")
    .replace(/\u2029/g, "\\u2029");
}

/** Base64 of bytes, for data URLs (Buffer in Node, btoa in browsers). */
export function base64(bytes: Uint8Array): string {
  const g = globalThis as { Buffer?: { from(b: Uint8Array): { toString(enc: string): string } } };
  if (g.Buffer) return g.Buffer.from(bytes).toString("base64");
  let s = "";
  for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return btoa(s);
}
