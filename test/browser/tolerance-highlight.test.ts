import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../src/setup/format";
import { toleranceMapInProcess, type ToleranceMapSpec } from "../../src/tolerance";
import { tolerancePage } from "../../widgets/tolerance/html";
import { toleranceWidgetState } from "../../widgets/tolerance/model";
import { SELECTED_CELL_ATTRIBUTE, TOLERANCE_CLASS } from "../../widgets/tolerance/names";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { WIDGET_WAIT_MS } from "./helpers/widgets";

/**
 * The tolerance map frames the cell the reader opened: after a click (or Enter on the
 * keyboard cursor) a frame sits exactly over that cell — where the view's own scales put
 * the cell's neighbours' centres — and moves with the next choice.
 */
const ROOT = join(__dirname, "..", "..");
const squeezed = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;
const SPEC: ToleranceMapSpec = {
  x: { target: "cavity.detuning", from: "-4 MHz", to: "4 MHz", points: 5 },
  y: { target: "cavity.inputCoupling", from: "0 %", to: "100 %", points: 3 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 32 },
  figure: { kind: "margin-at", frequency: "1.16 MHz" },
};
const MAP = `.${TOLERANCE_CLASS}`;
const FRAME = `${MAP} .qf-cell-highlight`;

let dir: string;
let session: BrowserSession;

async function centre(i: number, j: number): Promise<{ x: number; y: number }> {
  return session.page.evaluate(([ci, cj]) => (globalThis as any).quietframeRuntime.toleranceMaps[0].cellCenter(ci, cj), [i, j] as const);
}

async function waitSelected(i: number, j: number): Promise<void> {
  await session.page.waitForFunction(([sel, attr, v]) => (globalThis as any).document.querySelector(sel).getAttribute(attr) === v, [MAP, SELECTED_CELL_ATTRIBUTE, `${i},${j}`] as const, {
    timeout: WIDGET_WAIT_MS,
  });
}

/** The frame's box must be centred on the cell and span half-way to each neighbour's centre (uniform linear axes). */
async function expectFramed(i: number, j: number): Promise<void> {
  const frame = session.page.locator(FRAME);
  expect(await frame.isVisible()).toBe(true);
  expect(await frame.getAttribute("data-cell")).toBe(`${i},${j}`);
  const box = (await frame.boundingBox())!;
  const c = await centre(i, j);
  const right = await centre(i < 4 ? i + 1 : i - 1, j);
  const up = await centre(i, j < 2 ? j + 1 : j - 1);
  const cellWidth = Math.abs(right.x - c.x);
  const cellHeight = Math.abs(up.y - c.y);
  // Half a CSS pixel: layout rounds boxes to device pixels.
  expect(Math.abs(box.x + box.width / 2 - c.x)).toBeLessThan(0.5);
  expect(Math.abs(box.y + box.height / 2 - c.y)).toBeLessThan(0.5);
  expect(Math.abs(box.width - cellWidth)).toBeLessThan(0.5);
  expect(Math.abs(box.height - cellHeight)).toBeLessThan(0.5);
}

beforeAll(async () => {
  const map = await toleranceMapInProcess(squeezed, SPEC);
  dir = mkdtempSync(join(tmpdir(), "quietframe-highlight-"));
  writeFileSync(join(dir, "page.html"), tolerancePage(toleranceWidgetState(squeezed, SPEC, map, { target: 3 })));
  session = await openBrowser({ allow: LOCAL_ONLY });
  await session.page.goto(pathToFileURL(join(dir, "page.html")).href);
  await session.page.waitForFunction((sel) => (globalThis as any).document.querySelector(sel)?.getAttribute("data-quietframe-status") === "ready", MAP, { timeout: WIDGET_WAIT_MS });
}, 120_000);

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("tolerance map: the opened cell is framed", () => {
  it("no frame before any cell is opened", async () => {
    expect(await session.page.locator(FRAME).isHidden()).toBe(true);
  });

  it("a click frames that cell, and the frame does not take the next click", async () => {
    const at = await centre(1, 2);
    await session.page.mouse.click(at.x, at.y);
    await waitSelected(1, 2);
    await expectFramed(1, 2);
    // The frame lets clicks through: at the framed cell's centre the map's canvas is hit.
    expect(await session.page.evaluate(([x, y]) => (globalThis as any).document.elementFromPoint(x, y)?.tagName, [at.x, at.y] as const)).toBe("CANVAS");
    const again = await centre(3, 0);
    await session.page.mouse.click(again.x, again.y);
    await waitSelected(3, 0);
    await expectFramed(3, 0);
  });

  it("Enter on the keyboard cursor frames the cursor's cell", async () => {
    await session.page.locator(`${MAP} .qf-heatmap`).focus();
    await session.page.keyboard.press("ArrowLeft");
    await session.page.keyboard.press("ArrowUp");
    await session.page.keyboard.press("Enter");
    await waitSelected(2, 1);
    await expectFramed(2, 1);
    expect(session.consoleErrors).toEqual([]);
  });
});
