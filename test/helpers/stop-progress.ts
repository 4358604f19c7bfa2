/**
 * A progress callback that stops a design run: it aborts its controller in call number `k`
 * and remembers what every call was told (samples, parameters or starts done).
 */
export function stopAt(k: number): { signal: AbortSignal; onProgress: (done: number, total: number) => void; calls: number[] } {
  const controller = new AbortController();
  const calls: number[] = [];
  return {
    signal: controller.signal,
    calls,
    onProgress: (done) => {
      calls.push(done);
      if (calls.length === k) controller.abort();
    },
  };
}
