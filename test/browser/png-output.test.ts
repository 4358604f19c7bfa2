import { buildSync } from "esbuild";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { STATUS_ATTRIBUTE, VERSION_ATTRIBUTE } from "../../widgets/core/page/names";
import { HIDDEN_PNG_ATTRIBUTE, PAGE_OUTPUT_CLASS, PNG_DATA_URL_PREFIX, PNG_KEY_ATTRIBUTE, pngOutputKey } from "../../widgets/core/page/png-output";
import { splitKernelFreeOutput } from "../../widgets/core/notebook/figure-output";
import { renderPng } from "../../widgets/core/render/static";
import { explorer, type SetupDescription } from "../../widgets/notebook";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";

/**
 * The runtime's hiding of a kernel-free output's PNG output (widgets/core/browser/png-output.ts),
 * in Chromium, on output areas laid out as JupyterLab and Notebook 7 lay them out (an element
 * per output with a prompt and the rendered output, siblings in the cell's output area) and
 * as the classic notebook does. The real front-ends are in jupyter-kernel-free.test.ts; here
 * the cases they never produce on their own: a user's image between the page and its PNG, a
 * PNG arriving after the page booted, a widget that failed to start.
 */
const ROOT = join(__dirname, "..", "..");
const svg = (fill: string) => `<svg xmlns="http://www.w3.org/2000/svg" width="4" height="3"><rect width="4" height="3" fill="${fill}"/></svg>`;
const OURS = Buffer.from(renderPng(svg("#123456"), { scale: 1 })).toString("base64");
const USERS = Buffer.from(renderPng(svg("#abcdef"), { scale: 1 })).toString("base64");

type Layout = "lab" | "classic";
const CHILD: Record<Layout, { child: string; prompt: string; html: string; image: string }> = {
  lab: { child: "jp-OutputArea-child", prompt: "jp-OutputPrompt", html: "jp-RenderedHTMLCommon jp-OutputArea-output", image: "jp-RenderedImage jp-OutputArea-output" },
  classic: { child: "output_area", prompt: "prompt", html: "output_subarea output_html rendered_html", image: "output_subarea output_png" },
};

/** A page output: the wrapper naming `key`, one widget root with `status`. */
function pageOutput(layout: Layout, id: string, key: string, status: string): string {
  const c = CHILD[layout];
  return `<div class="${c.child}" id="${id}"><div class="${c.prompt}"></div><div class="${c.html}"><div class="${PAGE_OUTPUT_CLASS}" ${PNG_KEY_ATTRIBUTE}="${key}"><div ${VERSION_ATTRIBUTE}="0" ${STATUS_ATTRIBUTE}="${status}"></div></div></div></div>`;
}

/** An image output as the front-end draws image/png. */
function imageOutput(layout: Layout, id: string, base64: string): string {
  const c = CHILD[layout];
  // A notebook may store base64 wrapped in lines; the key must not care.
  return `<div class="${c.child}" id="${id}"><div class="${c.prompt}"></div><div class="${c.image}"><img src="${PNG_DATA_URL_PREFIX}${base64}"></div></div>`;
}

let session: BrowserSession;
let page: Page;

beforeAll(async () => {
  session = await openBrowser({ allow: LOCAL_ONLY });
  page = session.page;
}, 60_000);

afterAll(async () => {
  await session?.close();
});

/** A fresh page with the hiding code (bundled from the sources) and the given output area. */
async function outputArea(html: string): Promise<void> {
  const bundle = buildSync({
    stdin: { contents: `import { hidePngOutputsOnceLive } from "./widgets/core/browser/png-output"; globalThis.hidePngOutputsOnceLive = hidePngOutputsOnceLive;`, resolveDir: ROOT, loader: "ts" },
    bundle: true,
    format: "iife",
    platform: "browser",
    write: false,
  }).outputFiles[0].text;
  await page.setContent(`<!doctype html><body><div class="area">${html}</div></body>`);
  await page.addScriptTag({ content: bundle });
}

async function boot(): Promise<void> {
  await page.evaluate(() => (globalThis as any).hidePngOutputsOnceLive(document));
}

