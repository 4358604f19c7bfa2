import { spawnSync } from "node:child_process";
import { join } from "node:path";
import { REPO_ROOT, SYSTEM_PYTHON } from "../jupyter/env";
import type { QuietframeKernelEnv } from "./kernel-env";

/** Runs one of the Python front-end scripts in this folder against the kernel in `env`. */
export interface ClientRun {
  status: number | null;
  stdout: string;
  /** The Python client's stderr, which also carries the kernel's log (the kernel inherits it). */
  stderr: string;
  /** Counts from the script's summary line, e.g. "PROTOCOL run=17 failures=0 errors=0 skipped=0". */
  summary: { run: number; failures: number; errors: number; skipped: number } | undefined;
}

export function runPythonClient(script: string, tag: string, env: QuietframeKernelEnv): ClientRun {
  // The repository root is the kernel's working directory, so cells can require("./dist/...").
  const r = spawnSync(SYSTEM_PYTHON, [join(__dirname, script)], { cwd: REPO_ROOT, env: env.env, encoding: "utf8", timeout: 300_000 });
  const m = new RegExp(`^${tag} run=(\\d+) failures=(\\d+) errors=(\\d+) skipped=(\\d+)$`, "m").exec(r.stdout);
  return {
    status: r.status,
    stdout: r.stdout,
    stderr: r.stderr,
    summary: m ? { run: Number(m[1]), failures: Number(m[2]), errors: Number(m[3]), skipped: Number(m[4]) } : undefined,
  };
}
