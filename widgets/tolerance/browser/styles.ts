/** The tolerance map's styles in the page. */
import { injectStyleOnce } from "../../core/browser/dom";
import { TOLERANCE_CLASS } from "../names";

/** The tolerance map's styles, added to the page once however many maps and runtime copies it holds. */
const STYLE_ID = "quietframe-tolerance-style";

const T = `.${TOLERANCE_CLASS}`;
const CSS = `
${T}{font-family:system-ui,sans-serif;font-size:14px;color:#1d1d1d;max-width:100%;margin:.5em 0}
${T} .qf-live{display:flex;flex-direction:column;gap:.5em}
${T} .qf-heatmap{overflow-x:auto;cursor:pointer;align-self:flex-start}
${T} .qf-heatmap:focus-visible{outline:2px solid #1b4f72;outline-offset:2px}
${T} .qf-cell-cursor{font-size:13px;color:#333;font-variant-numeric:tabular-nums}
${T}>.qf-alert,${T} .qf-cell-note{border-left:4px solid #a06a00;background:#fdf5e4;color:#4a3300;padding:.45em .7em;white-space:pre-wrap}
${T} .qf-cell-explorer .quietframe-explorer{border-top:1px solid #ddd;padding-top:.5em}
`;

export function injectToleranceStyles(doc: Document): void {
  injectStyleOnce(STYLE_ID, CSS, doc);
}
