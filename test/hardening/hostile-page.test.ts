import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../src/cli/run";
import type { SetupDescription } from "../../src/setup/format";
import { createExplorerState } from "../../widgets/explorer/model";
import { FINGERPRINT_ATTRIBUTE } from "../../widgets/core/page/names";
import { stateDocumentText } from "../../widgets/explorer/document";
import { MAX_STATE_TEXT_BYTES } from "../../widgets/core/state/state-text";
import type { ExplorerState } from "../../widgets/explorer/format";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "../browser/helpers/chromium";
import { expectPageMatchesEngine, pageState, waitAllReady, WIDGET } from "../browser/helpers/widgets";
import { HOSTILE_PAYLOADS } from "./hostile-payloads";

/**
 * A standalone page rendered by the CLI from a state whose title, set-up name, description
 * and control labels carry every hostile payload, opened in Debian's Chromium: no payload
 * runs (each would set window.__pwned or open a dialog), the page has exactly the elements
 * of the same page with harmless text, the text shows literally, and the widget computes
 * what the engine computes in Node. The page's loader panel then gets hostile pasted states.
 */
const ROOT = join(__dirname, "..", "..");
const squeezed = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;
const HOSTILE = HOSTILE_PAYLOADS.join(" ");

function stateWith(text: string): ExplorerState {
  return createExplorerState(
    { ...structuredClone(squeezed), name: text, description: text },
    {
      controls: [
        { target: "squeezer.squeezing", label: `${text} (squeezing)`, min: "-15 dB", max: "0 dB", scale: "linear" },
        { target: "detector.efficiency", label: `${text} (efficiency)`, min: 0.5, max: 1 },
      ],
      settings: { title: text, grid: { from: "1.1 MHz", to: "1.3 MHz", points: 200 }, spectralDensity: "amplitude" },
    },
  );
}

let dir: string;
let session: BrowserSession;
const dialogs: string[] = [];
const requests: string[] = [];

async function renderPage(name: string, state: ExplorerState): Promise<string> {
  const stateFile = join(dir, `${name}.json`);
  writeFileSync(stateFile, stateDocumentText(state));
  let err = "";
  const out = join(dir, `${name}.html`);
  const code = await runCliAsync(["render", stateFile, "-o", out], { out: () => undefined, err: (s) => (err += s) });
  expect(err).toBe("");
  expect(code).toBe(0);
  return pathToFileURL(out).href;
}

/** Element names in document order, every on* attribute and every script URL in the live DOM. */
async function domInventory(): Promise<{ tags: string[]; active: string[] }> {
  return session.page.evaluate(() => {
    const all = Array.from((globalThis as any).document.querySelectorAll("*")) as any[];
    const active: string[] = [];
    for (const e of all) {
      for (const a of Array.from(e.attributes) as any[]) {
        if (/^on/i.test(a.name) || /^\s*(javascript|vbscript):/i.test(a.value)) active.push(`${e.tagName}.${a.name}`);
      }
    }
    return { tags: all.map((e) => e.tagName.toLowerCase()), active };
  });
}

