/** The quietframe kernel's spec (kernel.json) and its installation. */
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { join, resolve } from "node:path";
import { QuietframeError } from "../../src/index";

/**
 * The quietframe kernel's Jupyter kernel spec, installed through the chosen Python's
 * jupyter_client (KernelSpecManager), so it lands exactly where that Jupyter looks:
 * the user's data dir (--user), a prefix's share/jupyter/kernels (--prefix DIR), or the
 * system's. Front-ends list it as "TypeScript (quietframe)".
 */

export const KERNEL_NAME = "quietframe-ts";
export const KERNEL_DISPLAY_NAME = "TypeScript (quietframe)";

export interface KernelSpec {
  argv: string[];
  display_name: string;
  language: string;
  interrupt_mode: "signal";
  metadata: Record<string, unknown>;
}

/** The compiled launcher; from sources (tests) it is the built copy under dist/. */
export function launcherPath(): string {
  const beside = resolve(__dirname, "launch.js");
  if (existsSync(beside)) return beside;
  const built = resolve(__dirname, "..", "..", "dist", "widgets", "kernel", "launch.js");
  if (existsSync(built)) return built;
  throw new QuietframeError({ path: "kernel launcher", value: beside, problem: "is missing", allowed: "a built quietframe (npm run build)" });
}

/** kernel.json: this very Node binary runs the launcher, so the kernel starts even when `node` is not on Jupyter's PATH. */
export function kernelSpec(nodePath: string = process.execPath, launcher: string = launcherPath()): KernelSpec {
  return {
    argv: [nodePath, launcher, "--config-path", "{connection_file}"],
    display_name: KERNEL_DISPLAY_NAME,
    language: "typescript",
    interrupt_mode: "signal",
    metadata: { quietframe: { comms: true, widget_protocol: "2.1.0" } },
  };
}

export interface InstallOptions {
  /** The per-user kernel registry (default when not root). */
  user?: boolean;
  /** Install into PREFIX/share/jupyter/kernels/ instead. */
  prefix?: string;
  /** The Python whose Jupyter should see the kernel (default "python3"). */
  python?: string;
  /** Environment for the Python process (tests pass a private Jupyter environment). */
  env?: NodeJS.ProcessEnv;
}

// Runs inside the chosen Python: writes kernel.json to a temporary dir and lets Jupyter copy it.
const INSTALL_PY = `
import json, os, sys, tempfile
try:
    from jupyter_client.kernelspec import KernelSpecManager
except ImportError:
    sys.stderr.write("jupyter_client is not installed for this Python\\n")
    sys.exit(3)
spec, name, user, prefix = json.loads(sys.argv[1]), sys.argv[2], sys.argv[3] == "1", sys.argv[4] or None
with tempfile.TemporaryDirectory() as d:
    os.chmod(d, 0o755)
    with open(os.path.join(d, "kernel.json"), "w") as f:
        json.dump(spec, f, indent=1, sort_keys=True)
    print(KernelSpecManager().install_kernel_spec(d, name, user=user, prefix=prefix))
`;

function isRoot(): boolean {
  return typeof process.geteuid === "function" && process.geteuid() === 0;
}

/** Installs the kernel spec; returns the directory Jupyter installed it to. */
export function installKernelSpec(options: InstallOptions = {}): string {
  if (options.user && options.prefix) throw new QuietframeError({ path: "--prefix", value: options.prefix, problem: "cannot be combined with --user", allowed: "one of --user or --prefix DIR" });
  const python = options.python ?? "python3";
  const user = options.prefix ? false : (options.user ?? !isRoot());
  const prefix = options.prefix ? resolve(options.prefix) : "";
  const spec = kernelSpec();
  const run = spawnSync(python, ["-c", INSTALL_PY, JSON.stringify(spec), KERNEL_NAME, user ? "1" : "0", prefix], { env: options.env ?? process.env, encoding: "utf8" });
  if (run.error) {
    throw new QuietframeError({
      path: "--python",
      value: python,
      problem: `cannot be started (${(run.error as NodeJS.ErrnoException).code ?? run.error.message})`,
      allowed: "a Python with Jupyter, e.g. --python /usr/bin/python3",
    });
  }
  if (run.status === 3) throw new QuietframeError({ path: "--python", value: python, problem: "has no jupyter_client", allowed: "the Python your Jupyter runs on (e.g. --python /usr/bin/python3)" });
  if (run.status !== 0) {
    throw new QuietframeError({
      path: "kernel install",
      value: python,
      problem: `Jupyter refused the kernel spec: ${(run.stderr || "").trim().split("\n").slice(-1)[0] || `exit status ${run.status}`}`,
      allowed: "a writable kernel directory (try --user or --prefix DIR)",
    });
  }
  const dir = run.stdout.trim().split("\n").slice(-1)[0];
  return dir && existsSync(join(dir, "kernel.json")) ? dir : dir || "(unknown)";
}
