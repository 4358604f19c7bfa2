import { describe, expect, it } from "vitest";
import { clip, describeSent, echoable, MAX_ECHOED_CHARS } from "../../widgets/core/comm/bounded-text";

// The kernel's own limit (docs/kernel.md): names and values from a front-end are echoed in
// errors and log lines with at most MAX_ECHOED_CHARS characters, and the whole length said.

describe("clip", () => {
  it("keeps short text and cuts long text to the stated length, saying how long it was", () => {
    expect(MAX_ECHOED_CHARS).toBe(120);
    expect(clip("update")).toBe("update");
    expect(clip("a".repeat(120))).toBe("a".repeat(120));
    expect(clip("a".repeat(10_000_000))).toBe(`${"a".repeat(120)}… (10000000 characters, cut to 120)`);
  });
});

describe("describeSent and echoable", () => {
  it("describe values by kind without writing out large ones", () => {
    expect(describeSent(undefined)).toBe("nothing");
    expect(describeSent(null)).toBe("null");
    expect(describeSent("b".repeat(500))).toBe(JSON.stringify(clip("b".repeat(500))));
    expect(describeSent(new Uint8Array(10_000_000))).toBe("10000000 bytes of binary data");
    expect(describeSent([1, 2])).toBe("an array of 2 items");
    expect(describeSent({ a: 1 })).toBe("object");
  });

  it("pass short values through as they are, and long or binary ones as a description", () => {
    expect(echoable(3)).toBe(3);
    expect(echoable({ a: [1, 2] })).toEqual({ a: [1, 2] });
    expect(echoable("c".repeat(200))).toBe(clip("c".repeat(200)));
    expect(echoable(new Float64Array(4))).toBe("32 bytes of binary data");
    expect(echoable({ big: "d".repeat(1000) })).toBe("object");
  });
});
