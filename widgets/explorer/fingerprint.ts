/** The explorer's fingerprint: SHA-256 over every plotted number of a budget. */
import type { NoiseBudget } from "../../src/index";
import { seriesFingerprint } from "../core/state/series-fingerprint";

/**
 * Fingerprint of computed curves: SHA-256 over the exact IEEE-754 doubles (little-endian) of
 * the frequencies, the total, every budget term and every reference, each preceded by its
 * label. Two runs agree on it only if every plotted number agrees bit for bit.
 */
export function budgetFingerprint(budget: NoiseBudget): string {
  return seriesFingerprint(({ label, series }) => {
    label(`quantity ${budget.quantity.name} [${budget.quantity.unit}]`);
    series("frequencies", budget.frequencies);
    series("total", budget.total);
    for (const t of budget.terms) series(`term ${t.id}`, t.psd);
    for (const r of budget.references) series(`reference ${r.id}`, r.psd);
  });
}
