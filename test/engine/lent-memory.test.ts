/**
 * Arrays lent from one transfer solver to the next (src/engine/lent-memory.ts): a spare is reused
 * only when large enough and by one owner at a time, and budgets solved in lent memory left dirty
 * by other models give the bits of the same budgets solved first. Reference: the same calls in
 * another order (common practice, no outside source: the claim is that order changes nothing).
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { noiseBudget } from "../../src/engine/budget";
import { giveBackArrays, takeFloats, takeInts } from "../../src/engine/lent-memory";
import { prepare } from "../../src/prepare";
import { logGrid } from "../../src/setup/grid";

const EXAMPLES = join(__dirname, "..", "..", "examples");
const examples = readdirSync(EXAMPLES).filter((f) => f.endsWith(".json"));

function bytes(xs: Float64Array): string {
  return Buffer.from(xs.buffer, xs.byteOffset, xs.byteLength).toString("hex");
}

describe("lent arrays", () => {
  it("are at least as long as asked, reused once given back, and never lent to two owners at once", () => {
    const floats = takeFloats(1000);
    const ints = takeInts(300);
    expect(floats.length).toBeGreaterThanOrEqual(1000);
    expect(ints.length).toBeGreaterThanOrEqual(300);
    // Taken and not given back: a second owner gets other arrays.
    const other = takeFloats(10);
    expect(other).not.toBe(floats);
    giveBackArrays(floats, ints);
    // Given back once or twice, lent once.
    giveBackArrays(floats, ints);
    const again = takeFloats(900);
    expect(again).toBe(floats);
    expect(takeFloats(900)).not.toBe(floats);
    expect(takeInts(300)).toBe(ints);
    // Too short for a larger request: a new array.
    giveBackArrays(again, ints);
    expect(takeFloats(5000).length).toBeGreaterThanOrEqual(5000);
    expect(takeFloats(5000)).not.toBe(floats);
  });
});

describe("budgets solved in lent memory another model left dirty", () => {
  it("give the bits they gave first, for every example at 1, 3 and 256 frequencies", () => {
    const cases = examples.flatMap((file) => {
      const { assembled, setup } = prepare(readFileSync(join(EXAMPLES, file), "utf8"));
      const range = setup.grid ?? { from: 1, to: 1e5 };
      return [1, 3, 256].map((points) => ({ assembled, frequencies: points === 1 ? Float64Array.of(Math.sqrt(range.from * range.to)) : logGrid({ from: range.from, to: range.to, points }) }));
    });
    const fingerprint = (c: (typeof cases)[number]): string => {
      const b = noiseBudget(c.assembled, c.frequencies);
      return [bytes(b.total), ...b.terms.map((t) => bytes(t.psd)), ...b.references.map((r) => bytes(r.psd))].join(" ");
    };
    const first = cases.map(fingerprint);
    // Backwards, then every other one: each solver takes arrays another model wrote last.
    const backwards = [...cases].reverse().map(fingerprint).reverse();
    expect(backwards).toEqual(first);
    const alternate = cases.map((_, i) => (i % 2 === 0 ? i : cases.length - i)).map((i) => [i, fingerprint(cases[i])] as const);
    for (const [i, print] of alternate) expect(print, `case ${i}`).toBe(first[i]);
  });
});
