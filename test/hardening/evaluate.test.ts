import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { EXAMPLE_TEXTS, errorDefect, exampleObject } from "./support";

const RUNS = 300;
const TIMEOUT = 120_000;

/** A parameter value rescaled: the number of "<number> <unit>" text or a bare number, times `factor`. */
function rescaled(value: unknown, factor: number): unknown {
  if (typeof value === "number") return value * factor;
  if (typeof value !== "string") return value;
  const m = /^(-?[0-9.]+(?:e[+-]?\d+)?)(\s*)(.*)$/i.exec(value);
  return m ? `${Number(m[1]) * factor}${m[2]}${m[3]}` : value;
}

const finiteNonNegative = (a: Float64Array): boolean => a.every((v) => Number.isFinite(v) && v >= 0);

describe("evaluating rescaled example set-ups gives finite, non-negative spectra or a QuietframeError (fast-check, seed 99)", () => {
  it(
    "every parameter of an example scaled by up to six decades either way",
    () => {
      let evaluated = 0;
      fc.assert(
        fc.property(fc.nat(EXAMPLE_TEXTS.length - 1), fc.array(fc.tuple(fc.nat(), fc.nat(), fc.double({ min: -6, max: 6, noNaN: true })), { minLength: 1, maxLength: 4 }), (which, edits) => {
          const doc = exampleObject(which);
          for (const [ci, pi, decades] of edits) {
            const c = doc.components[ci % doc.components.length];
            const keys = Object.keys(c.params ?? {});
            if (keys.length === 0) continue;
            const k = keys[pi % keys.length];
            c.params[k] = rescaled(c.params[k], 10 ** decades);
          }
          const text = JSON.stringify(doc);
          try {
            const setup = loadSetup(text);
            const grid = { ...(setup.grid ?? { from: 10, to: 1000, points: 6 }), points: 6 };
            const { budget } = evaluateSetup(setup, grid);
            expect(budget.total.length).toBe(6);
            if (!finiteNonNegative(budget.total)) throw new Error(`total: ${Array.from(budget.total)}`);
            for (const t of budget.terms) if (!finiteNonNegative(t.psd)) throw new Error(`term ${t.id}: ${Array.from(t.psd)}`);
            for (const r of budget.references) if (!finiteNonNegative(r.psd)) throw new Error(`reference ${r.id}: ${Array.from(r.psd)}`);
            evaluated++;
          } catch (e) {
            const defect = errorDefect(e, false);
            if (defect) throw new Error(`${defect}\ninput: ${text}`);
          }
        }),
        { seed: 99, numRuns: RUNS },
      );
      // Guards against a vacuous run in which every mutation was refused before evaluation.
      expect(evaluated).toBeGreaterThan(RUNS / 4);
    },
    TIMEOUT,
  );
});
