/**
 * The kernel's comms by id and the targets that open them (Jupyter messaging, "Custom Messages").
 */
import { randomUUID } from "node:crypto";
import { Comm, type CommMessage, type CommSender } from "./comm";

/**
 * The kernel's comms: targets that front-ends may open comms to, the comms open now, and
 * the three comm messages from the front-ends. Nothing a front-end sends can stop the
 * kernel: each problem becomes a line in the kernel log and, where a comm is known, a
 * report on that comm; a target's or callback's exception is caught the same way.
 */

/** Called when a front-end opens a comm to a registered target. */
export type TargetHandler = (comm: Comm, openMsg: CommMessage) => void | Promise<void>;

export interface CommTransport {
  /** Publishes a comm message to the front-ends (on iopub, parented to the request being served). */
  publish(msgType: "comm_open" | "comm_msg" | "comm_close", content: Record<string, unknown>, metadata: Record<string, unknown>, buffers: readonly Uint8Array[]): void;
  /** A line for the kernel log (the kernel's own stderr, never a cell's output). */
  log(line: string): void;
}

/** The comm messages a front-end sends on the shell channel. */
export const FRONT_END_COMM_TYPES = ["comm_open", "comm_msg", "comm_close"] as const;
export type FrontEndCommType = (typeof FRONT_END_COMM_TYPES)[number];
export function isFrontEndCommType(t: string): t is FrontEndCommType {
  return (FRONT_END_COMM_TYPES as readonly string[]).includes(t);
}

export class CommManager {
  private readonly targets = new Map<string, TargetHandler>();
  private readonly comms = new Map<string, Comm>();
  private readonly sender: CommSender;

  constructor(private readonly transport: CommTransport) {
    this.sender = { send: (type, content, metadata, buffers) => transport.publish(type, content, metadata, buffers) };
  }

  registerTarget(name: string, handler: TargetHandler): void {
    if (typeof name !== "string" || name === "") throw new Error("a comm target needs a non-empty name");
    this.targets.set(name, handler);
  }

  unregisterTarget(name: string): void {
    this.targets.delete(name);
  }

  /** Opens a comm from the kernel to the front-ends' `target`. */
  open(target: string, data: Record<string, unknown> = {}, metadata: Record<string, unknown> = {}, buffers: readonly Uint8Array[] = []): Comm {
    const comm = this.track(randomUUID().replace(/-/g, ""), target);
    this.transport.publish("comm_open", { comm_id: comm.id, target_name: target, data }, metadata, buffers);
    return comm;
  }

  /** The comm with this id, if open. */
  get(id: string): Comm | undefined {
    return this.comms.get(id);
  }

  /** For comm_info_reply: open comms, only those of `targetName` when given (messaging spec, "Comm info"). */
  commInfo(targetName?: string): Record<string, { target_name: string }> {
    const out: Record<string, { target_name: string }> = {};
    for (const comm of this.comms.values()) {
      if (targetName === undefined || comm.targetName === targetName) out[comm.id] = { target_name: comm.targetName };
    }
    return out;
  }

  log(line: string): void {
    this.transport.log(line);
  }

  /** Handles comm_open / comm_msg / comm_close from a front-end. Never throws. */
  async handle(msgType: FrontEndCommType, content: Record<string, unknown>, metadata: Record<string, unknown>, buffers: readonly Uint8Array[], msgId: string): Promise<void> {
    const commId = content.comm_id;
    if (typeof commId !== "string" || commId === "") {
      this.transport.log(`${msgType} ${msgId} ignored: content.comm_id must be a non-empty string, got ${describe(commId)}`);
      return;
    }
    const rawData = content.data ?? {};
    const dataOk = typeof rawData === "object" && rawData !== null && !Array.isArray(rawData);
    const msg: CommMessage = {
      commId,
      data: dataOk ? (rawData as Record<string, unknown>) : {},
      metadata,
      buffers,
      msgId,
      ...(typeof content.target_name === "string" ? { targetName: content.target_name } : {}),
    };
    try {
      if (msgType === "comm_open") await this.handleOpen(msg, content, dataOk);
      else if (msgType === "comm_msg") await this.handleMsg(msg, dataOk, rawData);
      else this.handleClose(msg);
    } catch (e) {
      this.transport.log(`${msgType} on comm ${commId}: handler failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
    }
  }

  private async handleOpen(msg: CommMessage, content: Record<string, unknown>, dataOk: boolean): Promise<void> {
    const target = content.target_name;
    const handler = typeof target === "string" ? this.targets.get(target) : undefined;
    if (typeof target !== "string" || !handler || !dataOk) {
      const why = typeof target !== "string" ? "comm_open without target_name" : !handler ? `no comm target "${target}" in this kernel` : "comm_open data must be a JSON object";
      this.transport.log(`comm_open ${msg.commId} refused: ${why}`);
      // Tell the front-end its comm is dead (as kernels do for unknown targets).
      this.transport.publish("comm_close", { comm_id: msg.commId, data: { error: why } }, {}, []);
      return;
    }
    if (this.comms.has(msg.commId)) {
      this.transport.log(`comm_open ${msg.commId} ignored: a comm with this id is already open`);
      return;
    }
    const comm = this.track(msg.commId, target);
    await handler(comm, msg);
  }

  private async handleMsg(msg: CommMessage, dataOk: boolean, rawData: unknown): Promise<void> {
    const comm = this.comms.get(msg.commId);
    if (!comm) {
      const why = `no open comm "${msg.commId}" in this kernel`;
      this.transport.log(`comm_msg ${msg.msgId} ignored: ${why}`);
      this.transport.publish("comm_close", { comm_id: msg.commId, data: { error: why } }, {}, []);
      return;
    }
    if (!dataOk) {
      const why = `comm_msg data must be a JSON object, got ${describe(rawData)}`;
      this.transport.log(`comm ${comm.id} (${comm.targetName}): ${why}`);
      comm.reject(why, msg);
      return;
    }
    await comm.deliver(msg);
  }

  private handleClose(msg: CommMessage): void {
    const comm = this.comms.get(msg.commId);
    if (!comm) {
      this.transport.log(`comm_close for unknown comm ${msg.commId} ignored`);
      return;
    }
    comm.finish(msg);
  }

  private track(id: string, target: string): Comm {
    const comm = new Comm(id, target, this.sender, (c) => this.comms.delete(c.id));
    this.comms.set(id, comm);
    return comm;
  }
}

function describe(v: unknown): string {
  if (v === undefined) return "nothing";
  if (v === null) return "null";
  if (Array.isArray(v)) return "an array";
  return typeof v === "string" ? JSON.stringify(v.length > 60 ? v.slice(0, 57) + "..." : v) : typeof v;
}
