/**
 * Chunking and the atomic write. Chunking: every item lands in exactly one chunk, in order,
 * the same on every call (the property under test; common practice, no outside source).
 * Atomic write: the target is either absent or whole, no temporary file is left behind, and a
 * directory that cannot be written is named.
 */
import { chmodSync, existsSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { afterAll, describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { atomicWrite, chunkRange, chunkRanges, parseChunkIndex, planSweep } from "../../src/sweep";
import { gridSweep, scratch } from "./helpers";

const tmp = scratch();
afterAll(tmp.cleanup);

describe("chunking", () => {
  it("covers every item once, in order, and is the same on every call (fast-check, seed 13)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5000 }), fc.integer({ min: 1, max: 700 }), (items, size) => {
        const ranges = chunkRanges(items, size);
        expect(chunkRanges(items, size)).toEqual(ranges);
        expect(ranges.length).toBe(Math.ceil(items / size));
        let next = 0;
        for (const r of ranges) {
          expect(r.from).toBe(next);
          expect(r.to - r.from).toBeGreaterThan(0);
          expect(r.to - r.from).toBeLessThanOrEqual(size);
          next = r.to;
        }
        expect(next).toBe(items);
      }),
      { seed: 13, numRuns: 300 },
    );
  });

  it("a chunk index out of range names the chunk and the range", () => {
    expect(() => chunkRange(10, 3, 4)).toThrow(QuietframeError);
    expect(() => chunkRange(10, 3, 4)).toThrow("chunk = 4: is not a chunk of this sweep; allowed: an integer from 0 to 3");
    expect(() => parseChunkIndex("7", 3, "SLURM_ARRAY_TASK_ID")).toThrow('SLURM_ARRAY_TASK_ID = "7": is not a chunk of this sweep; allowed: an integer from 0 to 2');
    expect(() => parseChunkIndex("-1", 3, "--chunk")).toThrow("--chunk");
    expect(() => parseChunkIndex(undefined, 3, "SLURM_ARRAY_TASK_ID")).toThrow("no chunk index given");
    expect(parseChunkIndex("2", 3, "--chunk")).toBe(2);
  });
});

describe("atomicWrite", () => {
  it("writes the whole text and leaves no temporary file; a second write replaces it whole", () => {
    const dir = tmp.make("atomic");
    const target = join(dir, "result.json");
    atomicWrite(target, "first\n");
    atomicWrite(target, "second, longer\n");
    expect(readFileSync(target, "utf8")).toBe("second, longer\n");
    expect(readdirSync(dir)).toEqual(["result.json"]);
  });

  it("into a path that is not a writable directory: a QuietframeError naming the directory, and nothing written", () => {
    const dir = tmp.make("atomic-bad");
    const file = join(dir, "plain-file");
    writeFileSync(file, "x");
    const e = (() => {
      try {
        atomicWrite(join(file, "result.json"), "text");
      } catch (error) {
        return error as QuietframeError;
      }
      throw new Error("written");
    })();
    expect(e).toBeInstanceOf(QuietframeError);
    expect(e.path).toBe(file);
    expect(e.problem).toBe("is not a directory");
    expect(readdirSync(dir)).toEqual(["plain-file"]);
  });

  it("into a directory without write permission: a QuietframeError naming it, and nothing written", () => {
    const dir = tmp.make("atomic-denied");
    // Root may write anywhere, so as root the write is tried with the effective user "nobody"; otherwise the directory is made read-only.
    const asRoot = process.getuid?.() === 0;
    if (!asRoot) chmodSync(dir, 0o500);
    let error: unknown;
    try {
      if (asRoot) process.seteuid!(65534);
      atomicWrite(join(dir, "chunk-000000.json"), "text");
    } catch (e) {
      error = e;
    } finally {
      if (asRoot) process.seteuid!(0);
      else chmodSync(dir, 0o700);
    }
    expect(error).toBeInstanceOf(QuietframeError);
    expect((error as QuietframeError).message).toBe(`${dir}: cannot be written (no permission); allowed: a directory this user can write`);
    expect(readdirSync(dir)).toEqual([]);
  });

  it("planning into a directory under a file names that directory", () => {
    const dir = tmp.make("plan-bad");
    writeFileSync(join(dir, "taken"), "x");
    expect(() => planSweep(gridSweep(), join(dir, "taken", "sweep"))).toThrow(/taken\/sweep: (is not a directory|does not exist)/);
    expect(existsSync(join(dir, "taken", "sweep"))).toBe(false);
  });
});
