/** The quietframe kernel's server: tslab's, with comms served here. */
import { AsyncLocalStorage } from "node:async_hooks";
import { randomUUID } from "node:crypto";
import { JupyterHandlerImpl, ZmqServer } from "tslab/dist/jupyter";
import { QUIETFRAME_VERSION } from "../../src/index";
import { CommManager, isFrontEndCommType } from "../core/comm/comm-manager";
import { decodeMessage, encodeMessage, type MessageHeader, type OutgoingMessage, type SigningKey, type WireMessage } from "./wire";

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
 */

type ShellSocket = Parameters<ZmqServer["handleShellMessage"]>[0];
type KernelInfo = ReturnType<JupyterHandlerImpl["handleKernel"]>;

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

  constructor(handler: JupyterHandlerImpl, configPath: string, log: (line: string) => void) {
    super(handler, configPath);
    this.log = log;
    this.comms = new CommManager({
      publish: (msgType, content, metadata, buffers) => this.publish({ msgType, parent: this.currentParent(), content, metadata, buffers }),
      log,
    });
  }

  override async handleShellMessage(sock: ShellSocket, ...frames: Buffer[]): Promise<void> {
    let msg: WireMessage;
    try {
      msg = decodeMessage(frames, this.signing());
    } catch (e) {
      // Unsigned or garbled: the spec says to ignore it; the log says why.
      this.log(`shell message dropped: ${e instanceof Error ? e.message : String(e)}`);
      return;
    }
    const type = msg.header.msg_type;
    if (isFrontEndCommType(type) || type === "comm_info_request") {
      return this.requests.run(msg.header, () => this.serveComm(sock, msg));
    }
    if (type === "execute_request") this.lastExecute = msg.header;
    return this.requests.run(msg.header, () => super.handleShellMessage(sock, ...frames));
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
      this.publish({ msgType: "status", parent: msg.header, content: { execution_state: "idle" } });
    }
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
    const frames = encodeMessage(msg, this.signing(), this.session);
    sock.send(frames).catch((e: unknown) => this.log(`sending ${msg.msgType} failed: ${e instanceof Error ? e.message : String(e)}`));
  }
}
