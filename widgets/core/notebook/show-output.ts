/**
 * Shows a kernel-free widget output in the running kernel: the page, then its figure as a PNG
 * output of its own (figure-output.ts says why). The runtime goes with the first output of a
 * kernel session only (unless the caller decides), and is marked as shown only when the
 * output really reached a front-end.
 */
import type { RenderPngOptions } from "../render/static";
import { displayBundle, type MimeBundle } from "./display";
import { splitKernelFreeOutput } from "./figure-output";
import { markRuntimeShown, runtimeShown } from "./session";

export interface WidgetOutputOptions {
  /** Carry the browser runtime in this output (default: only if no widget carried it yet in this kernel). */
  includeRuntime?: boolean;
  /** The options the bundle's PNG was rendered with; its scale (default 1 in notebooks) sets the figure's display size. */
  png?: RenderPngOptions;
}

/** The PNG scale of notebook outputs: one image pixel per chart pixel. */
export const NOTEBOOK_PNG_SCALE = 1;

export async function showWidgetOutput(options: WidgetOutputOptions, bundle: (includeRuntime: boolean) => Promise<MimeBundle>): Promise<void> {
  const carry = options.includeRuntime ?? !runtimeShown();
  const { page, figure } = splitKernelFreeOutput(await bundle(carry), options.png?.scale ?? NOTEBOOK_PNG_SCALE);
  const result = displayBundle(page);
  if (figure) displayBundle(figure.bundle, figure.options);
  if (carry && result.via !== "none") markRuntimeShown();
}
