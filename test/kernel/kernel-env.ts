import { mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { delimiter, dirname, join } from "node:path";
import { installKernelSpec, KERNEL_NAME, type KernelSpec } from "../../widgets/kernel/kernel-spec";
import { SYSTEM_PYTHON } from "../jupyter/env";

/**
 * A private Jupyter environment with the quietframe kernel registered in it by the same
 * code as `quietframe kernel install --prefix DIR` (never the user's own Jupyter). Needs a
 * build (the kernel spec points at dist/widgets/kernel/launch.js).
 */

export interface QuietframeKernelEnv {
  readonly dir: string;
  readonly env: NodeJS.ProcessEnv;
  readonly kernelName: string;
  readonly kernelSpec: KernelSpec;
  dispose(): void;
}

export function createQuietframeKernelEnv(): QuietframeKernelEnv {
  const dir = mkdtempSync(join(tmpdir(), "quietframe-kernel-"));
  const sub = (name: string): string => {
    const p = join(dir, name);
    mkdirSync(p, { recursive: true });
    return p;
  };
  const prefix = sub("prefix");
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    PATH: [dirname(process.execPath), process.env.PATH ?? ""].filter(Boolean).join(delimiter),
    JUPYTER_PATH: join(prefix, "share", "jupyter"),
    JUPYTER_CONFIG_DIR: sub("config"),
    JUPYTER_DATA_DIR: sub("data"),
    JUPYTER_RUNTIME_DIR: sub("runtime"),
    IPYTHONDIR: sub("ipython"),
    PYDEVD_DISABLE_FILE_VALIDATION: "1",
    NO_COLOR: "1",
  };
  delete env.JUPYTER_PREFER_ENV_PATH;
  try {
    const installed = installKernelSpec({ prefix, python: SYSTEM_PYTHON, env });
    const kernelSpec = JSON.parse(readFileSync(join(installed, "kernel.json"), "utf8")) as KernelSpec;
    return { dir, env, kernelName: KERNEL_NAME, kernelSpec, dispose: () => rmSync(dir, { recursive: true, force: true }) };
  } catch (e) {
    rmSync(dir, { recursive: true, force: true });
    throw e;
  }
}
