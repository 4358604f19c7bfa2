/**
 * The controls on a standalone page: the frequency-range control moves the grid, the curves
 * and the headline (compared with the engine in Node on the same grid), the exact-value field
 * sets a slider's value exactly and refuses a value out of range with value, unit and range,
 * and every slider's label names its unit.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../src/setup/format";
import { FINGERPRINT_ATTRIBUTE, STATUS_ATTRIBUTE } from "../../widgets/core/page/names";
import { stateDocumentText } from "../../widgets/explorer/document";
import type { ExplorerState } from "../../widgets/explorer/format";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { REPO_ROOT } from "../jupyter/env";
import { run } from "../jupyter/notebook-file";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { fingerprintOf, pageState, waitAllReady, WIDGET, WIDGET_WAIT_MS } from "./helpers/widgets";

const CLI = join(REPO_ROOT, "dist", "src", "cli", "main.js");
const POWER = "arm.power";
let dir: string;
let initial: ExplorerState;
let browser: BrowserSession | undefined;
let page: Page;

async function commit(selector: string, text: string): Promise<void> {
  const field = page.locator(`${WIDGET} ${selector}`);
  await field.fill(text);
  await field.press("Enter");
}

async function waitForNewFingerprint(before: string | null): Promise<void> {
  await page.waitForFunction(
    ([selector, old, attr, status]) => {
      const el = (globalThis as any).document.querySelector(selector);
      return el.getAttribute(status) === "ready" && el.getAttribute(attr) !== old;
    },
    [WIDGET, before, FINGERPRINT_ATTRIBUTE, STATUS_ATTRIBUTE] as const,
    { timeout: WIDGET_WAIT_MS },
  );
}

const readout = (): Promise<string> => page.locator(`${WIDGET} .qf-readout`).innerText();

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-controls-"));
  const setup = JSON.parse(readFileSync(join(REPO_ROOT, "examples", "free-test-mass.json"), "utf8")) as SetupDescription;
  initial = createExplorerState(setup, {
    controls: [{ target: POWER, label: "input power", min: "1 mW", max: "400 mW" }],
    settings: { grid: { from: "10 Hz", to: "100 kHz", points: 240 }, title: "Range check" },
  });
  const stateFile = join(dir, "state.json");
  writeFileSync(stateFile, stateDocumentText(initial));
  const rendered = await run(process.execPath, [CLI, "render", stateFile, "-o", join(dir, "page.html"), "--strict"], { env: process.env, timeoutMs: 120_000 });
  if (rendered.code !== 0) throw new Error(`quietframe render exited with ${rendered.code}:\n${rendered.stderr}`);
  browser = await openBrowser({ allow: LOCAL_ONLY });
  page = browser.page;
  await page.goto(pathToFileURL(join(dir, "page.html")).href, { waitUntil: "load" });
  await waitAllReady(page, 1);
}, 180_000);

afterAll(async () => {
  await browser?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("controls of a budget widget", { timeout: 120_000 }, () => {
  it("labels a slider with its unit", async () => {
    expect(await page.locator(`${WIDGET} .qf-controls label`).first().innerText()).toBe("input power [mW]");
  });

  it("the frequency range moves the grid, the curves and the headline as the engine does", async () => {
    const before = await fingerprintOf(page, 0);
    const headlineBefore = await readout();
    await commit('input[data-range="from"]', "1 kHz");
    await waitForNewFingerprint(before);
    const state = await pageState(page, 0);
    expect(state.settings.grid).toEqual({ from: "1 kHz", to: "100 kHz", points: 240 });
    const expected = computeExplorer({ ...initial, settings: { ...initial.settings, grid: { from: "1 kHz", to: "100 kHz", points: 240 } } });
    expect(state.fingerprint).toBe(expected.fingerprint);
    expect(await fingerprintOf(page, 0)).toBe(expected.fingerprint);
    expect(expected.evaluation.budget.frequencies[0]).toBe(1000);
    expect(await readout()).not.toBe(headlineBefore);
  });

  it("a range that is not one is refused beside the fields and changes nothing", async () => {
    const before = await fingerprintOf(page, 0);
    await commit('input[data-range="to"]', "10 Hz");
    const message = page.locator(`${WIDGET} .qf-frequency-range [role=alert]`);
    await expect.poll(() => message.innerText()).toMatch(/frequency range\.to = "10 Hz": must be above from/);
    expect(await fingerprintOf(page, 0)).toBe(before);
    await commit('input[data-range="to"]', "100 kHz");
    await expect.poll(() => message.innerText()).toBe("");
  });

  it("the exact-value field sets the slider's value exactly, or says what is allowed", async () => {
    const before = await fingerprintOf(page, 0);
    await commit("input.qf-exact[aria-label='exact value of input power']", "123.456 mW");
    await waitForNewFingerprint(before);
    expect((await pageState(page, 0)).values[POWER]).toBe("123.456 mW");
    const now = await fingerprintOf(page, 0);
    await commit("input.qf-exact[aria-label='exact value of input power']", "2 W");
    const message = page.locator(`${WIDGET} .qf-controls .qf-exact-error`).first();
    await expect.poll(() => message.innerText()).toMatch(/input power \(arm\.power\) = "2 W": is outside the control's range; allowed: 1 mW … 400 mW/);
    expect(await fingerprintOf(page, 0)).toBe(now);
  });
});
