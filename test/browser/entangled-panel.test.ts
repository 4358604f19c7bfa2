import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { computeEntangled, createEntangledState, sliderValue, type EntangledState } from "../../widgets/entangled/model";
import { ENTANGLED_NUMBER_ATTRIBUTES } from "../../widgets/entangled/names";
import { entangledHtml } from "../../widgets/entangled/html";
import { STATUS_ATTRIBUTE } from "../../widgets/core/page/names";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";

/**
 * The live entangled-light panel in Chromium: it boots from its embedded state, shows the
 * numbers Node computes for that state, and moving a slider recomputes them in the page with
 * the same model code, to the bit.
 */
const PANEL = ".quietframe-entangled";
const WAIT_MS = 60_000;

let dir: string;
let session: BrowserSession;
let dbState: EntangledState;
let rState: EntangledState;

async function waitReady(count: number): Promise<void> {
  await session.page.waitForFunction(
    ([selector, n, status]) => {
      const els = Array.from((globalThis as any).document.querySelectorAll(selector)) as any[];
      return els.length === n && els.every((e) => e.getAttribute(status) === "ready");
    },
    [PANEL, count, STATUS_ATTRIBUTE] as const,
    { timeout: WAIT_MS },
  );
}

async function numbers(index: number): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const [key, attr] of Object.entries(ENTANGLED_NUMBER_ATTRIBUTES)) out[key] = Number(await session.page.locator(PANEL).nth(index).getAttribute(attr));
  return out;
}

async function pageState(index: number): Promise<EntangledState> {
  return session.page.evaluate(
    ([selector, i]) => {
      const el = (globalThis as any).document.querySelectorAll(selector)[i];
      const panel = (globalThis as any).quietframeEntangledPanels().find((p: any) => p.element === el);
      if (!panel) throw new Error(`no live panel for element ${i}`);
      return panel.currentState();
    },
    [PANEL, index] as const,
  );
}

/** Moves a slider as a drag would and waits until the Duan sum on the page has changed. */
async function moveSlider(index: number, target: string, k: number): Promise<void> {
  const panel = session.page.locator(PANEL).nth(index);
  const before = await panel.getAttribute(ENTANGLED_NUMBER_ATTRIBUTES.duanSum);
  await panel.locator(`input[type=range][data-target="${target}"]`).evaluate((input: any, value: number) => {
    input.value = String(value);
    input.dispatchEvent(new Event("input", { bubbles: true }));
    input.dispatchEvent(new Event("change", { bubbles: true }));
  }, k);
  await session.page.waitForFunction(
    ([selector, i, attr, old, status]) => {
      const el = (globalThis as any).document.querySelectorAll(selector)[i];
      return el.getAttribute(status) === "ready" && el.getAttribute(attr) !== old;
    },
    [PANEL, index, ENTANGLED_NUMBER_ATTRIBUTES.duanSum, before, STATUS_ATTRIBUTE] as const,
    { timeout: WAIT_MS },
  );
}

