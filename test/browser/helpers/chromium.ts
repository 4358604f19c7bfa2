import { existsSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";

/** Debian's Chromium (the package scripts/ensure-system-deps.sh installs). */
export const CHROMIUM = process.env.QUIETFRAME_CHROMIUM ?? "/usr/bin/chromium";
export const CHROMIUM_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--disable-dev-shm-usage",
];

export interface BrowserSession {
  readonly context: BrowserContext;
  readonly page: Page;
  /** console.error messages (with " @ <url of the source>" when known) and uncaught page errors, in order, from every page of the context. */
  readonly consoleErrors: string[];
  /** console.warn messages of every page of the context, in the same form. */
  readonly consoleWarnings: string[];
  /** Requests the page tried to make that `allow` refused (each was aborted). */
  readonly refusedRequests: string[];
  close(): Promise<void>;
}

export interface OpenBrowserOptions {
  /** Which request URLs may go through; every other request is recorded and aborted. */
  allow: (url: string) => boolean;
}

/** Local files and in-page data only: nothing may reach a network. */
export const LOCAL_ONLY = (url: string): boolean => /^(file|data|blob):/.test(url);

/**
 * Headless Chromium with a fresh profile of its own (removed on close). Requests are
 * filtered on the page, so a test can assert that nothing outside was even attempted.
 */
export async function openBrowser(options: OpenBrowserOptions): Promise<BrowserSession> {
  if (!existsSync(CHROMIUM)) throw new Error(`Chromium not found at ${CHROMIUM}: install the Debian package "chromium" (scripts/ensure-system-deps.sh does)`);
  const profile = mkdtempSync(join(tmpdir(), "quietframe-chromium-"));
  let context: BrowserContext;
  try {
    context = await chromium.launchPersistentContext(profile, { executablePath: CHROMIUM, headless: true, args: CHROMIUM_ARGS, timeout: 60_000 });
  } catch (e) {
    rmSync(profile, { recursive: true, force: true });
    throw e;
  }
  const consoleErrors: string[] = [];
  const consoleWarnings: string[] = [];
  const refusedRequests: string[] = [];
  const listen = (p: Page): void => {
    p.on("console", (m) => {
      const list = m.type() === "error" ? consoleErrors : m.type() === "warning" ? consoleWarnings : undefined;
      const where = m.location().url;
      list?.push(where ? `${m.text()} @ ${where}` : m.text());
    });
    p.on("pageerror", (e) => consoleErrors.push(`page error: ${e.message}`));
  };
  // The page the browser opened with, and every page opened later (context.newPage()).
  const first = context.pages()[0];
  if (first) listen(first);
  context.on("page", listen);
  const page = first ?? (await context.newPage());
  page.setDefaultTimeout(60_000);
  await page.route("**/*", (route) => {
    const url = route.request().url();
    if (options.allow(url)) return route.continue();
    refusedRequests.push(url);
    return route.abort();
  });
  // A notebook page asks before leaving with unsaved changes; the tests decide for the reader.
  page.on("dialog", (d) => void d.accept().catch(() => undefined));
  return {
    context,
    page,
    consoleErrors,
    consoleWarnings,
    refusedRequests,
    close: async () => {
      try {
        await context.close();
      } finally {
        rmSync(profile, { recursive: true, force: true });
      }
    },
  };
}
