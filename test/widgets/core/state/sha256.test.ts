import { createHash } from "node:crypto";
import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { sha256Hex, utf8 } from "../../../../widgets/core/state/sha256";

const nodeSha256 = (bytes: Uint8Array): string => createHash("sha256").update(bytes).digest("hex");

describe("sha256Hex", () => {
  // FIPS 180-4 examples (NIST CSRC "SHA-256" example values); digests written from memory and
  // confirmed against node:crypto when this test was written.
  test.each([
    ["abc", "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"],
    ["", "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855"],
    ["abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq", "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1"],
    ["abcdefghbcdefghicdefghijdefghijkefghijklfghijklmghijklmnhijklmnoijklmnopjklmnopqklmnopqrlmnopqrsmnopqrstnopqrstu", "cf5b16a778af8380036ce59e7b0492370b249b11e8f07a51afac45037afee9d1"],
  ])("FIPS 180-4 example %j", (message, digest) => {
    expect(sha256Hex(utf8(message))).toBe(digest);
  });

  test("FIPS 180-4 example: one million 'a'", () => {
    expect(sha256Hex(new Uint8Array(1_000_000).fill(0x61))).toBe("cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
  });

  test("every length from 0 to 200 bytes, across the padding boundaries at 55/56 and 119/120 (node:crypto as reference)", () => {
    for (let n = 0; n <= 200; n++) {
      const bytes = Uint8Array.from({ length: n }, (_, i) => (i * 131 + n * 7) & 0xff);
      expect(sha256Hex(bytes), `length ${n}`).toBe(nodeSha256(bytes));
    }
  });

  test("random byte arrays (node:crypto as reference, fast-check, fixed seed)", () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 1000 }), (bytes) => sha256Hex(bytes) === nodeSha256(bytes)),
      { seed: 180_4, numRuns: 300 },
    );
  });

  test("does not change its input", () => {
    const bytes = Uint8Array.from([1, 2, 3, 250]);
    sha256Hex(bytes);
    expect(Array.from(bytes)).toEqual([1, 2, 3, 250]);
  });
});

describe("utf8", () => {
  test("encodes like Node's Buffer (node:buffer as reference, fast-check, fixed seed)", () => {
    fc.assert(
      fc.property(fc.string({ unit: "binary", maxLength: 200 }), (s) => {
        expect(Array.from(utf8(s))).toEqual(Array.from(Buffer.from(s, "utf8")));
      }),
      { seed: 8259, numRuns: 300 },
    );
  });
});
