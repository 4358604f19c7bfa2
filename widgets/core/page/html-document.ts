/** The complete HTML document every standalone page uses (title, base style). */
import { QUIETFRAME_VERSION } from "../../../src/index";
import { escapeHtml } from "./escape";

/** The page look shared by every standalone quietframe document. */
export const BASE_PAGE_STYLE = `
body{font-family:system-ui,sans-serif;margin:1.5rem auto;max-width:1000px;padding:0 1rem;color:#1d1d1d;background:#fff}
h1{font-size:1.3rem;font-weight:600}
`;

/**
 * A complete HTML document with a title heading; `body` is trusted markup produced by our
 * own writers, the title is escaped here. Pages need no network: nothing refers outside.
 */
export function htmlDocument(title: string, body: readonly string[], extraStyle = ""): string {
  return [
    "<!DOCTYPE html>",
    `<html lang="en">`,
    "<head>",
    `<meta charset="utf-8">`,
    `<meta name="viewport" content="width=device-width, initial-scale=1">`,
    `<meta name="generator" content="quietframe ${escapeHtml(QUIETFRAME_VERSION)}">`,
    `<title>${escapeHtml(title)} — quietframe</title>`,
    `<style>${BASE_PAGE_STYLE}${extraStyle}</style>`,
    "</head>",
    "<body>",
    `<h1>${escapeHtml(title)}</h1>`,
    ...body,
    "</body>",
    "</html>",
    "",
  ].join("\n");
}
