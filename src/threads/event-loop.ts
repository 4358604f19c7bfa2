/**
 * A turn of the event loop between slices of a long computation, so that timers, worker
 * messages, signals (SIGINT) and abort events run in between. Platform-free: setImmediate in
 * Node, a zero timeout in a page.
 */
export function yieldToEventLoop(): Promise<void> {
  return new Promise((resolve) => (typeof setImmediate === "function" ? setImmediate(resolve) : setTimeout(resolve, 0)));
}
