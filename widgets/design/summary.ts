/** The design answer as text: a title, summary lines a notebook prints, and the figure values as people read them. */
import { decodeNumber } from "./answer";
import type { DesignAnswer, DesignState, FigureLabel, PlainNumber } from "./format";

const QUESTION_TITLES = { ranking: "What to improve first", optimum: "Best settings", spread: "Spread of the figure" } as const;

export function designTitle(state: DesignState): string {
  return state.title ?? `${QUESTION_TITLES[state.question.kind]}${state.setup.name ? `: ${state.setup.name}` : ""}`;
}

/** "3.210 dB", "1.23e-36 m²/Hz", "1.07", "no value". */
export function figureText(figure: FigureLabel, value: PlainNumber): string {
  const x = decodeNumber(value);
  if (Number.isNaN(x)) return "no value";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : "−∞";
  if (figure.unit === "dB") return `${x.toFixed(3)} dB`;
  return figure.unit === "" ? x.toPrecision(6) : `${x.toPrecision(6)} ${figure.unit}`;
}

function signedDb(x: PlainNumber, digits: number): string {
  const v = x === null ? NaN : decodeNumber(x);
  return Number.isFinite(v) ? `${v >= 0 ? "+" : ""}${v.toFixed(digits)} dB` : "–";
}

/** Summary lines of an answer. */
export function answerSummary(answer: DesignAnswer): string[] {
  const f = (v: PlainNumber): string => figureText(answer.figure, v);
  switch (answer.kind) {
    case "ranking": {
      const lines = [`${answer.figure.label}: ${f(answer.current)} now (gains in dB, positive = better)`];
      answer.rows.forEach((r, i) => {
        const best = r.best ? `; alone at best ${f(r.best.figure)} at ${r.best.shown} (${r.best.at})` : "";
        lines.push(
          `${i + 1}. ${r.target} = ${r.shown}: ${signedDb(r.gainPer1Percent, 4)} per +1 %, ${r.helps === "neither" ? "neither way helps" : `${r.helps} helps`}${r.bound ? ` (bound ${r.bound})` : ""}${best}`,
        );
        if (r.message) lines.push(`   note: ${r.message}`);
      });
      return lines;
    }
    case "optimum": {
      const lines = [`${answer.figure.label}: ${f(answer.current)} now`];
      if (answer.optimum) {
        lines.push(`best: ${f(answer.optimum.figure)}`);
        for (const v of answer.optimum.values) lines.push(`  ${v.target} = ${v.shown}${v.onBound ? ` (on the ${v.onBound} end)` : ""}`);
      } else lines.push(answer.message);
      const converged = answer.starts.filter((s) => s.status === "converged").length;
      lines.push(`${answer.starts.length} starts (${converged} converged), ${answer.evaluations} evaluations`);
      return lines;
    }
    case "spread": {
      const d = answer.distribution;
      const lines = [
        `${answer.figure.label}: ${f(answer.nominal)} at the centres; ${answer.samples} samples, seed ${answer.seed}`,
        ...answer.uncertain.map((u) => `  ${u.target}: ${u.shown}${u.truncated ? ` (truncated at a bound, ${u.redrawn} redrawn)` : ""}`),
        `median ${f(d.median)}, 5 % ${f(d.p5)}, 95 % ${f(d.p95)}`,
        `first order: ${f(answer.linear.mean)} ± ${decodeNumber(answer.linear.deviation).toPrecision(4)}; ${answer.linear.note}`,
      ];
      if (answer.probability)
        lines.push(`probability of ${f(answer.probability.target)} or better: ${(100 * answer.probability.reached).toFixed(1)} % ± ${(100 * answer.probability.standardError).toFixed(1)} %`);
      if (answer.failed.unstable + answer.failed.invalid > 0)
        lines.push(`samples without a value: ${answer.failed.unstable} unstable, ${answer.failed.invalid} refused; e.g. ${answer.failed.message}`);
      return lines;
    }
  }
}

/** Title and summary as one text (the notebook's text/plain output and the static fallback). */
export function designSummaryText(state: DesignState): string {
  return [designTitle(state), ...answerSummary(state.answer)].join("\n");
}
