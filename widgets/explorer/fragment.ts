/** The explorer's page fragment. Pure: the runtime's text is passed in (html.ts reads it in Node). */
import { QUIETFRAME_VERSION } from "../../src/index";
import type { ExplorerComputation } from "./model";
import { explorerReach } from "./reach";
import type { ExplorerState } from "./format";
import { stateDocumentText } from "./document";
import { escapeHtml, jsonTextForScript } from "../core/page/escape";
import { bootstrapScriptTag, runtimeScriptTag } from "../core/page/bootstrap";
import { cautionHtml, fallbackFigure, fallbackNote, fallbackPng, fallbackStyle, summaryListHtml } from "../core/page/fallback";
import { safetyNoteHtml } from "../core/page/safety-note";
import { VERSION_ATTRIBUTE } from "../core/page/names";
import type { FragmentParts } from "../core/page/parts";
import { EXPLORER_CLASS, STATE_SCRIPT_CLASS } from "./names";
import { headlineSummary, reachSummary } from "./summary";

const FALLBACK_STYLE = fallbackStyle(EXPLORER_CLASS, { caution: true });

/**
 * A self-contained HTML fragment for one explorer: static figure and summary, the state as
 * JSON, and a bootstrap that turns it into the live widget when the runtime is present.
 */
export function explorerFragment(state: ExplorerState, computation: ExplorerComputation, parts: FragmentParts): string {
  const title = chartTitle(state);
  const out: string[] = [];
  out.push(`<div class="${EXPLORER_CLASS}" ${VERSION_ATTRIBUTE}="${escapeHtml(QUIETFRAME_VERSION)}">`);
  out.push(`<style>${FALLBACK_STYLE}</style>`);
  out.push(safetyNoteHtml());
  out.push(`<div class="qf-fallback">`);
  if (parts.svg !== undefined) out.push(fallbackFigure(checkedSvg(parts.svg)));
  if (parts.png !== undefined) out.push(fallbackPng(parts.png, `Noise budget: ${title}`));
  out.push(summaryHtml(title, state, computation));
  out.push(fallbackNote("Static figure: the controls appear where scripts run (a trusted notebook or a browser page)."));
  out.push(`</div>`);
  out.push(`<script type="application/json" class="${STATE_SCRIPT_CLASS}">${jsonTextForScript(stateDocumentText(state))}</script>`);
  out.push(`</div>`);
  if (parts.runtime !== undefined) out.push(runtimeScriptTag(parts.runtime));
  out.push(bootstrapScriptTag());
  return out.join("\n");
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
  const heading = title ? `<p class="qf-fallback-title"><strong>${escapeHtml(title)}</strong></p>` : "";
  return `${heading}${cautionHtml(computation.evaluation.cautions)}${summaryListHtml(lines)}`;
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
