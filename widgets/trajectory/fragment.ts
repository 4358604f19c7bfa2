/** The trajectory widget's page fragment and standalone page. Pure: the runtime's text is passed in (html.ts reads it in Node). */
import { QUIETFRAME_VERSION } from "../../src/index";
import { trajectoryDocumentText } from "./document";
import type { TrajectoryState } from "./format";
import { trajectoryTitle, type TrajectoryComputation } from "./model";
import { TRAJECTORY_CLASS, TRAJECTORY_STATE_CLASS } from "./names";
import { trajectorySummary } from "./summary";
import { escapeHtml, jsonTextForScript } from "../core/page/escape";
import { cautionHtml, fallbackFigure, fallbackNote, fallbackPng, fallbackStyle, summaryListHtml } from "../core/page/fallback";
import { bootstrapScriptTag, runtimeScriptTag } from "../core/page/bootstrap";
import { safetyNoteHtml } from "../core/page/safety-note";
import { FINGERPRINT_ATTRIBUTE, VERSION_ATTRIBUTE } from "../core/page/names";
import type { FragmentParts, PageParts } from "../core/page/parts";
import { plainSvg } from "../core/page/plain-svg";
import { standaloneShell } from "../core/page/standalone-shell";

const FALLBACK_STYLE = fallbackStyle(TRAJECTORY_CLASS, { caution: true });

/**
 * A self-contained fragment for one trajectory widget: static figure, cautions and summary,
 * the state document as application/json, and a bootstrap that starts the live widget.
 */
export function trajectoryFragment(state: TrajectoryState, computation: TrajectoryComputation, parts: FragmentParts): string {
  const title = trajectoryTitle(state);
  const out: string[] = [];
  out.push(`<div class="${TRAJECTORY_CLASS}" ${VERSION_ATTRIBUTE}="${escapeHtml(QUIETFRAME_VERSION)}" ${FINGERPRINT_ATTRIBUTE}="${escapeHtml(computation.fingerprint)}">`);
  out.push(`<style>${FALLBACK_STYLE}</style>`);
  out.push(safetyNoteHtml());
  out.push(`<div class="qf-fallback">`);
  if (parts.svg !== undefined) out.push(fallbackFigure(plainSvg(parts.svg)));
  if (parts.png !== undefined) out.push(fallbackPng(parts.png, `Trajectories: ${title}`));
  out.push(`<p class="qf-fallback-title"><strong>${escapeHtml(title)}</strong></p>`);
  out.push(cautionHtml(computation.cautions));
  out.push(summaryListHtml(trajectorySummary(computation, state.joint)));
  out.push(fallbackNote("Static figure: the controls appear where scripts run (a trusted notebook or a browser page)."));
  out.push(`</div>`);
  out.push(`<script type="application/json" class="${TRAJECTORY_STATE_CLASS}">${jsonTextForScript(trajectoryDocumentText(state))}</script>`);
  out.push(`</div>`);
  if (parts.runtime !== undefined) out.push(runtimeScriptTag(parts.runtime));
  out.push(bootstrapScriptTag());
  return out.join("\n");
}

/** A standalone page holding one live trajectory widget; it needs no network. */
export function trajectoryPageDocument(state: TrajectoryState, computation: TrajectoryComputation, parts: PageParts): string {
  return standaloneShell(
    trajectoryTitle(state),
    [
      trajectoryFragment(state, computation, { svg: parts.svg, png: parts.png }),
      `<footer><small>Made with quietframe ${escapeHtml(QUIETFRAME_VERSION)}. The simulation runs again in this page from the state (seed, step, duration); the fingerprint shows whether the curves match the stored ones bit for bit.</small></footer>`,
    ],
    parts.runtime,
  );
}
