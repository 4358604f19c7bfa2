import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { runCliAsync } from "../../../src/cli/run";
import { optimizeDesign, QuietframeError, rankParameters, spreadAnalysis, type FigureSpec, type SetupDescription } from "../../../src/index";
import { decodeNumber, rankingAnswer, rankOneByOne } from "../../../widgets/design/answer";
import { designDocumentText, loadDesignState, readDesignState } from "../../../widgets/design/document";
import { answerFingerprint } from "../../../widgets/design/fingerprint";
import type { OptimumAnswer, RankingAnswer, SpreadAnswer } from "../../../widgets/design/format";
import { designMethods } from "../../../widgets/design/methods";
import { optimumWidget, PROGRESS_LABELS, progressReporter, rankingWidget, spreadWidget, designWidget } from "../../../widgets/design/notebook";
import { bandRows, curvePoints, gainBars, histogramMarks, spreadHistogram } from "../../../widgets/design/specs";
import { loadWidgetState } from "../../../widgets/registry";
import { kindOutput } from "../../../widgets/core/render/kind-output";

/**
 * The design widget against the engine's own answers (rankParameters, optimizeDesign,
 * spreadAnalysis are the reference: the widget must plot exactly their numbers), its state's round
 * trip and strict reading, and the recomputation of a saved state to the same fingerprint.
 * Set-up: examples/free-test-mass.json (an invented scenario) on a coarse grid to keep it quick.
 */
const setup = JSON.parse(readFileSync("examples/free-test-mass.json", "utf8")) as SetupDescription;
const grid = { from: "10 Hz", to: "10 kHz", points: 31 };
const margin: FigureSpec = { kind: "margin-at", frequency: "300 Hz" };

const ranking = rankingWidget(setup, margin, { grid, parameters: ["arm.power", "detector.efficiency", "mirror.mass"], scanPoints: 7 });
const spread = spreadWidget(setup, margin, [{ target: "detector.efficiency", value: "95 % ± 2 %" }], { grid, samples: 200, seed: 7, target: "0 dB" });
const optimum = optimumWidget(setup, margin, [{ target: "arm.power", min: "1 mW", max: "1 W" }], { grid, starts: 2, seed: 3 });

