/**
 * A widget's figures as short labelled lines of plain text. The static fallback, the live
 * readout and text/plain all show these, so a reader without scripts sees the same numbers.
 */
export interface SummaryLine {
  readonly label: string;
  readonly text: string;
}

/** Heading of the safety box (live widgets and static fallbacks) above the components' cautions. */
export const CAUTION_HEADING = "Safety caution";
