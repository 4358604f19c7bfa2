/**
 * Toolbar actions of the browser views: downloads, copying to the clipboard, file names, buttons
 * that report failures.
 */
import { messageOf } from "./boot";
import { el } from "./dom";

/** Saves text or a URL as a file through a temporary link (works offline and from file://). */
export function downloadText(text: string, filename: string, mime: string): void {
  const url = URL.createObjectURL(new Blob([text], { type: mime }));
  downloadUrl(url, filename);
  // Revoke later: some browsers start reading the blob only after the click returns.
  setTimeout(() => URL.revokeObjectURL(url), 30_000);
}

export function downloadUrl(url: string, filename: string): void {
  const link = el("a", { href: url, download: filename, hidden: "" });
  document.body.append(link);
  link.click();
  link.remove();
}

/**
 * Copies text to the clipboard. Where the clipboard API is refused (insecure context,
 * sandboxed output frame), the text is shown selected in a textarea for the reader to copy.
 */
export async function copyText(text: string, fallbackHost: HTMLElement): Promise<"copied" | "shown"> {
  try {
    if (navigator.clipboard && window.isSecureContext) {
      await navigator.clipboard.writeText(text);
      return "copied";
    }
  } catch {
    // Fall through to the textarea.
  }
  const area = el("textarea", { class: "qf-copy-fallback", readonly: "", "aria-label": "state JSON to copy" });
  area.value = text;
  fallbackHost.replaceChildren(el("p", {}, ["Copy the state below (Ctrl+C / ⌘C):"]), area);
  fallbackHost.hidden = false;
  area.focus();
  area.select();
  return "shown";
}

/** A file name from a title: letters, digits and dashes only. */
export function fileStem(title: string): string {
  const stem = title
    .normalize("NFKD")
    .replace(/[^A-Za-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .toLowerCase()
    .slice(0, 48)
    .replace(/-+$/, "");
  return stem ? `quietframe-${stem}` : "quietframe";
}

/** A toolbar button whose action may be async; a failure is shown in `alert` under the button's label. */
export function actionButton(label: string, title: string, action: () => unknown, alert: HTMLElement): HTMLButtonElement {
  const b = el("button", { type: "button", title }, [label]);
  b.addEventListener("click", () => {
    Promise.resolve()
      .then(action)
      .catch((e: unknown) => {
        alert.textContent = `${label} failed: ${messageOf(e)}`;
        alert.hidden = false;
      });
  });
  return b;
}
