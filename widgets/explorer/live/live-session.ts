/**
 * Whether a live explorer's fallback already carried the browser runtime in this kernel.
 * Kept apart from the kernel-free outputs' flag (widgets/notebook/session.ts): a front-end
 * with a widget manager shows the live widget and never renders its fallback HTML, so a
 * runtime inside a fallback does not reach the page, and later kernel-free outputs must
 * still bring their own. On globalThis, like that flag, so two loaded copies agree.
 */
const LIVE_RUNTIME_CARRIED = Symbol.for("quietframe.live.runtimeCarried");

type SessionGlobal = { [LIVE_RUNTIME_CARRIED]?: boolean };

export function liveRuntimeCarried(): boolean {
  return (globalThis as SessionGlobal)[LIVE_RUNTIME_CARRIED] === true;
}

export function markLiveRuntimeCarried(): void {
  (globalThis as SessionGlobal)[LIVE_RUNTIME_CARRIED] = true;
}

/** Forget it (after clearing all outputs, and in tests). */
export function resetLiveSession(): void {
  delete (globalThis as SessionGlobal)[LIVE_RUNTIME_CARRIED];
}
