/** Strict reading of a design answer carried in a page or file: every field checked, a fresh copy built. */
import { expectArray, expectRecord } from "../core/state/strict-read";
import { finite, finiteList, flag, plain, plainList, range, record, text, textOrNull, whole, word } from "./fields";
import type { DesignAnswer, FigureLabel, OptimumAnswer, QuestionKind, RankingAnswer, SpreadAnswer } from "./format";

const COUNT = 1e15;

/** Reads the answer to a question of `kind`; an answer of another kind is refused at `path.kind`. */
export function checkAnswer(input: unknown, path: string, kind: QuestionKind): DesignAnswer {
  word(expectRecord(input, path, `the answer to a ${kind} question`).kind, [kind], `${path}.kind`);
  const o = record(input, path, ANSWER_KEYS[kind], `the answer to a ${kind} question`);
  switch (kind) {
    case "ranking":
      return rankingAnswer(o, path);
    case "optimum":
      return optimumAnswer(o, path);
    case "spread":
      return spreadAnswer(o, path);
  }
}

const ANSWER_KEYS: Record<QuestionKind, readonly string[]> = {
  ranking: ["kind", "figure", "current", "rows", "evaluations"],
  optimum: ["kind", "figure", "status", "current", "optimum", "starts", "curves", "evaluations", "message"],
  spread: ["kind", "figure", "nominal", "samples", "seed", "uncertain", "failed", "distribution", "probability", "linear", "values", "bands", "evaluations"],
};

function figureLabel(v: unknown, path: string): FigureLabel {
  const o = record(v, path, ["kind", "label", "unit", "better"], "a figure of merit");
  return {
    kind: text(o.kind, `${path}.kind`, 40),
    label: text(o.label, `${path}.label`, 400),
    unit: text(o.unit, `${path}.unit`, 40),
    better: word(o.better, ["higher", "lower"] as const, `${path}.better`),
  };
}

function rankingAnswer(o: Record<string, unknown>, path: string): RankingAnswer {
  const rows = expectArray(o.rows, `${path}.rows`, "an array of ranked parameters").map((r, i) => {
    const at = `${path}.rows[${i}]`;
    const row = record(r, at, ["target", "value", "shown", "gainPer1Percent", "gainError", "gainFor10Percent", "helps", "bound", "best", "message"], "a ranked parameter");
    let best: RankingAnswer["rows"][number]["best"] = null;
    if (row.best !== null) {
      const b = record(row.best, `${at}.best`, ["value", "shown", "figure", "gainDb", "at", "range"], "the best value alone");
      best = {
        value: finite(b.value, `${at}.best.value`),
        shown: text(b.shown, `${at}.best.shown`, 200),
        figure: plain(b.figure, `${at}.best.figure`),
        gainDb: plain(b.gainDb, `${at}.best.gainDb`),
        at: text(b.at, `${at}.best.at`, 40),
        range: range(b.range, `${at}.best.range`),
      };
    }
    return {
      target: text(row.target, `${at}.target`, 200),
      value: finite(row.value, `${at}.value`),
      shown: text(row.shown, `${at}.shown`, 200),
      gainPer1Percent: plain(row.gainPer1Percent, `${at}.gainPer1Percent`),
      gainError: plain(row.gainError, `${at}.gainError`),
      gainFor10Percent: plain(row.gainFor10Percent, `${at}.gainFor10Percent`),
      helps: word(row.helps, ["increase", "decrease", "neither"] as const, `${at}.helps`),
      bound: textOrNull(row.bound, `${at}.bound`),
      best,
      message: textOrNull(row.message, `${at}.message`),
    };
  });
  return { kind: "ranking", figure: figureLabel(o.figure, `${path}.figure`), current: plain(o.current, `${path}.current`), rows, evaluations: whole(o.evaluations, `${path}.evaluations`, 0, COUNT) };
}

