/** The explorer's styles in the page. */
import { widgetBaseCss } from "../../core/browser/styles";
import { injectStyleOnce } from "../../core/browser/dom";
import { EXPLORER_CLASS } from "../names";

/** The explorer's styles, added to the page once however many widgets and runtime copies it holds. */
const STYLE_ID = "quietframe-explorer-style";

const W = `.${EXPLORER_CLASS}`;
const CSS = `${widgetBaseCss(W)}
${W} .qf-controls label{font-weight:500}
${W} .qf-controls output,.qf-unit{font-variant-numeric:tabular-nums;color:#333}
${W} [aria-invalid=true]{outline:2px solid #b3261e;outline-offset:1px}
${W} .qf-notice{border-left:4px solid #a06a00;background:#fdf5e4;color:#4a3300;padding:.45em .7em;white-space:pre-wrap}
${W} .qf-caution{border:2px solid #c77700;background:#fff6de;color:#3d2600;padding:.45em .7em}
${W} .qf-caution strong::before{content:"\\26A0\\FE0E  "}
${W} .qf-caution ul{margin:.2em 0 0;padding-left:1.2em}
${W} .qf-flash{color:#2f5f2f;padding:.2em .7em}
${W} .qf-chart{position:relative}
${W} .qf-canvas{overflow-x:auto}
${W} .qf-pointer{position:absolute;pointer-events:none;background:rgba(255,255,255,.95);border:1px solid #bbb;border-radius:3px;padding:.3em .5em;font-size:12px;line-height:1.35;white-space:nowrap;z-index:2}
${W} .qf-pointer table{border-collapse:collapse}
${W} .qf-pointer td{padding:0 .4em 0 0}
${W} .qf-pointer td:last-child{text-align:right;font-variant-numeric:tabular-nums}
${W} .qf-readout dd{margin:0}
${W} .qf-reach-gauge{display:grid;grid-template-columns:max-content minmax(8em,24em) max-content;gap:.2em .8em;align-items:center;font-size:13px}
${W} .qf-reach-gauge[hidden]{display:none}
${W} .qf-gauge-row{display:contents}
${W} .qf-gauge-track{display:block;height:.7em;background:#ececec;border-radius:2px;overflow:hidden}
${W} .qf-gauge-bar{display:block;height:100%;background:#3a6ea5}
${W} .qf-gauge-initial .qf-gauge-bar{background:#9a9a9a}
${W} .qf-gauge-value{font-variant-numeric:tabular-nums}
${W} .qf-notes{margin:0;padding-left:1.2em;color:#4a4a4a;font-size:13px}
${W} .qf-actions button{font:inherit;font-size:13px;padding:.2em .7em;cursor:pointer}
${W} .qf-copy-fallback{width:100%;min-height:6em;font-family:ui-monospace,monospace;font-size:12px}
`;

export function injectStyles(doc: Document): void {
  injectStyleOnce(STYLE_ID, CSS, doc);
}
