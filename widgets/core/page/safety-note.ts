/** The standing one-line safety note every widget fragment carries, whatever its cautions. */
import { escapeHtml } from "./escape";

/** Points to the README's safety section; set-up-specific cautions are listed apart from it. */
export const SAFETY_NOTE_TEXT =
  "quietframe computes and does not certify: before building a set-up, read the Safety section of the quietframe README and follow your local rules and licensed practice.";

/**
 * The note as a paragraph of the widget's root, outside its static fallback, so it stays on
 * screen when the live widget replaces the fallback.
 */
export function safetyNoteHtml(): string {
  return `<p class="qf-safety-note" role="note"><small>${escapeHtml(SAFETY_NOTE_TEXT)}</small></p>`;
}
