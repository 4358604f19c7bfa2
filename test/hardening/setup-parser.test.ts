import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { loadSetup } from "../../src/pipeline";
import type { ResolvedSetup } from "../../src/setup/validate";
import { EXAMPLE_TEXTS, errorDefect, exampleObject, inputMentionsForbidden, mutatedText, mutationArb, prototypesAreClean } from "./support";

const RUNS = 10_000;
const TIMEOUT = 120_000;

/** Describes what is wrong with a resolved set-up (empty string when nothing is). */
function setupDefect(s: ResolvedSetup): string {
  if (!Array.isArray(s.components) || s.components.length === 0) return "no components";
  if (s.readout.length === 0) return "no readout";
  for (const c of s.components) {
    if (!s.kinds.has(c.name)) return `component ${c.name} has no kind`;
    for (const [k, v] of Object.entries(c.values)) {
      if (typeof v === "number" && !Number.isFinite(v)) return `${c.path}.${k} resolved to ${v}`;
    }
  }
  if (s.grid && !(Number.isFinite(s.grid.from) && Number.isFinite(s.grid.to) && Number.isInteger(s.grid.points))) {
    return `grid resolved to ${JSON.stringify(s.grid)}`;
  }
  return "";
}

/** The property: a resolved set-up, or a user-facing error with paths and clean messages; prototypes untouched. */
function loadsCleanly(text: string): void {
  let defect: string;
  try {
    defect = setupDefect(loadSetup(text));
  } catch (e) {
    defect = errorDefect(e, inputMentionsForbidden(text));
  }
  if (defect) throw new Error(`${defect}\ninput: ${text.slice(0, 2000)}`);
  if (!prototypesAreClean()) throw new Error(`a built-in prototype changed\ninput: ${text.slice(0, 2000)}`);
}

describe("set-up loader: any text ends in a set-up or a QuietframeError (fast-check, seed 20240611)", () => {
  it("the shipped examples load, and the property rejects a non-QuietframeError", () => {
    for (const text of EXAMPLE_TEXTS) expect(() => loadsCleanly(text)).not.toThrow();
    expect(() => loadsCleanly("{")).not.toThrow();
    // A guard against a vacuous check: the property must fail on a raw TypeError.
    expect(errorDefect(new TypeError("x"), false)).toMatch(/not a QuietframeError/);
    expect(EXAMPLE_TEXTS.length).toBeGreaterThanOrEqual(5);
  });

  it(
    "arbitrary JSON documents",
    () => {
      fc.assert(fc.property(fc.json({ maxDepth: 4 }), loadsCleanly), { seed: 20240611, numRuns: RUNS });
    },
    TIMEOUT,
  );

  it(
    "arbitrary strings, including lone surrogates",
    () => {
      fc.assert(fc.property(fc.string({ unit: "binary", maxLength: 60 }), loadsCleanly), { seed: 20240611, numRuns: RUNS });
    },
    TIMEOUT,
  );

  it(
    "mutations of the shipped examples: deleted, replaced, duplicated and hostile fields",
    () => {
      const bases = EXAMPLE_TEXTS.map((_, i) => exampleObject(i));
      fc.assert(
        fc.property(fc.nat(bases.length - 1), fc.array(mutationArb, { minLength: 1, maxLength: 3 }), (which, mutations) => {
          let doc: unknown = bases[which];
          let text = JSON.stringify(doc);
          for (const m of mutations) {
            text = mutatedText(doc, m);
            try {
              doc = JSON.parse(text);
            } catch {
              break; // the root was deleted: the empty text is the input
            }
          }
          loadsCleanly(text);
        }),
        { seed: 20240611, numRuns: RUNS },
      );
    },
    TIMEOUT,
  );

  it(
    "parsed objects handed in directly (no JSON text), with prototype-named keys",
    () => {
      fc.assert(
        fc.property(fc.nat(EXAMPLE_TEXTS.length - 1), mutationArb, (which, m) => {
          const text = mutatedText(exampleObject(which), m);
          let value: unknown;
          try {
            value = JSON.parse(text);
          } catch {
            return;
          }
          let defect: string;
          try {
            defect = setupDefect(loadSetup(value));
          } catch (e) {
            defect = errorDefect(e, inputMentionsForbidden(text));
          }
          if (defect) throw new Error(`${defect}\ninput: ${text.slice(0, 2000)}`);
          expect(prototypesAreClean()).toBe(true);
        }),
        { seed: 20240611, numRuns: RUNS },
      );
    },
    TIMEOUT,
  );
});
