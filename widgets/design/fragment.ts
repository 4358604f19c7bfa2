/** The design widget's page fragment and standalone page. Pure: the runtime's text is passed in (html.ts reads it in Node). */
import { QUIETFRAME_VERSION } from "../../src/index";
import { bootstrapScriptTag, runtimeScriptTag } from "../core/page/bootstrap";
import { escapeHtml, jsonForScript } from "../core/page/escape";
import { cautionHtml, fallbackFigure, fallbackNote, fallbackPng, fallbackStyle } from "../core/page/fallback";
import { designCautions } from "./cautions";
import { htmlDocument } from "../core/page/html-document";
import { FINGERPRINT_ATTRIBUTE, VERSION_ATTRIBUTE } from "../core/page/names";
import { plainSvg } from "../core/page/plain-svg";
import { safetyNoteHtml } from "../core/page/safety-note";
import type { FragmentParts, PageParts } from "../core/page/parts";
import type { DesignState } from "./format";
import { DESIGN_CLASS, DESIGN_STATE_CLASS } from "./names";
import { designSummaryText, designTitle } from "./summary";

const FALLBACK_STYLE = fallbackStyle(DESIGN_CLASS, { caution: true, extra: `.${DESIGN_CLASS} .qf-fallback pre{white-space:pre-wrap;font-family:system-ui,sans-serif}` });

/**
 * A self-contained HTML fragment for one design answer: the static charts and the summary, the
 * state as JSON (question and answer: the page draws the answer it carries, computing nothing),
 * and the bootstrap that turns it into the live charts when the runtime is present.
 */
export function designFragment(state: DesignState, parts: FragmentParts): string {
  const out: string[] = [];
  out.push(`<div class="${DESIGN_CLASS}" ${VERSION_ATTRIBUTE}="${escapeHtml(QUIETFRAME_VERSION)}" ${FINGERPRINT_ATTRIBUTE}="${escapeHtml(state.fingerprint)}">`);
  out.push(`<style>${FALLBACK_STYLE}</style>`);
  out.push(safetyNoteHtml());
  out.push(`<div class="qf-fallback">`);
  if (parts.svg !== undefined) out.push(fallbackFigure(plainSvg(parts.svg)));
  if (parts.png !== undefined) out.push(fallbackPng(parts.png, designTitle(state)));
  out.push(cautionHtml(designCautions(state)));
  out.push(`<pre class="qf-summary">${escapeHtml(designSummaryText(state))}</pre>`);
  out.push(fallbackNote("Static figure: tooltips, the methods text and downloads appear where scripts run (a trusted notebook or a browser page)."));
  out.push(`</div>`);
  out.push(`<script type="application/json" class="${DESIGN_STATE_CLASS}">${jsonForScript(state)}</script>`);
  out.push(`</div>`);
  if (parts.runtime !== undefined) out.push(runtimeScriptTag(parts.runtime));
  out.push(bootstrapScriptTag());
  return out.join("\n");
}

/** A complete HTML document with one design widget (the runtime inside its fragment); needs no network. */
export function designPageDocument(state: DesignState, parts: PageParts): string {
  return htmlDocument(designTitle(state), [designFragment(state, parts)]);
}
