import { describe, expect, it } from "vitest";
import { decodeHeaderOnly, decodeMessage, DELIMITER, encodeMessage, MAX_MESSAGE_BYTES, messageBytes, sign } from "../../widgets/kernel/wire";

describe("sign", () => {
  it("computes HMAC-SHA256 over the frames in order (RFC 4231, test case 2)", () => {
    // RFC 4231 §4.3: key "Jefe", data "what do ya want for nothing?".
    const expected = "5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843";
    expect(sign(["what do ya want ", "for nothing?"], { key: "Jefe", scheme: "hmac-sha256" })).toBe(expected);
  });

  it("gives an empty signature when the key is empty (messaging spec, 'The Wire Protocol': authentication off)", () => {
    expect(sign(["{}"], { key: "", scheme: "hmac-sha256" })).toBe("");
  });
});

describe("encodeMessage and decodeMessage", () => {
  const signing = { key: "secret", scheme: "hmac-sha256" };

  it("round-trip identities, the four JSON parts and binary buffers", () => {
    const frames = encodeMessage(
      {
        identities: [Buffer.from("peer")],
        msgType: "comm_msg",
        parent: { msg_id: "p1", session: "s" },
        content: { comm_id: "c", data: { x: 1 } },
        metadata: { m: true },
        buffers: [new Uint8Array([1, 2, 3])],
      },
      signing,
      "kernel-session",
    );
    // Messaging spec, "The Wire Protocol": [identities, <IDS|MSG>, signature, header, parent, metadata, content, buffers…].
    expect(frames[1].equals(DELIMITER)).toBe(true);
    expect(frames.length).toBe(1 + 1 + 1 + 4 + 1);
    const msg = decodeMessage(frames, signing);
    expect(msg.identities.map((b) => b.toString())).toEqual(["peer"]);
    expect(msg.header.msg_type).toBe("comm_msg");
    expect(msg.header.session).toBe("s"); // follows the parent's session
    expect(msg.header.version).toBe("5.3");
    expect(msg.parent).toEqual({ msg_id: "p1", session: "s" });
    expect(msg.metadata).toEqual({ m: true });
    expect(msg.content).toEqual({ comm_id: "c", data: { x: 1 } });
    expect([...msg.buffers[0]]).toEqual([1, 2, 3]);
  });

  it("signs the four JSON frames only, so buffers do not change the signature (messaging spec, 'The Wire Protocol')", () => {
    const base = { msgType: "comm_msg", parent: undefined, content: { a: 1 } };
    const frames = encodeMessage({ ...base, buffers: [new Uint8Array([9])] }, signing, "s");
    const expected = sign(frames.slice(2, 6), signing);
    expect(frames[1].toString()).toBe(expected);
  });

  it("refuses a tampered message, a missing delimiter and too few frames", () => {
    const frames = encodeMessage({ msgType: "comm_msg", parent: undefined, content: { a: 1 } }, signing, "s");
    const tampered = [...frames];
    tampered[5] = Buffer.from(JSON.stringify({ a: 2 }));
    expect(() => decodeMessage(tampered, signing)).toThrow("invalid message signature");
    expect(() => decodeMessage(frames.slice(1), signing)).toThrow("no <IDS|MSG> delimiter");
    expect(() => decodeMessage(frames.slice(0, 4), signing)).toThrow("frames after the delimiter");
  });

  it("refuses a header without msg_type and a content frame that is not an object", () => {
    const mk = (header: unknown, content: unknown) => {
      const json = [header, {}, {}, content].map((p) => Buffer.from(JSON.stringify(p)));
      return [DELIMITER, Buffer.from(sign(json, signing)), ...json];
    };
    expect(() => decodeMessage(mk({ msg_id: "x" }, {}), signing)).toThrow("header without msg_type");
    expect(() => decodeMessage(mk({ msg_id: "x", msg_type: "comm_msg" }, [1]), signing)).toThrow("content frame is not a JSON object");
  });
});

describe("a message over the size limit", () => {
  const signing = { key: "secret", scheme: "hmac-sha256" };
  const big = (bytes: number) =>
    encodeMessage({ identities: [Buffer.from("id")], msgType: "comm_msg", parent: undefined, content: { data: "x".repeat(bytes) }, buffers: [new Uint8Array(bytes)] }, signing, "s");

  it("is measured over every frame after the delimiter, buffers included", () => {
    const frames = big(1000);
    const at = frames.findIndex((f) => f.equals(DELIMITER));
    expect(messageBytes(frames)).toBe(frames.slice(at + 1).reduce((n, f) => n + f.byteLength, 0));
    expect(messageBytes(frames)).toBeGreaterThan(2000);
    expect(messageBytes([Buffer.from("no delimiter")])).toBeUndefined();
    expect(MAX_MESSAGE_BYTES).toBe(8 * 1024 * 1024);
  });

  it("gives its header and identities without parsing the rest, once the signature is checked", () => {
    const frames = big(MAX_MESSAGE_BYTES);
    const at = frames.findIndex((f) => f.equals(DELIMITER));
    const { identities, header } = decodeHeaderOnly(frames, signing);
    expect(header.msg_type).toBe("comm_msg");
    expect(identities.map(String)).toEqual(["id"]);
    const forged = [...frames];
    forged[at + 5] = Buffer.from("{}");
    expect(() => decodeHeaderOnly(forged, signing)).toThrow("invalid message signature");
  });
});
