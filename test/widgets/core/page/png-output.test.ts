import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { pngSize, splitKernelFreeOutput } from "../../../../widgets/core/notebook/figure-output";
import { PAGE_OUTPUT_CLASS, PNG_KEY_ATTRIBUTE, pngOutputKey } from "../../../../widgets/core/page/png-output";
import { renderPng } from "../../../../widgets/core/render/static";
import { REPO_ROOT } from "../../../jupyter/env";

/** A 3 × 2 drawing: the PNG's IHDR must say 3 × 2 pixels per unit of scale. */
const SVG = '<svg xmlns="http://www.w3.org/2000/svg" width="3" height="2"><rect width="3" height="2" fill="#000"/></svg>';

describe("pngOutputKey", () => {
  // FNV-1a 32-bit reference values (the FNV authors' published test vectors; from memory):
  // "" → 811c9dc5, "a" → e40c292c, "foobar" → bf9cf968. The key is the length, then the hash.
  it("is the text's length and its FNV-1a hash", () => {
    expect(pngOutputKey("")).toBe("0-811c9dc5");
    expect(pngOutputKey("a")).toBe("1-e40c292c");
    expect(pngOutputKey("foobar")).toBe("6-bf9cf968");
  });

  it("ignores line breaks a notebook writer may put into base64 text", () => {
    expect(pngOutputKey("foo\nbar\n")).toBe(pngOutputKey("foobar"));
  });
});

describe("splitKernelFreeOutput", () => {
  const png = renderPng(SVG, { scale: 2 });
  const bundle = { "text/html": "<p>page</p>", "image/png": png, "text/plain": "A named set-up\nfingerprint: sha256:0" };

  it("reads a PNG's size from its IHDR chunk and refuses other bytes", () => {
    expect(pngSize(png)).toEqual({ width: 6, height: 4 });
    const file = readFileSync(join(REPO_ROOT, "package.json"));
    expect(() => pngSize(new Uint8Array(file))).toThrow(/not a PNG/);
  });

  it("sends the page without the PNG, wrapped with the key of the PNG output that follows it", () => {
    const { page, figure } = splitKernelFreeOutput(bundle, 2);
    const key = pngOutputKey(Buffer.from(png).toString("base64"));
    expect(page["text/plain"]).toBe(bundle["text/plain"]);
    const html = String(page["text/html"]);
    expect(html.startsWith(`<div class="${PAGE_OUTPUT_CLASS}" ${PNG_KEY_ATTRIBUTE}="${key}">`)).toBe(true);
    expect(html.endsWith("<p>page</p></div>")).toBe(true);
    expect(Object.keys(page).sort()).toEqual(["text/html", "text/plain"]);
    expect(figure?.bundle["image/png"]).toBe(png);
    expect(figure?.bundle["text/plain"]).toBe("Figure: A named set-up (static image; the text summary is in the output above)");
  });

  it("sizes the PNG output in chart pixels: the PNG's pixels over its scale", () => {
    expect(splitKernelFreeOutput(bundle, 2).figure?.options.metadata).toEqual({ "image/png": { width: 3, height: 2 } });
    expect(splitKernelFreeOutput({ ...bundle, "image/png": renderPng(SVG, { scale: 1 }) }, 1).figure?.options.metadata).toEqual({ "image/png": { width: 3, height: 2 } });
  });

  it("leaves a bundle without a PNG as it is", () => {
    const plain = { "text/html": "<p>page</p>", "text/plain": "x" };
    expect(splitKernelFreeOutput(plain, 1)).toEqual({ page: plain });
  });
});
