/** The design widget's notebook API: rankingWidget, optimumWidget, spreadWidget, designWidget(saved state). */
import { inspect } from "node:util";
import { QuietframeError, parseJsonText, type FigureSpec, type OptimizeParameter, type SetupDescription, type UncertaintySpec } from "../../src/index";
import type { MimeBundle } from "../core/notebook/display";
import { showWidgetOutput } from "../core/notebook/show-output";
import { renderPng, renderSvg, type RenderPngOptions } from "../core/render/static";
import { computeAnswer, type StepReport } from "./answer";
import { designCautions } from "./cautions";
import { designCsv } from "./csv";
import { designDocumentText, designState, isDesignInput, loadDesignState } from "./document";
import type { DesignAnswer, DesignQuestion, DesignState, GridText, OptimumAnswer, OptimumQuestion, RankingAnswer, RankingQuestion, SpreadAnswer, SpreadQuestion } from "./format";
import { designHtml } from "./html";
import { designMethods } from "./methods";
import { checkQuestion } from "./question-read";
import { designFigureSpec } from "./specs";
import { designSummaryText } from "./summary";
import { computeAnswerInSlices, type StoppableRunOptions } from "./notebook-run";
import { PROGRESS_LABELS, progressLine, type ProgressWords } from "./progress";

export { PROGRESS_LABELS } from "./progress";
export type { StoppableRunOptions } from "./notebook-run";

export interface DesignShowOptions {
  /** Carry the browser runtime in this output (default: only if no widget carried it yet in this kernel). */
  includeRuntime?: boolean;
  /** PNG fallback options (default scale 1). */
  png?: RenderPngOptions;
}

/** Options every design widget takes besides its question. */
export interface DesignWidgetOptions {
  /** Grid of the curves and grid-based figures, e.g. { from: "10 Hz", to: "10 kHz", points: 200 }; default the set-up's. */
  grid?: GridText;
  /** Shown above the widget. */
  title?: string;
  /**
   * Stops the computation between parameters, starts or blocks of samples: the call then throws
   * a DesignRunStopped ("stopped after N of M …") and no widget is made (set() keeps the last answer).
   */
  signal?: AbortSignal;
}

export type RankingWidgetOptions = DesignWidgetOptions & Omit<RankingQuestion, "kind">;
export type OptimumWidgetOptions = DesignWidgetOptions & Omit<OptimumQuestion, "kind" | "parameters">;
export type SpreadWidgetOptions = DesignWidgetOptions & Omit<SpreadQuestion, "kind" | "uncertain">;

/** Changes of a question that `set()` accepts: any of its fields but the kind. */
export type QuestionChanges = Partial<Omit<RankingQuestion, "kind">> | Partial<Omit<OptimumQuestion, "kind">> | Partial<Omit<SpreadQuestion, "kind">>;

// Runs shorter than this print nothing.
const QUIET_MS = 1000;

/**
 * A design answer held by a notebook cell: `.result` is the answer as plain values (numbers,
 * text, arrays) for printing or tables, `await w.show()` displays the charts, `w.set({...})`
 * asks again with changes (bad input throws a message naming the field and keeps the last
 * answer), `w.stateText()` saves it for `quietframe render`.
 */
export class NotebookDesign<A extends DesignAnswer = DesignAnswer> {
  #state: DesignState;
  #fingerprintMatches: boolean;
  #running = false;

  constructor(state: DesignState, fingerprintMatches = true) {
    this.#state = state;
    this.#fingerprintMatches = fingerprintMatches;
  }

