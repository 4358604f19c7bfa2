/** The shell of every kind's standalone page. */
import { runtimeScriptTag } from "./bootstrap";
import { htmlDocument } from "./html-document";

/**
 * The shell of every kind's standalone page: a complete document around the widget markup,
 * with the runtime last, so that it boots every widget above it as it installs. The page
 * needs no network: runtime, state and figures are all inline.
 */
export function standaloneShell(title: string, body: readonly string[], runtime: string, extraStyle = ""): string {
  return htmlDocument(title, [...body, runtimeScriptTag(runtime)], extraStyle);
}
