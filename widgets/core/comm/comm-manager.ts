/**
 * The kernel's comms by id and the targets that open them (Jupyter messaging, "Custom Messages").
 */
import { randomUUID } from "node:crypto";
import { clip, describeSent } from "./bounded-text";
import { Comm, type CommMessage, type CommSender } from "./comm";

/**
 * The kernel's comms: targets that front-ends may open comms to, the comms open now, and
 * the three comm messages from the front-ends. Nothing a front-end sends can stop the
 * kernel: each problem becomes a line in the kernel log and, where a comm is known, a
 * report on that comm; a target's or callback's exception is caught the same way.
 *
 * Comm ids are the kernel's: a front-end comm_open that reuses the id of an open comm is
 * refused without touching that comm (answering it with comm_close would close the open
 * comm for every front-end).
 *
 * Work that only the newest of several queued front-end messages needs (recomputing a chart
 * while a burst of slider moves is still arriving) is deferred by key with `defer` and run
 * once by `settle`, which the kernel server calls when no comm message is waiting.
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
  private readonly deferred = new Map<object, () => void>();
  private inBurst = false;

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

  /**
   * Runs `task` now, or, while the kernel server works through queued front-end messages,
   * once they are all handled (`settle`). A later task with the same key replaces an earlier
   * one that has not run yet.
   */
  defer(key: object, task: () => void): void {
    if (!this.inBurst) return this.runGuarded(task);
    this.deferred.delete(key);
    this.deferred.set(key, task);
  }

  /** Whether `defer` keeps tasks for `settle` (true) or runs them now (false); the kernel server sets it. */
  holdDeferred(on: boolean): void {
    this.inBurst = on;
  }

  /** Runs the deferred tasks, oldest key first. */
  settle(): void {
    while (this.deferred.size > 0) {
      const [key, task] = this.deferred.entries().next().value as [object, () => void];
      this.deferred.delete(key);
      this.runGuarded(task);
    }
  }

  private runGuarded(task: () => void): void {
    try {
      task();
    } catch (e) {
      this.transport.log(`deferred work failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
    }
  }

  /** Handles comm_open / comm_msg / comm_close from a front-end. Never throws. */
  async handle(msgType: FrontEndCommType, content: Record<string, unknown>, metadata: Record<string, unknown>, buffers: readonly Uint8Array[], msgId: string): Promise<void> {
    const commId = content.comm_id;
    if (typeof commId !== "string" || commId === "") {
      this.transport.log(`${msgType} ${clip(msgId)} ignored: content.comm_id must be a non-empty string, got ${describeSent(commId)}`);
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
      this.transport.log(`${msgType} on comm ${clip(commId)}: handler failed: ${clip(e instanceof Error ? (e.stack ?? e.message) : String(e))}`);
    }
  }

  private async handleOpen(msg: CommMessage, content: Record<string, unknown>, dataOk: boolean): Promise<void> {
    const target = content.target_name;
    const open = this.comms.get(msg.commId);
    if (open) {
      // Checked first: a comm_close for this id (the answer to a refused comm_open) would close the open comm.
      this.transport.log(`comm_open ${clip(msg.commId)} refused: the id belongs to the open comm of target "${clip(open.targetName)}"; a front-end cannot replace it`);
      return;
    }
    const handler = typeof target === "string" ? this.targets.get(target) : undefined;
    if (typeof target !== "string" || !handler || !dataOk) {
      const why = typeof target !== "string" ? "comm_open without target_name" : !handler ? `no comm target "${clip(target)}" in this kernel` : "comm_open data must be a JSON object";
      this.transport.log(`comm_open ${clip(msg.commId)} refused: ${why}`);
      // Tell the front-end its comm is dead (as kernels do for unknown targets).
      this.transport.publish("comm_close", { comm_id: msg.commId, data: { error: why } }, {}, []);
      return;
    }
    const comm = this.track(msg.commId, target);
    await handler(comm, msg);
  }

  private async handleMsg(msg: CommMessage, dataOk: boolean, rawData: unknown): Promise<void> {
    const comm = this.comms.get(msg.commId);
    if (!comm) {
      const why = `no open comm "${clip(msg.commId)}" in this kernel`;
      this.transport.log(`comm_msg ${clip(msg.msgId)} ignored: ${why}`);
      this.transport.publish("comm_close", { comm_id: msg.commId, data: { error: why } }, {}, []);
      return;
    }
    if (!dataOk) {
      const why = `comm_msg data must be a JSON object, got ${describeSent(rawData)}`;
      this.transport.log(`comm ${comm.id} (${comm.targetName}): ${why}`);
      comm.reject(why, msg);
      return;
    }
    await comm.deliver(msg);
  }

  private handleClose(msg: CommMessage): void {
    const comm = this.comms.get(msg.commId);
    if (!comm) {
      this.transport.log(`comm_close for unknown comm ${clip(msg.commId)} ignored`);
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
