import { QUIETFRAME_VERSION } from "../../src/version";
import { trajectoryDocumentText } from "./document";
import type { TrajectoryState } from "./format";
import { trajectoryTitle, type TrajectoryComputation } from "./model";
import { TRAJECTORY_CLASS, TRAJECTORY_STATE_CLASS } from "./names";
import { trajectorySummary } from "./summary";
import { base64, escapeHtml, jsonTextForScript } from "../core/page/escape";
import { cautionHtml, RUNTIME_MISSING_TEXT, runtimeScriptTag } from "../explorer/fragment";
import { FINGERPRINT_ATTRIBUTE, RUNTIME_READY_EVENT, STATUS_ATTRIBUTE } from "../core/page/names";
import { htmlDocument } from "../core/page/html-document";
import { plainSvg } from "../core/page/plain-svg";

export interface TrajectoryHtmlOptions {
  /** Carry the browser runtime in this fragment (once per page or notebook). */
  includeRuntime: boolean;
  /** Static SVG of the charts, shown until the runtime boots. */
  svg?: string;
  /** Static PNG (bytes), shown where inline SVG is stripped. */
  png?: Uint8Array;
}

// Boots with the runtime on the page, or waits for it; says so when it never comes.
const BOOTSTRAP =
  `(function(){var w=window,d=document,r=w.quietframeRuntime;if(r&&r.boot){r.boot();return;}` +
  `w.addEventListener("${RUNTIME_READY_EVENT}",function(){w.quietframeRuntime.boot();},{once:true});` +
  `setTimeout(function(){if(w.quietframeRuntime)return;` +
  `d.querySelectorAll(".${TRAJECTORY_CLASS}:not([${STATUS_ATTRIBUTE}]) .qf-fallback").forEach(function(f){` +
  `if(f.querySelector(".qf-runtime-missing"))return;var p=d.createElement("p");p.className="qf-runtime-missing";` +
  `p.textContent=${JSON.stringify(RUNTIME_MISSING_TEXT)};f.appendChild(p);});},4000);})();`;

const FALLBACK_STYLE =
  `.${TRAJECTORY_CLASS} .qf-fallback svg+img.qf-fallback-png{display:none}` +
  `.${TRAJECTORY_CLASS} .qf-fallback img,.${TRAJECTORY_CLASS} .qf-fallback svg{max-width:100%;height:auto}` +
  `.${TRAJECTORY_CLASS} .qf-fallback .qf-caution{border:2px solid #c77700;background:#fff6de;color:#3d2600;padding:.45em .7em;margin:.5em 0}` +
  `.${TRAJECTORY_CLASS} .qf-fallback .qf-caution ul{margin:.2em 0 0;padding-left:1.2em}`;

/**
 * A self-contained fragment for one trajectory widget: static figure, cautions and summary,
 * the state document as application/json, and a bootstrap that starts the live widget.
 */
export function trajectoryHtml(state: TrajectoryState, computation: TrajectoryComputation, options: TrajectoryHtmlOptions): string {
  const title = trajectoryTitle(state);
  const parts: string[] = [];
  parts.push(`<div class="${TRAJECTORY_CLASS}" data-quietframe-version="${escapeHtml(QUIETFRAME_VERSION)}" ${FINGERPRINT_ATTRIBUTE}="${escapeHtml(computation.fingerprint)}">`);
  parts.push(`<style>${FALLBACK_STYLE}</style>`);
  parts.push(`<div class="qf-fallback">`);
  if (options.svg !== undefined) parts.push(plainSvg(options.svg));
  if (options.png !== undefined) parts.push(`<img class="qf-fallback-png" alt="${escapeHtml(`Trajectories: ${title}`)}" src="data:image/png;base64,${base64(options.png)}">`);
  parts.push(`<p class="qf-fallback-title"><strong>${escapeHtml(title)}</strong></p>`);
  parts.push(cautionHtml(computation.cautions));
  const items = trajectorySummary(computation, state.joint).map((l) => `<dt>${escapeHtml(l.label)}</dt><dd>${escapeHtml(l.text)}</dd>`).join("");
  parts.push(`<dl class="qf-summary">${items}</dl>`);
  parts.push(`<p class="qf-fallback-note"><small>Static figure: the controls appear where scripts run (a trusted notebook or a browser page).</small></p>`);
  parts.push(`</div>`);
  parts.push(`<script type="application/json" class="${TRAJECTORY_STATE_CLASS}">${jsonTextForScript(trajectoryDocumentText(state))}</script>`);
  parts.push(`</div>`);
  if (options.includeRuntime) parts.push(runtimeScriptTag());
  parts.push(`<script>${BOOTSTRAP}</script>`);
  return parts.join("\n");
}

/** A standalone page holding one live trajectory widget; it needs no network. */
export function trajectoryPage(state: TrajectoryState, computation: TrajectoryComputation, figures: { svg?: string; png?: Uint8Array } = {}): string {
  return htmlDocument(trajectoryTitle(state), [
    trajectoryHtml(state, computation, { includeRuntime: false, svg: figures.svg, png: figures.png }),
    `<footer><small>Made with quietframe ${escapeHtml(QUIETFRAME_VERSION)}. The simulation runs again in this page from the state (seed, step, duration); the fingerprint shows whether the curves match the stored ones bit for bit.</small></footer>`,
    runtimeScriptTag(),
  ]);
}

