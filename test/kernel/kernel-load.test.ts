import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createQuietframeKernelEnv, type QuietframeKernelEnv } from "./kernel-env";
import { runPythonClient, type ClientRun } from "./run-python-client";

// jupyter_client (Debian) as a front-end that loads the built kernel (kernel_load_frontend.py):
// 5,000 slider updates sent as fast as the shell socket takes them (each answered with busy,
// echo_update, the snapped value and idle, in order; kernel, chart and front-end agree at the
// end), a cell moving a slider 1,000 times, 50 live explorers moved 100 times each in one cell,
// kill -9 of the kernel during a burst followed by a restart, and a drag over every position of
// the slider as the slider computes them, none of which the kernel corrects. Each check there cites the
// messaging spec or messages.md of @jupyter-widgets/schema. Throughput and memory of the burst
// are in the benchmark (npm run bench kernel), not here. Needs a build.

describe("the quietframe kernel under load, with jupyter_client as the front-end", () => {
  let env: QuietframeKernelEnv;
  let run: ClientRun;

  beforeAll(() => {
    env = createQuietframeKernelEnv();
    run = runPythonClient("kernel_load_frontend.py", "LOAD", env);
  }, 320_000);

  afterAll(() => env?.dispose());

  it("passes every load check, with none skipped", () => {
    expect(run.summary, run.stdout + run.stderr).toEqual({ run: 5, failures: 0, errors: 0, skipped: 0 });
    expect(run.status).toBe(0);
  });

  it("loses no message: the kernel log reports no send the sockets refused and no uncaught error", () => {
    const log = run.stderr.match(/\[quietframe kernel\][^\n]*/g) ?? [];
    expect(log.filter((l) => /could not be sent|uncaught exception|unhandled rejection|handler failed|deferred work failed/.test(l))).toEqual([]);
    // Two kernels ran (the second after kill -9 and restart); both started.
    expect(log.filter((l) => /\] started \(pid \d+\)/.test(l))).toHaveLength(2);
  });
});
