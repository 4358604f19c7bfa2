/** The entangled-light panel's page fragment and standalone page. Pure: the runtime's text is passed in (html.ts reads it in Node). */
import { QUIETFRAME_VERSION } from "../../src/index";
import { computeEntangled, entangledStateText, entangledSummary, type EntangledComputation, type EntangledState } from "./model";
import { ENTANGLED_CLASS, ENTANGLED_NUMBER_ATTRIBUTES, ENTANGLED_STATE_CLASS } from "./names";
import { escapeHtml, jsonTextForScript } from "../core/page/escape";
import { bootstrapScriptTag, runtimeScriptTag } from "../core/page/bootstrap";
import { fallbackFigure, fallbackNote, fallbackPng, fallbackStyle, summaryListHtml } from "../core/page/fallback";
import { safetyNoteHtml } from "../core/page/safety-note";
import { VERSION_ATTRIBUTE } from "../core/page/names";
import type { FragmentParts, PageParts } from "../core/page/parts";
import { plainSvg } from "../core/page/plain-svg";
import { standaloneShell } from "../core/page/standalone-shell";

const FALLBACK_STYLE = fallbackStyle(ENTANGLED_CLASS);

/**
 * A self-contained fragment for one entangled-light panel: static figure and the numbers as
 * text, the state as application/json, and a bootstrap that starts the live panel.
 */
export function entangledFragment(state: EntangledState, parts: FragmentParts, computation: EntangledComputation = computeEntangled(state)): string {
  const numbers = Object.entries(ENTANGLED_NUMBER_ATTRIBUTES)
    .map(([key, attr]) => ` ${attr}="${escapeHtml(String(computation[key as keyof typeof ENTANGLED_NUMBER_ATTRIBUTES]))}"`)
    .join("");
  const out: string[] = [];
  out.push(`<div class="${ENTANGLED_CLASS}" ${VERSION_ATTRIBUTE}="${escapeHtml(QUIETFRAME_VERSION)}"${numbers}>`);
  out.push(`<style>${FALLBACK_STYLE}</style>`);
  out.push(safetyNoteHtml());
  out.push(`<div class="qf-fallback">`);
  if (parts.svg !== undefined) out.push(fallbackFigure(plainSvg(parts.svg)));
  if (parts.png !== undefined) out.push(fallbackPng(parts.png, `Entangled light: ${state.title}`));
  out.push(`<p class="qf-fallback-title"><strong>${escapeHtml(state.title)}</strong></p>`);
  out.push(summaryListHtml(entangledSummary(state, computation)));
  out.push(fallbackNote("Static figure: the controls appear where scripts run (a trusted notebook or a browser page)."));
  out.push(`</div>`);
  out.push(`<script type="application/json" class="${ENTANGLED_STATE_CLASS}">${jsonTextForScript(entangledStateText(state))}</script>`);
  out.push(`</div>`);
  if (parts.runtime !== undefined) out.push(runtimeScriptTag(parts.runtime));
  // The shared bootstrap: it also says, after a while, when the page never got the runtime.
  out.push(bootstrapScriptTag());
  return out.join("\n");
}

/** A standalone page holding one live panel; it needs no network. */
export function entangledPageDocument(state: EntangledState, parts: PageParts, computation: EntangledComputation = computeEntangled(state)): string {
  return standaloneShell(state.title, [entangledFragment(state, { svg: parts.svg, png: parts.png }, computation)], parts.runtime);
}
