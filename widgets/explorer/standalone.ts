/** The explorer's standalone page (one explorer and a panel to open another state). Pure: see html.ts for Node. */
import { QUIETFRAME_VERSION } from "../../src/index";
import type { ExplorerComputation } from "./model";
import type { ExplorerState } from "./format";
import { escapeHtml } from "../core/page/escape";
import { chartTitle, explorerFragment } from "./fragment";
import { LOADER_CLASS } from "./names";
import type { PageParts } from "../core/page/parts";
import { standaloneShell } from "../core/page/standalone-shell";

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
export function explorerPage(state: ExplorerState, computation: ExplorerComputation, parts: PageParts): string {
  const title = chartTitle(state) || "noise budget";
  const widget = explorerFragment(state, computation, { svg: parts.svg, png: parts.png });
  return standaloneShell(
    title,
    [
      `<div id="${WIDGET_SLOT_ID}">`,
      widget,
      "</div>",
      `<section class="${LOADER_CLASS}" data-quietframe-slot="${WIDGET_SLOT_ID}">`,
      "<h2>Open another state</h2>",
      "<p>Paste a quietframe state file (the JSON that the “Download state” button of any quietframe widget saves: an explorer, a trajectory run, an entangled-light panel, a tolerance map or a design answer) or choose one; it is checked and recomputed here, nothing is sent anywhere.</p>",
      `<textarea class="qf-loader-text" spellcheck="false" aria-label="state JSON"></textarea>`,
      `<div class="qf-loader-row"><button type="button" class="qf-loader-load">Load pasted state</button>`,
      `<label>or open a file: <input type="file" class="qf-loader-file" accept=".json,application/json"></label></div>`,
      `<div class="qf-loader-alert" role="alert" hidden></div>`,
      "</section>",
      `<footer>Made with quietframe ${escapeHtml(QUIETFRAME_VERSION)}. The numbers are recomputed in this page from the state; the fingerprint shows whether they match the stored ones bit for bit.</footer>`,
    ],
    // The runtime, last, boots every widget on the page, and the loader panel, as it installs.
    parts.runtime,
    PAGE_STYLE,
  );
}
