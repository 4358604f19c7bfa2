import { describe, expect, it } from "vitest";
import { SendQueue, withSendQueue } from "../../widgets/kernel/send-queue";

// The zeromq package's Writable.send, as its documentation (lib/index.d.ts of zeromq 6) states
// it: a send resolves once ZeroMQ has queued the message; "Only one asynchronously blocking call
// to send() may be executed simultaneously", a second one fails with EBUSY; a publisher set not
// to drop (ZMQ_XPUB_NODROP) refuses with EAGAIN at a peer's high-water mark. The fake socket
// below behaves that way; the queue must deliver every message, in order, and never throw.

class FakeZmqSocket {
  readonly received: string[] = [];
  busy = false;
  /** How many of the next sends are refused with EAGAIN (a front-end's queue is full). */
  fullFor = 0;
  /** Sends refused for good (a closed socket), by message text. */
  readonly broken = new Set<string>();
  noDrop = false;

  send(frames: Buffer[]): Promise<void> {
    if (this.busy) throw Object.assign(new Error("Socket is busy writing"), { code: "EBUSY" });
    const text = frames.map((f) => f.toString()).join("|");
    if (this.broken.has(text)) return Promise.reject(Object.assign(new Error("Socket is closed"), { code: "EBADF" }));
    if (this.fullFor > 0) {
      this.fullFor -= 1;
      return Promise.reject(Object.assign(new Error("Operation was not possible or timed out"), { code: "EAGAIN" }));
    }
    this.busy = true;
    return new Promise((resolve) =>
      setImmediate(() => {
        this.busy = false;
        this.received.push(text);
        resolve();
      }),
    );
  }

  close(): string {
    return `closed ${this.received.length}`;
  }
}

const frames = (n: number): Buffer[] => [Buffer.from(`m${n}`)];

describe("SendQueue", () => {
  it("delivers a burst sent in one event-loop turn, all of it and in order, where direct sends would throw EBUSY", async () => {
    const direct = new FakeZmqSocket();
    void direct.send(frames(0));
    expect(() => direct.send(frames(1))).toThrow("busy");
    const socket = new FakeZmqSocket();
    const log: string[] = [];
    const queue = new SendQueue(
      (f) => socket.send(f),
      (l) => log.push(l),
    );
    const all = Array.from({ length: 5000 }, (_, i) => queue.push(frames(i)));
    expect(queue.pending).toBeGreaterThan(0);
    await Promise.all(all);
    expect(socket.received).toEqual(Array.from({ length: 5000 }, (_, i) => `m${i}`));
    expect(queue.counts).toEqual({ sent: 5000, failed: 0 });
    expect(log).toEqual([]);
  });

  it("tries a message again while the front-end's queue is full (EAGAIN), keeping the order", async () => {
    const socket = new FakeZmqSocket();
    socket.fullFor = 4;
    const queue = new SendQueue(
      (f) => socket.send(f),
      () => undefined,
    );
    await Promise.all([queue.push(frames(1)), queue.push(frames(2))]);
    expect(socket.received).toEqual(["m1", "m2"]);
  });

  it("logs a message the socket refuses for good and sends the ones after it", async () => {
    const socket = new FakeZmqSocket();
    socket.broken.add("m2");
    const log: string[] = [];
    const queue = new SendQueue(
      (f) => socket.send(f),
      (l) => log.push(l),
    );
    await Promise.all([1, 2, 3].map((i) => queue.push(frames(i))));
    expect(socket.received).toEqual(["m1", "m3"]);
    expect(queue.counts).toEqual({ sent: 2, failed: 1 });
    expect(log).toEqual(["a message could not be sent: Socket is closed"]);
  });
});

describe("withSendQueue", () => {
  it("queues every send of the stand-in, and leaves the socket's other members to the socket", async () => {
    const socket = new FakeZmqSocket();
    const { socket: stand, queue } = withSendQueue(socket, () => undefined);
    const sends = [stand.send(frames(1)), stand.send(frames(2)), stand.send(frames(3))];
    await Promise.all(sends);
    expect(socket.received).toEqual(["m1", "m2", "m3"]);
    expect(queue.counts.sent).toBe(3);
    stand.noDrop = true;
    expect(socket.noDrop).toBe(true);
    expect(stand.close()).toBe("closed 3");
  });
});
