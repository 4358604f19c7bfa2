import { readFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { QuietframeError, QuietframeErrors } from "../../src/errors";
import type { SetupDescription } from "../../src/setup/format";
import { toleranceMapInProcess, type ToleranceMap, type ToleranceMapSpec } from "../../src/tolerance";
import { createEntangledState } from "../../widgets/entangled/model";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { entangledHtml } from "../../widgets/entangled/html";
import { explorerHtml } from "../../widgets/explorer/html";
import { standalonePage } from "../../widgets/explorer/html";
import { tolerancePage, toleranceHtml } from "../../widgets/tolerance/html";
import { explorerFigures } from "../../widgets/explorer/figures";
import { parseExplorerState, stateDocumentText } from "../../widgets/explorer/document";
import type { ExplorerState } from "../../widgets/explorer/format";
import { toleranceWidgetState } from "../../widgets/tolerance/model";
import { HOSTILE_PAYLOADS } from "./hostile-payloads";

/**
 * Text from an untrusted state (title, set-up name and description, control labels) in
 * every HTML and SVG output: the markup must be exactly the markup the same output has
 * for harmless text — the same elements in the same order, no event-handler attribute, no
 * script URL — and the text must appear escaped (HTML 5.2 §8.1.2 and §8.3: in text and
 * attribute values, & < > " ' escaped leave no markup; section numbers from memory).
 */
const ROOT = join(__dirname, "..", "..");
const squeezed = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;
const HARMLESS = "plain words";

/** Tag names in document order, and every attribute that could run code. */
function markupInventory(html: string): { tags: string[]; active: string[] } {
  const tags = [...html.matchAll(/<\/?([A-Za-z][\w:-]*)/g)].map((m) => m[1].toLowerCase());
  const active: string[] = [];
  for (const m of html.matchAll(/<[A-Za-z][^>]*>/g)) {
    for (const a of m[0].matchAll(/\s([^\s=/>]+)\s*=\s*("[^"]*"|'[^']*'|[^\s"'>]+)/g)) {
      const value = a[2].replace(/^["']|["']$/g, "").trim();
      if (/^on/i.test(a[1]) || /^(javascript|vbscript):/i.test(value)) active.push(`${a[1]}=${value}`);
    }
  }
  return { tags, active };
}

/** Text with the character references of HTML and XML resolved. */
function decodeReferences(markup: string): string {
  return markup
    .replace(/&#x([0-9a-f]+);/gi, (_, h: string) => String.fromCodePoint(parseInt(h, 16)))
    .replace(/&#(\d+);/g, (_, d: string) => String.fromCodePoint(Number(d)))
    .replace(/&(lt|gt|quot|apos|amp);/g, (_, n: string) => ({ lt: "<", gt: ">", quot: '"', apos: "'", amp: "&" })[n]!);
}

/** The explorer state an untrusted file with `text` in every free-text field reads back to. */
function explorerStateWith(text: string): ExplorerState {
  const setup: SetupDescription = { ...structuredClone(squeezed), name: text, description: text };
  const state = createExplorerState(setup, {
    controls: [
      { target: "squeezer.squeezing", label: text, min: "-15 dB", max: "0 dB", scale: "linear" },
      { target: "detector.efficiency", label: text, min: 0.5, max: 1 },
    ],
    settings: { title: text, grid: { from: "1.1 MHz", to: "1.3 MHz", points: 40 }, spectralDensity: "amplitude" },
  });
  // Through the file loader, as a reader's browser or the CLI would read it.
  return parseExplorerState(stateDocumentText(state));
}

const TOLERANCE_SPEC: ToleranceMapSpec = {
  x: { target: "cavity.detuning", from: "-4 MHz", to: "4 MHz", points: 3 },
  y: { target: "detector.efficiency", from: "50 %", to: "100 %", points: 2 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 16 },
  figure: { kind: "margin-at", frequency: "1.16 MHz" },
};

describe("hostile text in every HTML and SVG output is text, never markup", () => {
  let map: ToleranceMap;
  beforeAll(async () => {
    map = await toleranceMapInProcess(squeezed, TOLERANCE_SPEC);
  }, 120_000);

  /** Each writer, given the text to place in every free-text field. */
  const outputs: Record<string, (text: string) => Promise<string> | string> = {
    "static SVG": async (t) => {
      const s = explorerStateWith(t);
      return (await explorerFigures(computeExplorer(s), s)).svg;
    },
    "explorer fragment with its SVG and PNG": async (t) => {
      const s = explorerStateWith(t);
      const c = computeExplorer(s);
      const f = await explorerFigures(c, s);
      return explorerHtml(s, c, { includeRuntime: false, svg: f.svg, png: f.png });
    },
    "standalone page": (t) => {
      const s = explorerStateWith(t);
      return standalonePage(s, computeExplorer(s));
    },
    "tolerance fragment and page": (t) => {
      const s = toleranceWidgetState({ ...structuredClone(squeezed), name: t }, TOLERANCE_SPEC, map, {
        title: t,
        labels: { "cavity.detuning": t, "detector.efficiency": t },
      });
      return toleranceHtml(s, { includeRuntime: false }) + tolerancePage(s);
    },
    "entangled panel": (t) => entangledHtml(createEntangledState({ squeezingDb: -9, title: t }), { includeRuntime: false }),
  };

  for (const [name, render] of Object.entries(outputs)) {
    it.each(HOSTILE_PAYLOADS)(`${name}: %s`, async (payload) => {
      const harmless = await render(HARMLESS);
      const hostile = await render(payload);
      const want = markupInventory(harmless);
      const got = markupInventory(hostile);
      expect(got.active).toEqual(want.active);
      expect(got.tags).toEqual(want.tags);
      // The text is there as text: decoding the character references gives it back whole.
      expect(decodeReferences(hostile)).toContain(payload);
    });
  }
});

describe("component names cannot carry markup at all", () => {
  it.each(HOSTILE_PAYLOADS)("a component named %s is refused with its path", (payload) => {
    const setup = structuredClone(squeezed);
    setup.components[0].name = payload;
    let caught: unknown;
    try {
      createExplorerState(setup);
    } catch (e) {
      caught = e;
    }
    const first = caught instanceof QuietframeErrors ? caught.problems[0] : caught;
    expect(first).toBeInstanceOf(QuietframeError);
    expect((first as QuietframeError).path).toBe("components[0].name");
  });
});