async function pwned(): Promise<unknown> {
  return session.page.evaluate(() => (globalThis as any).__pwned ?? null);
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-hostile-"));
  session = await openBrowser({ allow: LOCAL_ONLY });
  session.page.on("dialog", (d) => dialogs.push(d.message()));
  session.page.on("request", (r) => requests.push(r.url()));
}, 120_000);

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("a standalone page from a hostile state file", () => {
  let harmless: { tags: string[]; active: string[] };

  beforeAll(async () => {
    await session.page.goto(await renderPage("harmless", stateWith("plain words")));
    await waitAllReady(session.page, 1);
    harmless = await domInventory();
    await session.page.goto(await renderPage("hostile", stateWith(HOSTILE)));
    await waitAllReady(session.page, 1);
  }, 180_000);

  it("runs none of the payloads: no __pwned, no dialog, no request for the image, no page error", async () => {
    expect(await pwned()).toBeNull();
    expect(dialogs).toEqual([]);
    expect(requests.filter((u) => /\/x$/.test(u) || /^javascript:/.test(u))).toEqual([]);
    expect(session.consoleErrors).toEqual([]);
    expect(session.refusedRequests).toEqual([]);
  });

  it("has exactly the elements of the same page with harmless text, and no active attribute", async () => {
    const hostile = await domInventory();
    expect(hostile.active).toEqual([]);
    expect(hostile.tags).toEqual(harmless.tags);
  });

  it("shows the text literally: page heading, control labels and the state the widget holds", async () => {
    expect(await session.page.locator("h1").textContent()).toBe(HOSTILE);
    const labels = await session.page.locator(`${WIDGET} label`).allTextContents();
    // Each label is the control's own text, literally, followed by its unit where it has one.
    expect(labels).toContain(`${HOSTILE} (squeezing) [dB]`);
    expect(labels.filter((l) => l === `${HOSTILE} (efficiency)` || (l.startsWith(`${HOSTILE} (efficiency) [`) && l.endsWith("]")))).toHaveLength(1);
    const state = await pageState(session.page, 0);
    expect(state.settings.title).toBe(HOSTILE);
    expect(state.setup.name).toBe(HOSTILE);
    await expectPageMatchesEngine(session.page, 0);
  });

  describe("the loader panel", () => {
    async function paste(text: string): Promise<string> {
      await session.page.locator(".qf-loader-text").fill(text);
      await session.page.locator(".qf-loader-load").click();
      return (await session.page.locator(".qf-loader-alert").textContent()) ?? "";
    }

    it("refuses a state with prototype keys in a control definition, names the path, keeps the widget and Object.prototype", async () => {
      const before = await session.page.locator(WIDGET).first().getAttribute(FINGERPRINT_ATTRIBUTE);
      const doc = JSON.parse(stateDocumentText(stateWith("proto")));
      const model = Object.values(doc.state)[0] as { state: { controls: Record<string, unknown>[] } };
      const text = JSON.stringify(doc).replace(
        JSON.stringify(model.state.controls[0]).slice(0, -1),
        `${JSON.stringify(model.state.controls[0]).slice(0, -1)},"__proto__":{"polluted":"yes"},"constructor":{"prototype":{"polluted":"yes"}}`,
      );
      expect(text).toContain('"__proto__":{"polluted":"yes"}');
      const alert = await paste(text);
      expect(alert).toMatch(/^Not loaded: /);
      expect(alert).toMatch(/controls\[0\]\.(__proto__|constructor)/);
      expect(await session.page.evaluate(() => ({}) as any).then((o: any) => o.polluted ?? null)).toBeNull();
      expect(await session.page.evaluate(() => (Object.prototype as any).polluted ?? null)).toBeNull();
      expect(await session.page.locator(WIDGET).first().getAttribute(FINGERPRINT_ATTRIBUTE)).toBe(before);
    });

    it("refuses text over the size limit, saying so, and keeps the widget", async () => {
      const before = await session.page.locator(WIDGET).first().getAttribute(FINGERPRINT_ATTRIBUTE);
      // Padded in the page: typing 5 MiB into the text area would only measure the typing.
      await session.page.locator(".qf-loader-text").evaluate((t: any, [base, n]) => (t.value = base + " ".repeat(n)), [stateDocumentText(stateWith("big")), MAX_STATE_TEXT_BYTES] as const);
      await session.page.locator(".qf-loader-load").click();
      const alert = (await session.page.locator(".qf-loader-alert").textContent()) ?? "";
      expect(alert).toContain(`more than the ${MAX_STATE_TEXT_BYTES}-byte limit`);
      expect(await session.page.locator(WIDGET).first().getAttribute(FINGERPRINT_ATTRIBUTE)).toBe(before);
    }, 120_000);

    it("refuses a state whose value is invalid, showing the payload inside it as text, and keeps the widget", async () => {
      const before = await session.page.locator(WIDGET).first().getAttribute(FINGERPRINT_ATTRIBUTE);
      const doc = JSON.parse(stateDocumentText(stateWith("value")));
      const model = Object.values(doc.state)[0] as { state: { values: Record<string, unknown> } };
      model.state.values["detector.efficiency"] = HOSTILE_PAYLOADS[1];
      const alert = await paste(JSON.stringify(doc));
      expect(alert).toMatch(/^Not loaded: /);
      // The value is quoted as JSON in the message, so its inner quotes carry backslashes.
      expect(alert).toContain(JSON.stringify(HOSTILE_PAYLOADS[1]));
      expect(await session.page.locator(".qf-loader-alert img").count()).toBe(0);
      expect(await pwned()).toBeNull();
      expect(await session.page.locator(WIDGET).first().getAttribute(FINGERPRINT_ATTRIBUTE)).toBe(before);
    });

    it("loads a valid hostile state in place of the widget; nothing runs and the title is text", async () => {
      const alert = await paste(stateDocumentText(stateWith(HOSTILE_PAYLOADS[3])));
      expect(alert).toBe("");
      await waitAllReady(session.page, 1);
      const state = await pageState(session.page, 0);
      expect(state.settings.title).toBe(HOSTILE_PAYLOADS[3]);
      expect(await session.page.locator(`${WIDGET} foreignObject, ${WIDGET} iframe, ${WIDGET} img[src="x"]`).count()).toBe(0);
      expect((await domInventory()).active).toEqual([]);
      expect(await pwned()).toBeNull();
      expect(dialogs).toEqual([]);
      await expectPageMatchesEngine(session.page, 0);
    });
  });
});