describe("design widget: the plotted rows are the engine's numbers", () => {
  it("bars are rankParameters' gains per 1 % (magnitude, the helping direction, ± the error), in rank order", () => {
    const engine = rankParameters(setup, margin, { grid, parameters: ["arm.power", "detector.efficiency", "mirror.mass"], scanPoints: 7 });
    const bars = gainBars(ranking.result as RankingAnswer);
    const withGain = engine.parameters.filter((p) => p.gainPer1Percent !== null);
    expect(bars.map((b) => b.target)).toEqual(withGain.map((p) => p.target));
    bars.forEach((b, i) => {
      const p = withGain[i];
      expect(b.gain).toBe(Math.abs(p.gainPer1Percent!));
      expect(b.high - b.gain).toBeCloseTo(p.gainPer1PercentError!, 15);
      expect(b.direction.startsWith(p.helps === "neither" ? "either" : p.helps)).toBe(true);
    });
  });

  it("histogram counts sum to the samples with a value and match a direct count; marks are spreadAnalysis' percentiles; band = its bands", () => {
    const engine = spreadAnalysis(setup, margin, [{ target: "detector.efficiency", value: "95 % ± 2 %" }], { grid, samples: 200, seed: 7, target: "0 dB" });
    const answer = spread.result as SpreadAnswer;
    expect(answer.values.map(decodeNumber)).toEqual(Array.from(engine.values));
    const bins = spreadHistogram(answer);
    const withValue = Array.from(engine.values).filter((v) => Number.isFinite(v));
    expect(bins.reduce((n, b) => n + b.count, 0)).toBe(withValue.length);
    expect(withValue.length).toBe(200 - engine.failed.unstable - engine.failed.invalid);
    for (const [k, b] of bins.entries()) {
      const last = k === bins.length - 1;
      expect(b.count).toBe(withValue.filter((v) => v >= b.x0 && (last ? v <= b.x1 : v < b.x1)).length);
    }
    const marks = Object.fromEntries(histogramMarks(answer).map((m) => [m.mark, m.value]));
    expect(marks).toEqual({ "5 %": engine.distribution.p5, median: engine.distribution.median, "95 %": engine.distribution.p95, target: 0 });
    const band = bandRows(answer);
    expect(band.map((r) => r.f)).toEqual(Array.from(engine.bands!.frequencies));
    expect(band.map((r) => r.p5)).toEqual(Array.from(engine.bands!.p5));
    expect(band.map((r) => r.median)).toEqual(Array.from(engine.bands!.median));
    expect(band.map((r) => r.p95)).toEqual(Array.from(engine.bands!.p95));
  });

  it("the optimum is optimizeDesign's, and its curves are the total noise before and at it", () => {
    const engine = optimizeDesign(setup, margin, [{ target: "arm.power", min: "1 mW", max: "1 W" }], { grid, starts: 2, seed: 3 });
    const answer = optimum.result as OptimumAnswer;
    expect(answer.optimum!.figure).toBe(engine.optimum!.figure);
    expect(answer.optimum!.values[0].value).toBe(engine.optimum!.values[0].value);
    const points = curvePoints(answer);
    expect(points.filter((p) => p.curve === "as given").length).toBe(31);
    expect(points.filter((p) => p.curve === "at the optimum").length).toBe(31);
    // The optimum improves the margin at 300 Hz, so the noise there must be lower than before.
    const near = (name: string) => points.filter((p) => p.curve === name).reduce((a, b) => (Math.abs(Math.log(b.f / 300)) < Math.abs(Math.log(a.f / 300)) ? b : a));
    if (engine.optimum!.figure > engine.current) expect(near("at the optimum").psd).toBeLessThanOrEqual(near("as given").psd);
  });

  it("ranking one parameter at a time (for progress) gives exactly rankParameters' table: rows, order and evaluations", () => {
    const steps: string[] = [];
    const oneByOne = rankOneByOne(setup, margin, { kind: "ranking", scanPoints: 5 }, grid, (done, total) => steps.push(`${done}/${total}`));
    const once = rankParameters(setup, margin, { grid, scanPoints: 5 });
    expect(oneByOne).toEqual(once);
    expect(rankingAnswer(oneByOne)).toEqual(rankingAnswer(once));
    expect(steps.at(-1)).toBe(`${once.parameters.length}/${once.parameters.length}`);
  });

  it("reports progress only for runs longer than a second, at most once a second", () => {
    let t = 0;
    const lines: string[] = [];
    const quiet = progressReporter(
      () => t,
      (s) => lines.push(s),
    );
    t = 500;
    quiet.onStep(1, 4);
    quiet.finish();
    expect(lines).toEqual([]);
    t = 0;
    const slow = progressReporter(
      () => t,
      (s) => lines.push(s),
    );
    for (const [time, done] of [
      [1200, 1],
      [1500, 2],
      [2300, 3],
    ]) {
      t = time;
      slow.onStep(done, 4);
    }
    t = 2600;
    slow.finish();
    expect(lines).toEqual(["ranking: 1 of 4 parameters (25 %)\n", "ranking: 3 of 4 parameters (75 %)\n", "design: finished in 2.6 s\n"]);
    t = 0;
    const spreadLines: string[] = [];
    const samples = progressReporter(
      () => t,
      (s) => spreadLines.push(s),
      PROGRESS_LABELS.spread,
    );
    t = 1500;
    samples.onStep(100, 250);
    expect(spreadLines).toEqual(["spread: 100 of 250 samples (40 %)\n"]);
  });

  it("`.result` is plain JSON values", () => {
    for (const w of [ranking, spread, optimum]) expect(JSON.parse(JSON.stringify(w.result))).toEqual(w.result);
  });
});

