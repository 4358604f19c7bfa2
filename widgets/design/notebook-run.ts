/**
 * A design question computed in the kernel in slices, so that a stop is heard while the cell
 * runs: the steps of computeAnswer (a parameter, an optimizer start or a block of samples) run
 * with a turn of the event loop (setImmediate) between slices, and in those turns the kernel
 * serves the Stop button's comm message, Jupyter's kernel interrupt (the kernel spec's
 * interrupt_mode "signal": SIGINT to the kernel process) and the caller's AbortSignal. Any of
 * them ends the run between two steps with a DesignRunStopped ("stopped after N of M …") and no
 * answer. Not stopped, the answer has the bits of computeAnswer: the steps are the same.
 */
import { checkStopSignal, runInSlices, yieldToEventLoop, type FigureSpec, type SetupDescription, type SliceOptions } from "../../src/index";
import type { CommManager } from "../core/comm/comm-manager";
import { createControl, hbox, html, type ControlModel } from "../core/comm/controls/controls";
import { displayWidget } from "../core/comm/display-widget";
import { kernelComms } from "../core/comm/kernel-comms";
import { escapeHtml } from "../core/page/escape";
import { answerSteps, type StepReport } from "./answer";
import type { DesignAnswer, DesignQuestion, GridText } from "./format";
import { PROGRESS_LABELS, progressLine, type ProgressWords } from "./progress";

/** Longest stretch of computation between two turns of the kernel's event loop, in ms. */
export const KERNEL_SLICE_MS = 20;

export interface StoppableRunOptions {
  /** The caller's own stop: aborting it ends the run between two steps. */
  signal?: AbortSignal;
  /**
   * Show a Stop button and a progress line in the cell's output while the run goes on (a
   * widget-protocol button; default: when this process is the quietframe kernel).
   */
  stopButton?: boolean;
}

/** What tests replace: the comms the Stop button opens on, and the slicing. */
export interface RunSeams {
  comms?: CommManager;
  slices?: SliceOptions;
}

/**
 * Computes the answer in slices; resolves to it, or rejects with a DesignRunStopped when the
 * Stop button, SIGINT or `options.signal` stopped it (or with what a step throws).
 * `onStep` is told the progress when no Stop button shows it.
 */
export async function computeAnswerInSlices(
  setup: SetupDescription,
  figure: FigureSpec,
  question: DesignQuestion,
  grid: GridText | undefined,
  options: StoppableRunOptions & { onStep?: StepReport },
  seams: RunSeams = {},
): Promise<DesignAnswer> {
  const given = checkStopSignal(options.signal);
  const words = PROGRESS_LABELS[question.kind];
  // tslab runs a cell's synchronous part with vm's breakOnSigint, which takes the SIGINT listeners
  // away meanwhile and loses a signal handler installed then (the next SIGINT would end the
  // kernel): listen, and compute, only once that part has returned.
  await yieldToEventLoop();
  const controller = new AbortController();
  const stopWith = (reason: unknown): void => {
    if (!controller.signal.aborted) controller.abort(reason);
  };
  const onGivenAbort = (): void => stopWith(given?.reason);
  const onInterrupt = (): void => stopWith(new Error("interrupted (SIGINT)"));
  if (given?.aborted) stopWith(given.reason);
  given?.addEventListener("abort", onGivenAbort, { once: true });
  process.on("SIGINT", onInterrupt);
  let control: StopControl | undefined;
  try {
    const comms = seams.comms ?? kernelComms();
    if (options.stopButton ?? comms !== undefined) control = new StopControl(comms, words, () => stopWith(new Error("Stop button")));
    const shown = control;
    const onStep: StepReport | undefined = shown ? (done, total) => shown.say(progressLine(words, done, total)) : options.onStep;
    const answer = await runInSlices(answerSteps(setup, figure, question, grid, onStep, controller.signal), seams.slices ?? { sliceMs: KERNEL_SLICE_MS });
    control?.finish(`${words.name}: done`);
    return answer;
  } catch (e) {
    control?.finish(`${words.name}: ${e instanceof Error ? e.message : String(e)}`);
    throw e;
  } finally {
    process.off("SIGINT", onInterrupt);
    given?.removeEventListener("abort", onGivenAbort);
  }
}

/** What a front-end's button sends when clicked (ipywidgets' ButtonView: a custom message { event: "click" }). */
function isClick(content: unknown): boolean {
  return typeof content === "object" && content !== null && (content as { event?: unknown }).event === "click";
}

/**
 * The Stop button and the progress line of one run, shown in the cell's output. When the run
 * ends the button is disabled and the line says how it ended; the output stays as a record.
 */
class StopControl {
  private readonly button: ControlModel;
  private readonly line: ControlModel;
  private readonly row: ControlModel;

  constructor(comms: CommManager | undefined, words: ProgressWords, onStop: () => void) {
    this.button = createControl("ButtonModel", { button_style: "warning" }, { comms, description: "Stop", tooltip: "Stop between two steps; the widget keeps its last answer" });
    this.line = html({ comms, value: escapeHtml(`${words.name}: starting`) });
    this.row = hbox([this.button, this.line], { comms });
    this.button.on("custom", (content) => {
      if (isClick(content)) onStop();
    });
    displayWidget(this.row);
  }

  say(text: string): void {
    if (!this.line.isClosed) this.line.set({ value: escapeHtml(text) });
  }

  finish(text: string): void {
    this.say(text);
    if (!this.button.isClosed) this.button.set({ disabled: true });
  }
}
