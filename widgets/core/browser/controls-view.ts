/**
 * The controls (sliders, number fields, dropdowns) of a widget state in the page, as explorers
 * and trajectory widgets show them.
 */
import { parseQuantity, QuietframeError, type QuantityKind } from "../../../src/index";
import { exactValue, labelWithUnit, sliderPosition, sliderValue, typedValue, writeValue, type ResolvedControl } from "../controls/setup-controls";
import { el } from "./dom";

export type ValueListener = (target: string, value: string | number) => void;

interface ControlRow {
  readonly control: ResolvedControl;
  readonly input: HTMLInputElement | HTMLSelectElement;
  /** What follows the input: the value shown, an exact-value field and its message. */
  readonly after: readonly HTMLElement[];
  show(value: string | number): void;
}

/**
 * The widget's controls, built from resolved controls. A control reports the value as a
 * set-up writes it ("6.5 K"); checking and computing happen in the model, so the browser
 * accepts exactly what the kernel and the CLI accept.
 */
export class ControlsView {
  readonly element: HTMLElement;
  private readonly rows = new Map<string, ControlRow>();

  constructor(controls: readonly ResolvedControl[], values: Readonly<Record<string, string | number>>, idPrefix: string, onValue: ValueListener) {
    this.element = el("div", { class: "qf-controls" });
    controls.forEach((c, i) => {
      const id = `${idPrefix}-c${i}`;
      const row = buildRow(c, id, onValue);
      row.show(values[c.target]);
      this.rows.set(c.target, row);
      this.element.append(el("label", { for: id, title: c.target }, [labelWithUnit(c)]), row.input, el("span", { class: "qf-control-value" }, [...row.after]));
    });
  }

  /** Puts values into the controls (reset, load) without reporting them back. */
  show(values: Readonly<Record<string, string | number>>): void {
    for (const [target, row] of this.rows) if (target in values) row.show(values[target]);
  }

  /** Marks which control holds the value that was refused (or none). */
  markInvalid(targets: readonly string[]): void {
    for (const [target, row] of this.rows) {
      if (targets.includes(target)) row.input.setAttribute("aria-invalid", "true");
      else row.input.removeAttribute("aria-invalid");
    }
  }

  input(target: string): HTMLInputElement | HTMLSelectElement | undefined {
    return this.rows.get(target)?.input;
  }
}

function buildRow(c: ResolvedControl, id: string, onValue: ValueListener): ControlRow {
  if (c.control === "slider") return sliderRow(c, id, onValue);
  if (c.control === "number") return numberRow(c, id, onValue);
  return dropdownRow(c, id, onValue);
}

function sliderRow(c: ResolvedControl, id: string, onValue: ValueListener): ControlRow {
  const input = el("input", { id, type: "range", min: "0", max: String(c.steps), step: "1", "data-target": c.target });
  const shown = el("output", { for: id });
  const display = (text: string): void => {
    shown.textContent = text;
    input.setAttribute("aria-valuetext", text);
  };
  // A field for an exact value: checked here like any value of the control, so a refused
  // value says why (value, unit, range) and changes nothing.
  const exact = el("input", { type: "text", class: "qf-exact", inputmode: "decimal", spellcheck: "false", autocomplete: "off", "aria-label": `exact value of ${c.label}`, placeholder: "exact value" });
  const message = el("span", { class: "qf-exact-error", role: "alert" });
  const refuse = (text: string): void => {
    message.textContent = text;
    if (text) exact.setAttribute("aria-invalid", "true");
    else exact.removeAttribute("aria-invalid");
  };
  input.addEventListener("input", () => {
    const written = writeValue(c, sliderValue(c, Number(input.value)));
    display(written);
    refuse("");
    onValue(c.target, written);
  });
  exact.addEventListener("change", () => {
    if (exact.value.trim() === "") return refuse("");
    let checked: { written: string; si: number };
    try {
      checked = exactValue(c, exact.value);
    } catch (e) {
      if (e instanceof QuietframeError) return refuse(e.message);
      throw e;
    }
    refuse("");
    input.value = String(sliderPosition(c, checked.si));
    display(checked.written);
    onValue(c.target, checked.written);
  });
  return {
    control: c,
    input,
    after: [shown, exact, message],
    show(value) {
      // A value between slider positions is shown as written and kept until the slider moves.
      const si = safeParse(value, c.kind as QuantityKind);
      if (si !== undefined) input.value = String(sliderPosition(c, si));
      display(typeof value === "number" ? writeValue(c, value) : value);
    },
  };
}

function numberRow(c: ResolvedControl, id: string, onValue: ValueListener): ControlRow {
  const input = el("input", { id, type: "text", inputmode: "decimal", spellcheck: "false", autocomplete: "off", "data-target": c.target });
  // On change (Enter or leaving the field), not on every key: half-typed numbers are not values.
  // A bare number is taken in the unit shown beside the field.
  input.addEventListener("change", () => onValue(c.target, typedValue(c, input.value)));
  return {
    control: c,
    input,
    after: [el("span", { class: "qf-unit" }, [c.unit])],
    show(value) {
      input.value = String(value);
    },
  };
}

function dropdownRow(c: ResolvedControl, id: string, onValue: ValueListener): ControlRow {
  const choices = c.choices ?? [];
  const input = el(
    "select",
    { id, "data-target": c.target },
    choices.map((choice, k) => el("option", { value: String(k) }, [String(choice)])),
  );
  input.addEventListener("change", () => onValue(c.target, choices[Number(input.value)]));
  return {
    control: c,
    input,
    after: [el("span", { class: "qf-unit" }, [""])],
    show(value) {
      const k = choices.findIndex((choice) => sameChoice(c, choice, value));
      input.value = String(Math.max(0, k));
    },
  };
}

function sameChoice(c: ResolvedControl, choice: string | number, value: string | number): boolean {
  if (String(choice) === String(value)) return true;
  if (c.kind === "choice") return false;
  const a = safeParse(choice, c.kind);
  return a !== undefined && a === safeParse(value, c.kind);
}

function safeParse(value: unknown, kind: QuantityKind): number | undefined {
  try {
    return parseQuantity(value, kind, "value");
  } catch {
    return undefined;
  }
}
