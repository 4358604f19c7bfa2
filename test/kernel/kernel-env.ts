import { readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { installKernelSpec, KERNEL_NAME, type KernelSpec } from "../../widgets/kernel/kernel-spec";
import { createPrivateJupyterDirs, SYSTEM_PYTHON } from "../jupyter/env";

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
  const { dir, prefix, env } = createPrivateJupyterDirs("quietframe-kernel-");
  try {
    const installed = installKernelSpec({ prefix, python: SYSTEM_PYTHON, env });
    const kernelSpec = JSON.parse(readFileSync(join(installed, "kernel.json"), "utf8")) as KernelSpec;
    return { dir, env, kernelName: KERNEL_NAME, kernelSpec, dispose: () => rmSync(dir, { recursive: true, force: true }) };
  } catch (e) {
    rmSync(dir, { recursive: true, force: true });
    throw e;
  }
}
