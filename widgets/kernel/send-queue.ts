/** One ordered send queue per ZeroMQ socket: every message waits for the one before it. */

/**
 * A socket of the zeromq package takes one send at a time: a second send while the first is
 * still in progress fails with EBUSY (thrown, or a rejected promise), and that message is
 * gone. Every sender of the kernel (tslab's replies and streams, the comm server, status)
 * calls `send` without waiting, so a burst of messages in one event-loop turn loses most of
 * them. The queue keeps the messages in order and hands the next one over only when the
 * socket has taken the previous one; nothing is dropped, and nothing throws into the caller
 * (a cell that moves a slider must not lose its output because the socket was busy).
 *
 * A publisher set not to drop (iopub) refuses a send with EAGAIN while a front-end's queue is
 * full; the message is then tried again, waiting a little longer each time (up to
 * MAX_RETRY_WAIT_MS), until the front-end has read enough. A stall is logged once it lasts
 * STALL_REPORT_MS.
 */

/** Longest wait between two tries of a message the socket refused with EAGAIN, in milliseconds. */
export const MAX_RETRY_WAIT_MS = 50;
/** A message waiting this long (ms) for a front-end to read is reported in the kernel log, once per message. */
export const STALL_REPORT_MS = 30_000;

/** What the queue needs of a socket: the zeromq package's Writable.send. */
export interface FrameSocket {
  send(frames: Buffer[]): Promise<void>;
}

export class SendQueue {
  private readonly waiting: { frames: Buffer[]; taken: () => void }[] = [];
  private pumping = false;
  private sentCount = 0;
  private failedCount = 0;

  /**
   * @param send the socket's own send, bound to it
   * @param log where a send the socket refused for good is reported (the kernel log)
   */
  constructor(
    private readonly send: (frames: Buffer[]) => Promise<void>,
    private readonly log: (line: string) => void,
  ) {}

  /** Queues a message; resolves once the socket has taken it (or refused it for good, which is logged). */
  push(frames: Buffer[]): Promise<void> {
    const taken = new Promise<void>((resolve) => this.waiting.push({ frames, taken: resolve }));
    if (!this.pumping) void this.pump();
    return taken;
  }

  /** Messages waiting for the socket. */
  get pending(): number {
    return this.waiting.length;
  }

  /** Messages the socket took, and messages it refused (each logged). */
  get counts(): { sent: number; failed: number } {
    return { sent: this.sentCount, failed: this.failedCount };
  }

  private async pump(): Promise<void> {
    this.pumping = true;
    try {
      while (this.waiting.length > 0) {
        const { frames, taken } = this.waiting.shift()!;
        await this.sendOne(frames);
        taken();
      }
    } finally {
      this.pumping = false;
    }
  }

  private async sendOne(frames: Buffer[]): Promise<void> {
    const started = Date.now();
    let wait = 1;
    let reported = false;
    for (;;) {
      try {
        // Awaited: the socket accepts the next send only after this one has been queued by ZeroMQ.
        await this.send(frames);
        this.sentCount += 1;
        return;
      } catch (e) {
        if ((e as { code?: unknown }).code !== "EAGAIN") {
          // A closed socket or a refused message: report it; the messages after it still go out.
          this.failedCount += 1;
          this.log(`a message could not be sent: ${e instanceof Error ? e.message : String(e)}`);
          return;
        }
      }
      if (!reported && Date.now() - started >= STALL_REPORT_MS) {
        reported = true;
        this.log(`a front-end has read nothing for ${Math.round((Date.now() - started) / 1000)} s; ${this.waiting.length + 1} messages wait for it`);
      }
      await delay(wait);
      wait = Math.min(2 * wait, MAX_RETRY_WAIT_MS);
    }
  }
}

function delay(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}

/**
 * The socket with every send routed through a SendQueue: a stand-in for it that the kernel
 * server puts where tslab keeps its sockets, so tslab's own sends (which call `socket.send`
 * directly and ignore the result) are queued too. The zeromq sockets cannot be patched in
 * place (their objects are not extensible); everything but `send` reaches the socket itself.
 */
export function withSendQueue<S extends FrameSocket>(socket: S, log: (line: string) => void): { socket: S; queue: SendQueue } {
  const queue = new SendQueue((frames) => socket.send(frames), log);
  const queuedSend = (frames: Buffer[]): Promise<void> => queue.push(frames);
  const stand = new Proxy(socket, {
    get(target, key) {
      if (key === "send") return queuedSend;
      const value: unknown = Reflect.get(target, key, target);
      // Native methods need the socket itself as `this`.
      return typeof value === "function" ? value.bind(target) : value;
    },
    set: (target, key, value) => Reflect.set(target, key, value, target),
  });
  return { socket: stand, queue };
}
