/**
 * The best margin alone (bestMargin, for a figure of merit) against the headline figures it is
 * one of, bit for bit, on every example's budget and on a budget with no SQL reference.
 * Reference: headlineFigures itself (common practice, no outside source: the claim is identity).
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { bestMargin, headlineFigures } from "../../src/engine/headline";
import { evaluate } from "../../src/evaluate";
import { prepare } from "../../src/prepare";

const EXAMPLES = join(__dirname, "..", "..", "examples");
const examples = readdirSync(EXAMPLES).filter((f) => f.endsWith(".json"));

describe("bestMargin", () => {
  it.each(examples)("%s: the headline's best margin and its frequency", (file) => {
    const { budget } = evaluate(prepare(readFileSync(join(EXAMPLES, file), "utf8")));
    const headline = headlineFigures(budget);
    const best = bestMargin(budget);
    expect(Object.is(best.bestMarginDb, headline.bestMarginDb)).toBe(true);
    expect(Object.is(best.bestMarginAt, headline.bestMarginAt)).toBe(true);
    expect(Number.isFinite(best.bestMarginDb)).toBe(true);
  });

  it("a budget without an SQL reference: −∞ at NaN, as the headline", () => {
    const { budget } = evaluate(prepare(readFileSync(join(EXAMPLES, examples[0]), "utf8")));
    const withoutSql = { ...budget, references: budget.references.filter((r) => r.id !== "sql") };
    expect(bestMargin(withoutSql)).toEqual({ bestMarginDb: -Infinity, bestMarginAt: NaN });
    expect(headlineFigures(withoutSql)).toMatchObject({ bestMarginDb: -Infinity, bestMarginAt: NaN });
  });
});
