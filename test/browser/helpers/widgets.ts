import type { Page } from "playwright-core";
import { expect } from "vitest";
import { curveRows, type CurveRow } from "../../../widgets/explorer/budget-spec";
import { resolveControls, sliderValue, writeValue } from "../../../widgets/core/controls/setup-controls";
import { computeExplorer, type ExplorerComputation } from "../../../widgets/explorer/model";
import { FINGERPRINT_ATTRIBUTE, STATUS_ATTRIBUTE } from "../../../widgets/core/page/names";
import type { ExplorerState } from "../../../widgets/explorer/format";

/**
 * Reading and driving the live widgets of a page through the runtime's test hooks
 * (window.quietframeRuntime.widgets[k].currentState() / plottedRows()). Widgets are addressed
 * by their position among the page's `.quietframe-explorer` elements, in document order,
 * and matched to the runtime's widget objects by element.
 */
export const WIDGET = ".quietframe-explorer";

/** Generous: a loaded 2-core machine computes a budget and draws a chart in well under this. */
export const WIDGET_WAIT_MS = 60_000;

/** Waits until the page shows `count` widgets and every one of them is ready. */
export async function waitAllReady(page: Page, count: number, timeout = WIDGET_WAIT_MS): Promise<void> {
  try {
    await page.waitForFunction(
      ([selector, n, status]) => {
        const els = Array.from((globalThis as any).document.querySelectorAll(selector)) as any[];
        return els.length === n && els.every((el) => el.getAttribute(status) === "ready");
      },
      [WIDGET, count, STATUS_ATTRIBUTE] as const,
      { timeout },
    );
  } catch (e) {
    const seen = await page.evaluate(
      ([selector, status]) =>
        (Array.from((globalThis as any).document.querySelectorAll(selector)) as any[]).map((el) => `${el.getAttribute(status)}: ${(el.querySelector(".qf-alert")?.textContent ?? "").slice(0, 300)}`),
      [WIDGET, STATUS_ATTRIBUTE] as const,
    );
    throw new Error(`expected ${count} ready widgets, the page has ${JSON.stringify(seen)}: ${(e as Error).message}`);
  }
}

export async function widgetAttribute(page: Page, index: number, name: string): Promise<string | null> {
  return page.locator(WIDGET).nth(index).getAttribute(name);
}

export async function fingerprintOf(page: Page, index: number): Promise<string | null> {
  return widgetAttribute(page, index, FINGERPRINT_ATTRIBUTE);
}

/** The state the widget at `index` holds now (its "Download state"). */
export async function pageState(page: Page, index: number): Promise<ExplorerState> {
  return page.evaluate(
    ([selector, i]) => {
      const el = (globalThis as any).document.querySelectorAll(selector)[i];
      const w = (globalThis as any).quietframeRuntime.widgets.find((x: any) => x.element === el);
      if (!w) throw new Error(`no live widget for element ${i}`);
      return w.currentState();
    },
    [WIDGET, index] as const,
  );
}

/** The rows the chart of the widget at `index` is plotting now. */
export async function plottedRows(page: Page, index: number): Promise<CurveRow[]> {
  return page.evaluate(
    ([selector, i]) => {
      const el = (globalThis as any).document.querySelectorAll(selector)[i];
      const w = (globalThis as any).quietframeRuntime.widgets.find((x: any) => x.element === el);
      if (!w) throw new Error(`no live widget for element ${i}`);
      return w.plottedRows();
    },
    [WIDGET, index] as const,
  );
}

/** The slider position (0 … steps) a range control of the widget at `index` shows. */
export async function sliderPosition(page: Page, index: number, target: string): Promise<number> {
  return Number(await page.locator(WIDGET).nth(index).locator(`input[type=range][data-target="${target}"]`).inputValue());
}

/** The value, as a set-up writes it, that slider position k of a control stands for (computed in Node). */
export function sliderText(state: ExplorerState, target: string, k: number): string {
  const [c] = resolveControls(
    state.setup,
    state.controls.filter((x) => x.target === target),
  );
  if (!c) throw new Error(`the state has no control for ${target}`);
  return writeValue(c, sliderValue(c, k));
}

/**
 * Sets a slider to position k as a reader's drag would (value, then `input` and `change`),
 * and waits until the widget is ready again with a different fingerprint.
 */
export async function moveSlider(page: Page, index: number, target: string, k: number, timeout = WIDGET_WAIT_MS): Promise<void> {
  const widget = page.locator(WIDGET).nth(index);
  const before = await widget.getAttribute(FINGERPRINT_ATTRIBUTE);
  await widget.locator(`input[type=range][data-target="${target}"]`).evaluate((input: any, value: number) => {
    input.value = String(value);
    input.dispatchEvent(new Event("input", { bubbles: true }));
    input.dispatchEvent(new Event("change", { bubbles: true }));
  }, k);
  await page.waitForFunction(
    ([selector, i, old, status, fp]) => {
      const el = (globalThis as any).document.querySelectorAll(selector)[i];
      return el.getAttribute(status) === "ready" && el.getAttribute(fp) !== old;
    },
    [WIDGET, index, before, STATUS_ATTRIBUTE, FINGERPRINT_ATTRIBUTE] as const,
    { timeout },
  );
}

/** Rows compared one by one before the whole set, so a failure names a row. */
const SAMPLE_ROWS = (n: number): number[] => [...new Set([0, 1, Math.floor(n / 3), Math.floor(n / 2), n - 2, n - 1])].filter((i) => i >= 0 && i < n);

/**
 * Recomputes, in this Node process, the state the widget at `index` holds, and checks that
 * the page shows exactly that: fingerprint attribute, the state's own fingerprint and every
 * plotted row, bit for bit. Returns the Node computation.
 */
export async function expectPageMatchesEngine(page: Page, index: number): Promise<{ state: ExplorerState; computation: ExplorerComputation }> {
  const state = await pageState(page, index);
  const computation = computeExplorer(state);
  expect(await fingerprintOf(page, index)).toBe(computation.fingerprint);
  expect(state.fingerprint).toBe(computation.fingerprint);
  const rows = await plottedRows(page, index);
  const want = curveRows(computation.table);
  expect(want.length).toBeGreaterThan(10);
  expect(rows.length).toBe(want.length);
  for (const i of SAMPLE_ROWS(want.length)) expect(rows[i], `plotted row ${i}`).toEqual(want[i]);
  expect(rows).toEqual(want);
  return { state, computation };
}

/** A slider position away from the current one (and from both ends, where values are clamped). */
export function otherPosition(state: ExplorerState, target: string, current: number): number {
  const [c] = resolveControls(
    state.setup,
    state.controls.filter((x) => x.target === target),
  );
  if (!c || c.control !== "slider") throw new Error(`${target} is not a slider`);
  const steps = c.steps;
  const k = current > steps / 2 ? Math.round(steps * 0.2) : Math.round(steps * 0.8);
  if (k === current) throw new Error("no other slider position");
  return k;
}