describe("design widget state", () => {
  it("round-trips through its document text and recomputes to the stored fingerprint (the engine is deterministic with seeds)", () => {
    for (const w of [ranking, spread, optimum]) {
      const text = w.stateText();
      expect(readDesignState(text)).toEqual(w.state);
      const loaded = loadDesignState(text);
      expect(loaded.fingerprintMatches).toBe(true);
      expect(loaded.recomputedFingerprint).toBe(w.fingerprint);
      expect(answerFingerprint(readDesignState(text).answer)).toBe(w.fingerprint);
      expect(designWidget(text).fingerprint).toBe(w.fingerprint);
    }
  });

  it("renders a saved state through the registry (as `quietframe render` does), checking the fingerprint", async () => {
    const { kind, loaded } = loadWidgetState(spread.stateText());
    expect(kind.name).toBe("design");
    expect(loaded.fingerprint).toEqual({ stored: spread.fingerprint, recomputed: spread.fingerprint, writtenBy: spread.state.quietframe });
    const svg = new TextDecoder().decode(await kindOutput(kind, loaded, "svg", 1));
    expect(svg.startsWith("<svg")).toBe(true);
    const csv = new TextDecoder().decode(await kindOutput(kind, loaded, "csv", 1));
    expect(csv.split("\n").filter((l) => l.startsWith("sample,")).length).toBe(200);
    const html = new TextDecoder().decode(await kindOutput(kind, loaded, "html", 1));
    expect(html).toContain(`data-quietframe-fingerprint="${spread.fingerprint}"`);
  });

  it("`quietframe render` writes the figure of a saved state and, with --strict, refuses one whose answer it does not reproduce", async () => {
    const dir = mkdtempSync(join(tmpdir(), "quietframe-design-render-"));
    try {
      const run = async (...argv: string[]) => {
        let out = "";
        let err = "";
        const code = await runCliAsync(["render", ...argv], { out: (t) => (out += t), err: (t) => (err += t) });
        return { code, out, err };
      };
      const saved = join(dir, "ranking.json");
      writeFileSync(saved, ranking.stateText());
      const ok = await run(saved, "-o", join(dir, "ranking.csv"), "--strict");
      expect(ok.code).toBe(0);
      expect(ok.out).toContain(ranking.fingerprint);
      expect(readFileSync(join(dir, "ranking.csv"), "utf8").split("\n")[0]).toBe("rank,parameter,value,gain_dB_per_1_percent,low_dB,high_dB,helps");
      // A stored answer that is not what the question gives: its fingerprint no longer matches the recomputation.
      const doc = JSON.parse(ranking.stateText());
      const model = Object.values(doc.state)[0] as { state: { answer: RankingAnswer; fingerprint: string } };
      const rows = model.state.answer.rows;
      model.state.answer = { ...model.state.answer, rows: [{ ...rows[0], value: rows[0].value * 2 }, ...rows.slice(1)] };
      model.state.fingerprint = answerFingerprint(model.state.answer);
      writeFileSync(saved, JSON.stringify(doc));
      const refused = await run(saved, "-o", join(dir, "ranking.svg"), "--strict");
      expect(refused.code).toBe(1);
      expect(refused.err).toMatch(/recomputed curves differ/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("a changed number changes the fingerprint, and loading reports the mismatch", () => {
    const state = spread.state;
    const changed = { ...state, answer: { ...(state.answer as SpreadAnswer), values: [0.5, ...(state.answer as SpreadAnswer).values.slice(1)] } };
    expect(answerFingerprint(changed.answer)).not.toBe(state.fingerprint);
    const edited = { ...state, fingerprint: answerFingerprint(changed.answer) };
    expect(loadDesignState(edited).fingerprintMatches).toBe(false);
  });

  it("methods text names the method, seed, samples, bounds and tolerances", () => {
    expect(spread.methods).toMatch(/Monte Carlo with 200 samples, seed 7/);
    expect(spread.methods).toContain("detector.efficiency 95 % ± 2 %");
    expect(optimum.methods).toMatch(/Nelder–Mead/);
    expect(optimum.methods).toContain("seed 3");
    expect(optimum.methods).toContain("arm.power from 1 mW to 1 W");
    expect(optimum.methods).toMatch(/smaller than 1e-10/);
    expect(ranking.methods).toMatch(/Ridders/);
    expect(ranking.methods).toMatch(/first relative step 0\.02/);
    expect(ranking.methods).toMatch(/Bounds: .*arm\.power from 10 µW to 10 W/);
    expect(designMethods(ranking.state)).toBe(ranking.methods);
  });
});

describe("design widget: bad input names the field and keeps the last answer", () => {
  const errorOf = (fn: () => unknown): QuietframeError => {
    try {
      fn();
    } catch (e) {
      if (e instanceof QuietframeError) return e;
      throw e;
    }
    throw new Error("no error");
  };

  it("an unknown parameter, reversed bounds, a bad seed: the message names the field and the answer stays", () => {
    const before = optimum.fingerprint;
    expect(errorOf(() => optimum.set({ parameters: [{ target: "arm.nothing" }] })).path).toBe("parameters[0].target");
    expect(errorOf(() => optimum.set({ parameters: [{ target: "arm.power", min: "1 W", max: "1 mW" }] })).path).toBe("parameters[0].max");
    expect(errorOf(() => optimum.set({ seed: -1 })).path).toBe("changes.seed");
    expect(optimum.fingerprint).toBe(before);
    expect(errorOf(() => rankingWidget(setup, margin, { grid, parameters: ["nothing.here"] })).path).toBe("options.parameters[0]");
  });

  it("each bad field of a saved state is named", () => {
    const doc = JSON.parse(spread.stateText()) as { state: Record<string, { state: Record<string, unknown> }> };
    const id = Object.keys(doc.state)[0];
    const base = `state.state.${id}.state`;
    const broken = (change: (s: Record<string, unknown>) => void): string => {
      const copy = structuredClone(doc);
      change(copy.state[id].state);
      return errorOf(() => readDesignState(JSON.stringify(copy))).path;
    };
    expect(broken((s) => (s.format = "x"))).toBe(`${base}.format`);
    expect(broken((s) => (s.version = 99))).toBe(`${base}.version`);
    expect(broken((s) => (s.extra = 1))).toBe(`${base}.extra`);
    expect(broken((s) => (s.fingerprint = "md5:1"))).toBe(`${base}.fingerprint`);
    expect(broken((s) => ((s.question as Record<string, unknown>).kind = "guess"))).toBe(`${base}.question.kind`);
    expect(broken((s) => ((s.question as Record<string, unknown>).samples = 1))).toBe(`${base}.question.samples`);
    expect(broken((s) => ((s.answer as Record<string, unknown>).kind = "ranking"))).toBe(`${base}.answer.kind`);
    expect(broken((s) => ((s.answer as { values: unknown[] }).values[3] = "x"))).toBe(`${base}.answer.values[3]`);
    expect(broken((s) => (s.answer as { values: unknown[] }).values.pop())).toBe(`${base}.answer.values`);
    expect(broken((s) => ((s.answer as { distribution: Record<string, unknown> }).distribution.median = "x"))).toBe(`${base}.answer.distribution.median`);
    expect(broken((s) => ((s.grid as Record<string, unknown>).points = 0.5))).toBe(`${base}.grid.points`);
    const rankingDoc = JSON.parse(ranking.stateText()) as typeof doc;
    const rankingId = Object.keys(rankingDoc.state)[0];
    const rankingBase = `state.state.${rankingId}.state`;
    const brokenRanking = (change: (s: Record<string, unknown>) => void): string => {
      const copy = structuredClone(rankingDoc);
      change(copy.state[rankingId].state);
      return errorOf(() => readDesignState(JSON.stringify(copy))).path;
    };
    expect(brokenRanking((s) => ((s.answer as { rows: Record<string, unknown>[] }).rows[1].helps = "sideways"))).toBe(`${rankingBase}.answer.rows[1].helps`);
    expect(brokenRanking((s) => ((s.answer as { rows: { best: Record<string, unknown> }[] }).rows[0].best.range = [1]))).toBe(`${rankingBase}.answer.rows[0].best.range`);
    expect(brokenRanking((s) => ((s.question as Record<string, unknown>).scanPoints = 2))).toBe(`${rankingBase}.question.scanPoints`);
    expect(brokenRanking((s) => ((s.question as Record<string, unknown>).seed = 1))).toBe(`${rankingBase}.question.seed`);
    const optimumDoc = JSON.parse(optimum.stateText()) as typeof doc;
    const optimumId = Object.keys(optimumDoc.state)[0];
    const optimumState = optimumDoc.state[optimumId].state as { answer: { curves: { after: unknown[] } }; question: { parameters: Record<string, unknown>[] } };
    optimumState.answer.curves.after.pop();
    expect(errorOf(() => readDesignState(JSON.stringify(optimumDoc))).path).toBe(`state.state.${optimumId}.state.answer.curves.after`);
    optimumState.answer.curves.after.push(1e-39);
    optimumState.question.parameters[0].min = { value: 1 };
    expect(errorOf(() => readDesignState(JSON.stringify(optimumDoc))).path).toBe(`state.state.${optimumId}.state.question.parameters[0].min`);
    // A question the engine refuses when computing again: the path points into the question.
    const copy = structuredClone(doc);
    (copy.state[id].state.question as { uncertain: { target: string }[] }).uncertain[0].target = "detector.nothing";
    expect(errorOf(() => loadDesignState(JSON.stringify(copy))).path).toBe(`${base}.question.uncertain[0].target`);
  });
});

it("the document text is stable (two-space JSON, final newline)", () => {
  const text = designDocumentText(ranking.state);
  expect(text.endsWith("}\n")).toBe(true);
  expect(JSON.parse(text).state).toBeDefined();
});
