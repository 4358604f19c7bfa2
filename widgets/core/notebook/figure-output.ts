/**
 * Splits a widget's kernel-free mime bundle into two outputs: the page (HTML with the summary,
 * the state and the scripts, plain text) and the figure as a PNG output of its own.
 *
 * JupyterLab 4 and Notebook 7 show text/html before image/png even in an untrusted notebook,
 * and their sanitizer drops inline SVG and data: images, so a PNG inside the page's bundle
 * never shows there. As its own output the PNG shows in every front-end; a trusted page hides
 * it once its widget is live (core/browser/png-output.ts finds it by the key the page carries).
 */
import { base64, escapeHtml } from "../page/escape";
import { PAGE_OUTPUT_CLASS, PNG_KEY_ATTRIBUTE, pngOutputKey } from "../page/png-output";
import type { DisplayOptions, MimeBundle } from "./display";

export interface SplitOutput {
  readonly page: MimeBundle;
  /** Absent when the bundle had no PNG: then the page is the bundle unchanged. */
  readonly figure?: { readonly bundle: MimeBundle; readonly options: DisplayOptions };
}

/**
 * Where styles apply but scripts do not (an export with scripts blocked), the page's inline SVG
 * would show above the PNG output: the same figure twice. Inside the wrapper it stays hidden;
 * the doubled class outranks the fallback style's `:has(svg)` rule (widgets/core/page/fallback.ts).
 */
const WRAPPER_STYLE = `<style>.${PAGE_OUTPUT_CLASS} .qf-fallback .qf-fallback-svg.qf-fallback-svg{display:none}</style>`;

// The PNG signature and the IHDR chunk that must follow it (PNG specification, ISO/IEC 15948, 5.2 and 11.2.2).
const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
const IHDR = [0x49, 0x48, 0x44, 0x52];

/** Width and height in pixels from a PNG's IHDR chunk; throws if the bytes are not a PNG. */
export function pngSize(png: Uint8Array): { width: number; height: number } {
  const ok = png.length >= 24 && PNG_SIGNATURE.every((b, i) => png[i] === b) && IHDR.every((b, i) => png[12 + i] === b);
  if (!ok) throw new Error("quietframe: the figure is not a PNG");
  const view = new DataView(png.buffer, png.byteOffset, png.byteLength);
  return { width: view.getUint32(16), height: view.getUint32(20) };
}

/**
 * The page and the figure outputs of a kernel-free bundle. `scale` is the PNG's pixels per
 * chart pixel: the figure's display size (metadata width and height, CSS pixels) is the
 * chart's, as the page draws it, whatever resolution the PNG was rendered at.
 */
export function splitKernelFreeOutput(bundle: MimeBundle, scale: number): SplitOutput {
  const { "image/png": png, ...rest } = bundle;
  if (!(png instanceof Uint8Array) || typeof rest["text/html"] !== "string") return { page: bundle };
  const size = pngSize(png);
  const key = pngOutputKey(base64(png));
  const page: MimeBundle = { ...rest, "text/html": `<div class="${PAGE_OUTPUT_CLASS}" ${PNG_KEY_ATTRIBUTE}="${escapeHtml(key)}">${WRAPPER_STYLE}${rest["text/html"]}</div>` };
  const width = Math.round(size.width / scale);
  const height = Math.round(size.height / scale);
  return {
    page,
    figure: { bundle: { "image/png": png, "text/plain": figureAltText(rest["text/plain"]) }, options: { metadata: { "image/png": { width, height } } } },
  };
}

/** The PNG output's text: what the figure is (the summary's first line names the widget). */
function figureAltText(summary: unknown): string {
  const first = typeof summary === "string" ? summary.split("\n", 1)[0].trim() : "";
  return first ? `Figure: ${first} (static image; the text summary is in the output above)` : "Figure (static image; the text summary is in the output above)";
}