function optimumAnswer(o: Record<string, unknown>, path: string): OptimumAnswer {
  let optimum: OptimumAnswer["optimum"] = null;
  if (o.optimum !== null) {
    const p = record(o.optimum, `${path}.optimum`, ["figure", "values"], "the optimum");
    const values = expectArray(p.values, `${path}.optimum.values`, "an array of optimized values").map((v, i) => {
      const at = `${path}.optimum.values[${i}]`;
      const q = record(v, at, ["target", "value", "shown", "range", "onBound"], "an optimized value");
      return {
        target: text(q.target, `${at}.target`, 200),
        value: finite(q.value, `${at}.value`),
        shown: text(q.shown, `${at}.shown`, 200),
        range: range(q.range, `${at}.range`),
        onBound: textOrNull(q.onBound, `${at}.onBound`),
      };
    });
    optimum = { figure: plain(p.figure, `${path}.optimum.figure`), values };
  }
  const starts = expectArray(o.starts, `${path}.starts`, "an array of start reports").map((s, i) => {
    const at = `${path}.starts[${i}]`;
    const q = record(s, at, ["status", "figure", "evaluations", "message"], "a start report");
    return {
      status: text(q.status, `${at}.status`, 40),
      figure: plain(q.figure, `${at}.figure`),
      evaluations: whole(q.evaluations, `${at}.evaluations`, 0, COUNT),
      message: textOrNull(q.message, `${at}.message`),
    };
  });
  let curves: OptimumAnswer["curves"] = null;
  if (o.curves !== null) {
    const c = record(o.curves, `${path}.curves`, ["frequencies", "before", "after", "unit"], "the noise before and after");
    const frequencies = finiteList(c.frequencies, `${path}.curves.frequencies`);
    curves = {
      frequencies,
      before: plainList(c.before, `${path}.curves.before`, frequencies.length),
      after: plainList(c.after, `${path}.curves.after`, frequencies.length),
      unit: text(c.unit, `${path}.curves.unit`, 40),
    };
  }
  return {
    kind: "optimum",
    figure: figureLabel(o.figure, `${path}.figure`),
    status: word(o.status, ["ok", "infeasible"] as const, `${path}.status`),
    current: plain(o.current, `${path}.current`),
    optimum,
    starts,
    curves,
    evaluations: whole(o.evaluations, `${path}.evaluations`, 0, COUNT),
    message: text(o.message, `${path}.message`),
  };
}

function spreadAnswer(o: Record<string, unknown>, path: string): SpreadAnswer {
  const samples = whole(o.samples, `${path}.samples`, 2, 100_000);
  const uncertain = expectArray(o.uncertain, `${path}.uncertain`, "an array of uncertain parameters").map((u, i) => {
    const at = `${path}.uncertain[${i}]`;
    const q = record(u, at, ["target", "shown", "centre", "spread", "distribution", "truncated", "redrawn"], "an uncertain parameter");
    return {
      target: text(q.target, `${at}.target`, 200),
      shown: text(q.shown, `${at}.shown`, 200),
      centre: finite(q.centre, `${at}.centre`),
      spread: finite(q.spread, `${at}.spread`),
      distribution: word(q.distribution, ["normal", "uniform"] as const, `${at}.distribution`),
      truncated: flag(q.truncated, `${at}.truncated`),
      redrawn: whole(q.redrawn, `${at}.redrawn`, 0, COUNT),
    };
  });
  const f = record(o.failed, `${path}.failed`, ["unstable", "invalid", "message"], "the samples without a value");
  const d = record(o.distribution, `${path}.distribution`, ["median", "p5", "p95", "mean", "deviation"], "the distribution of the figure");
  let probability: SpreadAnswer["probability"] = null;
  if (o.probability !== null) {
    const p = record(o.probability, `${path}.probability`, ["target", "reached", "standardError"], "the probability of reaching the target");
    probability = {
      target: finite(p.target, `${path}.probability.target`),
      reached: finite(p.reached, `${path}.probability.reached`),
      standardError: finite(p.standardError, `${path}.probability.standardError`),
    };
  }
  const l = record(o.linear, `${path}.linear`, ["mean", "deviation", "holds", "note"], "the first-order propagation");
  let bands: SpreadAnswer["bands"] = null;
  if (o.bands !== null) {
    const b = record(o.bands, `${path}.bands`, ["frequencies", "p5", "median", "p95", "unit"], "the noise bands");
    const frequencies = finiteList(b.frequencies, `${path}.bands.frequencies`);
    const n = frequencies.length;
    bands = {
      frequencies,
      p5: plainList(b.p5, `${path}.bands.p5`, n),
      median: plainList(b.median, `${path}.bands.median`, n),
      p95: plainList(b.p95, `${path}.bands.p95`, n),
      unit: text(b.unit, `${path}.bands.unit`, 40),
    };
  }
  return {
    kind: "spread",
    figure: figureLabel(o.figure, `${path}.figure`),
    nominal: plain(o.nominal, `${path}.nominal`),
    samples,
    seed: whole(o.seed, `${path}.seed`, 0, 4294967295),
    uncertain,
    failed: {
      unstable: whole(f.unstable, `${path}.failed.unstable`, 0, samples),
      invalid: whole(f.invalid, `${path}.failed.invalid`, 0, samples),
      message: textOrNull(f.message, `${path}.failed.message`),
    },
    distribution: {
      median: plain(d.median, `${path}.distribution.median`),
      p5: plain(d.p5, `${path}.distribution.p5`),
      p95: plain(d.p95, `${path}.distribution.p95`),
      mean: plain(d.mean, `${path}.distribution.mean`),
      deviation: plain(d.deviation, `${path}.distribution.deviation`),
    },
    probability,
    linear: {
      mean: plain(l.mean, `${path}.linear.mean`),
      deviation: plain(l.deviation, `${path}.linear.deviation`),
      holds: flag(l.holds, `${path}.linear.holds`),
      note: text(l.note, `${path}.linear.note`),
    },
    values: plainList(o.values, `${path}.values`, samples),
    bands,
    evaluations: whole(o.evaluations, `${path}.evaluations`, 0, COUNT),
  };
}
