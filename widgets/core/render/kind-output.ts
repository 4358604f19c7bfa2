/**
 * A loaded state of any kind as a file, in Node: the standalone page (html), the static figure
 * (svg, png at a scale) or the plotted numbers (csv). `quietframe render` writes these.
 */
import type { LoadedWidget, WidgetKind } from "../kind";
import { runtimeSource } from "../page/runtime-source";
import { renderPng, renderSvg } from "./static";

export const OUTPUT_FORMATS = ["html", "svg", "png", "csv"] as const;
export type OutputFormat = (typeof OUTPUT_FORMATS)[number];

export async function kindOutput<L extends LoadedWidget>(kind: WidgetKind<L>, loaded: L, format: OutputFormat, scale: number): Promise<Uint8Array> {
  const figure = kind.figure(loaded);
  if (format === "csv") return utf8(figure.csv);
  const svg = await renderSvg(figure.spec);
  if (format === "svg") return utf8(svg);
  const png = renderPng(svg, { scale });
  if (format === "png") return png;
  return utf8(kind.page(loaded, { runtime: runtimeSource(), svg, png }));
}

function utf8(text: string): Uint8Array {
  return new TextEncoder().encode(text);
}
