/** Front-end module "quietframe-live": the chart view's styles. */
import { injectStyleOnce } from "../../core/browser/dom";
import { CHART_VIEW_CLASS } from "../live/names";

/** Styles of the chart view, added once per page. Our own class, so the kernel-free runtime never boots it. */
const STYLE_ID = "quietframe-live-style";
const R = `.${CHART_VIEW_CLASS}`;
const CSS = `
${R}{font-family:system-ui,sans-serif;font-size:14px;color:#1d1d1d;display:flex;flex-direction:column;gap:.5em;margin:.4em 0}
${R} .qf-alert{border-left:4px solid #b3261e;background:#fbeceb;color:#5c1410;padding:.45em .7em;white-space:pre-wrap}
${R} .qf-alert[hidden],${R} .qf-caution[hidden]{display:none}
${R} .qf-caution{border:2px solid #c77700;background:#fff6de;color:#3d2600;padding:.45em .7em}
${R} .qf-caution ul{margin:.2em 0 0;padding-left:1.2em}
${R} .qf-chart{position:relative}
${R} .qf-canvas{overflow-x:auto}
${R} .qf-pointer{position:absolute;pointer-events:none;background:rgba(255,255,255,.95);border:1px solid #bbb;border-radius:3px;padding:.3em .5em;font-size:12px;line-height:1.35;white-space:nowrap;z-index:2}
${R} .qf-pointer table{border-collapse:collapse}
${R} .qf-pointer td{padding:0 .4em 0 0}
${R} .qf-readout{display:grid;grid-template-columns:max-content 1fr;gap:.15em .8em;margin:0}
${R} .qf-readout dt{font-weight:500;white-space:nowrap;width:auto;float:none;margin:0}
${R} .qf-readout dd{margin:0}
`;

export function injectLiveStyles(doc: Document): void {
  injectStyleOnce(STYLE_ID, CSS, doc);
}
