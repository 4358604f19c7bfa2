import { readFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../../src/setup/format";
import { computeExplorer, createExplorerState, type ExplorerComputation } from "../../../widgets/explorer/model";
import { base64, escapeHtml, jsonForScript } from "../../../widgets/core/page/escape";
import { explorerHtml } from "../../../widgets/explorer/html";
import { runtimeSource } from "../../../widgets/core/page/runtime-source";
import { standalonePage } from "../../../widgets/explorer/html";
import { headlineSummary } from "../../../widgets/explorer/summary";
import { explorerFigures } from "../../../widgets/explorer/figures";
import { parseExplorerState } from "../../../widgets/explorer/document";
import type { ExplorerState } from "../../../widgets/explorer/format";

const ROOT = join(__dirname, "..", "..", "..");
const HOSTILE = `</script><script>alert("x")</script> "quoted" 'single' & <b>bold</b>`;

function hostileState(): ExplorerState {
  const setup = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;
  setup.name = `Membrane ${HOSTILE}`;
  setup.description = HOSTILE;
  return createExplorerState(setup, {
    controls: [{ target: "membrane.temperature", label: `T ${HOSTILE}`, min: "10 mK", max: "300 K" }],
    settings: { grid: { from: "1.1 MHz", to: "1.3 MHz", points: 201 }, title: `Title ${HOSTILE}` },
  });
}

/** Every `<script …>` start tag in a document, with its body. */
function scripts(html: string): { attrs: string; body: string }[] {
  return [...html.matchAll(/<script([^>]*)>([\s\S]*?)<\/script>/gi)].map((m) => ({ attrs: m[1], body: m[2] }));
}

let state: ExplorerState;
let computation: ExplorerComputation;
let svg: string;
let png: Uint8Array;

beforeAll(async () => {
  state = hostileState();
  computation = computeExplorer(state);
  ({ svg, png } = await explorerFigures(computation, state));
});

describe("escaping", () => {
  it("escapeHtml turns every markup character into an entity", () => {
    expect(escapeHtml(`<a href="x">'&'</a>`)).toBe("&lt;a href=&quot;x&quot;&gt;&#39;&amp;&#39;&lt;/a&gt;");
  });

  it("jsonForScript leaves no '<' in the text and parses back to the same value", () => {
    const value = { s: HOSTILE, line: "a\u2028b" };
    const text = jsonForScript(value);
    expect(text).not.toContain("<");
    expect(text).not.toContain("\u2028");
    expect(JSON.parse(text)).toEqual(value);
  });

  it("explorerHtml carries the hostile names only as escaped text: no extra elements, no raw quotes", () => {
    const html = explorerHtml(state, computation, { includeRuntime: false, svg, png });
    // Exactly the state script and the bootstrap: the names opened no script of their own.
    expect(scripts(html).map((s) => s.attrs.trim())).toEqual(['type="application/json" class="quietframe-state"', ""]);
    expect(html).not.toContain("<b>bold</b>");
    expect(html).not.toMatch(/<script>alert/);
    expect(html).toContain(escapeHtml(`Title ${HOSTILE}`));
    // The alt attribute holds the title with its quotes as entities.
    expect(html).toMatch(/alt="Noise budget: Title &lt;\/script&gt;&lt;script&gt;alert\(&quot;x&quot;\)/);
  });

  it("a static SVG with active content is refused", () => {
    expect(() => explorerHtml(state, computation, { includeRuntime: false, svg: `<svg><script>alert(1)</script></svg>` })).toThrow(/script/);
    expect(() => explorerHtml(state, computation, { includeRuntime: false, svg: `<svg onload="alert(1)"></svg>` })).toThrow(/onload/);
    expect(() => explorerHtml(state, computation, { includeRuntime: false, svg: `<svg><a href="javascript:alert(1)">x</a></svg>` })).toThrow(/href/);
    expect(() => explorerHtml(state, computation, { includeRuntime: false, svg: "<div>not a drawing</div>" })).toThrow(/not an SVG/);
  });
});

describe("the embedded state", () => {
  it("round-trips: the JSON in the fragment is the widget-state document of the same state", () => {
    const html = explorerHtml(state, computation, { includeRuntime: false });
    const json = scripts(html).find((s) => s.attrs.includes("application/json"));
    expect(json).toBeDefined();
    expect(json!.body).not.toContain("<");
    const back = parseExplorerState(json!.body, "fragment");
    expect(back).toEqual(state);
    expect(computeExplorer(back).fingerprint).toBe(state.fingerprint);
  });
});

describe("the runtime", () => {
  it("is carried once when asked for, and not at all otherwise", () => {
    const runtime = runtimeSource();
    const first = explorerHtml(state, computation, { includeRuntime: true, svg, png });
    const later = explorerHtml(state, computation, { includeRuntime: false, svg, png });
    expect(first.split(runtime).length - 1).toBe(1);
    expect(later).not.toContain(runtime.slice(0, 200));
    expect(first.length - later.length).toBe(runtime.length + "<script></script>\n".length);
    // Each fragment still boots itself: it calls the runtime or waits for it.
    for (const html of [first, later]) expect(scripts(html).at(-1)!.body).toContain("quietframe:runtime-ready");
  });

  it("contains nothing that would end an inline script", () => {
    expect(runtimeSource()).not.toMatch(/<\/script|<!--/i);
  });
});

describe("the static fallback", () => {
  it("has the SVG, the PNG as a data URL and the headline figures as text", () => {
    const html = explorerHtml(state, computation, { includeRuntime: false, svg, png });
    expect(html).toContain('<div class="qf-fallback">');
    expect(html).toContain(svg.trim());
    const dataUrl = /src="data:image\/png;base64,([A-Za-z0-9+/=]+)"/.exec(html);
    expect(dataUrl).not.toBeNull();
    expect(Buffer.from(dataUrl![1], "base64").subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
    expect(dataUrl![1]).toBe(base64(png));
    for (const line of headlineSummary(computation.headline)) {
      expect(html).toContain(`<dt>${escapeHtml(line.label)}</dt><dd>${escapeHtml(line.text)}</dd>`);
    }
    expect(headlineSummary(computation.headline)[0].text).toMatch(/^\d+\.\d\d dB at 1\.\d+ MHz$/);
  });

  it("works without figures: the summary alone", () => {
    const html = explorerHtml(state, computation, { includeRuntime: false });
    expect(html).not.toContain("<svg");
    expect(html).not.toContain("<img");
    expect(html).toContain('<dl class="qf-summary">');
  });
});

describe("standalonePage", () => {
  it("is a complete document with the runtime once, the widget, a state loader and no outside URLs", () => {
    const page = standalonePage(state, computation, { svg, png });
    expect(page.startsWith("<!DOCTYPE html>")).toBe(true);
    expect(page.trimEnd().endsWith("</html>")).toBe(true);
    expect(page.split(runtimeSource()).length - 1).toBe(1);
    expect(page).toContain('class="quietframe-explorer"');
    expect(page).toContain('class="qf-loader-text"');
    expect(page).toContain('type="file"');
    expect(page).toContain(`<title>${escapeHtml(`Title ${HOSTILE}`)} — quietframe</title>`);
    // Nothing is loaded from elsewhere: no src/href attributes with a scheme other than data:.
    for (const m of page.matchAll(/\b(?:src|href)\s*=\s*"([^"]*)"/gi)) expect(m[1]).toMatch(/^data:/);
    expect(page).not.toMatch(/<link\b/i);
  });
});
