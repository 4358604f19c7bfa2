/** The look every kind's live widget shares (font, layout, controls grid, alerts, readout, toolbar). */

/** Rules scoped to a kind's root selector, e.g. ".quietframe-explorer"; each kind adds its own after these. */
export function widgetBaseCss(root: string): string {
  return `
${root}{font-family:system-ui,sans-serif;font-size:14px;color:#1d1d1d;max-width:100%;margin:.5em 0}
${root} .qf-live{display:flex;flex-direction:column;gap:.6em}
${root} .qf-controls{display:grid;grid-template-columns:minmax(8em,max-content) minmax(10em,22em) auto;gap:.35em .8em;align-items:center}
${root} .qf-controls input[type=range]{width:100%}
${root} .qf-controls input[type=text]{width:100%;box-sizing:border-box;font:inherit}
${root} .qf-controls input.qf-exact{width:8em;margin-left:.6em}
${root} .qf-controls .qf-exact-error{display:block;color:#a00;font-size:.9em}
${root} .qf-alert{border-left:4px solid #b3261e;background:#fbeceb;color:#5c1410;padding:.45em .7em;white-space:pre-wrap}
${root} .qf-readout{display:grid;grid-template-columns:max-content 1fr;gap:.15em .8em;margin:0}
${root} .qf-readout dt{font-weight:500}
${root} .qf-actions{display:flex;flex-wrap:wrap;gap:.4em}`;
}
