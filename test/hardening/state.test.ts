import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { createExplorerState } from "../../widgets/explorer/model";
import { parseExplorerState, stateDocumentText } from "../../widgets/explorer/document";
import { MAX_STATE_TEXT_BYTES } from "../../widgets/core/state/state-text";
import { EXPLORER_STATE_FORMAT } from "../../widgets/explorer/format";
import { EXAMPLE_TEXTS, errorDefect, exampleObject, inputMentionsForbidden, mutatedText, mutationArb, prototypesAreClean } from "./support";

const RUNS = 10_000;
const TIMEOUT = 120_000;

/** Real state documents: each example with one control on its second component's first parameter, on a short grid. */
const STATE_TEXTS: string[] = EXAMPLE_TEXTS.map((_, i) => {
  const setup = exampleObject(i);
  const c = setup.components[1];
  const param = Object.keys(c.params ?? {})[0];
  const written = param ? c.params[param] : undefined;
  const controls = param ? [{ target: `${c.name}.${param}`, control: "dropdown" as const, choices: [written] }] : [];
  const grid = setup.grid ?? { from: "10 Hz", to: "1 kHz" };
  return stateDocumentText(createExplorerState(setup, { controls, settings: { grid: { from: grid.from, to: grid.to, points: 8 }, spectralDensity: "amplitude" } }));
});

/** Objects in a loaded state that must be plain records (so nothing from the file became a prototype). */
function stateDefect(state: any): string {
  if (state.format !== EXPLORER_STATE_FORMAT) return `format ${String(state.format)}`;
  const records: unknown[] = [state, state.setup, state.values, state.settings, state.settings?.grid, ...(state.controls ?? [])];
  const walk = (v: unknown): void => {
    if (Array.isArray(v)) v.forEach(walk);
    else if (v && typeof v === "object") {
      records.push(v);
      Object.values(v).forEach(walk);
    }
  };
  walk(state.setup);
  for (const r of records) {
    if (!r || typeof r !== "object") return "a required record is missing";
    if (Object.getPrototypeOf(r) !== Object.prototype && !Array.isArray(r)) return "a record has a foreign prototype";
    for (const k of ["__proto__", "constructor", "prototype"]) if (Object.prototype.hasOwnProperty.call(r, k)) return `own key ${k} survived`;
  }
  return "";
}

function parsesCleanly(input: string | unknown, textForMessages: string): void {
  let defect: string;
  try {
    defect = stateDefect(parseExplorerState(input));
  } catch (e) {
    defect = errorDefect(e, inputMentionsForbidden(textForMessages));
    if (!defect && e instanceof QuietframeError && !/^state(?=$|[.[])/.test(e.path)) defect = `path not under the source: ${e.path}`;
  }
  if (defect) throw new Error(`${defect}\ninput: ${textForMessages.slice(0, 2000)}`);
  if (!prototypesAreClean()) throw new Error(`a built-in prototype changed\ninput: ${textForMessages.slice(0, 2000)}`);
}

describe("state loader: mutated state documents give a state or a QuietframeError with a path (fast-check, seed 4242)", () => {
  it("the real state documents load back to the states they were written from", () => {
    expect(STATE_TEXTS.length).toBe(EXAMPLE_TEXTS.length);
    for (const text of STATE_TEXTS) {
      const state = parseExplorerState(text);
      expect(stateDefect(state)).toBe("");
      expect(stateDocumentText(state)).toBe(text);
    }
  });

  it(
    "mutations of state documents, as text",
    () => {
      const bases = STATE_TEXTS.map((t) => JSON.parse(t));
      fc.assert(
        fc.property(fc.nat(bases.length - 1), fc.array(mutationArb, { minLength: 1, maxLength: 3 }), (which, mutations) => {
          let doc: unknown = bases[which];
          let text = JSON.stringify(doc);
          for (const m of mutations) {
            text = mutatedText(doc, m);
            try {
              doc = JSON.parse(text);
            } catch {
              break;
            }
          }
          parsesCleanly(text, text);
        }),
        { seed: 4242, numRuns: RUNS },
      );
    },
    TIMEOUT,
  );

  it(
    "mutations of bare explorer states, as parsed objects",
    () => {
      const bases = STATE_TEXTS.map((t) => {
        const models = JSON.parse(t).state;
        return models[Object.keys(models)[0]].state;
      });
      fc.assert(
        fc.property(fc.nat(bases.length - 1), mutationArb, (which, m) => {
          const text = mutatedText(bases[which], m);
          let value: unknown;
          try {
            value = JSON.parse(text);
          } catch {
            return;
          }
          parsesCleanly(value, text);
        }),
        { seed: 4242, numRuns: RUNS },
      );
    },
    TIMEOUT,
  );

  it(
    "text over the size limit is refused with a message naming its size",
    () => {
      const base = STATE_TEXTS[0];
      // Padding (whitespace, or text in a string) that keeps the document valid JSON; multi-byte padding passes the limit in bytes before characters.
      fc.assert(
        fc.property(fc.constantFrom(" ", "\n", "é", "€", "😀"), fc.integer({ min: 1, max: 4096 }), (pad, over) => {
          const perChar = Buffer.byteLength(pad, "utf8");
          const count = Math.ceil((MAX_STATE_TEXT_BYTES - Buffer.byteLength(base, "utf8") + over) / perChar);
          // Non-space padding goes inside the set-up's description, so the text stays a valid document.
          const text = pad.trim() === "" ? base + pad.repeat(count) : base.replace('"description": "', `"description": "${pad.repeat(count)}`);
          const bytes = Buffer.byteLength(text, "utf8");
          expect(bytes).toBeGreaterThan(MAX_STATE_TEXT_BYTES);
          let error: unknown;
          try {
            parseExplorerState(text);
          } catch (e) {
            error = e;
          }
          expect(error).toBeInstanceOf(QuietframeError);
          const q = error as QuietframeError;
          expect(q.path).toBe("state");
          expect(q.message).toContain(String(MAX_STATE_TEXT_BYTES));
          expect(q.message).toContain(text.length > MAX_STATE_TEXT_BYTES ? `at least ${text.length} bytes` : `${bytes} bytes`);
        }),
        { seed: 4242, numRuns: 25 },
      );
    },
    TIMEOUT,
  );

  it("text of exactly the size limit is not refused for its size", () => {
    const base = STATE_TEXTS[0];
    const text = base + " ".repeat(MAX_STATE_TEXT_BYTES - Buffer.byteLength(base, "utf8"));
    expect(Buffer.byteLength(text, "utf8")).toBe(MAX_STATE_TEXT_BYTES);
    expect(parseExplorerState(text).fingerprint).toBe(parseExplorerState(base).fingerprint);
  });
});
