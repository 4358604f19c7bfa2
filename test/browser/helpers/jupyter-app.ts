import { mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Page } from "playwright-core";
import type { NotebookServer } from "./notebook-server";

/**
 * Driving JupyterLab 4 and Notebook 7 pages through their application object (the server
 * runs with expose_app_in_browser): open a notebook, wait for its kernel, run every cell.
 */

/** Generous: a loaded 2-core machine starts a kernel and runs an example notebook well within it. */
export const APP_TIMEOUT_MS = 120_000;

/**
 * Opens `route` of the server ("lab/tree/notebooks/x.ipynb" in JupyterLab,
 * "notebooks/notebooks/x.ipynb" in Notebook 7) and waits until the notebook's file is read.
 */
export async function openNotebook(page: Page, server: NotebookServer, route: string): Promise<void> {
  await page.goto(`${server.origin}/${route}?token=${server.token}`, { waitUntil: "load" });
  await page.waitForFunction(() => (globalThis as any).jupyterapp?.shell?.currentWidget?.context?.isReady === true, undefined, { timeout: APP_TIMEOUT_MS });
}

export async function waitForKernelIdle(page: Page): Promise<void> {
  await page.waitForFunction(() => (globalThis as any).jupyterapp.shell.currentWidget.sessionContext.session?.kernel?.status === "idle", undefined, { timeout: APP_TIMEOUT_MS });
}

/** Runs every cell and waits until none is queued or running. Returns the error outputs' names and values. */
export async function runAll(page: Page): Promise<string[]> {
  await waitForKernelIdle(page);
  await page.evaluate(() => void (globalThis as any).jupyterapp.commands.execute("notebook:run-all-cells"));
  await page.waitForFunction(
    () => {
      const panel = (globalThis as any).jupyterapp.shell.currentWidget;
      const prompts = Array.from(panel.node.querySelectorAll(".jp-InputArea-prompt") as ArrayLike<{ textContent: string }>);
      return panel.sessionContext.session?.kernel?.status === "idle" && prompts.length > 0 && prompts.every((p) => !p.textContent.includes("*"));
    },
    undefined,
    { timeout: APP_TIMEOUT_MS * 2, polling: 500 },
  );
  return page.evaluate(() => {
    const nb = (globalThis as any).jupyterapp.shell.currentWidget.content;
    return nb.widgets.flatMap((cell: any) => (cell.model.type === "code" ? cell.model.outputs.toJSON() : [])).flatMap((o: any) => (o.output_type === "error" ? [`${o.ename}: ${o.evalue}`] : []));
  });
}

/** Where the browser suites keep screenshots: QUIETFRAME_TEST_ARTIFACTS (default: quietframe-test-artifacts/ in the OS temp dir), one folder per suite. */
export async function screenshotArtifact(page: Page, suite: string, name: string): Promise<void> {
  const dir = join(process.env.QUIETFRAME_TEST_ARTIFACTS ?? join(tmpdir(), "quietframe-test-artifacts"), suite);
  mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: join(dir, `${name}.png`), fullPage: false });
}