  /** The answer as plain JSON values. */
  get result(): A {
    return structuredClone(this.#state.answer) as A;
  }

  get state(): DesignState {
    return structuredClone(this.#state);
  }

  get fingerprint(): string {
    return this.#state.fingerprint;
  }

  /** False when the state came from a file whose stored answer this version does not reproduce bit for bit. */
  get fingerprintMatches(): boolean {
    return this.#fingerprintMatches;
  }

  /** The methods paragraph: method, seed, samples, bounds and tolerances. */
  get methods(): string {
    return designMethods(this.#state);
  }

  get cautions(): string[] {
    return designCautions(this.#state);
  }

  /** Asks the question again with some of its fields changed; on bad input or a stop (`options.signal`) nothing changes. */
  set(changes: QuestionChanges, options: Pick<DesignWidgetOptions, "signal"> = {}): this {
    const question = this.#changed(changes);
    const s = this.#state;
    this.#state = ask(s.setup, s.figure, question, { grid: s.grid, title: s.title, signal: options.signal });
    this.#fingerprintMatches = true;
    return this;
  }

  /**
   * set() that can be stopped while the cell runs: `await w.run({ starts: 8 })` computes in
   * slices with the event loop turning between them, shows a Stop button and a progress line
   * (in the quietframe kernel), and stops on that button, on the kernel's interrupt or on
   * `options.signal` with a DesignRunStopped ("stopped after N of M …"); the widget then keeps
   * its last answer and state. Not stopped, the answer has the bits set() gives.
   */
  async run(changes: QuestionChanges = {}, options: StoppableRunOptions = {}): Promise<this> {
    const question = this.#changed(changes);
    if (this.#running) throw new QuietframeError({ path: "run", problem: "is already computing this widget", allowed: "one run at a time: await it (or stop it) first" });
    this.#running = true;
    try {
      const s = this.#state;
      const state = await askInSlices(s.setup, s.figure, question, { grid: s.grid, title: s.title, signal: options.signal, stopButton: options.stopButton });
      this.#state = state;
      this.#fingerprintMatches = true;
      return this;
    } finally {
      this.#running = false;
    }
  }

  /** The question with the changes, checked (bad input throws a message naming the field). */
  #changed(changes: QuestionChanges): DesignQuestion {
    if (typeof changes !== "object" || changes === null || Array.isArray(changes))
      throw new QuietframeError({ path: "changes", value: changes, problem: "must be an object", allowed: "fields of the question, e.g. { seed: 2 }" });
    if ("kind" in changes) throw new QuietframeError({ path: "changes.kind", problem: "cannot change the kind of question", allowed: "a new widget for another question" });
    return checkQuestion({ ...this.#state.question, ...changes }, "changes");
  }

  /** The widget-state document (Jupyter widget state 2.0) as text. */
  stateText(): string {
    return designDocumentText(this.#state);
  }

  /** The Vega-Lite spec of the static figure (data inline). */
  spec(): Record<string, unknown> {
    return designFigureSpec(this.#state.answer);
  }

  /** Static figure: Vega-Lite spec, SVG, PNG and the plotted numbers as CSV. */
  async staticFigures(options: RenderPngOptions = {}): Promise<{ spec: Record<string, unknown>; svg: string; png: Uint8Array; csv: string }> {
    const spec = this.spec();
    const svg = await renderSvg(spec);
    return { spec, svg, png: renderPng(svg, options), csv: designCsv(this.#state.answer) };
  }

  async bundle(options: DesignShowOptions & { includeRuntime: boolean }): Promise<MimeBundle> {
    const svg = await renderSvg(this.spec());
    return {
      "text/html": designHtml(this.#state, { includeRuntime: options.includeRuntime, svg }),
      "image/png": renderPng(svg, { scale: 1, ...options.png }),
      "text/plain": this.toString(),
    };
  }

  /** Displays the widget; write `await w.show()`. */
  async show(options: DesignShowOptions = {}): Promise<void> {
    await showWidgetOutput(options, (includeRuntime) => this.bundle({ ...options, includeRuntime }));
  }

  toString(): string {
    return [designSummaryText(this.#state), ...this.cautions.map((c) => `caution: ${c}`), `fingerprint: ${this.#state.fingerprint}`].join("\n");
  }

  [inspect.custom](): string {
    return this.toString();
  }
}

/** Which parameters to improve first for a figure: gains per 1 % with errors, direction, bound, best alone. */
export function rankingWidget(setup: SetupDescription, figure: FigureSpec, options: RankingWidgetOptions = {}): NotebookDesign<RankingAnswer> {
  const { grid, title, signal, ...rest } = options;
  return new NotebookDesign<RankingAnswer>(ask(setup, figure, checkQuestion({ kind: "ranking", ...rest }, "options"), { grid, title, signal }));
}

/** The best settings of the given parameters within their ranges, with the noise before and after. */
export function optimumWidget(setup: SetupDescription, figure: FigureSpec, parameters: OptimizeParameter[], options: OptimumWidgetOptions = {}): NotebookDesign<OptimumAnswer> {
  const { grid, title, signal, ...rest } = options;
  const question = checkQuestion({ kind: "optimum", ...rest, parameters }, "options");
  return new NotebookDesign<OptimumAnswer>(ask(setup, figure, question, { grid, title, signal }));
}

/** What the spread of uncertain parameters does to the figure: histogram, percentiles, noise bands. */
export function spreadWidget(setup: SetupDescription, figure: FigureSpec, uncertain: UncertaintySpec[], options: SpreadWidgetOptions = {}): NotebookDesign<SpreadAnswer> {
  const { grid, title, signal, ...rest } = options;
  const question = checkQuestion({ kind: "spread", ...rest, uncertain }, "options");
  return new NotebookDesign<SpreadAnswer>(ask(setup, figure, question, { grid, title, signal }));
}

/** rankingWidget computed in slices, with a Stop button in the kernel: `await rankingWidgetAsync(…)` (see NotebookDesign.run). */
export async function rankingWidgetAsync(setup: SetupDescription, figure: FigureSpec, options: RankingWidgetOptions & StoppableRunOptions = {}): Promise<NotebookDesign<RankingAnswer>> {
  const { grid, title, signal, stopButton, ...rest } = options;
  return new NotebookDesign<RankingAnswer>(await askInSlices(setup, figure, checkQuestion({ kind: "ranking", ...rest }, "options"), { grid, title, signal, stopButton }));
}

/** optimumWidget computed in slices, with a Stop button in the kernel: `await optimumWidgetAsync(…)` (see NotebookDesign.run). */
export async function optimumWidgetAsync(
  setup: SetupDescription,
  figure: FigureSpec,
  parameters: OptimizeParameter[],
  options: OptimumWidgetOptions & StoppableRunOptions = {},
): Promise<NotebookDesign<OptimumAnswer>> {
  const { grid, title, signal, stopButton, ...rest } = options;
  const question = checkQuestion({ kind: "optimum", ...rest, parameters }, "options");
  return new NotebookDesign<OptimumAnswer>(await askInSlices(setup, figure, question, { grid, title, signal, stopButton }));
}

/** spreadWidget computed in slices, with a Stop button in the kernel: `await spreadWidgetAsync(…)` (see NotebookDesign.run). */
export async function spreadWidgetAsync(
  setup: SetupDescription,
  figure: FigureSpec,
  uncertain: UncertaintySpec[],
  options: SpreadWidgetOptions & StoppableRunOptions = {},
): Promise<NotebookDesign<SpreadAnswer>> {
  const { grid, title, signal, stopButton, ...rest } = options;
  const question = checkQuestion({ kind: "spread", ...rest, uncertain }, "options");
  return new NotebookDesign<SpreadAnswer>(await askInSlices(setup, figure, question, { grid, title, signal, stopButton }));
}

/** A saved design widget (a bare state or a widget-state document, as an object or JSON text), its answer computed again. */
export function designWidget(saved: DesignState | Record<string, unknown> | string): NotebookDesign {
  const value: unknown = typeof saved === "string" ? parseJsonText(saved, "designWidget input") : saved;
  if (!isDesignInput(value))
    throw new QuietframeError({ path: "state", problem: "is not a saved design widget", allowed: 'a state {"format": "quietframe.design", …} or a widget-state document holding one' });
  const loaded = loadDesignState(value, "state");
  return new NotebookDesign(loaded.state, loaded.fingerprintMatches);
}

function ask(setup: SetupDescription, figure: FigureSpec, question: DesignQuestion, options: DesignWidgetOptions): DesignState {
  const progress = progressReporter(Date.now, (t) => void process.stdout.write(t), PROGRESS_LABELS[question.kind]);
  const answer = computeAnswer(setup, figure, question, options.grid, progress.onStep, options.signal);
  progress.finish();
  return designState(setup, figure, question, answer, options);
}

/** ask() in slices, stoppable while the cell runs (notebook-run.ts); progress as a line under a Stop button, or as text without one. */
async function askInSlices(setup: SetupDescription, figure: FigureSpec, question: DesignQuestion, options: DesignWidgetOptions & StoppableRunOptions): Promise<DesignState> {
  const progress = progressReporter(Date.now, (t) => void process.stdout.write(t), PROGRESS_LABELS[question.kind]);
  const answer = await computeAnswerInSlices(setup, figure, question, options.grid, { signal: options.signal, stopButton: options.stopButton, onStep: progress.onStep });
  progress.finish();
  return designState(setup, figure, question, answer, options);
}

/**
 * Progress as text for computations that take more than a second: how many parameters, starts
 * or samples are done (at most one line a second), and when a long computation finished; quick
 * ones print nothing. The clock and the writer are parameters so tests need not wait.
 */
export function progressReporter(
  now: () => number = Date.now,
  write: (text: string) => void = (t) => void process.stdout.write(t),
  label: ProgressWords = PROGRESS_LABELS.ranking,
): { onStep: StepReport; finish(): void } {
  const started = now();
  let said = started;
  return {
    onStep(done, total) {
      const t = now();
      if (t - started < QUIET_MS || t - said < QUIET_MS) return;
      said = t;
      write(`${progressLine(label, done, total)}\n`);
    },
    finish() {
      const took = now() - started;
      if (took >= QUIET_MS) write(`design: finished in ${(took / 1000).toFixed(1)} s\n`);
    },
  };
}
