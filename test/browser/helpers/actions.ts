import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Locator, Page } from "playwright-core";
import { WIDGET, WIDGET_WAIT_MS } from "./widgets";

/**
 * Pressing a widget's action buttons as a reader would, and collecting what they produce:
 * files the browser really downloads (saved by Playwright into a directory of the test's),
 * and what the controls show on screen.
 */

/** A widget's button by its visible label (exact match, so "SVG" is not "Copy state"). */
export function actionButton(page: Page, index: number, label: string): Locator {
  return page.locator(WIDGET).nth(index).locator(".qf-actions").getByRole("button", { name: label, exact: true });
}

export interface DownloadedFile {
  /** The name the page suggested (the link's `download` attribute). */
  readonly suggestedFilename: string;
  /** Where the test saved it. */
  readonly path: string;
  readonly bytes: Buffer;
  readonly text: string;
}

/**
 * Clicks the button and waits for the download it starts; the file is saved under `dir`
 * with the suggested name. Fails when the click starts no download or the download fails.
 */
export async function downloadFrom(page: Page, button: Locator, dir: string, timeout = WIDGET_WAIT_MS): Promise<DownloadedFile> {
  const [download] = await Promise.all([page.waitForEvent("download", { timeout }), button.click()]);
  const failure = await download.failure();
  if (failure !== null) throw new Error(`the download of ${download.suggestedFilename()} failed: ${failure}`);
  const suggestedFilename = download.suggestedFilename();
  const path = join(dir, suggestedFilename);
  await download.saveAs(path);
  const bytes = readFileSync(path);
  return { suggestedFilename, path, bytes, text: bytes.toString("utf8") };
}

/**
 * What each control of the widget at `index` shows, keyed by target, as text: a slider's
 * value readout, a number field's text, a dropdown's selected option.
 */
export async function shownValues(page: Page, index: number): Promise<Record<string, string>> {
  return page.evaluate(
    ([selector, i]) => {
      const root = (globalThis as any).document.querySelectorAll(selector)[i];
      const out: Record<string, string> = {};
      for (const input of Array.from(root.querySelectorAll(".qf-controls [data-target]")) as any[]) {
        const target = input.getAttribute("data-target");
        if (input.tagName === "SELECT") out[target] = input.selectedOptions[0]?.textContent ?? "";
        else if (input.type === "range") out[target] = root.querySelector(`output[for="${input.id}"]`)?.textContent ?? "";
        else out[target] = input.value;
      }
      return out;
    },
    [WIDGET, index] as const,
  );
}

/** The text of the widget's alert when it is visible, otherwise null. */
export async function visibleAlert(page: Page, index: number): Promise<string | null> {
  const alert = page.locator(WIDGET).nth(index).locator(".qf-alert");
  return (await alert.isVisible()) ? await alert.textContent() : null;
}

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

/** Width and height from a PNG's IHDR chunk; throws when the bytes are not a PNG. */
export function pngSize(bytes: Buffer): { width: number; height: number } {
  if (bytes.length < 33 || !bytes.subarray(0, 8).equals(PNG_SIGNATURE)) throw new Error("not a PNG: wrong signature");
  // The first chunk must be IHDR: length 13, type, then width and height (big-endian).
  if (bytes.readUInt32BE(8) !== 13 || bytes.subarray(12, 16).toString("latin1") !== "IHDR") throw new Error("not a PNG: no IHDR chunk first");
  return { width: bytes.readUInt32BE(16), height: bytes.readUInt32BE(20) };
}

/** The number of slider positions a range control offers (its `max`). */
export async function sliderSteps(page: Page, index: number, target: string): Promise<number> {
  return Number(await page.locator(WIDGET).nth(index).locator(`input[type=range][data-target="${target}"]`).getAttribute("max"));
}
