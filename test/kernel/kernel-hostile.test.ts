import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createQuietframeKernelEnv, type QuietframeKernelEnv } from "./kernel-env";
import { runPythonClient, type ClientRun } from "./run-python-client";

// jupyter_client (Debian) as a hostile front-end of the built kernel (kernel_hostile_frontend.py):
// buffer paths and state keys through __proto__ / constructor / prototype, 10 MB names and
// buffers (over the 8 MiB message limit) and 1 MB ones (under it: echoed cut to 120
// characters), front-end comm_opens reusing the kernel's comm ids, and a chart closed by a
// front-end. Each case checks a bounded refusal, every widget's state unchanged, nothing on
// Object.prototype, and the next cell answered. The limits are the kernel's own (docs/kernel.md).
// Needs a build.

const MESSAGE_LIMIT = 8 * 1024 * 1024;
// Longest kernel log line a refusal may write: the cut names plus the fixed text around them.
const LONGEST_LOG_LINE = 1000;

describe("the quietframe kernel against a hostile front-end (jupyter_client)", () => {
  let env: QuietframeKernelEnv;
  let run: ClientRun;
  let log: string[];

  beforeAll(() => {
    env = createQuietframeKernelEnv();
    run = runPythonClient("kernel_hostile_frontend.py", "HOSTILE", env);
    log = run.stderr.match(/\[quietframe kernel\][^\n]*/g) ?? [];
  }, 320_000);

  afterAll(() => env?.dispose());

  it("passes every hostile case, with none skipped", () => {
    expect(run.summary, run.stdout + run.stderr.slice(-20_000)).toEqual({ run: 5, failures: 0, errors: 0, skipped: 0 });
    expect(run.status).toBe(0);
  });

  it("keeps every kernel log line short, whatever length the front-end sent", () => {
    expect(log.filter((l) => l.length > LONGEST_LOG_LINE).map((l) => `${l.slice(0, 200)}… (${l.length} characters)`)).toEqual([]);
    // 10 MB and 1 MB names went in several times; the whole log stays small.
    expect(run.stderr.length).toBeLessThan(200_000);
  });

  it("logs each refusal with its reason", () => {
    const expected = [
      new RegExp(`comm_msg \\S+ refused: \\d+ bytes, more than the kernel's limit of ${MESSAGE_LIMIT} bytes`),
      new RegExp(`execute_request \\S+ refused: \\d+ bytes, more than the kernel's limit of ${MESSAGE_LIMIT} bytes`),
      /buffer_paths\[0\] goes through "__proto__", a name reserved by JavaScript objects/,
      /FloatSliderModel\.constructor: is a name reserved by JavaScript objects/,
      /comm_open \S+ refused: the id belongs to the open comm of target "jupyter\.widget"/,
      /cut to 120\)/,
      /t{120}… \(1048584 characters, cut to 120\) \S+ ignored: not a request this kernel serves/,
    ];
    for (const pattern of expected)
      expect(
        log.some((l) => pattern.test(l)),
        `${pattern} in\n${log.join("\n").slice(0, 20_000)}`,
      ).toBe(true);
  });

  it("keeps running through all of it: no uncaught error, no failed handler", () => {
    expect(run.stderr).not.toMatch(/uncaught exception|unhandled rejection|handler failed|deferred work failed|could not be sent/);
  });
});
