/**
 * A design question computed in the kernel in slices, stoppable while the cell runs: the Stop
 * button is a widget-protocol ButtonModel whose click (a `custom` message { event: "click" },
 * as ipywidgets' ButtonView sends it) arrives between slices from a fake front-end; SIGINT (what
 * Jupyter sends a kernel whose spec says interrupt_mode "signal", jupyter_client's kernel spec
 * documentation) and the caller's AbortSignal stop it too. A stopped run gives no answer and the
 * widget keeps its last answer and state; a run not stopped has the bits of the synchronous one.
 * Reference for the counts: the steps of the run, counted by hand (common practice, no source).
 */
import { readFileSync } from "node:fs";
import { afterEach, describe, expect, it } from "vitest";
import { DesignRunStopped, QuietframeError, yieldToEventLoop, type FigureSpec, type SetupDescription } from "../../../src/index";
import { installKernelComms } from "../../../widgets/core/comm/kernel-comms";
import { computeAnswer } from "../../../widgets/design/answer";
import type { DesignQuestion } from "../../../widgets/design/format";
import { optimumWidget, optimumWidgetAsync, rankingWidget, rankingWidgetAsync, spreadWidget } from "../../../widgets/design/notebook";
import { computeAnswerInSlices } from "../../../widgets/design/notebook-run";
import { frontEnd, recordingComms, type Published } from "../../kernel/fake-transport";

const setup = JSON.parse(readFileSync("examples/free-test-mass.json", "utf8")) as SetupDescription;
const grid = { from: "10 Hz", to: "10 kHz", points: 31 };
const margin: FigureSpec = { kind: "margin-at", frequency: "300 Hz" };
const OPTIMUM: DesignQuestion = { kind: "optimum", parameters: [{ target: "arm.power", min: "1 mW", max: "1 W" }], starts: 4, seed: 3 };
const CLICK = { method: "custom", content: { event: "click" } };

afterEach(() => installKernelComms(undefined));

/** The comm id of the first model opened with this model name. */
function opened(sent: Published[], modelName: string): string {
  const open = sent.find((m) => m.msgType === "comm_open" && (m.content.data as { state: { _model_name: string } }).state._model_name === modelName);
  if (!open) throw new Error(`no ${modelName} was opened`);
  return open.content.comm_id as string;
}

/** The states the kernel sent to one comm in `update` messages, in order. */
function updates(sent: Published[], commId: string): Record<string, unknown>[] {
  return sent
    .filter((m) => m.msgType === "comm_msg" && m.content.comm_id === commId && (m.content.data as { method: string }).method === "update")
    .map((m) => (m.content.data as { state: Record<string, unknown> }).state);
}

