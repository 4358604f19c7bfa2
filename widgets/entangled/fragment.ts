import { QUIETFRAME_VERSION } from "../../src/version";
import { computeEntangled, entangledStateText, entangledSummary, type EntangledComputation, type EntangledState } from "./model";
import { ENTANGLED_CLASS, ENTANGLED_NUMBER_ATTRIBUTES, ENTANGLED_STATE_CLASS } from "./names";
import { base64, escapeHtml, jsonTextForScript } from "../core/page/escape";
import { runtimeSource } from "../core/page/runtime-source";
import { bootstrapScriptTag } from "../explorer/fragment";
import { STATUS_ATTRIBUTE } from "../core/page/names";
import { plainSvg } from "../core/page/plain-svg";

export interface EntangledHtmlOptions {
  /** Carry the browser runtime in this fragment (once per page or notebook). */
  includeRuntime: boolean;
  /** Static SVG of the panel (from renderSvg), shown until the runtime boots. */
  svg?: string;
  /** Static PNG (bytes), shown where inline SVG is stripped. */
  png?: Uint8Array;
}

const FALLBACK_STYLE =
  `.${ENTANGLED_CLASS} .qf-fallback svg+img.qf-fallback-png{display:none}` +
  `.${ENTANGLED_CLASS} .qf-fallback img,.${ENTANGLED_CLASS} .qf-fallback svg{max-width:100%;height:auto}`;

/**
 * A self-contained fragment for one entangled-light panel: static figure and the numbers as
 * text, the state as application/json, and a bootstrap that starts the live panel.
 */
export function entangledHtml(state: EntangledState, options: EntangledHtmlOptions, computation: EntangledComputation = computeEntangled(state)): string {
  const numbers = Object.entries(ENTANGLED_NUMBER_ATTRIBUTES)
    .map(([key, attr]) => ` ${attr}="${escapeHtml(String(computation[key as keyof typeof ENTANGLED_NUMBER_ATTRIBUTES]))}"`)
    .join("");
  const parts: string[] = [];
  parts.push(`<div class="${ENTANGLED_CLASS}" data-quietframe-version="${escapeHtml(QUIETFRAME_VERSION)}"${numbers}>`);
  parts.push(`<style>${FALLBACK_STYLE}</style>`);
  parts.push(`<div class="qf-fallback">`);
  if (options.svg !== undefined) parts.push(plainSvg(options.svg));
  if (options.png !== undefined) parts.push(`<img class="qf-fallback-png" alt="${escapeHtml(`Entangled light: ${state.title}`)}" src="data:image/png;base64,${base64(options.png)}">`);
  parts.push(`<p class="qf-fallback-title"><strong>${escapeHtml(state.title)}</strong></p>`);
  const items = entangledSummary(state, computation).map((l) => `<dt>${escapeHtml(l.label)}</dt><dd>${escapeHtml(l.text)}</dd>`).join("");
  parts.push(`<dl class="qf-summary">${items}</dl>`);
  parts.push(`<p class="qf-fallback-note"><small>Static figure: the controls appear where scripts run (a trusted notebook or a browser page).</small></p>`);
  parts.push(`</div>`);
  parts.push(`<script type="application/json" class="${ENTANGLED_STATE_CLASS}">${jsonTextForScript(entangledStateText(state))}</script>`);
  parts.push(`</div>`);
  if (options.includeRuntime) parts.push(`<script>${runtimeSource()}</script>`);
  // The shared bootstrap: it also says, after a while, when the page never got the runtime.
  parts.push(bootstrapScriptTag());
  return parts.join("\n");
}

export { STATUS_ATTRIBUTE };