function expected(state: EntangledState): Record<string, number> {
  const c = computeEntangled(state);
  return { duanSum: c.duanSum, eprX: c.eprX, eprP: c.eprP, logNegativity: c.logNegativity, conditionalVariance: c.conditionalVariance };
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-entangled-"));
  dbState = createEntangledState({ squeezingDb: -6, efficiency1: 0.9, efficiency2: 0.8, bandwidth: 1e6, title: `EPR pair <i>"one"</i>` });
  rState = createEntangledState({ r: 0.5, efficiency1: 0.97, efficiency2: 0.6 });
  const page = [
    "<!DOCTYPE html>",
    `<html lang="en"><head><meta charset="utf-8"><title>entangled panel</title></head><body>`,
    entangledHtml(dbState, { includeRuntime: true }),
    entangledHtml(rState, { includeRuntime: false }),
    "</body></html>",
  ].join("\n");
  writeFileSync(join(dir, "page.html"), page);
  session = await openBrowser({ allow: LOCAL_ONLY });
  await session.page.goto(pathToFileURL(join(dir, "page.html")).href);
  await waitReady(2);
});

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("entangled panel in the live page", () => {
  it("boots both panels with the numbers Node computes for their states", async () => {
    expect(await pageState(0)).toEqual(dbState);
    expect(await pageState(1)).toEqual(rState);
    expect(await numbers(0)).toEqual(expected(dbState));
    expect(await numbers(1)).toEqual(expected(rState));
    // Three charts per panel, drawn on canvases; the static fallback is hidden.
    expect(await session.page.locator(PANEL).nth(0).locator(".qf-charts canvas").count()).toBe(3);
    expect(await session.page.locator(PANEL).nth(0).locator(".qf-fallback").isHidden()).toBe(true);
  });

  it("moving the squeeze slider changes the Duan sum to exactly Node's value", async () => {
    const k = 150;
    await moveSlider(0, "squeeze", k);
    const want: EntangledState = { ...dbState, squeeze: { unit: "dB", value: sliderValue("dB", k) } };
    expect(want.squeeze.value).toBe(-15);
    expect(await pageState(0)).toEqual(want);
    const shown = await numbers(0);
    expect(shown.duanSum).toBe(computeEntangled(want).duanSum);
    expect(shown.duanSum).not.toBe(computeEntangled(dbState).duanSum);
    expect(shown).toEqual(expected(want));
    const readout = await session.page.locator(PANEL).nth(0).locator(".qf-readout").textContent();
    expect(readout).toContain("-15 dB");
  });

  it("the r slider and an efficiency slider of the second panel recompute the same way", async () => {
    await moveSlider(1, "squeeze", 120);
    await moveSlider(1, "efficiency2", 35);
    const want: EntangledState = { ...rState, squeeze: { unit: "r", value: 1.2 }, efficiency2: 0.35 };
    expect(await pageState(1)).toEqual(want);
    expect(await numbers(1)).toEqual(expected(want));
  });

  it("a bandwidth the model refuses is reported and the last valid numbers stay", async () => {
    const panel = session.page.locator(PANEL).nth(0);
    const before = await numbers(0);
    await panel.locator(`input[data-target="bandwidth"]`).fill("-5");
    await panel.locator(`input[data-target="bandwidth"]`).dispatchEvent("change");
    await session.page.waitForFunction(([selector, status]) => (globalThis as any).document.querySelector(selector).getAttribute(status) === "error", [PANEL, STATUS_ATTRIBUTE] as const, {
      timeout: WAIT_MS,
    });
    expect(await panel.locator(".qf-alert").textContent()).toMatch(/^Not applied: state\.bandwidth = -5/);
    expect(await numbers(0)).toEqual(before);
  });

  it("the bandwidth field takes a frequency with its unit", async () => {
    const panel = session.page.locator(PANEL).nth(0);
    const before = await pageState(0);
    await panel.locator(`input[data-target="bandwidth"]`).fill("5 MHz");
    await panel.locator(`input[data-target="bandwidth"]`).dispatchEvent("change");
    await session.page.waitForFunction(([selector, status]) => (globalThis as any).document.querySelector(selector).getAttribute(status) === "ready", [PANEL, STATUS_ATTRIBUTE] as const, {
      timeout: WAIT_MS,
    });
    const want: EntangledState = { ...before, bandwidth: 5e6 };
    expect(await pageState(0)).toEqual(want);
    expect(await numbers(0)).toEqual(expected(want));
  });

  it("the title is shown as text, never as markup", async () => {
    expect(await session.page.locator(`${PANEL} i`).count()).toBe(0);
  });

  it("logged no console errors and asked for nothing outside the file", () => {
    expect(session.consoleErrors).toEqual([]);
    expect(session.refusedRequests).toEqual([]);
  });
});