describe("a design run in the kernel, in slices", () => {
  it("the Stop button's click, delivered after the second slice, stops the run after 2 of 4 starts; the row says so and the button is disabled", async () => {
    const { comms, sent } = recordingComms();
    let pauses = 0;
    const pause = async (): Promise<void> => {
      pauses++;
      if (pauses === 2) await frontEnd(comms, opened(sent, "ButtonModel"), CLICK);
      await yieldToEventLoop();
    };
    const run = computeAnswerInSlices(setup, margin, OPTIMUM, grid, { stopButton: true }, { comms, slices: { pause } });
    const stopped = await run.catch((e: unknown) => e);
    expect(stopped).toBeInstanceOf(DesignRunStopped);
    expect((stopped as Error).message).toBe("optimize stopped after 2 of 4 starts; no result is given for a stopped run");
    const button = opened(sent, "ButtonModel");
    expect((sent.find((m) => m.content.comm_id === button)!.content.data as { state: Record<string, unknown> }).state).toMatchObject({ description: "Stop", disabled: false });
    expect(updates(sent, button)).toEqual([{ disabled: true }]);
    expect(updates(sent, opened(sent, "HTMLModel")).map((u) => u.value)).toEqual([
      "optimum: 1 of 4 starts (25 %)",
      "optimum: 2 of 4 starts (50 %)",
      "optimum: optimize stopped after 2 of 4 starts; no result is given for a stopped run",
    ]);
  });

  it("SIGINT (the kernel's interrupt) during the first pause stops it after 1 of 4 starts, and its handler is removed", async () => {
    const handlers = process.listenerCount("SIGINT");
    const pause = async (): Promise<void> => {
      process.emit("SIGINT");
      await yieldToEventLoop();
    };
    const run = computeAnswerInSlices(setup, margin, OPTIMUM, grid, { stopButton: false }, { slices: { pause } });
    // Not while the caller's synchronous part runs (a tslab cell runs it with vm's breakOnSigint, which loses handlers installed then).
    expect(process.listenerCount("SIGINT")).toBe(handlers);
    await expect(run).rejects.toThrow("optimize stopped after 1 of 4 starts");
    expect(process.listenerCount("SIGINT")).toBe(handlers);
  });

  it("the caller's AbortSignal stops it; a signal that is not one is refused by name", async () => {
    const controller = new AbortController();
    controller.abort();
    await expect(computeAnswerInSlices(setup, margin, OPTIMUM, grid, { signal: controller.signal, stopButton: false })).rejects.toThrow("optimize stopped after 0 of 4 starts");
    const bad = computeAnswerInSlices(setup, margin, OPTIMUM, grid, { signal: {} as AbortSignal, stopButton: false });
    await expect(bad).rejects.toThrow(QuietframeError);
    await expect(bad).rejects.toThrow("options.signal");
  });

  it("not stopped, each kind of question gives computeAnswer's answer bit for bit", async () => {
    const questions: DesignQuestion[] = [
      { kind: "ranking", parameters: ["arm.power", "detector.efficiency"], scanPoints: 5 },
      OPTIMUM,
      { kind: "spread", uncertain: [{ target: "detector.efficiency", value: "95 % ± 2 %" }], samples: 150, seed: 7 },
    ];
    for (const question of questions) {
      const sliced = await computeAnswerInSlices(setup, margin, question, grid, { stopButton: false });
      expect(JSON.stringify(sliced)).toBe(JSON.stringify(computeAnswer(setup, margin, question, grid)));
    }
  });
});

describe("the notebook's stoppable calls", () => {
  it("await w.run() in the kernel shows a Stop button; a click stops it and the widget keeps its answer and state", async () => {
    const { comms, sent } = recordingComms();
    installKernelComms(comms);
    const w = spreadWidget(setup, margin, [{ target: "detector.efficiency", value: "95 % ± 2 %" }], { grid, samples: 200, seed: 7 });
    const before = w.stateText();
    const running = w.run({ samples: 20000, seed: 8 });
    // The first slice has run and the event loop turns: the front-end's click is served now.
    await yieldToEventLoop();
    await frontEnd(comms, opened(sent, "ButtonModel"), CLICK);
    const stopped = await running.catch((e: unknown) => e);
    expect(stopped).toBeInstanceOf(DesignRunStopped);
    const [, done] = /^spread stopped after (\d+) of 20000 samples; no result is given for a stopped run$/.exec((stopped as Error).message) ?? [];
    expect(Number(done)).toBeGreaterThan(0);
    expect(Number(done)).toBeLessThan(20000);
    expect(w.stateText()).toBe(before);
    expect(w.fingerprintMatches).toBe(true);
  });

  it("a run not stopped gives the state the synchronous call gives, bit for bit; one run at a time", async () => {
    const params = [{ target: "arm.power", min: "1 mW", max: "1 W" }];
    const w = await optimumWidgetAsync(setup, margin, params, { grid, starts: 2, seed: 3 });
    expect(w.stateText()).toBe(optimumWidget(setup, margin, params, { grid, starts: 2, seed: 3 }).stateText());
    const first = w.run({ seed: 4 });
    await expect(w.run({ seed: 5 })).rejects.toThrow("run: is already computing this widget");
    await first;
    expect(w.stateText()).toBe(optimumWidget(setup, margin, params, { grid, starts: 2, seed: 4 }).stateText());
    await expect(w.run({ starts: 0 })).rejects.toThrow(QuietframeError);
    expect(w.stateText()).toBe(optimumWidget(setup, margin, params, { grid, starts: 2, seed: 4 }).stateText());
    const ranked = await rankingWidgetAsync(setup, margin, { grid, parameters: ["arm.power", "mirror.mass"], scanPoints: 5 });
    expect(ranked.stateText()).toBe(rankingWidget(setup, margin, { grid, parameters: ["arm.power", "mirror.mass"], scanPoints: 5 }).stateText());
  });
});