async function setStatus(id: string, status: string): Promise<void> {
  await page.evaluate(([id, attribute, status]) => document.querySelector(`#${id} [${attribute}]`)!.setAttribute(attribute, status), [id, STATUS_ATTRIBUTE, status] as const);
}

/** Which outputs show (by id), once the page's mutation observer has run. */
async function shown(): Promise<string[]> {
  await page.evaluate(() => new Promise((r) => setTimeout(r, 0)));
  return page.evaluate(() =>
    Array.from(document.querySelectorAll(".area > [id]"))
      .filter((e) => (e as HTMLElement).offsetParent !== null)
      .map((e) => e.id),
  );
}

describe.each(["lab", "classic"] as const)("a kernel-free output's PNG output, in the %s layout", (layout) => {
  const key = pngOutputKey(OURS);

  it("shows while the widget boots and hides once it is live, with the user's other image left alone", async () => {
    await outputArea(pageOutput(layout, "page", key, "booting") + imageOutput(layout, "png", OURS) + imageOutput(layout, "user", USERS));
    await boot();
    expect(await shown()).toEqual(["page", "png", "user"]);
    await setStatus("page", "ready");
    expect(await shown()).toEqual(["page", "user"]);
    expect(await page.evaluate((a) => document.querySelector("#png")!.hasAttribute(a), HIDDEN_PNG_ATTRIBUTE)).toBe(true);
  });

  it("hides its PNG output when it arrives after the widget is live (a separate message, a page still being parsed)", async () => {
    await outputArea(pageOutput(layout, "page", key, "ready"));
    await boot();
    await page.evaluate((html) => document.querySelector(".area")!.insertAdjacentHTML("beforeend", html), imageOutput(layout, "png", OURS.replace(/(.{76})/g, "$1\n")));
    expect(await shown()).toEqual(["page"]);
  });

  it("never hides an image that is not its own PNG, nor its PNG when another output stands between them", async () => {
    await outputArea(pageOutput(layout, "page", key, "ready") + imageOutput(layout, "user", USERS) + imageOutput(layout, "png", OURS));
    await boot();
    expect(await shown()).toEqual(["page", "user", "png"]);
  });

  it("keeps the PNG when the widget failed to start", async () => {
    await outputArea(pageOutput(layout, "page", key, "booting") + imageOutput(layout, "png", OURS));
    await boot();
    await setStatus("page", "error");
    expect(await shown()).toEqual(["page", "png"]);
  });

  it("two widgets in one cell each hide their own PNG", async () => {
    const other = Buffer.from(renderPng(svg("#654321"), { scale: 1 })).toString("base64");
    await outputArea(pageOutput(layout, "a", key, "ready") + imageOutput(layout, "a-png", OURS) + pageOutput(layout, "b", pngOutputKey(other), "booting") + imageOutput(layout, "b-png", other));
    await boot();
    expect(await shown()).toEqual(["a", "b", "b-png"]);
    await setStatus("b", "running");
    expect(await shown()).toEqual(["a", "b"]);
  });
});

describe("a page output where styles apply but scripts do not (an export with scripts blocked)", () => {
  /** The page's HTML with its script elements removed, as such a viewer treats it; whether its inline SVG and summary show. */
  async function scriptless(html: string): Promise<{ svgShown: boolean; summaryShown: boolean }> {
    await page.setContent(`<!doctype html><body>${html.replace(/<script\b[\s\S]*?<\/script>/g, "")}</body>`);
    return page.evaluate(() => ({
      svgShown: (document.querySelector(".qf-fallback-svg svg") as SVGElement).checkVisibility(),
      summaryShown: (document.querySelector(".qf-summary") as HTMLElement).checkVisibility(),
    }));
  }

  it("shows the summary and leaves the figure to the PNG output: the inline SVG stays hidden, where without the wrapper it shows", async () => {
    const setup = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane.json"), "utf8")) as SetupDescription;
    const bundle = await explorer(setup).bundle({ includeRuntime: false });
    const { page: output } = splitKernelFreeOutput(bundle, 1);
    expect(await scriptless(String(bundle["text/html"]))).toEqual({ svgShown: true, summaryShown: true });
    expect(await scriptless(String(output["text/html"]))).toEqual({ svgShown: false, summaryShown: true });
  });
});

it("logged no console errors", () => {
  expect(session.consoleErrors).toEqual([]);
});
