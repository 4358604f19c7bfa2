/**
 * The frequency-range control of a budget widget in the page: two fields for the ends of the
 * grid. A range that checks is reported to the widget, which recomputes its curves and
 * headline on it; one that does not is refused beside the fields and changes nothing.
 */
import { QuietframeError } from "../../../src/index";
import { frequencyRange, type GridText } from "../controls/frequency-range";
import { el } from "./dom";

export class FrequencyRangeView {
  readonly element: HTMLElement;
  private readonly from: HTMLInputElement;
  private readonly to: HTMLInputElement;
  private readonly message = el("span", { class: "qf-exact-error", role: "alert" });

  constructor(grid: GridText, idPrefix: string, onRange: (grid: GridText) => void) {
    const field = (id: string, label: string): HTMLInputElement =>
      el("input", { id, type: "text", class: "qf-exact", spellcheck: "false", autocomplete: "off", "aria-label": label, "data-range": label.startsWith("lowest") ? "from" : "to" });
    this.from = field(`${idPrefix}-from`, "lowest frequency");
    this.to = field(`${idPrefix}-to`, "highest frequency");
    this.show(grid);
    const changed = (): void => {
      let checked: GridText;
      try {
        checked = frequencyRange(this.from.value, this.to.value, grid.points);
      } catch (e) {
        if (!(e instanceof QuietframeError)) throw e;
        this.message.textContent = e.message;
        for (const input of [this.from, this.to]) input.setAttribute("aria-invalid", "true");
        return;
      }
      this.message.textContent = "";
      for (const input of [this.from, this.to]) input.removeAttribute("aria-invalid");
      onRange(checked);
    };
    this.from.addEventListener("change", changed);
    this.to.addEventListener("change", changed);
    this.element = el("div", { class: "qf-controls qf-frequency-range" }, [
      el("label", { for: this.from.id }, ["frequency range [Hz]"]),
      el("span", {}, [this.from, " to ", this.to]),
      el("span", { class: "qf-control-value" }, [`${grid.points} points`, this.message]),
    ]);
  }

  /** Puts a grid into the fields (load, reset) without reporting it. */
  show(grid: GridText): void {
    this.from.value = grid.from;
    this.to.value = grid.to;
    this.message.textContent = "";
  }
}
