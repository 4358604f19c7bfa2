import { QUIETFRAME_VERSION } from "../../src/version";
import { TOLERANCE_CLASS, TOLERANCE_STATE_CLASS } from "./names";
import { toleranceSummaryText, type ToleranceWidgetState } from "./model";
import { base64, escapeHtml, jsonForScript } from "../core/page/escape";
import { bootstrapScriptTag, runtimeScriptTag } from "../explorer/fragment";
import { htmlDocument } from "../core/page/html-document";

export interface ToleranceHtmlOptions {
  /** Carry the browser runtime in this fragment (once per page or notebook; see ExplorerHtmlOptions). */
  includeRuntime: boolean;
  /** Static SVG of the heat map (from renderSvg), shown until the runtime boots. */
  svg?: string;
  /** Static PNG of the heat map, shown where inline SVG is stripped. */
  png?: Uint8Array;
}

const FALLBACK_STYLE =
  `.${TOLERANCE_CLASS} .qf-fallback svg+img.qf-fallback-png{display:none}` +
  `.${TOLERANCE_CLASS} .qf-fallback img,.${TOLERANCE_CLASS} .qf-fallback svg{max-width:100%;height:auto}` +
  `.${TOLERANCE_CLASS} .qf-fallback pre{white-space:pre-wrap;font-family:system-ui,sans-serif}`;

/**
 * A self-contained HTML fragment for one tolerance map: the static heat map and its summary,
 * the map's state as JSON (data, base set-up and spec: the page recomputes nothing to draw
 * it), and the bootstrap that turns it into the live heat map when the runtime is present.
 */
export function toleranceHtml(state: ToleranceWidgetState, options: ToleranceHtmlOptions): string {
  const title = state.settings.title ?? state.setup.name ?? "tolerance map";
  const parts: string[] = [];
  parts.push(`<div class="${TOLERANCE_CLASS}" data-quietframe-version="${escapeHtml(QUIETFRAME_VERSION)}">`);
  parts.push(`<style>${FALLBACK_STYLE}</style>`);
  parts.push(`<div class="qf-fallback">`);
  if (options.svg !== undefined) parts.push(plainSvg(options.svg));
  if (options.png !== undefined) {
    parts.push(`<img class="qf-fallback-png" alt="${escapeHtml(`Tolerance map: ${title}`)}" src="data:image/png;base64,${base64(options.png)}">`);
  }
  parts.push(`<pre class="qf-summary">${escapeHtml(toleranceSummaryText(state))}</pre>`);
  parts.push(`<p class="qf-fallback-note"><small>Static figure: clicking a cell opens its explorer where scripts run (a trusted notebook or a browser page).</small></p>`);
  parts.push(`</div>`);
  parts.push(`<script type="application/json" class="${TOLERANCE_STATE_CLASS}">${jsonForScript(state)}</script>`);
  parts.push(`</div>`);
  if (options.includeRuntime) parts.push(runtimeScriptTag());
  parts.push(bootstrapScriptTag());
  return parts.join("\n");
}

/** A complete HTML document with one live tolerance map; needs no network. */
export function tolerancePage(state: ToleranceWidgetState, figures: { svg?: string; png?: Uint8Array } = {}): string {
  const title = state.settings.title ?? state.setup.name ?? "tolerance map";
  return htmlDocument(title, [toleranceHtml(state, { includeRuntime: true, svg: figures.svg, png: figures.png })]);
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
