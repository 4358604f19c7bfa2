/**
 * Shows a kernel-free widget output in the running kernel. The runtime goes with the first
 * output of a kernel session only (unless the caller decides), and is marked as shown only
 * when the output really reached a front-end.
 */
import { displayBundle, type MimeBundle } from "./display";
import { markRuntimeShown, runtimeShown } from "./session";

export async function showWidgetOutput(includeRuntime: boolean | undefined, bundle: (includeRuntime: boolean) => Promise<MimeBundle>): Promise<void> {
  const carry = includeRuntime ?? !runtimeShown();
  const result = displayBundle(await bundle(carry));
  if (carry && result.via !== "none") markRuntimeShown();
}
