/** The static SVG must be a plain drawing: no scripts, foreign objects, links or handlers. */
export function plainSvg(svg: string): string {
  const text = svg.replace(/^\s*<\?xml[^>]*\?>\s*/, "").trim();
  if (!/^<svg[\s>]/.test(text) || !/<\/svg>$/.test(text)) throw new Error("quietframe: the static figure is not an SVG element");
  if (/<(script|foreignobject|iframe|object|embed|use|image|a)[\s>/]/i.test(text) || /\son\w+\s*=/i.test(text) || /(javascript|data):/i.test(text)) {
    throw new Error("quietframe: the static figure has active content");
  }
  return text;
}
