/** The static fallback of every kind's fragment: figure, cautions, summary lines. */
import { base64, escapeHtml } from "./escape";
import { CAUTION_HEADING, type SummaryLine } from "./summary-line";

/**
 * The static fallback every kind's fragment shows until the runtime boots (and keeps for
 * viewers without scripts): the figure as SVG and PNG, safety cautions, summary lines.
 */

/**
 * The SVG's box (fallbackFigure) is hidden unless this style sheet applies and the SVG is in
 * it; then only the SVG shows, not the PNG. Where a sanitizer strips the <svg>, the PNG
 * appears instead; where it strips this <style> as well (JupyterLab and Notebook 7 for
 * untrusted outputs), the box stays hidden, so the SVG's loose text labels never show.
 * `caution` adds the safety box's look.
 */
export function fallbackStyle(className: string, options: { caution?: boolean; extra?: string } = {}): string {
  const k = `.${className}`;
  return (
    `${k} .qf-fallback .qf-fallback-svg:has(svg){display:block}` +
    `${k} .qf-fallback .qf-fallback-svg:has(svg)+img.qf-fallback-png{display:none}` +
    `${k} .qf-fallback img,${k} .qf-fallback svg{max-width:100%;height:auto}` +
    (options.caution
      ? `${k} .qf-fallback .qf-caution{border:2px solid #c77700;background:#fff6de;color:#3d2600;padding:.45em .7em;margin:.5em 0}${k} .qf-fallback .qf-caution ul{margin:.2em 0 0;padding-left:1.2em}`
      : "") +
    (options.extra ?? "")
  );
}

/**
 * The static SVG (checked by the caller) in the box fallbackStyle shows; hidden wherever that
 * style sheet is gone. `hidden="hidden"`, not a bare `hidden`: JupyterLab's sanitizer drops
 * the attribute when its value is empty.
 */
export function fallbackFigure(svg: string): string {
  return `<div class="qf-fallback-svg" hidden="hidden">${svg}</div>`;
}

/** The PNG fallback as an inline image; `alt` is escaped here. */
export function fallbackPng(png: Uint8Array, alt: string): string {
  return `<img class="qf-fallback-png" alt="${escapeHtml(alt)}" src="data:image/png;base64,${base64(png)}">`;
}

/** The components' safety cautions as a box of their own (nothing when there are none). */
export function cautionHtml(cautions: readonly string[]): string {
  if (cautions.length === 0) return "";
  const items = cautions.map((c) => `<li>${escapeHtml(c)}</li>`).join("");
  return `<div class="qf-caution" role="note"><strong>${escapeHtml(CAUTION_HEADING)}</strong><ul>${items}</ul></div>`;
}

/** Summary lines as a definition list. */
export function summaryListHtml(lines: readonly SummaryLine[]): string {
  return `<dl class="qf-summary">${lines.map((l) => `<dt>${escapeHtml(l.label)}</dt><dd>${escapeHtml(l.text)}</dd>`).join("")}</dl>`;
}

/**
 * How to trust a notebook, under every static fallback: an untrusted notebook shows the
 * fallback without scripts, and the figure as the still image of the PNG output that follows
 * the page (core/notebook/figure-output.ts).
 */
export const TRUST_HINT =
  "In a notebook that is not trusted the controls stay off and the figure is a still image: check where the notebook came from, then trust it (JupyterLab: Trust Notebook in the command palette; Notebook 7 and the classic notebook: File → Trust Notebook).";

/** The note under every static figure, with how to trust a notebook. */
export function fallbackNote(text: string): string {
  return `<p class="qf-fallback-note"><small>${escapeHtml(text)}</small></p><p class="qf-fallback-note qf-trust-hint"><small>${escapeHtml(TRUST_HINT)}</small></p>`;
}
