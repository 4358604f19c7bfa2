/**
 * SHA-256 digests of sweep descriptions and results (Node only): canonical JSON (keys sorted,
 * so the same description written in another key order has the same fingerprint) and raw
 * bytes of typed arrays (so a fingerprint sees every bit of every number).
 */
import { createHash } from "node:crypto";

/** JSON with every object's keys in sorted order (arrays keep their order). */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) => {
    if (v === null || typeof v !== "object" || Array.isArray(v)) return v;
    const record = v as Record<string, unknown>;
    return Object.fromEntries(
      Object.keys(record)
        .sort()
        .map((k) => [k, record[k]]),
    );
  });
}

/** "sha256:<hex>" of text (as UTF-8) or bytes. */
export function sha256(data: string | Uint8Array): string {
  return `sha256:${createHash("sha256").update(data).digest("hex")}`;
}

/** "sha256:<hex>" over labelled typed arrays, each as its bytes with its label and length first. */
export function arraysDigest(parts: readonly (readonly [string, Float64Array | Uint8Array])[]): string {
  const hash = createHash("sha256");
  for (const [label, array] of parts) {
    hash.update(`${label}:${array.length}\n`);
    hash.update(new Uint8Array(array.buffer, array.byteOffset, array.byteLength));
  }
  return `sha256:${hash.digest("hex")}`;
}

/** A "sha256:" followed by 64 lowercase hex digits. */
export const DIGEST_PATTERN = /^sha256:[0-9a-f]{64}$/;
