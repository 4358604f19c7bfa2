import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../src/setup/format";
import { computeExplorer } from "../../widgets/explorer/model";
import { FINGERPRINT_ATTRIBUTE, STATUS_ATTRIBUTE } from "../../widgets/core/page/names";
import { htmlDocument } from "../../widgets/core/page/html-document";
import { explorer } from "../../widgets/explorer/notebook/explorer";
import type { ExplorerState } from "../../widgets/explorer/format";
import { actionButton } from "./helpers/actions";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { expectPageMatchesEngine, pageState, sliderPosition, sliderText, waitAllReady, WIDGET, WIDGET_WAIT_MS } from "./helpers/widgets";

/**
 * Twenty explorer widgets in one page, as a notebook holds them: the HTML outputs the tslab
 * API writes (the first carries the runtime, the others their state, SVG fallback and
 * bootstrap), one after another in a page like an nbconvert export. Sliders of several
 * widgets are moved in bursts — many input events within one frame, interleaved between
 * widgets, and bursts spread over frames while computations run — then every widget must
 * plot exactly what Node computes for its own final control values, hold those values in
 * its exported state, and show no chart from an older setting. Reset, then move again.
 */
const ROOT = join(__dirname, "..", "..");
const example = (name: string): SetupDescription => JSON.parse(readFileSync(join(ROOT, "examples", name), "utf8")) as SetupDescription;

/** Two sliders per set-up; grids kept short so twenty widgets recompute quickly. */
const KINDS: { file: string; points: number; controls: { target: string; min: string | number; max: string | number; scale?: "linear" | "log"; steps?: number }[] }[] = [
  {
    file: "cryogenic-membrane-squeezed.json",
    points: 120,
    controls: [
      { target: "squeezer.squeezing", min: "-15 dB", max: "0 dB", scale: "linear", steps: 60 },
      { target: "membrane.temperature", min: "10 mK", max: "300 K", steps: 60 },
    ],
  },
  {
    file: "cryogenic-membrane.json",
    points: 120,
    controls: [
      { target: "cavity.photons", min: 1e4, max: 1e8, steps: 60 },
      { target: "detector.efficiency", min: 0.5, max: 1, scale: "linear", steps: 50 },
    ],
  },
  {
    file: "free-test-mass.json",
    points: 120,
    controls: [
      { target: "mirror.mass", min: "1 g", max: "1 kg", steps: 60 },
      { target: "arm.power", min: "1 mW", max: "100 mW", steps: 60 },
    ],
  },
  {
    file: "hybrid-spin-reference.json",
    points: 120,
    controls: [
      { target: "membrane.temperature", min: "100 mK", max: "10 K", steps: 40 },
      { target: "detector.efficiency", min: 0.5, max: 1, scale: "linear", steps: 50 },
    ],
  },
  {
    file: "long-baseline-detector.json",
    points: 120,
    controls: [
      { target: "squeezer.squeezing", min: "-12 dB", max: "0 dB", scale: "linear", steps: 48 },
      { target: "injection.transmission", min: 0.5, max: 1, scale: "linear", steps: 50 },
    ],
  },
];
const COUNT = 20;

let dir: string;
let session: BrowserSession;
/** The state each widget was created with, in page order. */
const initial: ExplorerState[] = [];

/** A move: widget, slider target, slider position. */
type Move = [number, string, number];

/** The state a widget must hold after `moves` (the last move of each slider wins), as Node computes it. */
function expectedState(i: number, moves: readonly Move[], from: ExplorerState = initial[i]): ExplorerState {
  const values = { ...from.values };
  for (const [w, target, k] of moves) if (w === i) values[target] = sliderText(from, target, k);
  const base = { ...from, values };
  return { ...base, fingerprint: computeExplorer(base).fingerprint };
}

