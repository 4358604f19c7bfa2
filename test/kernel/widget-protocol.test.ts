import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createQuietframeKernelEnv, type QuietframeKernelEnv } from "./kernel-env";
import { runPythonClient, type ClientRun } from "./run-python-client";

// jupyter_client (Debian) as the widget front-end: widget_protocol_frontend.py opens a
// FloatSlider and a model with a validator, moves the slider as a front-end does, checks
// echo_update, the kernel-side value, request_state, a kernel → front-end set, custom
// messages, binary buffers, the control target, and each bad input. Each check there cites
// the messaging spec ("Custom Messages", "Kernel status") or messages.md of
// @jupyter-widgets/schema (protocol 2.1). Needs a build.

describe("the widget message protocol with jupyter_client as the front-end", () => {
  let env: QuietframeKernelEnv;
  let run: ClientRun;

  beforeAll(() => {
    env = createQuietframeKernelEnv();
    run = runPythonClient("widget_protocol_frontend.py", "PROTOCOL", env);
  }, 320_000);

  afterAll(() => env?.dispose());

  it("passes every protocol check, with none skipped", () => {
    expect(run.summary, run.stdout + run.stderr).toEqual({ run: 17, failures: 0, errors: 0, skipped: 0 });
    expect(run.status).toBe(0);
  });

  it("writes each refused front-end message to the kernel log", () => {
    // The kernel's stderr reaches the client's stderr (jupyter_client starts it so), where
    // unittest's progress text may share a line with it.
    const log = run.stderr.match(/\[quietframe kernel\][^\n]*/g) ?? [];
    const expected = [
      /FloatSliderModel\.value = 50: is outside the slider's range; allowed: 0 ≤ value ≤ 10/,
      /FloatSliderModel\.value = "abc": has the wrong type/,
      /CounterModel\.count = -1: must be a whole number/,
      /FloatSliderModel\.nonsense = 1: is not a key of this model/,
      /_model_name = "Other": is fixed when the model is created/,
      /frobnicate refused: .*unknown method "frobnicate"/,
      /\(no method\) refused: .*data\.method is missing/,
      /data\.state must be an object/,
      /buffer_paths names 1 buffers but 0 arrived/,
      /comm_msg data must be a JSON object, got an array/,
      /ignored: content\.comm_id must be a non-empty string, got nothing/,
      /ignored: no open comm "no-such-model"/,
      /refused: no comm target "no\.such\.target"/,
      /on jupyter\.widget refused: this kernel creates widget models itself/,
    ];
    for (const pattern of expected)
      expect(
        log.some((l) => pattern.test(l)),
        `${pattern} in\n${log.join("\n")}`,
      ).toBe(true);
  });

  it("keeps running through all of it: no uncaught error, no failed handler", () => {
    expect(run.stderr).not.toMatch(/uncaught exception|unhandled rejection|handler failed/);
  });
});
