/**
 * Kernel-live widgets: the quietframe kernel's comms (Jupyter messaging protocol, "Custom
 * Messages"), widget models over the Jupyter widget message protocol 2.1, and the standard
 * controls of @jupyter-widgets/controls. The kernel itself starts from ./launch.
 */
export { Comm, type CommMessage } from "../core/comm/comm";
export { CommManager, type TargetHandler } from "../core/comm/comm-manager";
export { kernelComms } from "../core/comm/kernel-comms";
export { WidgetModel, WIDGET_TARGET, WIDGET_PROTOCOL_VERSION, type Validator, type WidgetModelOptions, type ChangeSource, type WidgetErrorContent } from "../core/comm/widget-model";
export { displayWidget, widgetViewBundle, WIDGET_VIEW_MIME } from "../core/comm/display-widget";
export { CONTROL_TARGET } from "../core/comm/widget-targets";
export { removeBuffers, putBuffers, type BufferPath } from "../core/comm/buffers";
export { ControlModel, createControl, floatSlider, floatLogSlider, dropdown, dropdownLabel, text, html, vbox, hbox } from "../core/comm/controls/controls";
export type { FloatSliderOptions, FloatLogSliderOptions, DropdownOptions, TextOptions, HtmlOptions, BoxOptions, CommonControlOptions } from "../core/comm/controls/controls";
export { KERNEL_NAME, KERNEL_DISPLAY_NAME } from "./kernel-spec";
