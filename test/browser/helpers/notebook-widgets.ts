import type { Page } from "playwright-core";
import { HIDDEN_PNG_ATTRIBUTE, PAGE_OUTPUT_CLASS } from "../../../widgets/core/page/png-output";
import { EXPLORER_CLASS } from "../../../widgets/explorer/names";
import { joined, type NotebookOutput } from "../../jupyter/notebook-file";

/** A widget output of an executed notebook: display data whose HTML holds an explorer element. */
export function isWidgetOutput(o: NotebookOutput): boolean {
  return o.output_type === "display_data" && joined(o.data?.["text/html"]).includes(`class="${EXPLORER_CLASS}"`);
}

/** The fingerprint a widget output's text summary reports (as the kernel computed it). */
export function summaryFingerprint(o: NotebookOutput): string {
  const m = /fingerprint: (sha256:[0-9a-f]{64})/.exec(joined(o.data?.["text/plain"]));
  if (!m) throw new Error("the widget output's text summary names no fingerprint");
  return m[1];
}

/** The inline SVG of a widget output's static fallback, as the kernel wrote it. */
export function fallbackSvg(o: NotebookOutput): string {
  const m = /<div class="qf-fallback">\s*<div class="qf-fallback-svg" hidden="hidden">(<svg[\s\S]*?<\/svg>)<\/div>/.exec(joined(o.data?.["text/html"]));
  if (!m) throw new Error("the widget output has no inline SVG in its fallback");
  return m[1];
}

/** Non-overlapping occurrences of `needle` in `haystack`. */
export function occurrences(haystack: string, needle: string): number {
  if (needle.length === 0) throw new Error("empty needle");
  let n = 0;
  for (let at = haystack.indexOf(needle); at >= 0; at = haystack.indexOf(needle, at + needle.length)) n++;
  return n;
}

/**
 * The PNG output a kernel-free widget output is followed by (widgets/core/notebook/figure-output.ts),
 * checked as stored: a PNG (signature, IHDR) whose metadata gives its size. Throws when a widget
 * output has no PNG output right after it.
 */
export interface StoredPngOutput {
  /** Pixels, from the PNG's IHDR chunk (PNG specification, ISO/IEC 15948, 11.2.2). */
  width: number;
  height: number;
  /** The display size the output's metadata asks for (CSS pixels). */
  metadata: { width: number; height: number };
  text: string;
}

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

export function pngOutputsAfterWidgets(outputs: readonly NotebookOutput[]): StoredPngOutput[] {
  return outputs.flatMap((o, i) => {
    if (!isWidgetOutput(o)) return [];
    const next = outputs[i + 1];
    if (next?.output_type !== "display_data" || next.data?.["image/png"] === undefined) throw new Error(`widget output ${i} is not followed by a PNG output`);
    const png = Buffer.from(joined(next.data["image/png"]).replace(/\s+/g, ""), "base64");
    if (!png.subarray(0, 8).equals(PNG_SIGNATURE) || png.subarray(12, 16).toString("latin1") !== "IHDR") throw new Error(`the PNG output after widget output ${i} is not a PNG`);
    const metadata = (next.metadata as Record<string, { width: number; height: number }> | undefined)?.["image/png"] ?? { width: 0, height: 0 };
    return [{ width: png.readUInt32BE(16), height: png.readUInt32BE(20), metadata: { width: metadata.width, height: metadata.height }, text: joined(next.data["text/plain"]) }];
  });
}

/** What a front-end shows of the output after each kernel-free page output (its PNG output). */
export interface PngOutputView {
  /** The image is rendered (not hidden by the page nor by a style). */
  visible: boolean;
  /** Set once the page hid it (widgets/core/browser/png-output.ts). */
  hiddenByPage: boolean;
  naturalWidth: number;
  naturalHeight: number;
  /** The img's width and height attributes (the front-end writes the output's metadata there). */
  width: string | null;
  height: string | null;
}

/**
 * Reads the PNG outputs under `root` (a notebook's node): `outputSelector` is the front-end's
 * element per output (".jp-OutputArea-child" in JupyterLab and Notebook 7, ".output_area" in
 * the classic notebook). Waits until every such image has loaded.
 */
export async function pngOutputViews(page: Page, rootSelector: string, outputSelector: string): Promise<PngOutputView[]> {
  const args = [rootSelector, outputSelector, `.${PAGE_OUTPUT_CLASS}`, HIDDEN_PNG_ATTRIBUTE] as const;
  await page.waitForFunction(
    ([root, output, wrapper]) =>
      (Array.from(document.querySelector(root)!.querySelectorAll(output)) as Element[])
        .filter((o) => o.querySelector(wrapper))
        .every((o) => (o.nextElementSibling?.querySelector("img") as HTMLImageElement | null)?.complete === true),
    args,
    { timeout: 60_000 },
  );
  return page.evaluate(
    ([root, output, wrapper, hidden]) =>
      (Array.from(document.querySelector(root)!.querySelectorAll(output)) as Element[])
        .filter((o) => o.querySelector(wrapper))
        .map((o) => {
          const next = o.nextElementSibling;
          const img = next?.querySelector("img") as HTMLImageElement | null;
          return {
            visible: img !== null && img !== undefined && img.checkVisibility() && img.getBoundingClientRect().width > 0,
            hiddenByPage: next?.hasAttribute(hidden) ?? false,
            naturalWidth: img?.naturalWidth ?? 0,
            naturalHeight: img?.naturalHeight ?? 0,
            width: img?.getAttribute("width") ?? null,
            height: img?.getAttribute("height") ?? null,
          };
        }),
    args,
  );
}
