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
