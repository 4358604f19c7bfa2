import { parseOptions } from "./options";
import { shownFigure, solveForTarget, targetWindow, type SolveResult, type WindowResult } from "../design";
import { QuietframeError } from "../errors";
import type { CliIo } from "./io";
import { DESIGN_OPTIONS, figureOption, formatOption, gridOption, rangeOption, readSetupDescription, withOptionNames } from "./design-args";
import { resultJson } from "./text-table";

/** `quietframe solve`: the value of a parameter that reaches a target, or the window around its value that keeps it. */
export function solveCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parseOptions("solve", args, {
    ...DESIGN_OPTIONS,
    param: { type: "string" },
    target: { type: "string" },
    window: { type: "boolean", default: false },
    range: { type: "string" },
  });
  const format = formatOption(values.format);
  const { description } = readSetupDescription(positionals);
  if (values.param === undefined) throw new QuietframeError({ path: "--param", problem: "is missing", allowed: 'the parameter to solve for, e.g. --param "detector.efficiency"' });
  if (values.target === undefined) throw new QuietframeError({ path: "--target", problem: "is missing", allowed: 'the figure to reach, e.g. --target "3 dB"' });
  const options = { grid: gridOption(description, values), range: values.range === undefined ? undefined : rangeOption(values.range, "--range") };
  const figure = figureOption(values.figure);
  const target = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(values.target.trim()) ? Number(values.target) : values.target;
  const names = { parameter: "--param", target: "--target", range: "--range", figure: "--figure" };
  const param = values.param;
  if (values.window) {
    const w = withOptionNames(names, () => targetWindow(description, figure, param, target, options));
    io.out(format === "json" ? resultJson(w) : windowText(w));
  } else {
    const s = withOptionNames(names, () => solveForTarget(description, figure, param, target, options));
    io.out(format === "json" ? resultJson(s) : solveText(s));
  }
  return 0;
}

function solveText(s: SolveResult): string {
  const lines = [
    `${s.figure.label}; target ${shownFigure(s.figure, s.target)}`,
    `${s.parameter} now ${s.current.shown}: ${shownFigure(s.figure, s.current.figure)} (${s.current.reaches ? "reaches the target" : "short of the target"})`,
    `searched ${s.range.shown} (low end: ${s.range.loEnd}, high end: ${s.range.hiEnd})`,
    `${s.outcome}: ${s.message}`,
  ];
  if (s.solution) lines.push(`solution: ${s.parameter} = ${s.solution.shown} → ${shownFigure(s.figure, s.solution.figure)}`);
  if (s.best) lines.push(`best reached: ${s.parameter} = ${s.best.shown} → ${shownFigure(s.figure, s.best.figure)} (${s.best.at})`);
  lines.push(`(${s.evaluations} evaluations)`);
  return lines.join("\n") + "\n";
}

function windowText(w: WindowResult): string {
  const lines = [`${w.figure.label}; target ${shownFigure(w.figure, w.target)}`, `${w.parameter} now ${w.current.shown}: ${shownFigure(w.figure, w.current.figure)}`, w.message];
  if (w.low && w.high) {
    lines.push(`low end:  ${w.low.shown} → ${shownFigure(w.figure, w.low.figure)} (${w.low.kind})`);
    lines.push(`high end: ${w.high.shown} → ${shownFigure(w.figure, w.high.figure)} (${w.high.kind})`);
  }
  lines.push(`(${w.evaluations} evaluations)`);
  return lines.join("\n") + "\n";
}
