import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createQuietframeKernelEnv, type QuietframeKernelEnv } from "./kernel-env";
import { runPythonClient, type ClientRun } from "./run-python-client";

// Debian's python3-jupyter-kernel-test (the Jupyter project's kernel conformance machinery)
// against the quietframe kernel: kernel_info, execute with stdout/stderr streams, display
// data (through quietframe's and tslab's display paths), completion, is_complete, inspect,
// and comm_info (messaging spec, "Comm info"); every message validated against its
// messaging-protocol-5 schema. Needs a build (the kernel spec runs dist/).

describe("the quietframe kernel under jupyter_kernel_test", () => {
  let env: QuietframeKernelEnv;
  let run: ClientRun;

  beforeAll(() => {
    env = createQuietframeKernelEnv();
    run = runPythonClient("kernel_conformance.py", "CONFORMANCE", env);
  }, 320_000);

  afterAll(() => env?.dispose());

  it("passes every conformance test it runs, with none skipped", () => {
    expect(run.summary, run.stdout + run.stderr).toEqual({ run: 8, failures: 0, errors: 0, skipped: 0 });
    expect(run.status).toBe(0);
  });

  it("runs comm_info among them, through the kernel spec in the private prefix", () => {
    expect(run.stderr).toMatch(/test_comm_info .* ok/);
    expect(env.kernelSpec.display_name).toBe("TypeScript (quietframe)");
  });

  it("leaves no uncaught error in the kernel log", () => {
    expect(run.stderr).toContain("[quietframe kernel] started");
    expect(run.stderr).not.toMatch(/uncaught exception|unhandled rejection|handler failed/);
  });
});
