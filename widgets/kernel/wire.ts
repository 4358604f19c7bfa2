/** The Jupyter wire format: frames and their HMAC signature. */
import { createHmac, randomUUID, timingSafeEqual } from "node:crypto";

/**
 * The Jupyter wire protocol (messaging spec, "The Wire Protocol"): routing identities, the
 * delimiter, an HMAC signature, four JSON frames (header, parent header, metadata,
 * content) and any number of raw binary buffers. The signature covers the four JSON frames
 * only, never the buffers, so comm messages that carry binary data verify correctly.
 */

export const DELIMITER = Buffer.from("<IDS|MSG>");

/** Jupyter messaging protocol version this layer speaks. */
export const PROTOCOL_VERSION = "5.3";

export interface MessageHeader {
  msg_id: string;
  msg_type: string;
  session: string;
  username: string;
  date: string;
  version: string;
}

export interface WireMessage {
  /** ZeroMQ routing prefix (shell and control replies go back to these identities). */
  identities: Buffer[];
  header: MessageHeader;
  /** Empty object when the message has no parent. */
  parent: Partial<MessageHeader>;
  metadata: Record<string, unknown>;
  content: Record<string, unknown>;
  buffers: Buffer[];
}

/** A message the kernel sends; identities only for replies on shell/control. */
export interface OutgoingMessage {
  identities?: Buffer[];
  msgType: string;
  parent: Partial<MessageHeader> | undefined;
  content: Record<string, unknown>;
  metadata?: Record<string, unknown>;
  buffers?: readonly Uint8Array[];
}

export interface SigningKey {
  key: string;
  /** "hmac-sha256" in practice; the algorithm is the part after "hmac-". */
  scheme: string;
}

export function sign(frames: readonly (string | Buffer)[], signing: SigningKey): string {
  // An empty key means authentication is off (messaging spec): the signature is empty.
  if (signing.key === "") return "";
  const algorithm = signing.scheme.startsWith("hmac-") ? signing.scheme.slice(5) : "sha256";
  const mac = createHmac(algorithm, signing.key);
  for (const f of frames) mac.update(f);
  return mac.digest("hex");
}

/**
 * Largest message the kernel reads: every frame after the delimiter (signature, the four JSON
 * frames and the binary buffers), in bytes. A larger one is refused before its JSON is parsed.
 * 8 MiB is far above any widget update or notebook cell and below what a front-end server
 * usually lets through a websocket.
 */
export const MAX_MESSAGE_BYTES = 8 * 1024 * 1024;

/** Largest header frame read from a message refused for its size (a real header is a few hundred bytes). */
const MAX_HEADER_BYTES = 64 * 1024;

/** Bytes of every frame after the delimiter (undefined when there is no delimiter). */
export function messageBytes(frames: readonly Buffer[]): number | undefined {
  const at = frames.findIndex((f) => f.equals(DELIMITER));
  if (at < 0) return undefined;
  let n = 0;
  for (let i = at + 1; i < frames.length; i++) n += frames[i].byteLength;
  return n;
}

/**
 * Of a message refused for its size: the signature checked and the header alone parsed (the
 * other frames stay unread), so the refusal can go back to the request. Throws with a short
 * reason when even that is not possible.
 */
export function decodeHeaderOnly(frames: readonly Buffer[], signing: SigningKey): { identities: Buffer[]; header: MessageHeader } {
  const at = frames.findIndex((f) => f.equals(DELIMITER));
  if (at < 0 || frames.length < at + 6) throw new Error("not a complete message");
  if (signing.key !== "" && !sameText(frames[at + 1].toString("ascii"), sign(frames.slice(at + 2, at + 6), signing))) throw new Error("invalid message signature");
  if (frames[at + 2].byteLength > MAX_HEADER_BYTES) throw new Error(`header frame of ${frames[at + 2].byteLength} bytes, more than ${MAX_HEADER_BYTES}`);
  const header: unknown = JSON.parse(frames[at + 2].toString("utf8"));
  if (typeof header !== "object" || header === null || typeof (header as MessageHeader).msg_type !== "string" || typeof (header as MessageHeader).msg_id !== "string") {
    throw new Error("header without msg_type or msg_id");
  }
  return { identities: frames.slice(0, at), header: header as MessageHeader };
}

/** Decodes and verifies raw frames; throws with a short reason when they are not a valid message. */
export function decodeMessage(frames: readonly Buffer[], signing: SigningKey): WireMessage {
  const at = frames.findIndex((f) => f.equals(DELIMITER));
  if (at < 0) throw new Error("no <IDS|MSG> delimiter");
  if (frames.length < at + 6) throw new Error(`only ${frames.length - at - 1} frames after the delimiter; need a signature and four JSON frames`);
  const signature = frames[at + 1].toString("ascii");
  const json = frames.slice(at + 2, at + 6);
  const expected = sign(json, signing);
  if (signing.key !== "" && !sameText(signature, expected)) throw new Error("invalid message signature");
  const parse = (i: number, name: string): Record<string, unknown> => {
    const value: unknown = JSON.parse(json[i].toString("utf8"));
    if (typeof value !== "object" || value === null || Array.isArray(value)) throw new Error(`${name} frame is not a JSON object`);
    return value as Record<string, unknown>;
  };
  const header = parse(0, "header");
  if (typeof header.msg_type !== "string" || typeof header.msg_id !== "string") throw new Error("header without msg_type or msg_id");
  return {
    identities: frames.slice(0, at),
    header: header as unknown as MessageHeader,
    parent: parse(1, "parent header") as Partial<MessageHeader>,
    metadata: parse(2, "metadata"),
    content: parse(3, "content"),
    buffers: frames.slice(at + 6),
  };
}

function sameText(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/** A header for a message the kernel originates; session and username follow the parent when there is one. */
export function newHeader(msgType: string, parent: Partial<MessageHeader> | undefined, session: string): MessageHeader {
  return {
    msg_id: randomUUID(),
    msg_type: msgType,
    session: parent?.session ?? session,
    username: parent?.username ?? "kernel",
    date: new Date().toISOString(),
    version: PROTOCOL_VERSION,
  };
}

/** Encodes and signs a message into frames ready for a ZeroMQ socket. */
export function encodeMessage(msg: OutgoingMessage, signing: SigningKey, session: string): Buffer[] {
  const header = newHeader(msg.msgType, msg.parent, session);
  const json = [header, msg.parent ?? {}, msg.metadata ?? {}, msg.content].map((part) => Buffer.from(JSON.stringify(part), "utf8"));
  const buffers = (msg.buffers ?? []).map((b) => Buffer.from(b.buffer, b.byteOffset, b.byteLength));
  return [...(msg.identities ?? []), DELIMITER, Buffer.from(sign(json, signing), "ascii"), ...json, ...buffers];
}
