import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../src/setup/format";
import { toleranceCellSetup, toleranceMapInProcess, type ToleranceMap, type ToleranceMapSpec } from "../../src/tolerance";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { tolerancePage } from "../../widgets/tolerance/html";
import { cellControls, cellGrid, toleranceWidgetState, type ToleranceWidgetState } from "../../widgets/tolerance/model";
import { SELECTED_CELL_ATTRIBUTE, TOLERANCE_CLASS } from "../../widgets/tolerance/names";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { expectPageMatchesEngine, pageState, waitAllReady, WIDGET, WIDGET_WAIT_MS } from "./helpers/widgets";

/**
 * The live tolerance map in Chromium: the heat map draws from the data the page carries, a
 * click on a cell opens an explorer of exactly that cell (values and fingerprint as Node
 * computes them from toleranceCellSetup), another click replaces it, and a failed cell says
 * why instead of opening one.
 */
const ROOT = join(__dirname, "..", "..");
const squeezed = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;

const SPEC: ToleranceMapSpec = {
  x: { target: "cavity.detuning", from: "-4 MHz", to: "4 MHz", points: 5 },
  y: { target: "cavity.inputCoupling", from: "0 %", to: "100 %", points: 3 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 48 },
  figure: { kind: "margin-at", frequency: "1.16 MHz" },
};
const MAP = `.${TOLERANCE_CLASS}`;

let dir: string;
let session: BrowserSession;
let map: ToleranceMap;
let state: ToleranceWidgetState;

/** Clicks the centre of cell (i, j) with the mouse, where the page's own scales put it. */
async function clickCell(i: number, j: number): Promise<void> {
  const at = await session.page.evaluate(([ci, cj]) => (globalThis as any).quietframeRuntime.toleranceMaps[0].cellCenter(ci, cj), [i, j] as const);
  await session.page.mouse.click(at.x, at.y);
  await session.page.waitForFunction(([sel, attr, v]) => (globalThis as any).document.querySelector(sel).getAttribute(attr) === v, [MAP, SELECTED_CELL_ATTRIBUTE, `${i},${j}`] as const, {
    timeout: WIDGET_WAIT_MS,
  });
}

/** The explorer state Node derives for cell (i, j), independently of the page's code path. */
function nodeCellState(i: number, j: number) {
  return createExplorerState(toleranceCellSetup(squeezed, map, i, j), { controls: cellControls(state), settings: { grid: cellGrid(state), spectralDensity: "amplitude" } });
}

beforeAll(async () => {
  map = await toleranceMapInProcess(squeezed, SPEC);
  state = toleranceWidgetState(squeezed, SPEC, map, { target: 3 });
  dir = mkdtempSync(join(tmpdir(), "quietframe-tolerance-"));
  writeFileSync(join(dir, "page.html"), tolerancePage(state));
  session = await openBrowser({ allow: LOCAL_ONLY });
  await session.page.goto(pathToFileURL(join(dir, "page.html")).href);
  await session.page.waitForFunction((sel) => (globalThis as any).document.querySelector(sel)?.getAttribute("data-quietframe-status") === "ready", MAP, { timeout: WIDGET_WAIT_MS });
});

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("tolerance map in the browser", () => {
  it("draws the heat map on a canvas and hides the static fallback; no explorer yet", async () => {
    const box = await session.page.locator(`${MAP} .qf-heatmap canvas`).boundingBox();
    expect(box && box.width > 200 && box.height > 150).toBe(true);
    expect(await session.page.locator(`${MAP} .qf-fallback`).isHidden()).toBe(true);
    expect(await session.page.locator(WIDGET).count()).toBe(0);
  });

  it("a click on cell (1, 2) opens an explorer with that cell's values and Node's fingerprint", async () => {
    await clickCell(1, 2);
    await waitAllReady(session.page, 1);
    const shown = await pageState(session.page, 0);
    expect(shown.values).toEqual({ "cavity.detuning": map.x.written[1], "cavity.inputCoupling": map.y.written[2] });
    const expected = nodeCellState(1, 2);
    expect(shown.setup).toEqual(expected.setup);
    expect(shown.controls).toEqual(expected.controls);
    expect(shown.fingerprint).toBe(computeExplorer(expected).fingerprint);
    await expectPageMatchesEngine(session.page, 0);
  });

  it("a click on another cell replaces the explorer", async () => {
    await clickCell(2, 1);
    await session.page.waitForFunction(
      ([sel, v]) => {
        const els = (globalThis as any).document.querySelectorAll(sel);
        return els.length === 1 && els[0].getAttribute("data-quietframe-status") === "ready" && els[0].getAttribute("data-quietframe-fingerprint") === v;
      },
      [WIDGET, computeExplorer(nodeCellState(2, 1)).fingerprint] as const,
      { timeout: WIDGET_WAIT_MS },
    );
    expect(await session.page.locator(WIDGET).count()).toBe(1);
    const shown = await pageState(session.page, 0);
    expect(shown.values).toEqual({ "cavity.detuning": map.x.written[2], "cavity.inputCoupling": map.y.written[1] });
    expect(await session.page.evaluate(() => (globalThis as any).quietframeRuntime.widgets.length)).toBe(1);
  });

  it("a click on an unstable cell says why and opens no explorer", async () => {
    await clickCell(4, 1);
    expect(await session.page.locator(WIDGET).count()).toBe(0);
    const note = session.page.locator(`${MAP} .qf-cell-note`);
    expect(await note.isVisible()).toBe(true);
    expect(await note.textContent()).toMatch(/unstable/);
  });

  it("the keyboard reaches cells: arrows move, Enter opens", async () => {
    await session.page.locator(`${MAP} .qf-heatmap`).focus();
    // The cursor stands on the last selected cell (4, 1); left twice and up once is (2, 2).
    for (const key of ["ArrowLeft", "ArrowLeft", "ArrowUp", "Enter"]) await session.page.keyboard.press(key);
    await waitAllReady(session.page, 1);
    expect(await session.page.locator(MAP).getAttribute(SELECTED_CELL_ATTRIBUTE)).toBe("2,2");
    expect((await pageState(session.page, 0)).values).toEqual({ "cavity.detuning": map.x.written[2], "cavity.inputCoupling": map.y.written[2] });
  });

  it("logged no console errors and asked for nothing outside the file", () => {
    expect(session.consoleErrors).toEqual([]);
    expect(session.refusedRequests).toEqual([]);
  });
});
