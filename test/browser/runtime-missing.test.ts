import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import type { Page } from "playwright-core";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../src/setup/format";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { RUNTIME_MISSING_TEXT } from "../../widgets/core/page/bootstrap";
import { explorerHtml } from "../../widgets/explorer/html";
import { STATUS_ATTRIBUTE } from "../../widgets/core/page/names";
import { runtimeSource } from "../../widgets/core/page/runtime-source";
import { explorerFigures } from "../../widgets/explorer/figures";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { expectPageMatchesEngine, waitAllReady, WIDGET } from "./helpers/widgets";

/**
 * Widget fragments written without the runtime (as every notebook widget after the first
 * is), on a page that has no runtime: after the bootstrap's delay each fallback says what is
 * missing. When the runtime does arrive, the widgets boot and the message never shows (or
 * goes away with the fallback). Time in the page is Playwright's fake clock, so the delay is
 * stepped through, not waited for.
 */
const ROOT = join(__dirname, "..", "..");
const MISSING = ".qf-runtime-missing";

function example(name: string): SetupDescription {
  return JSON.parse(readFileSync(join(ROOT, "examples", name), "utf8")) as SetupDescription;
}

let dir: string;
let pageFile: string;
let runtime: string;
let session: BrowserSession | undefined;

beforeAll(async () => {
  runtime = runtimeSource();
  dir = mkdtempSync(join(tmpdir(), "quietframe-runtime-missing-"));
  const fragments: string[] = [];
  for (const [name, controls] of [
    ["cryogenic-membrane.json", [{ target: "membrane.temperature", min: "10 mK", max: "10 K" }]],
    ["free-test-mass.json", [{ target: "arm.power", min: "1 mW", max: "400 mW" }]],
  ] as const) {
    const state = createExplorerState(example(name), { controls: [...controls] });
    const computation = computeExplorer(state);
    const { svg } = await explorerFigures(computation, state);
    const html = explorerHtml(state, computation, { includeRuntime: false, svg });
    expect(html).not.toContain(runtime.slice(0, 2000));
    fragments.push(html);
  }
  pageFile = join(dir, "page.html");
  writeFileSync(
    pageFile,
    `<!DOCTYPE html>\n<html lang="en">\n<head><meta charset="utf-8"><title>widgets without their runtime</title></head>\n<body>\n<h1>Two widgets</h1>\n${fragments.join("\n<p>Between the widgets.</p>\n")}\n</body>\n</html>\n`,
  );
}, 120_000);

afterEach(async () => {
  await session?.close();
  session = undefined;
});

afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

/** Opens the page with the page clock paused, counting every runtime-missing message ever added. */
async function openPausedPage(): Promise<Page> {
  session = await openBrowser({ allow: LOCAL_ONLY });
  const page = session.page;
  await page.addInitScript((selector) => {
    const w = globalThis as any;
    w.__missingAdded = 0;
    new w.MutationObserver((records: any[]) => {
      for (const r of records) for (const n of r.addedNodes) if (n.nodeType === 1 && n.matches(selector)) w.__missingAdded++;
    }).observe(w.document, { childList: true, subtree: true });
  }, MISSING);
  await page.clock.install({ time: new Date("2030-01-01T00:00:00Z") });
  await page.clock.pauseAt(new Date("2030-01-01T00:00:01Z"));
  await page.goto(pathToFileURL(pageFile).href, { waitUntil: "load" });
  expect(await page.locator(WIDGET).count()).toBe(2);
  return page;
}

async function messagesAdded(page: Page): Promise<number> {
  return page.evaluate(() => (globalThis as any).__missingAdded as number);
}

/** Adds the runtime to the page as a late script element (it runs as it is inserted). */
async function appendRuntime(page: Page): Promise<void> {
  await page.evaluate((source) => {
    const d = (globalThis as any).document;
    const script = d.createElement("script");
    script.textContent = source;
    d.body.append(script);
  }, runtime);
}

async function statuses(page: Page): Promise<(string | null)[]> {
  return page.locator(WIDGET).evaluateAll((els, name) => els.map((el) => el.getAttribute(name)), STATUS_ATTRIBUTE);
}

describe("widgets whose page has no runtime", { timeout: 150_000 }, () => {
  it("show the static figure and, after the bootstrap's delay, say in the fallback what is missing", async () => {
    const page = await openPausedPage();
    // Nothing booted, nothing said yet: the figure stands alone.
    expect(await statuses(page)).toEqual([null, null]);
    expect(await page.locator(MISSING).count()).toBe(0);
    await page.clock.runFor(1000);
    expect(await page.locator(MISSING).count()).toBe(0);
    await page.clock.runFor(10_000);
    for (let i = 0; i < 2; i++) {
      const fallback = page.locator(WIDGET).nth(i).locator(".qf-fallback");
      expect(await fallback.isVisible()).toBe(true);
      expect(await fallback.locator(":scope > .qf-fallback-svg > svg").isVisible()).toBe(true);
      const message = fallback.locator(MISSING);
      expect(await message.count()).toBe(1);
      expect(await message.textContent()).toBe(RUNTIME_MISSING_TEXT);
      expect(await message.isVisible()).toBe(true);
    }
    // Every bootstrap's timer has fired; still one message per widget.
    await page.clock.runFor(10_000);
    expect(await page.locator(MISSING).count()).toBe(2);
    expect(await messagesAdded(page)).toBe(2);
    expect(await statuses(page)).toEqual([null, null]);

    // The runtime arriving late still brings them to life; the message goes with the fallback.
    await appendRuntime(page);
    await page.clock.resume();
    await waitAllReady(page, 2);
    for (let i = 0; i < 2; i++) {
      expect(await page.locator(WIDGET).nth(i).locator(".qf-fallback").isHidden()).toBe(true);
      await expectPageMatchesEngine(page, i);
    }
    expect(await page.locator(`${MISSING}:visible`).count()).toBe(0);
    expect(session!.consoleErrors).toEqual([]);
    expect(session!.refusedRequests).toEqual([]);
  });

  it("boot when the runtime arrives a little later, and never show the message", async () => {
    const page = await openPausedPage();
    await page.clock.runFor(1000);
    expect(await statuses(page)).toEqual([null, null]);
    await appendRuntime(page);
    // The runtime took the widgets over as it ran, before the bootstraps' delay is over.
    expect(await statuses(page)).not.toContain(null);
    await page.clock.runFor(10_000);
    await page.clock.resume();
    await waitAllReady(page, 2);
    for (let i = 0; i < 2; i++) await expectPageMatchesEngine(page, i);
    expect(await page.locator(MISSING).count()).toBe(0);
    expect(await messagesAdded(page)).toBe(0);
    expect(session!.consoleErrors).toEqual([]);
    expect(session!.refusedRequests).toEqual([]);
  });
});
