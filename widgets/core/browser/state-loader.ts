/** The standalone page's panel that opens another saved state, of any widget kind, in place of the page's widget. */
import { QuietframeError, QuietframeErrors } from "../../../src/index";
import type { BootContext } from "../kind";
import { LOADER_CLASS } from "../page/names";
import { el } from "./dom";

/**
 * The "open another state" panel: pasted text or a chosen file is read by the registry's loader
 * (any kind: explorer, trajectory, entangled panel, tolerance map, design answer) and replaces
 * the widget in the panel's slot. The text only ever becomes a JSON script's content and then
 * parsed data; it is never markup or code.
 */
export function bootStateLoaders(root: ParentNode, context: BootContext): void {
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
        const opened = context.open(input, source);
        const script = el("script", { type: "application/json", class: opened.stateScriptClass });
        script.textContent = opened.stateText;
        context.release(slot);
        slot.replaceChildren(el("div", { class: opened.className }, [script]));
        alert.hidden = true;
        alert.textContent = "";
        context.boot(slot);
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
