import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createQuietframeKernelEnv, type QuietframeKernelEnv } from "./kernel-env";
import { runPythonClient, type ClientRun } from "./run-python-client";

// jupyter_client (Debian) as the front-end of a design run in the real kernel:
// design_stop_frontend.py awaits w.run(...) of a Monte Carlo widget in a cell and, while the
// cell runs, clicks the Stop button the kernel shows (a comm message) or interrupts the
// kernel (SIGINT); either stops the run with "stopped after N of M samples" and the widget
// keeps its answer. Sources are cited in the script. Needs a build.

describe("stopping a design run while its cell runs, with jupyter_client as the front-end", () => {
  let env: QuietframeKernelEnv;
  let run: ClientRun;

  beforeAll(() => {
    env = createQuietframeKernelEnv();
    run = runPythonClient("design_stop_frontend.py", "DESIGNSTOP", env);
  }, 320_000);

  afterAll(() => env?.dispose());

  it("passes every check, with none skipped", () => {
    expect(run.summary, run.stdout + run.stderr).toEqual({ run: 2, failures: 0, errors: 0, skipped: 0 });
    expect(run.status).toBe(0);
  });

  it("keeps running through it: no uncaught error, no failed handler", () => {
    expect(run.stderr).not.toMatch(/uncaught exception|unhandled rejection|handler failed/);
  });
});
