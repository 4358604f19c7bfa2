/** The live explorer's widget host in the running quietframe kernel. */
import { createControl, dropdown, floatLogSlider, floatSlider, text, vbox } from "../../core/comm/controls/controls";
import { displayWidget } from "../../core/comm/display-widget";
import { kernelComms } from "../../core/comm/kernel-comms";
import { WidgetModel } from "../../core/comm/widget-model";
import type { LiveModel, StandardControl, WidgetHost } from "./host";

/**
 * The widget host of the running quietframe kernel, or undefined in any other process
 * (plain tslab, scripts, tests): there the explorer shows its kernel-free output.
 */
export function kernelWidgetHost(): WidgetHost | undefined {
  const comms = kernelComms();
  if (!comms) return undefined;
  return {
    control: (kind, state) => openControl(kind, state),
    vbox: (children) => vbox(children.map(asModel)),
    custom: (state) => new WidgetModel(state),
    display: (model, fallback) => {
      displayWidget(asModel(model), fallback);
    },
    defer: (key, task) => comms.defer(key, task),
  };
}

function openControl(kind: StandardControl, state: Record<string, unknown>): LiveModel {
  const { description, ...rest } = state as { description?: string } & Record<string, unknown>;
  switch (kind) {
    case "FloatSlider":
      return floatSlider({ description, ...rest, style: { description_width: "initial" } });
    case "FloatLogSlider":
      return floatLogSlider({ description, ...rest, style: { description_width: "initial" } });
    case "Dropdown":
      return dropdown({ description, options: rest._options_labels as string[], index: rest.index as number, style: { description_width: "initial" } });
    case "Text":
      return text({ description, ...rest, style: { description_width: "initial" } });
    default:
      return createControl(`${String(kind)}Model`, state);
  }
}

function asModel(model: LiveModel): WidgetModel {
  if (!(model instanceof WidgetModel)) throw new Error("quietframe: a live widget model from another host");
  return model;
}
