/**
 * The design question computed again in the page: the same steps as the kernel (answerSteps: a
 * parameter, an optimizer start or a block of samples at a time), run in slices of about 12 ms
 * with a turn of the event loop between them, so the page stays responsive; a progress line
 * counts the steps and a Stop button ends the run between two steps. An optimization draws the
 * best of the starts so far after each start, marked provisional, until the final answer
 * replaces it. A stopped or failed run shows why and draws the last whole answer again: nothing
 * half-computed stays on the page.
 */
import { DesignRunStopped, runInSlices, yieldToEventLoop } from "../../../src/index";
import { messageOf } from "../../core/browser/boot";
import { el } from "../../core/browser/dom";
import { answerSteps } from "../answer";
import type { DesignAnswer, DesignState } from "../format";
import { PROGRESS_LABELS, progressLine } from "../progress";
import { NewestBest, type ProvisionalAnswer } from "../provisional";

/** Longest stretch of computation between two turns of the page's event loop, in ms. */
export const PAGE_SLICE_MS = 12;

/** The run's status on the widget's root: "idle", "running", "done", "stopped" or "error". */
export const RUN_STATUS_ATTRIBUTE = "data-quietframe-run";

/** A progress line such as "optimum: 2 of 4 starts (50 %)". */
export function progressText(kind: DesignState["question"]["kind"], done: number, total: number): string {
  return progressLine(PROGRESS_LABELS[kind], done, total);
}

/** The Compute and Stop buttons and the progress line of one widget. */
export class PageRun {
  readonly element: HTMLElement;
  private readonly compute = el("button", { type: "button", title: "Compute the answer again in this page, step by step" }, ["Compute in this page"]);
  private readonly stop = el("button", { type: "button", title: "Stop the computation; the answer shown stays as it was", disabled: "" }, ["Stop"]);
  private readonly progress = el("progress", { max: "1", value: "0" });
  private readonly line = el("span", { class: "qf-run-line", role: "status" }, [""]);
  private controller: AbortController | undefined;
  /** The last whole answer drawn: the saved one, then each answer computed here. */
  private shown: DesignAnswer;

  /** `show` draws a finished answer, `showBest` an optimization's best so far; `root` carries the run's status attribute. */
  constructor(
    private readonly state: DesignState,
    private readonly root: HTMLElement,
    private readonly show: (answer: DesignAnswer) => Promise<void>,
    private readonly showBest: (best: ProvisionalAnswer) => Promise<void>,
  ) {
    this.shown = state.answer;
    this.element = el("div", { class: "qf-run" }, [this.compute, this.stop, this.progress, this.line]);
    this.compute.addEventListener("click", () => void this.run());
    this.stop.addEventListener("click", () => this.controller?.abort());
    root.setAttribute(RUN_STATUS_ATTRIBUTE, "idle");
  }

  /** Computes the question in slices; resolves when the run has finished, stopped or failed. */
  async run(): Promise<void> {
    if (this.controller) return;
    const controller = new AbortController();
    this.controller = controller;
    const { setup, figure, question, grid } = this.state;
    this.setRunning(true);
    this.line.textContent = `${question.kind}: starting`;
    const onStep = (done: number, total: number): void => {
      this.progress.value = done / total;
      this.line.textContent = progressText(question.kind, done, total);
    };
    // An optimization's best so far ends the slice, and the pause draws it before the event loop turns.
    const newest = question.kind === "optimum" ? new NewestBest(setup, figure, grid) : undefined;
    let provisionalDrawn = false;
    const pause = async (): Promise<void> => {
      const best = newest?.next();
      if (best) {
        await this.showBest(best);
        provisionalDrawn = true;
      }
      await yieldToEventLoop();
    };
    try {
      const steps = answerSteps(setup, figure, question, grid, onStep, controller.signal, newest?.report);
      const answer = await runInSlices(steps, { sliceMs: PAGE_SLICE_MS, pause, endSliceAfter: () => newest?.waiting ?? false });
      await this.show(answer);
      this.shown = answer;
      this.line.textContent = `${question.kind}: done in this page`;
      this.root.setAttribute(RUN_STATUS_ATTRIBUTE, "done");
    } catch (e) {
      const stopped = e instanceof DesignRunStopped;
      if (provisionalDrawn) await this.show(this.shown);
      this.line.textContent = stopped ? `${e.message}; the answer shown is the one saved` : `the computation failed: ${messageOf(e)}`;
      this.root.setAttribute(RUN_STATUS_ATTRIBUTE, stopped ? "stopped" : "error");
    } finally {
      this.controller = undefined;
      this.setRunning(false);
    }
  }

  private setRunning(running: boolean): void {
    this.compute.disabled = running;
    this.stop.disabled = !running;
    if (running) this.root.setAttribute(RUN_STATUS_ATTRIBUTE, "running");
  }
}
