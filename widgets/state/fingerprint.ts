import type { NoiseBudget } from "../../src/engine/budget";
import { sha256Hex, utf8 } from "./sha256";

/**
 * Fingerprint of computed curves: SHA-256 over the exact IEEE-754 doubles (little-endian) of
 * the frequencies, the total, every budget term and every reference, each preceded by its
 * label. Two runs agree on it only if every plotted number agrees bit for bit.
 */
export function budgetFingerprint(budget: NoiseBudget): string {
  const parts: Uint8Array[] = [];
  const addLabel = (s: string): void => {
    parts.push(utf8(`${s}\n`));
  };
  const addSeries = (label: string, values: Float64Array): void => {
    addLabel(label);
    const bytes = new Uint8Array(values.length * 8);
    const view = new DataView(bytes.buffer);
    values.forEach((v, i) => view.setFloat64(8 * i, v, true));
    parts.push(bytes);
  };
  addLabel(`quantity ${budget.quantity.name} [${budget.quantity.unit}]`);
  addSeries("frequencies", budget.frequencies);
  addSeries("total", budget.total);
  for (const t of budget.terms) addSeries(`term ${t.id}`, t.psd);
  for (const r of budget.references) addSeries(`reference ${r.id}`, r.psd);
  const all = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let offset = 0;
  for (const p of parts) {
    all.set(p, offset);
    offset += p.length;
  }
  return `sha256:${sha256Hex(all)}`;
}
