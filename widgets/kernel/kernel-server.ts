/** The quietframe kernel's server: tslab's, with comms served here. */
import { AsyncLocalStorage } from "node:async_hooks";
import { randomUUID } from "node:crypto";
import { setImmediate as nextTurn } from "node:timers/promises";
import { JupyterHandlerImpl, ZmqServer } from "tslab/dist/jupyter";
import { QUIETFRAME_VERSION } from "../../src/index";
import { clip } from "../core/comm/bounded-text";
import { CommManager, isFrontEndCommType } from "../core/comm/comm-manager";
import { withSendQueue, type FrameSocket, type SendQueue } from "./send-queue";
import { decodeHeaderOnly, decodeMessage, encodeMessage, MAX_MESSAGE_BYTES, messageBytes, type MessageHeader, type OutgoingMessage, type SigningKey, type WireMessage } from "./wire";

/**
 * tslab's ZMQ server with the comm messages of the Jupyter messaging protocol. Every
 * shell/control message passes through here first: comm_open, comm_msg, comm_close and
 * comm_info_request are served by the CommManager (with busy/idle status around them, as
 * the spec asks of every request); everything else goes to tslab unchanged.
 *
 * Messages the kernel originates (a comm_open from a cell, an update after a slider moved)
 * need the parent header of the request being served, so that front-ends route them (the
 * widget protocol's echo_update is matched by it). Each request is served inside an
 * AsyncLocalStorage context holding its header; cell code, its promises and timers inherit it.
 *
 * Under load:
 * - Every socket sends through one ordered queue (send-queue.ts), tslab's sends included, and
 *   the iopub publisher waits at its high-water mark instead of dropping: no message is lost.
 * - Comm messages and comm_info requests are served one after another in arrival order, each
 *   with busy, its replies, idle. Work deferred by the comms (a chart recomputation) runs when
 *   no comm message is waiting, inside the context of the last one served, before its idle.
 * - A message over MAX_MESSAGE_BYTES is refused before its JSON is parsed.
 */

type ShellSocket = Parameters<ZmqServer["handleShellMessage"]>[0];
type KernelInfo = ReturnType<JupyterHandlerImpl["handleKernel"]>;
type SocketName = "iopub" | "shell" | "control" | "stdin" | "hb";

/** The requests tslab's server answers (the rest it would only warn about, echoing the whole type). */
const TSLAB_REQUESTS = new Set(["kernel_info_request", "execute_request", "is_complete_request", "inspect_request", "complete_request", "shutdown_request"]);

/** tslab's handler, answering kernel_info with our implementation name. */
export class QuietframeHandler extends JupyterHandlerImpl {
  override handleKernel(): KernelInfo {
    const info = super.handleKernel();
    // The messaging spec requires status in every reply; tslab leaves it out of kernel_info_reply.
    return {
      ...info,
      status: "ok",
      implementation: "quietframe-ts",
      implementation_version: QUIETFRAME_VERSION,
      banner: `${info.banner} (quietframe ${QUIETFRAME_VERSION}, kernel with comms)`,
    } as KernelInfo;
  }
}

export class CommKernelServer extends ZmqServer {
  readonly comms: CommManager;
  private readonly requests = new AsyncLocalStorage<MessageHeader>();
  /** Parent for kernel messages sent outside any request's context (e.g. from a raw socket callback). */
  private lastExecute: MessageHeader | undefined;
  private readonly session = randomUUID();
  private readonly log: (line: string) => void;
  private readonly commQueue: { sock: ShellSocket; msg: WireMessage }[] = [];
  private servingComms = false;
  /** The send queue of each socket, once init() has opened them. */
  readonly sendQueues = new Map<SocketName, SendQueue>();

  constructor(handler: JupyterHandlerImpl, configPath: string, log: (line: string) => void) {
    super(handler, configPath);
    this.log = log;
    // iopub waits at a front-end's high-water mark instead of dropping (ZMQ_XPUB_NODROP, which
    // applies to PUB sockets too); set before tslab binds it, as socket options take effect on bind.
    const self = this as unknown as { bindSocket(sock: unknown, port: number): Promise<void> };
    const bind = self.bindSocket.bind(this);
    self.bindSocket = (sock, port) => {
      if (sock === this.iopub) this.iopub.noDrop = true;
      return bind(sock, port);
    };
    this.comms = new CommManager({
      publish: (msgType, content, metadata, buffers) => this.publish({ msgType, parent: this.currentParent(), content, metadata, buffers }),
      log,
    });
  }

  override async init(): Promise<void> {
    await super.init();
    // No I/O callback runs between the sockets' bind and this line, so no message is sent before the queues are in place.
    const queued = <S extends FrameSocket>(name: SocketName, socket: S): S => {
      const { socket: stand, queue } = withSendQueue(socket, (line) => this.log(`${name}: ${line}`));
      this.sendQueues.set(name, queue);
      return stand;
    };
    this.iopub = queued("iopub", this.iopub);
    this.shell = queued("shell", this.shell);
    this.control = queued("control", this.control);
    this.stdin = queued("stdin", this.stdin);
    this.hb = queued("hb", this.hb);
  }