/** Dispatches every move's input event in one synchronous task: all within one frame. */
async function burstInOneFrame(moves: readonly Move[]): Promise<void> {
  await session.page.evaluate(
    ([selector, list]) => {
      const widgets = (globalThis as any).document.querySelectorAll(selector);
      for (const [w, target, k] of list) {
        const input = widgets[w].querySelector(`input[type=range][data-target="${target}"]`);
        input.value = String(k);
        input.dispatchEvent(new Event("input", { bubbles: true }));
      }
    },
    [WIDGET, moves] as const,
  );
}

/** Dispatches the moves spread over many frames (0 … 2 ms apart), so input arrives while widgets compute. */
async function burstAcrossFrames(moves: readonly Move[]): Promise<void> {
  await session.page.evaluate(
    async ([selector, list]) => {
      const widgets = (globalThis as any).document.querySelectorAll(selector);
      let n = 0;
      for (const [w, target, k] of list) {
        const input = widgets[w].querySelector(`input[type=range][data-target="${target}"]`);
        input.value = String(k);
        input.dispatchEvent(new Event("input", { bubbles: true }));
        if (++n % 3 === 0) await new Promise((r) => setTimeout(r, n % 2 === 0 ? 0 : 2));
        if (n % 7 === 0) input.dispatchEvent(new Event("change", { bubbles: true }));
      }
    },
    [WIDGET, moves] as const,
  );
}

/** Waits until every widget is ready and shows the fingerprint it must end with. */
async function waitForFingerprints(want: readonly string[]): Promise<void> {
  try {
    await session.page.waitForFunction(
      ([selector, fps, status, fpAttr]) => {
        const els = Array.from((globalThis as any).document.querySelectorAll(selector)) as any[];
        return els.length === fps.length && els.every((el, i) => el.getAttribute(status) === "ready" && el.getAttribute(fpAttr) === fps[i]);
      },
      [WIDGET, want, STATUS_ATTRIBUTE, FINGERPRINT_ATTRIBUTE] as const,
      { timeout: WIDGET_WAIT_MS },
    );
  } catch (e) {
    const seen = await session.page.locator(WIDGET).evaluateAll((els, fpAttr) => els.map((el) => el.getAttribute(fpAttr as string)), FINGERPRINT_ATTRIBUTE);
    const wrong = want.map((fp, i) => (seen[i] === fp ? "" : `widget ${i}: shows ${seen[i]}, expected ${fp}`)).filter(Boolean);
    throw new Error(`widgets did not settle on their final values: ${wrong.join("; ")} (${(e as Error).message})`);
  }
}

/** Every widget holds, plots and exports exactly the state it must end with. */
async function expectWidgets(want: readonly ExplorerState[], moves: readonly Move[]): Promise<void> {
  await waitForFingerprints(want.map((s) => s.fingerprint));
  // A late frame from an older setting would change a fingerprint after settling: give it time to show.
  await session.page.evaluate(() => new Promise((r) => (globalThis as any).requestAnimationFrame(() => (globalThis as any).requestAnimationFrame(() => setTimeout(r, 50)))));
  for (let i = 0; i < COUNT; i++) {
    const held = await pageState(session.page, i);
    // Its own values — not another widget's, not an older setting.
    expect(held.values, `widget ${i} values`).toEqual(want[i].values);
    expect(held.fingerprint, `widget ${i} fingerprint`).toBe(want[i].fingerprint);
    expect(held.setup, `widget ${i} set-up`).toEqual(initial[i].setup);
    await expectPageMatchesEngine(session.page, i);
  }
  for (const [w, target] of moves) {
    const last = [...moves].reverse().find((m) => m[0] === w && m[1] === target)!;
    expect(await sliderPosition(session.page, w, target), `widget ${w} ${target} slider`).toBe(last[2]);
  }
  expect(session.consoleErrors).toEqual([]);
}

