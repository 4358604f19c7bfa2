/**
 * The comm manager of the running quietframe kernel, found on globalThis (undefined in any other
 * process).
 */
import type { CommManager } from "./comm-manager";

/**
 * The kernel's CommManager, reachable from cell code. It lives on a global symbol, not in a
 * module variable, because a notebook may load another copy of quietframe (its own
 * node_modules) than the one that started the kernel; both must see the same comms.
 */

const KEY = Symbol.for("quietframe.kernel");

interface KernelSlot {
  comms: CommManager;
}

/** The running quietframe kernel's comms; undefined elsewhere (plain tslab, scripts, tests). */
export function kernelComms(): CommManager | undefined {
  const slot = (globalThis as Record<symbol, KernelSlot | undefined>)[KEY];
  return slot?.comms;
}

/** Called once by the kernel launcher (and by tests with a fake transport). */
export function installKernelComms(comms: CommManager | undefined): void {
  const g = globalThis as Record<symbol, KernelSlot | undefined>;
  if (comms === undefined) delete g[KEY];
  else g[KEY] = { comms };
}
