/**
 * Per-kernel bookkeeping. The browser runtime is large, so only the first widget shown in a
 * kernel session carries it; later widgets boot with the copy already on the page. The flag
 * lives on globalThis so that two loaded copies of this module (say dist/ and a package
 * install) still agree within one kernel process.
 */
const RUNTIME_SHOWN = Symbol.for("quietframe.notebook.runtimeShown");

type SessionGlobal = { [RUNTIME_SHOWN]?: boolean };

export function runtimeShown(): boolean {
  return (globalThis as SessionGlobal)[RUNTIME_SHOWN] === true;
}

export function markRuntimeShown(): void {
  (globalThis as SessionGlobal)[RUNTIME_SHOWN] = true;
}

/**
 * Forget that the runtime was shown, so the next widget carries it again. Use it after
 * clearing all outputs (the runtime went with them) and in tests.
 */
export function resetDisplaySession(): void {
  delete (globalThis as SessionGlobal)[RUNTIME_SHOWN];
}
