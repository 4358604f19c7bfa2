/**
 * Text widths for Vega in Node, where it has no canvas to measure with and would guess 0.8 of
 * the font size per character: far wider than the text resvg then draws, which left the
 * static figure with an empty margin beside its longest text. These are advance widths of
 * DejaVu Sans (the family the PNG renders with), in ems, approximate (from memory of the
 * font's metrics, to about 0.02 em); characters not listed count as 0.65 em.
 */
const NARROW: Readonly<Record<string, number>> = {
  " ": 0.318,
  ".": 0.318,
  ",": 0.318,
  ":": 0.337,
  ";": 0.337,
  "|": 0.337,
  "!": 0.4,
  "'": 0.275,
  "(": 0.39,
  ")": 0.39,
  "[": 0.39,
  "]": 0.39,
  "-": 0.361,
  "/": 0.337,
  "÷": 0.838,
  "+": 0.838,
  "=": 0.838,
  "²": 0.4,
  "√": 0.636,
  ħ: 0.634,
  χ: 0.6,
  Ω: 0.764,
  i: 0.278,
  j: 0.278,
  l: 0.278,
  f: 0.352,
  t: 0.392,
  r: 0.411,
  s: 0.521,
  z: 0.525,
  c: 0.55,
  k: 0.579,
  v: 0.592,
  x: 0.592,
  y: 0.592,
  m: 0.974,
  w: 0.818,
  I: 0.295,
  J: 0.295,
  M: 0.863,
  W: 0.989,
};

/** Width in pixels of `text` at `fontSize` px. */
export function textWidth(text: string, fontSize: number): number {
  let ems = 0;
  for (const ch of text) {
    const listed = NARROW[ch];
    if (listed !== undefined) ems += listed;
    else if (/[0-9]/.test(ch)) ems += 0.636;
    else if (/[a-z]/.test(ch)) ems += 0.62;
    else if (/[A-Z]/.test(ch)) ems += 0.72;
    else ems += 0.65;
  }
  return ems * fontSize;
}

interface VegaTextMetrics {
  width: (item: { text?: unknown; fontSize?: number }, text?: unknown) => number;
}

/** Makes Node's Vega measure text with these widths (Vega's documented hook for renderers without a canvas). */
export function useDejaVuWidths(vega: unknown): void {
  const metrics = (vega as { textMetrics?: VegaTextMetrics }).textMetrics;
  if (!metrics) return;
  metrics.width = (item, text) => {
    const value = text ?? item.text;
    const line = Array.isArray(value) ? value.join(" ") : String(value ?? "");
    return textWidth(line, typeof item.fontSize === "number" ? item.fontSize : 11);
  };
}
