import { readFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { loadSetup } from "../../src/pipeline";
import type { SetupDescription } from "../../src/setup/format";
import { toleranceMapInProcess } from "../../src/tolerance";
import { createEntangledState, entangledStateText, loadEntangledState } from "../../widgets/entangled/model";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { standalonePage } from "../../widgets/explorer/html";
import { parseExplorerState, stateDocumentText } from "../../widgets/explorer/document";
import { MAX_STATE_TEXT_BYTES } from "../../widgets/core/state/state-text";
import { loadToleranceState, toleranceWidgetState } from "../../widgets/tolerance/model";
import { errorDefect, jsonPaths, mutatedText, prototypesAreClean } from "./support";

/**
 * `__proto__`, `constructor` and `prototype` written as keys into every object of real
 * state files — the set-up, its components and params, each control definition, settings
 * and grid, the values — one at a time, each holding a payload that would show on every
 * object if it reached Object.prototype. Every loader must give a clean state or its own
 * error, and the built-in prototypes must stay exactly as they were (common practice, no source).
 */
const ROOT = join(__dirname, "..", "..");
const squeezed = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;
const KEYS = ["__proto__", "constructor", "prototype"] as const;

/** Number of objects (not arrays) in a JSON value: the places a key can be written into. */
function objectCount(doc: unknown): number {
  return jsonPaths(doc).filter((p) => {
    const v = p.reduce((o: any, k) => o[k], doc);
    return v && typeof v === "object" && !Array.isArray(v);
  }).length;
}

/** Own keys of every object in a loaded value that name prototypes (none may survive). */
function reservedKeysIn(v: unknown, seen: string[] = []): string[] {
  if (Array.isArray(v)) v.forEach((x) => reservedKeysIn(x, seen));
  else if (v && typeof v === "object") {
    if (Object.getPrototypeOf(v) !== Object.prototype && Object.getPrototypeOf(v) !== null) seen.push("foreign prototype");
    for (const k of Object.keys(v)) {
      if ((KEYS as readonly string[]).includes(k)) seen.push(k);
      reservedKeysIn((v as Record<string, unknown>)[k], seen);
    }
  }
  return seen;
}

function everyPlacement(text: string, load: (t: string) => unknown, after?: (loaded: any) => void): number {
  const doc = JSON.parse(text);
  const n = objectCount(doc);
  let loaded = 0;
  for (let pick = 0; pick < n; pick++) {
    for (const key of KEYS) {
      const hostile = mutatedText(doc, { op: "protoPayload", pick, key });
      expect(hostile).toContain(JSON.stringify(key));
      let value: unknown;
      let refused: unknown;
      try {
        value = load(hostile);
      } catch (e) {
        refused = e;
      }
      if (refused === undefined) {
        expect(reservedKeysIn(value), `${key} at object ${pick}`).toEqual([]);
        after?.(value);
        loaded++;
      } else {
        expect(errorDefect(refused, false), `${key} at object ${pick}`).toBe("");
      }
      expect(prototypesAreClean(), `${key} at object ${pick}`).toBe(true);
      expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    }
  }
  return loaded;
}

describe("prototype keys anywhere in a state file reach no prototype", () => {
  const explorer = createExplorerState(squeezed, {
    controls: [
      { target: "squeezer.squeezing", label: "squeezing", min: "-15 dB", max: "0 dB", scale: "linear" },
      { target: "squeezer.angle", control: "dropdown", choices: ["0 deg", "60 deg", "90 deg"] },
      { target: "detector.efficiency", control: "number", min: 0.5, max: 1 },
    ],
    settings: { title: "t", grid: { from: "1.1 MHz", to: "1.3 MHz", points: 16 }, spectralDensity: "power" },
  });

  it("explorer state documents, then rendered to a page", () => {
    const text = stateDocumentText(explorer);
    // Every object of the document, including each control definition and the nested params.
    expect(objectCount(JSON.parse(text))).toBeGreaterThan(15);
    everyPlacement(
      text,
      (t) => parseExplorerState(t),
      (s) => standalonePage(s, computeExplorer(s)),
    );
  });

  it("set-up files", () => {
    everyPlacement(JSON.stringify(squeezed), (t) => loadSetup(t));
  });

  it("entangled-panel states", () => {
    everyPlacement(entangledStateText(createEntangledState({ squeezingDb: -6, title: "pair" })), (t) => loadEntangledState(t));
  });

  describe("tolerance-map states", () => {
    let text = "";
    beforeAll(async () => {
      const spec = {
        x: { target: "cavity.detuning", from: "-4 MHz", to: "4 MHz", points: 2 },
        y: { target: "detector.efficiency", from: "50 %", to: "100 %", points: 2 },
        grid: { from: "1.1 MHz", to: "1.3 MHz", points: 8 },
        figure: { kind: "margin-at" as const, frequency: "1.16 MHz" },
      };
      text = JSON.stringify(toleranceWidgetState(squeezed, spec, await toleranceMapInProcess(squeezed, spec), { title: "map" }));
    }, 120_000);
    it("every object", () => {
      everyPlacement(text, (t) => loadToleranceState(t));
    });
  });
});

describe("every state loader has the state-file size limit", () => {
  const padded = (text: string): string => text.replace(/\}\s*$/, `${" ".repeat(MAX_STATE_TEXT_BYTES)}}`);
  const loaders: [string, () => string, (t: string) => unknown][] = [
    ["explorer", () => stateDocumentText(createExplorerState(squeezed)), (t) => parseExplorerState(t)],
    ["entangled panel", () => entangledStateText(createEntangledState({ squeezingDb: -6 })), (t) => loadEntangledState(t)],
  ];
  it.each(loaders)("%s: refused with a message naming the limit", (_, make, load) => {
    let caught: unknown;
    try {
      load(padded(make()));
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(QuietframeError);
    expect((caught as QuietframeError).message).toContain(`more than the ${MAX_STATE_TEXT_BYTES}-byte limit`);
  });

  it("tolerance map: refused with a message naming the limit", async () => {
    const spec = {
      x: { target: "cavity.detuning", from: "-4 MHz", to: "4 MHz", points: 2 },
      y: { target: "detector.efficiency", from: "50 %", to: "100 %", points: 2 },
      grid: { from: "1.1 MHz", to: "1.3 MHz", points: 8 },
      figure: { kind: "margin-at" as const, frequency: "1.16 MHz" },
    };
    const text = JSON.stringify(toleranceWidgetState(squeezed, spec, await toleranceMapInProcess(squeezed, spec)));
    expect(() => loadToleranceState(padded(text))).toThrow(`more than the ${MAX_STATE_TEXT_BYTES}-byte limit`);
  });
});
