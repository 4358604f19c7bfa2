import type { NoiseBudget } from "../engine/budget";
import { bestMargin } from "../engine/headline";
import { log10 } from "../numeric/portable-math";
import { inspiralRange } from "../reach";
import type { FigurePlan } from "./spec";

/** A budget reduced to one figure of merit (the definitions are beside the figure specs in spec.ts). */

/** The figure of merit of one budget; `frequencies` are the budget's. */
export function figureValue(figure: FigurePlan, budget: NoiseBudget, frequencies: Float64Array): number {
  switch (figure.kind) {
    case "margin-at": {
      const sql = sqlOf(budget);
      // The same expression as the headline margin.
      return 10 * log10(sql[figure.index] / budget.total[figure.index]);
    }
    case "margin-band": {
      const sql = sqlOf(budget);
      let reference = 0;
      let noise = 0;
      for (let i = figure.first; i <= figure.last; i++) {
        reference += sql[i];
        noise += budget.total[i];
      }
      return 10 * log10(reference / noise);
    }
    case "best-margin":
      return bestMargin(budget).bestMarginDb;
    case "range-gain": {
      if (budget.quantity.name !== "strain") throw new Error(`internal: a range-gain cell is referred to ${budget.quantity.name}`);
      const ratio = inspiralRange(frequencies, budget.total, figure.inspiral).metres / figure.referenceMetres;
      return figure.measure === "range" ? ratio : ratio * ratio * ratio;
    }
    case "noise-at":
      return budget.total[figure.index];
  }
}

function sqlOf(budget: NoiseBudget): Float64Array {
  const sql = budget.references.find((r) => r.id === "sql");
  if (!sql) throw new Error("internal: a margin cell has no SQL reference");
  return sql.psd;
}
