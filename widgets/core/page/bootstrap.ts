/** The runtime and bootstrap script elements that end every widget fragment. */
import { RUNTIME_READY_EVENT, STATUS_ATTRIBUTE, VERSION_ATTRIBUTE } from "./names";

/**
 * The script elements of a widget fragment: the runtime (carried by the first widget of a page
 * or notebook) and the small bootstrap every fragment ends with, which boots the runtime if it
 * is on the page and otherwise waits for it.
 */

/** Shown in a widget whose page never received the runtime (the first widget's output was cleared). */
export const RUNTIME_MISSING_TEXT =
  "The interactive controls need the quietframe runtime, which the first widget of a notebook carries. Re-run that cell, or show this widget with show({ includeRuntime: true }).";
const RUNTIME_MISSING_DELAY_MS = 4000;

// Fallbacks of every kind of widget that has not booted (no status yet) get the hint.
const NOT_BOOTED_FALLBACKS = `[${VERSION_ATTRIBUTE}]:not([${STATUS_ATTRIBUTE}]) .qf-fallback`;

// Runs the runtime if it is already on the page, otherwise waits for it to arrive. Only the
// first widget of a notebook carries the runtime; if that output was cleared, say so in the
// fallback after a few seconds instead of leaving the reader to wonder.
const BOOTSTRAP =
  `(function(){var w=window,d=document,r=w.quietframeRuntime;if(r&&r.boot){r.boot();return;}` +
  `w.addEventListener("${RUNTIME_READY_EVENT}",function(){w.quietframeRuntime.boot();},{once:true});` +
  `setTimeout(function(){if(w.quietframeRuntime)return;` +
  `d.querySelectorAll(${JSON.stringify(NOT_BOOTED_FALLBACKS)}).forEach(function(f){` +
  `if(f.querySelector(".qf-runtime-missing"))return;var p=d.createElement("p");p.className="qf-runtime-missing";` +
  `p.textContent=${JSON.stringify(RUNTIME_MISSING_TEXT)};f.appendChild(p);});},${RUNTIME_MISSING_DELAY_MS});})();`;

/** The runtime as an inline script element. */
export function runtimeScriptTag(runtime: string): string {
  return `<script>${runtime}</script>`;
}

/** The bootstrap, last in every fragment. */
export function bootstrapScriptTag(): string {
  return `<script>${BOOTSTRAP}</script>`;
}
