/**
 * An evaluation and its reference curves compute their warnings and PSDs when first read, and
 * still write themselves as JSON (and read) as the plain objects they stand for: every field,
 * the lazy ones included, in the same order. Checked on every example against an object built
 * by reading each field (common practice, no outside source: the claim is identity with it).
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { evaluate } from "../../src/evaluate";
import { prepare } from "../../src/prepare";

const EXAMPLES = join(__dirname, "..", "..", "examples");
const files = readdirSync(EXAMPLES).filter((f) => f.endsWith(".json"));

describe.each(files)("%s", (file) => {
  const prepared = prepare(readFileSync(join(EXAMPLES, file), "utf8"));
  // The example's own band (a tabulated classical spectrum may cover no more), at few points.
  const band = prepared.setup.grid ?? { from: 1, to: 1e5 };
  const GRID = { from: band.from, to: band.to, points: 24 };

  it("writes its evaluation as JSON with every field read, the lazy warnings and reference PSDs included", () => {
    const evaluation = evaluate(prepared, GRID);
    const { budget } = evaluation;
    const plain = {
      assembled: evaluation.assembled,
      stability: evaluation.stability,
      physicality: evaluation.physicality,
      budget: {
        frequencies: budget.frequencies,
        quantity: budget.quantity,
        readout: budget.readout,
        total: budget.total,
        terms: budget.terms,
        references: budget.references.map((r) => ({ id: r.id, label: r.label, psd: r.psd })),
        warnings: budget.warnings,
      },
      cautions: evaluation.cautions,
      warnings: evaluation.warnings,
    };
    expect(budget.references.length).toBeGreaterThan(0);
    expect(JSON.stringify(evaluate(prepared, GRID))).toBe(JSON.stringify(plain));
  });

  it("reads the same warnings, cautions and reference PSDs twice (computed once, kept)", () => {
    const evaluation = evaluate(prepared, GRID);
    expect(evaluation.warnings).toBe(evaluation.warnings);
    expect(evaluation.warnings).toEqual([...evaluation.budget.warnings, ...prepared.warnings]);
    expect(evaluation.cautions).toEqual(prepared.cautions);
    for (const r of evaluation.budget.references) {
      expect(r.psd).toBe(r.psd);
      expect(r.psd.length).toBe(GRID.points);
      expect(r.psd.every((v) => Number.isFinite(v) && v >= 0)).toBe(true);
    }
  });
});
