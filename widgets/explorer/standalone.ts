import { QUIETFRAME_VERSION } from "../../src/version";
import type { ExplorerComputation } from "./model";
import type { ExplorerState } from "./format";
import { escapeHtml } from "../core/page/escape";
import { chartTitle, explorerHtml, runtimeScriptTag } from "./fragment";
import { LOADER_CLASS } from "../core/page/names";
import { htmlDocument } from "../core/page/html-document";

/** Static figures for the page's fallback (see ExplorerHtmlOptions). */
export interface StandaloneFigures {
  svg?: string;
  png?: Uint8Array;
}

export const WIDGET_SLOT_ID = "quietframe-widget";

const PAGE_STYLE = `
h2{font-size:1.05rem;font-weight:600;margin-top:2rem}
.${LOADER_CLASS} textarea{width:100%;min-height:8rem;font-family:ui-monospace,monospace;font-size:.85rem}
.${LOADER_CLASS} .qf-loader-row{display:flex;gap:.75rem;align-items:center;margin:.5rem 0;flex-wrap:wrap}
footer{margin-top:2rem;color:#666;font-size:.85rem}
`;

/**
 * A complete HTML document: one live explorer, and a panel to paste or open another state
 * file, rendered by the same runtime. It needs no network: runtime, state and figures are
 * all inline, and nothing refers to an outside URL.
 */
export function standalonePage(state: ExplorerState, computation: ExplorerComputation, figures: StandaloneFigures = {}): string {
  const title = chartTitle(state) || "noise budget";
  const widget = explorerHtml(state, computation, { includeRuntime: false, svg: figures.svg, png: figures.png });
  return htmlDocument(
    title,
    [
      `<div id="${WIDGET_SLOT_ID}">`,
      widget,
      "</div>",
      `<section class="${LOADER_CLASS}" data-quietframe-slot="${WIDGET_SLOT_ID}">`,
      "<h2>Open another state</h2>",
      "<p>Paste a quietframe state file (the JSON that the widget's “Download state” button saves) or choose one; it is checked and recomputed here, nothing is sent anywhere.</p>",
      `<textarea class="qf-loader-text" spellcheck="false" aria-label="state JSON"></textarea>`,
      `<div class="qf-loader-row"><button type="button" class="qf-loader-load">Load pasted state</button>`,
      `<label>or open a file: <input type="file" class="qf-loader-file" accept=".json,application/json"></label></div>`,
      `<div class="qf-loader-alert" role="alert" hidden></div>`,
      "</section>",
      `<footer>Made with quietframe ${escapeHtml(QUIETFRAME_VERSION)}. The numbers are recomputed in this page from the state; the fingerprint shows whether they match the stored ones bit for bit.</footer>`,
      // The runtime boots every widget on the page, and the loader panel, as it installs.
      runtimeScriptTag(),
    ],
    PAGE_STYLE,
  );
}