/** Seeded positions (a small linear congruential generator, so the run is the same every time). */
function moveList(seed: number, widgets: readonly number[], perSlider: number): Move[] {
  let x = seed;
  const next = (n: number): number => {
    x = (x * 1103515245 + 12345) % 2147483648;
    return x % n;
  };
  const moves: Move[] = [];
  for (let step = 0; step < perSlider; step++) {
    for (const w of widgets) {
      for (const c of initial[w].controls) moves.push([w, c.target, next((c.steps ?? 100) + 1)]);
    }
  }
  return moves;
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-many-"));
  const outputs: string[] = [];
  for (let i = 0; i < COUNT; i++) {
    const kind = KINDS[i % KINDS.length];
    const setup = { ...example(kind.file), grid: { ...example(kind.file).grid!, points: kind.points } };
    const w = explorer(setup, { controls: kind.controls, settings: { title: `widget ${i}` } });
    const bundle = await w.bundle({ includeRuntime: i === 0 });
    initial.push(JSON.parse(JSON.stringify(w.state)) as ExplorerState);
    // As in a notebook export: each output in a cell of its own, the runtime in the first only.
    outputs.push(`<div class="cell"><div class="output_html">${bundle["text/html"]}</div></div>`);
  }
  writeFileSync(join(dir, "notebook.html"), htmlDocument("twenty widgets", outputs));
  session = await openBrowser({ allow: LOCAL_ONLY });
  await session.page.goto(pathToFileURL(join(dir, "notebook.html")).href);
  await waitAllReady(session.page, COUNT);
}, 300_000);

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("twenty widgets on one page", () => {
  it("boot with the runtime carried once, each with its own state", async () => {
    for (let i = 0; i < COUNT; i++) expect((await pageState(session.page, i)).fingerprint).toBe(initial[i].fingerprint);
    expect(new Set(initial.map((s) => s.settings.title)).size).toBe(COUNT);
    // One inline script is the runtime (hundreds of kilobytes); the others are states and bootstraps.
    const sizes = await session.page.evaluate(() => Array.from((globalThis as any).document.scripts as any[], (s: any) => (s.textContent ?? "").length));
    expect(sizes.filter((n) => n > 100_000)).toHaveLength(1);
    expect(sizes.length).toBe(1 + 2 * COUNT);
  });

  // Widgets of the same set-up side by side (0 and 5, 1 and 6 …) would show crossed state at once.
  const MOVED = [0, 5, 1, 6, 3, 8, 13, 19];
  let afterFirst: ExplorerState[] = [];

  it("many inputs within one frame, interleaved between eight widgets: each ends on its own final values", async () => {
    const moves = moveList(17, MOVED, 25);
    expect(moves.length).toBe(25 * MOVED.length * 2);
    await burstInOneFrame(moves);
    afterFirst = initial.map((_, i) => expectedState(i, moves));
    // The widgets not moved keep their initial state.
    for (let i = 0; i < COUNT; i++) if (!MOVED.includes(i)) expect(afterFirst[i].fingerprint).toBe(initial[i].fingerprint);
    await expectWidgets(afterFirst, moves);
  }, 300_000);

  it("bursts spread over frames while widgets compute: no stale chart, no lost or crossed state", async () => {
    const moves = moveList(4242, [2, 7, 12, 17, 0, 5], 30);
    await burstAcrossFrames(moves);
    const want = afterFirst.map((s, i) => expectedState(i, moves, s));
    await expectWidgets(want, moves);
    afterFirst = want;
  }, 300_000);

  it("reset on several widgets returns each to its own initial state; moving again works", async () => {
    const reset = [0, 5, 2, 17];
    for (const i of reset) await actionButton(session.page, i, "Reset").click();
    const want = afterFirst.map((s, i) => (reset.includes(i) ? initial[i] : s));
    await expectWidgets(want, []);
    for (const i of reset) {
      for (const c of initial[i].controls) {
        expect(await pageState(session.page, i).then((s) => s.values[c.target])).toBe(initial[i].values[c.target]);
      }
    }
    const again = moveList(99, reset, 20);
    await burstInOneFrame(again);
    await expectWidgets(
      want.map((s, i) => expectedState(i, again, s)),
      again,
    );
  }, 300_000);
});
