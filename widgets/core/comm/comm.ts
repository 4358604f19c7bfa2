/**
 * Comms of the Jupyter messaging protocol ("Custom Messages" section): a comm is a channel
 * with an id between a kernel-side object and a front-end object, opened by either side for
 * a target name, carrying JSON `data`, `metadata` and binary buffers until one side closes it.
 */

/** A message received on a comm (from comm_open, comm_msg or comm_close). */
export interface CommMessage {
  readonly commId: string;
  readonly data: Record<string, unknown>;
  readonly metadata: Record<string, unknown>;
  readonly buffers: readonly Uint8Array[];
  /** The front-end's message id (its echo_update bookkeeping matches parent headers against it). */
  readonly msgId: string;
  /** Only on comm_open. */
  readonly targetName?: string;
}

/** How a comm reaches the front-ends; the kernel server supplies it, tests use a fake. */
export interface CommSender {
  send(msgType: "comm_open" | "comm_msg" | "comm_close", content: Record<string, unknown>, metadata: Record<string, unknown>, buffers: readonly Uint8Array[]): void;
}

export type MessageCallback = (msg: CommMessage) => void | Promise<void>;
export type CloseCallback = (msg: CommMessage | undefined) => void;
/** Told when the front-end sent something this comm cannot take (the comm may answer on itself). */
export type InvalidCallback = (problem: string, msg: CommMessage) => void;

export class Comm {
  readonly id: string;
  readonly targetName: string;
  private closed = false;
  private readonly messageCallbacks: MessageCallback[] = [];
  private readonly closeCallbacks: CloseCallback[] = [];
  private readonly invalidCallbacks: InvalidCallback[] = [];

  constructor(
    id: string,
    targetName: string,
    private readonly sender: CommSender,
    private readonly onClosed: (comm: Comm) => void,
  ) {
    this.id = id;
    this.targetName = targetName;
  }

  get isClosed(): boolean {
    return this.closed;
  }

  /** Sends comm_msg to the front-ends. Throws after close: a message then would be lost silently. */
  send(data: Record<string, unknown>, metadata: Record<string, unknown> = {}, buffers: readonly Uint8Array[] = []): void {
    if (this.closed) throw new Error(`comm ${this.id} (${this.targetName}) is closed`);
    this.sender.send("comm_msg", { comm_id: this.id, data }, metadata, buffers);
  }

  onMessage(cb: MessageCallback): void {
    this.messageCallbacks.push(cb);
  }

  /** Called once, when either side closes the comm (with the front-end's message if it closed it). */
  onClose(cb: CloseCallback): void {
    this.closeCallbacks.push(cb);
  }

  onInvalid(cb: InvalidCallback): void {
    this.invalidCallbacks.push(cb);
  }

  /** Closes from the kernel side: sends comm_close and forgets the comm. Closing twice does nothing. */
  close(data: Record<string, unknown> = {}, metadata: Record<string, unknown> = {}, buffers: readonly Uint8Array[] = []): void {
    if (this.closed) return;
    this.sender.send("comm_close", { comm_id: this.id, data }, metadata, buffers);
    this.finish(undefined);
  }

  /** @internal the manager hands a front-end comm_msg over. */
  async deliver(msg: CommMessage): Promise<void> {
    for (const cb of [...this.messageCallbacks]) await cb(msg);
  }

  /** @internal the manager reports a message this comm cannot take. */
  reject(problem: string, msg: CommMessage): void {
    for (const cb of [...this.invalidCallbacks]) cb(problem, msg);
  }

  /** @internal the front-end closed it (or the kernel did, through close()). */
  finish(msg: CommMessage | undefined): void {
    if (this.closed) return;
    this.closed = true;
    this.onClosed(this);
    for (const cb of [...this.closeCallbacks]) cb(msg);
  }
}
