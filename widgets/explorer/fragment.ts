import { QUIETFRAME_VERSION } from "../../src/version";
import type { ExplorerComputation } from "./model";
import { explorerReach } from "./reach";
import type { ExplorerState } from "./format";
import { stateDocumentText } from "./document";
import { base64, escapeHtml, jsonTextForScript } from "../core/page/escape";
import { runtimeSource } from "../core/page/runtime-source";
import { EXPLORER_CLASS, RUNTIME_READY_EVENT, STATE_SCRIPT_CLASS, STATUS_ATTRIBUTE } from "../core/page/names";
import { CAUTION_HEADING, headlineSummary, reachSummary } from "./summary";
import { ENTANGLED_CLASS } from "../entangled/names";
import { TOLERANCE_CLASS } from "../tolerance/names";

/** Shown in a widget whose page never received the runtime (the first widget's output was cleared). */
export const RUNTIME_MISSING_TEXT =
  "The interactive controls need the quietframe runtime, which the first widget of a notebook carries. Re-run that cell, or show this widget with show({ includeRuntime: true }).";
const RUNTIME_MISSING_DELAY_MS = 4000;

export interface ExplorerHtmlOptions {
  /**
   * Carry the browser runtime (about 0.8 MB) in this fragment. A page or notebook needs it
   * once: set it for the first widget only; later fragments boot with the same runtime.
   */
  includeRuntime: boolean;
  /** Static SVG of the chart, shown until the runtime boots and kept for viewers without scripts. */
  svg?: string;
  /** Static PNG of the chart (bytes), shown where inline SVG is stripped (e.g. untrusted notebooks). */
  png?: Uint8Array;
}

// Fallbacks of every kind of widget that has not booted (no status yet) get the hint.
const NOT_BOOTED_FALLBACKS = [EXPLORER_CLASS, TOLERANCE_CLASS, ENTANGLED_CLASS].map((c) => `.${c}:not([${STATUS_ATTRIBUTE}]) .qf-fallback`).join(",");

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

// With both images present only the SVG shows; where a sanitizer strips the <svg>, the
// sibling rule no longer matches and the PNG appears instead.
const FALLBACK_STYLE =
  `.${EXPLORER_CLASS} .qf-fallback svg+img.qf-fallback-png{display:none}` +
  `.${EXPLORER_CLASS} .qf-fallback img,.${EXPLORER_CLASS} .qf-fallback svg{max-width:100%;height:auto}` +
  `.${EXPLORER_CLASS} .qf-fallback .qf-caution{border:2px solid #c77700;background:#fff6de;color:#3d2600;padding:.45em .7em;margin:.5em 0}` +
  `.${EXPLORER_CLASS} .qf-fallback .qf-caution ul{margin:.2em 0 0;padding-left:1.2em}`;

/**
 * A self-contained HTML fragment for one explorer: static figure and summary, the state as
 * JSON, and a bootstrap that turns it into the live widget when the runtime is present.
 */
export function explorerHtml(state: ExplorerState, computation: ExplorerComputation, options: ExplorerHtmlOptions): string {
  const title = chartTitle(state);
  const parts: string[] = [];
  parts.push(`<div class="${EXPLORER_CLASS}" data-quietframe-version="${escapeHtml(QUIETFRAME_VERSION)}">`);
  parts.push(`<style>${FALLBACK_STYLE}</style>`);
  parts.push(`<div class="qf-fallback">`);
  if (options.svg !== undefined) parts.push(checkedSvg(options.svg));
  if (options.png !== undefined) {
    parts.push(`<img class="qf-fallback-png" alt="${escapeHtml(`Noise budget: ${title}`)}" src="data:image/png;base64,${base64(options.png)}">`);
  }
  parts.push(summaryHtml(title, state, computation));
  parts.push(`<p class="qf-fallback-note"><small>Static figure: the controls appear where scripts run (a trusted notebook or a browser page).</small></p>`);
  parts.push(`</div>`);
  parts.push(`<script type="application/json" class="${STATE_SCRIPT_CLASS}">${jsonTextForScript(stateDocumentText(state))}</script>`);
  parts.push(`</div>`);
  if (options.includeRuntime) parts.push(runtimeScriptTag());
  parts.push(`<script>${BOOTSTRAP}</script>`);
  return parts.join("\n");
}

/** The runtime as an inline script element. */
export function runtimeScriptTag(): string {
  return `<script>${runtimeSource()}</script>`;
}

/** The bootstrap alone, for pages that place the runtime themselves. */
export function bootstrapScriptTag(): string {
  return `<script>${BOOTSTRAP}</script>`;
}

export function chartTitle(state: ExplorerState): string {
  return state.settings.title ?? state.setup.name ?? "";
}

/**
 * Title, safety cautions (first, so nobody reads figures past them) and the summary lines:
 * headline figures and, for a strain budget, the reach gauge against the initial set-up.
 */
function summaryHtml(title: string, state: ExplorerState, computation: ExplorerComputation): string {
  const reach = explorerReach(state, computation);
  const lines = [...headlineSummary(computation.headline), ...(reach ? reachSummary(reach) : [])];
  const items = lines.map((line) => `<dt>${escapeHtml(line.label)}</dt><dd>${escapeHtml(line.text)}</dd>`).join("");
  const heading = title ? `<p class="qf-fallback-title"><strong>${escapeHtml(title)}</strong></p>` : "";
  return `${heading}${cautionHtml(computation.evaluation.cautions)}<dl class="qf-summary">${items}</dl>`;
}

/** The components' safety cautions as a box of their own (nothing when there are none). */
export function cautionHtml(cautions: readonly string[]): string {
  if (cautions.length === 0) return "";
  const items = cautions.map((c) => `<li>${escapeHtml(c)}</li>`).join("");
  return `<div class="qf-caution" role="note"><strong>${escapeHtml(CAUTION_HEADING)}</strong><ul>${items}</ul></div>`;
}

/**
 * The static SVG comes from our own renderer, whose text is escaped; this guards the
 * invariant that it is a plain drawing (no scripts, event handlers or script links) before
 * it is inlined into a page. Attribute values are skipped, so titles in aria-labels are fine.
 */
function checkedSvg(svg: string): string {
  const text = svg.replace(/^\s*<\?xml[^>]*\?>\s*/, "").trim();
  if (!/^<svg[\s>]/.test(text) || !/<\/svg>$/.test(text)) throw new Error("quietframe: the static figure is not an SVG element");
  const tag = /<([A-Za-z][\w:.-]*)((?:\s+[^\s=/>]+(?:\s*=\s*(?:"[^"]*"|'[^']*'|[^\s"'>]+))?)*)\s*\/?>/g;
  const attribute = /([^\s=/>]+)(?:\s*=\s*("[^"]*"|'[^']*'|[^\s"'>]+))?/g;
  const tags = [...text.matchAll(tag)];
  // Every "<letter" must be a tag this scan understood, or something could hide from it.
  if (tags.length !== (text.match(/<[A-Za-z]/g) ?? []).length) throw new Error("quietframe: the static figure has markup that cannot be checked");
  for (const [, name, attrs] of tags) {
    if (/^(script|foreignobject|iframe|object|embed|use|image)$/i.test(name)) throw new Error(`quietframe: the static figure contains a <${name}> element`);
    for (const [, attr, value = ""] of attrs.matchAll(attribute)) {
      const unquoted = value.replace(/^["']|["']$/g, "").trim();
      if (/^on/i.test(attr) || /^\s*(javascript|data):/i.test(unquoted)) throw new Error(`quietframe: the static figure has an active attribute ${attr}`);
    }
  }
  return text;
}
