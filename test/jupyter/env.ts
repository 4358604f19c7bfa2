import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { delimiter, dirname, join, resolve } from "node:path";

/**
 * A private Jupyter environment for tests: its own config, data, runtime and kernel-spec
 * directories in a temp dir, with the repository's tslab registered there. Child processes
 * started with `env` never read or write the user's own Jupyter set-up.
 */

export const REPO_ROOT = resolve(__dirname, "..", "..");

/** Debian's interpreter: the one the Jupyter packages install for (another python3 may come first on PATH). */
export const SYSTEM_PYTHON = "/usr/bin/python3";

/** Kernel name tslab registers for TypeScript. */
export const TS_KERNEL = "tslab";

export interface JupyterEnv {
  /** Root of the private directories. */
  readonly dir: string;
  /** Environment for Jupyter child processes. */
  readonly env: NodeJS.ProcessEnv;
  /** The kernel spec as registered (argv, display name, language). */
  readonly kernelSpec: { argv: string[]; display_name: string; language: string };
  /** Removes the private directories. */
  dispose(): void;
}

export function tslabBinary(): string {
  return join(REPO_ROOT, "node_modules", ".bin", "tslab");
}

/**
 * Private Jupyter directories (config, data, runtime, IPython, a kernel-spec prefix) in a new
 * temp dir whose name starts with `label`, and the environment that points Jupyter at them.
 */
export function createPrivateJupyterDirs(label: string): { dir: string; prefix: string; env: NodeJS.ProcessEnv } {
  const dir = mkdtempSync(join(tmpdir(), label));
  const sub = (name: string): string => {
    const p = join(dir, name);
    mkdirSync(p, { recursive: true });
    return p;
  };
  const prefix = sub("prefix");
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    // The kernel spec's argv starts a `#!/usr/bin/env node` script, so node must be found.
    PATH: [dirname(process.execPath), process.env.PATH ?? ""].filter(Boolean).join(delimiter),
    JUPYTER_PATH: join(prefix, "share", "jupyter"),
    JUPYTER_CONFIG_DIR: sub("config"),
    JUPYTER_DATA_DIR: sub("data"),
    JUPYTER_RUNTIME_DIR: sub("runtime"),
    IPYTHONDIR: sub("ipython"),
    // Debian's debugpy warns on every kernel start without this.
    PYDEVD_DISABLE_FILE_VALIDATION: "1",
    // Keep the test's own output plain and the kernel's locale predictable.
    NO_COLOR: "1",
  };
  // A Jupyter config dir from the caller's environment must not leak in.
  delete env.JUPYTER_PREFER_ENV_PATH;
  return { dir, prefix, env };
}

export function createJupyterEnv(): JupyterEnv {
  if (!existsSync(SYSTEM_PYTHON)) {
    throw new Error(`${SYSTEM_PYTHON} is missing: run scripts/ensure-system-deps.sh (npm test does) to install the Debian Jupyter packages`);
  }
  const binary = tslabBinary();
  if (!existsSync(binary)) throw new Error("node_modules/.bin/tslab is missing: run npm ci");
  const { dir, prefix, env } = createPrivateJupyterDirs("quietframe-jupyter-");
  try {
    execFileSync(binary, ["install", `--python=${SYSTEM_PYTHON}`, `--binary=${binary}`, "--prefix", prefix], {
      env,
      stdio: ["ignore", "pipe", "pipe"],
    });
  } catch (e) {
    rmSync(dir, { recursive: true, force: true });
    const err = e as { stderr?: Buffer; message: string };
    throw new Error(`tslab install failed: ${err.stderr?.toString() ?? err.message}`);
  }
  const specFile = join(prefix, "share", "jupyter", "kernels", TS_KERNEL, "kernel.json");
  const kernelSpec = JSON.parse(readFileSync(specFile, "utf8")) as JupyterEnv["kernelSpec"];
  return {
    dir,
    env,
    kernelSpec,
    dispose: () => rmSync(dir, { recursive: true, force: true }),
  };
}
