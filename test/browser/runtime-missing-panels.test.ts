import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../src/setup/format";
import { toleranceMapInProcess } from "../../src/tolerance";
import { createEntangledState } from "../../widgets/entangled/model";
import { ENTANGLED_CLASS } from "../../widgets/entangled/names";
import { entangledHtml } from "../../widgets/entangled/html";
import { RUNTIME_MISSING_TEXT } from "../../widgets/core/page/bootstrap";
import { STATUS_ATTRIBUTE } from "../../widgets/core/page/names";
import { runtimeSource } from "../../widgets/core/page/runtime-source";
import { toleranceHtml } from "../../widgets/tolerance/html";
import { toleranceWidgetState } from "../../widgets/tolerance/model";
import { TOLERANCE_CLASS } from "../../widgets/tolerance/names";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { WIDGET_WAIT_MS } from "./helpers/widgets";

/**
 * A tolerance map and an entangled-light panel written without the runtime (as any widget
 * after a notebook's first is), on a page that never gets it: after the bootstrap's delay
 * each fallback says what is missing, as explorer widgets do. When the runtime arrives they
 * boot and the fallback, message included, goes away. The page's clock is Playwright's.
 */
const ROOT = join(__dirname, "..", "..");
const squeezed = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;
const PANELS = [`.${TOLERANCE_CLASS}`, `.${ENTANGLED_CLASS}`];
const MISSING = ".qf-runtime-missing";

let dir: string;
let session: BrowserSession;

beforeAll(async () => {
  const spec = {
    x: { target: "cavity.detuning", from: "-4 MHz", to: "4 MHz", points: 3 },
    y: { target: "detector.efficiency", from: "50 %", to: "100 %", points: 2 },
    grid: { from: "1.1 MHz", to: "1.3 MHz", points: 16 },
    figure: { kind: "margin-at" as const, frequency: "1.16 MHz" },
  };
  const map = await toleranceMapInProcess(squeezed, spec);
  const fragments = [toleranceHtml(toleranceWidgetState(squeezed, spec, map), { includeRuntime: false }), entangledHtml(createEntangledState({ squeezingDb: -9 }), { includeRuntime: false })];
  for (const f of fragments) expect(f).not.toContain(runtimeSource().slice(0, 2000));
  dir = mkdtempSync(join(tmpdir(), "quietframe-missing-panels-"));
  writeFileSync(
    join(dir, "page.html"),
    `<!DOCTYPE html>\n<html lang="en">\n<head><meta charset="utf-8"><title>panels without their runtime</title></head>\n<body>\n${fragments.join("\n")}\n</body>\n</html>\n`,
  );
  session = await openBrowser({ allow: LOCAL_ONLY });
  await session.page.clock.install({ time: new Date("2030-01-01T00:00:00Z") });
  await session.page.clock.pauseAt(new Date("2030-01-01T00:00:01Z"));
  await session.page.goto(pathToFileURL(join(dir, "page.html")).href, { waitUntil: "load" });
}, 120_000);

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("tolerance and entangled widgets whose page has no runtime", { timeout: 150_000 }, () => {
  it("say in their fallback what is missing, once each, after the bootstrap's delay", async () => {
    const page = session.page;
    expect(await page.locator(MISSING).count()).toBe(0);
    await page.clock.runFor(1000);
    expect(await page.locator(MISSING).count()).toBe(0);
    await page.clock.runFor(10_000);
    for (const panel of PANELS) {
      const message = page.locator(`${panel} .qf-fallback ${MISSING}`);
      expect(await message.count(), panel).toBe(1);
      expect(await message.textContent()).toBe(RUNTIME_MISSING_TEXT);
      expect(await message.isVisible()).toBe(true);
    }
    // Both bootstraps' timers fired; still one message per panel.
    expect(await page.locator(MISSING).count()).toBe(2);
  });

  it("boot when the runtime arrives late; the message goes with the fallback", async () => {
    const page = session.page;
    await page.evaluate((source) => {
      const d = (globalThis as any).document;
      const script = d.createElement("script");
      script.textContent = source;
      d.body.append(script);
    }, runtimeSource());
    await page.clock.resume();
    for (const panel of PANELS) {
      await page.waitForFunction(([sel, attr]) => (globalThis as any).document.querySelector(sel)?.getAttribute(attr) === "ready", [panel, STATUS_ATTRIBUTE] as const, {
        timeout: WIDGET_WAIT_MS,
      });
    }
    expect(await page.locator(`${MISSING}:visible`).count()).toBe(0);
    expect(session.consoleErrors).toEqual([]);
    expect(session.refusedRequests).toEqual([]);
  });
});
