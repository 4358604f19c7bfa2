/** The standalone page's panel that opens another explorer state. */
import { QuietframeError, QuietframeErrors } from "../../../src/index";
import { EXPLORER_CLASS, LOADER_CLASS, STATE_SCRIPT_CLASS } from "../names";
import { loadExplorerState, stateDocumentText } from "../document";
import { el } from "../../core/browser/dom";

/**
 * The standalone page's "open another state" panel: pasted text or a chosen file is read
 * as a state document and replaces the widget in the panel's slot. The text only ever
 * becomes a JSON script's content and then parsed data; it is never markup or code.
 */
export function bootLoaders(root: ParentNode, boot: (root: ParentNode) => void, release: (slot: Element) => void): void {
  for (const panel of root.querySelectorAll<HTMLElement>(`.${LOADER_CLASS}:not([data-quietframe-booted])`)) {
    panel.setAttribute("data-quietframe-booted", "");
    const text = panel.querySelector<HTMLTextAreaElement>(".qf-loader-text");
    const file = panel.querySelector<HTMLInputElement>(".qf-loader-file");
    const button = panel.querySelector<HTMLButtonElement>(".qf-loader-load");
    const alert = panel.querySelector<HTMLElement>(".qf-loader-alert");
    const slotId = panel.getAttribute("data-quietframe-slot");
    const slot = slotId ? document.getElementById(slotId) : null;
    if (!text || !button || !alert || !slot) continue;
    const load = (input: string, source: string): void => {
      try {
        // Full check here (shape, set-up, values, one computation), so a bad file is reported
        // in the panel and the current widget stays instead of being replaced by an error.
        const { state } = loadExplorerState(input, source);
        const script = el("script", { type: "application/json", class: STATE_SCRIPT_CLASS });
        script.textContent = stateDocumentText(state);
        release(slot);
        slot.replaceChildren(el("div", { class: EXPLORER_CLASS }, [script]));
        alert.hidden = true;
        alert.textContent = "";
        boot(slot);
      } catch (e) {
        alert.textContent = `Not loaded: ${e instanceof QuietframeError || e instanceof QuietframeErrors ? e.message : String(e)}`;
        alert.hidden = false;
      }
    };
    button.addEventListener("click", () => load(text.value, "pasted state"));
    file?.addEventListener("change", () => {
      const chosen = file.files?.[0];
      if (!chosen) return;
      chosen.text().then(
        (content) => {
          text.value = content;
          load(content, chosen.name);
        },
        (e: unknown) => {
          alert.textContent = `Not loaded: cannot read ${chosen.name} (${String(e)})`;
          alert.hidden = false;
        },
      );
    });
  }
}
