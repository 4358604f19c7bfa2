/**
 * Hides the PNG output a kernel-free notebook output sends after its page, once the page's
 * widgets are live, so a trusted notebook shows the live page only. An untrusted notebook runs
 * no script and keeps the PNG; so do pages whose widget failed to start.
 *
 * The PNG is found from the page's wrapper (core/page/png-output.ts): the next element after
 * the wrapper or one of its nearest ancestors (the front-ends put each output in an element of
 * its own, siblings in the cell's output area), holding exactly one image whose picture has
 * the key the wrapper names. Anything else, a user's outputs included, is never touched. The
 * PNG output may arrive after the page booted (a separate message, or later in a page being
 * parsed), so wrappers wait, watched by one observer, until their PNG shows up.
 */
import { STATUS_ATTRIBUTE, VERSION_ATTRIBUTE } from "../page/names";
import { HIDDEN_PNG_ATTRIBUTE, PAGE_OUTPUT_CLASS, PNG_DATA_URL_PREFIX, PNG_KEY_ATTRIBUTE, pngOutputKey } from "../page/png-output";

/** Ancestors of the wrapper whose next sibling may be the PNG output (JupyterLab, Notebook 7, classic, nbconvert need at most 3). */
const MAX_LEVELS = 4;
/** Widget states in which the page is live; "booting" and "error" keep the PNG. */
const LIVE_STATUSES = new Set(["ready", "running"]);

const waiting = new Set<Element>();
const seenInDocument = new WeakSet<Element>();
let observer: MutationObserver | undefined;

/** Starts watching the page outputs under `root`; each hides its PNG output once its widgets are live. */
export function hidePngOutputsOnceLive(root: ParentNode): void {
  for (const wrapper of root.querySelectorAll(`.${PAGE_OUTPUT_CLASS}[${PNG_KEY_ATTRIBUTE}]`)) waiting.add(wrapper);
  settle();
}

function settle(): void {
  for (const wrapper of waiting) {
    if (!wrapper.isConnected) {
      // Gone for good once it had been in the document (its output was cleared or re-rendered).
      if (seenInDocument.has(wrapper)) waiting.delete(wrapper);
      continue;
    }
    seenInDocument.add(wrapper);
    if (!widgetsLive(wrapper)) continue;
    const png = pngOutputAfter(wrapper, wrapper.getAttribute(PNG_KEY_ATTRIBUTE) ?? "");
    if (!png) continue;
    png.style.display = "none";
    png.setAttribute(HIDDEN_PNG_ATTRIBUTE, "");
    waiting.delete(wrapper);
  }
  watch();
}

function watch(): void {
  if (waiting.size === 0) {
    observer?.disconnect();
    observer = undefined;
    return;
  }
  if (observer) return;
  observer = new MutationObserver(settle);
  observer.observe(document.documentElement, { childList: true, subtree: true, attributes: true, attributeFilter: [STATUS_ATTRIBUTE] });
}

function widgetsLive(wrapper: Element): boolean {
  const widgets = wrapper.querySelectorAll(`[${VERSION_ATTRIBUTE}]`);
  return widgets.length > 0 && Array.from(widgets).every((w) => LIVE_STATUSES.has(w.getAttribute(STATUS_ATTRIBUTE) ?? ""));
}

function pngOutputAfter(wrapper: Element, key: string): HTMLElement | undefined {
  let element: Element | null = wrapper;
  for (let level = 0; element && level < MAX_LEVELS; level++, element = element.parentElement) {
    const next = element.nextElementSibling;
    if (next instanceof HTMLElement && isPngOutput(next, key)) return next;
  }
  return undefined;
}

function isPngOutput(element: HTMLElement, key: string): boolean {
  const images = element.querySelectorAll("img");
  if (images.length !== 1 || element.querySelector(`[${VERSION_ATTRIBUTE}], svg, canvas, iframe, video`)) return false;
  const src = images[0].getAttribute("src") ?? "";
  return src.startsWith(PNG_DATA_URL_PREFIX) && pngOutputKey(src.slice(PNG_DATA_URL_PREFIX.length)) === key;
}