  override async handleShellMessage(sock: ShellSocket, ...frames: Buffer[]): Promise<void> {
    const size = messageBytes(frames);
    if (size !== undefined && size > MAX_MESSAGE_BYTES) return this.refuseOversized(sock, frames, size);
    let msg: WireMessage;
    try {
      msg = decodeMessage(frames, this.signing());
    } catch (e) {
      // Unsigned or garbled: the spec says to ignore it; the log says why.
      this.log(`shell message dropped: ${clip(e instanceof Error ? e.message : String(e))}`);
      return;
    }
    const type = msg.header.msg_type;
    if (isFrontEndCommType(type) || type === "comm_info_request") {
      this.commQueue.push({ sock, msg });
      if (!this.servingComms) await this.serveCommQueue();
      return;
    }
    if (!TSLAB_REQUESTS.has(type)) return this.ignoreUnknown(msg.header);
    if (type === "execute_request") this.lastExecute = msg.header;
    return this.requests.run(msg.header, () => super.handleShellMessage(sock, ...frames));
  }

  /** Serves queued comm messages in order until none is waiting; deferred comm work runs at the end. */
  private async serveCommQueue(): Promise<void> {
    this.servingComms = true;
    this.comms.holdDeferred(true);
    try {
      while (this.commQueue.length > 0) {
        const { sock, msg } = this.commQueue.shift()!;
        await this.requests.run(msg.header, () => this.serveComm(sock, msg));
      }
    } finally {
      this.comms.holdDeferred(false);
      this.servingComms = false;
      // Normally settled before the last idle; this catches work deferred by that settling itself.
      this.comms.settle();
    }
  }

  /** Served in handleShellMessage; overridden too, so tslab's reply (msg_type "complete_reply", no comms) can never go out. */
  override handleCommInfoRequest(sock: ShellSocket, msg: Parameters<ZmqServer["handleCommInfoRequest"]>[1]): void {
    const content = msg.content as { target_name?: unknown };
    this.reply(sock, { identities: msg.identity, msgType: "comm_info_reply", parent: msg.header, content: this.commInfoContent(content.target_name) });
  }

  private async serveComm(sock: ShellSocket, msg: WireMessage): Promise<void> {
    this.publish({ msgType: "status", parent: msg.header, content: { execution_state: "busy" } });
    try {
      const type = msg.header.msg_type;
      if (type === "comm_info_request") {
        this.reply(sock, { identities: msg.identities, msgType: "comm_info_reply", parent: msg.header, content: this.commInfoContent(msg.content.target_name) });
      } else if (isFrontEndCommType(type)) {
        await this.comms.handle(type, msg.content, msg.metadata, msg.buffers, msg.header.msg_id);
      }
    } finally {
      // Messages that already arrived join the queue during this turn; deferred work waits for the last of them.
      if (this.commQueue.length === 0) await nextTurn();
      if (this.commQueue.length === 0) this.comms.settle();
      this.publish({ msgType: "status", parent: msg.header, content: { execution_state: "idle" } });
    }
  }

  /** A request this kernel does not serve: busy and idle as for any request, and a short line in the kernel log. */
  private ignoreUnknown(header: MessageHeader): void {
    this.publish({ msgType: "status", parent: header, content: { execution_state: "busy" } });
    this.log(`${clip(header.msg_type)} ${clip(header.msg_id)} ignored: not a request this kernel serves`);
    this.publish({ msgType: "status", parent: header, content: { execution_state: "idle" } });
  }

  /**
   * A message over MAX_MESSAGE_BYTES: its signature is checked and its header read, nothing
   * else. It gets busy and idle like any request, a reply with the error when it is a request
   * that has one, and a line in the kernel log.
   */
  private refuseOversized(sock: ShellSocket, frames: Buffer[], size: number): void {
    const why = `${size} bytes, more than the kernel's limit of ${MAX_MESSAGE_BYTES} bytes (8 MiB) per message`;
    let identities: Buffer[];
    let header: MessageHeader;
    try {
      ({ identities, header } = decodeHeaderOnly(frames, this.signing()));
    } catch (e) {
      this.log(`shell message of ${why} dropped: ${clip(e instanceof Error ? e.message : String(e))}`);
      return;
    }
    const type = clip(header.msg_type);
    this.log(`${type} ${clip(header.msg_id)} refused: ${why}`);
    this.publish({ msgType: "status", parent: header, content: { execution_state: "busy" } });
    if (header.msg_type.endsWith("_request")) {
      const evalue = `${type}: the message is ${why}; allowed: messages of at most ${MAX_MESSAGE_BYTES} bytes`;
      this.reply(sock, {
        identities,
        msgType: header.msg_type.replace(/_request$/, "_reply"),
        parent: header,
        content: { status: "error", ename: "QuietframeError", evalue, traceback: [evalue] },
      });
    }
    this.publish({ msgType: "status", parent: header, content: { execution_state: "idle" } });
  }

  private commInfoContent(targetName: unknown): Record<string, unknown> {
    // Messaging spec, "Comm info": comms filtered by target_name when the request names one.
    const comms = this.comms.commInfo(typeof targetName === "string" && targetName !== "" ? targetName : undefined);
    return { status: "ok", comms };
  }

  private currentParent(): MessageHeader | undefined {
    return this.requests.getStore() ?? this.lastExecute;
  }

  private signing(): SigningKey {
    return { key: this.connInfo.key, scheme: this.connInfo.signature_scheme || "hmac-sha256" };
  }

  private publish(msg: OutgoingMessage): void {
    this.sendOn(this.iopub, { ...msg, identities: [] });
  }

  private reply(sock: ShellSocket, msg: OutgoingMessage): void {
    this.sendOn(sock, msg);
  }

  private sendOn(sock: { send(frames: Buffer[]): Promise<void> }, msg: OutgoingMessage): void {
    // The socket's send is its ordered queue (init), which never rejects and logs what the socket refused.
    void sock.send(encodeMessage(msg, this.signing(), this.session));
  }
}
