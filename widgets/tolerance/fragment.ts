/** The tolerance map's page fragment and standalone page. Pure: the runtime's text is passed in (html.ts reads it in Node). */
import { QUIETFRAME_VERSION } from "../../src/index";
import { TOLERANCE_CLASS, TOLERANCE_STATE_CLASS } from "./names";
import { toleranceSummaryText, type ToleranceWidgetState } from "./model";
import { escapeHtml, jsonForScript } from "../core/page/escape";
import { fallbackFigure, fallbackNote, fallbackPng, fallbackStyle } from "../core/page/fallback";
import { safetyNoteHtml } from "../core/page/safety-note";
import { VERSION_ATTRIBUTE } from "../core/page/names";
import type { FragmentParts, PageParts } from "../core/page/parts";
import { bootstrapScriptTag, runtimeScriptTag } from "../core/page/bootstrap";
import { htmlDocument } from "../core/page/html-document";

const FALLBACK_STYLE = fallbackStyle(TOLERANCE_CLASS, { extra: `.${TOLERANCE_CLASS} .qf-fallback pre{white-space:pre-wrap;font-family:system-ui,sans-serif}` });

/**
 * A self-contained HTML fragment for one tolerance map: the static heat map and its summary,
 * the map's state as JSON (data, base set-up and spec: the page recomputes nothing to draw
 * it), and the bootstrap that turns it into the live heat map when the runtime is present.
 */
export function toleranceFragment(state: ToleranceWidgetState, parts: FragmentParts): string {
  const title = toleranceTitle(state);
  const out: string[] = [];
  out.push(`<div class="${TOLERANCE_CLASS}" ${VERSION_ATTRIBUTE}="${escapeHtml(QUIETFRAME_VERSION)}">`);
  out.push(`<style>${FALLBACK_STYLE}</style>`);
  out.push(safetyNoteHtml());
  out.push(`<div class="qf-fallback">`);
  if (parts.svg !== undefined) out.push(fallbackFigure(plainSvg(parts.svg)));
  if (parts.png !== undefined) out.push(fallbackPng(parts.png, `Tolerance map: ${title}`));
  out.push(`<pre class="qf-summary">${escapeHtml(toleranceSummaryText(state))}</pre>`);
  out.push(fallbackNote("Static figure: clicking a cell opens its explorer where scripts run (a trusted notebook or a browser page)."));
  out.push(`</div>`);
  out.push(`<script type="application/json" class="${TOLERANCE_STATE_CLASS}">${jsonForScript(state)}</script>`);
  out.push(`</div>`);
  if (parts.runtime !== undefined) out.push(runtimeScriptTag(parts.runtime));
  out.push(bootstrapScriptTag());
  return out.join("\n");
}

/** A complete HTML document with one live tolerance map (the runtime inside its fragment); needs no network. */
export function tolerancePageDocument(state: ToleranceWidgetState, parts: PageParts): string {
  return htmlDocument(toleranceTitle(state), [toleranceFragment(state, parts)]);
}

export function toleranceTitle(state: ToleranceWidgetState): string {
  return state.settings.title ?? state.setup.name ?? "tolerance map";
}

/**
 * The SVG comes from renderSvg, which escapes text and admits only plain drawing elements;
 * this keeps the guarantee local: one <svg> element, no script, no event attribute.
 */
function plainSvg(svg: string): string {
  const text = svg.replace(/^\s*<\?xml[^>]*\?>\s*/, "").trim();
  if (!/^<svg[\s>]/.test(text) || !/<\/svg>$/.test(text)) throw new Error("quietframe: the static heat map is not an SVG element");
  if (/<script|<foreignobject|\son[a-z]+\s*=|javascript:/i.test(text)) throw new Error("quietframe: the static heat map contains active content");
  return text;
}
