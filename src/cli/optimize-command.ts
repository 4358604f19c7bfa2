import { parseOptions } from "./options";
import { optimizeSteps, runInSlices, runToEnd, shownFigure, type OptimizeParameter, type OptimizeResult } from "../design";
import { QuietframeError } from "../errors";
import type { CliIo } from "./io";
import { DESIGN_OPTIONS, figureOption, formatOption, gridOption, rangeOption, readSetupDescription, splitAssignment, stepsWithOptionNames, wholeOption } from "./design-args";
import { untilInterrupted } from "./stop-on-interrupt";
import { resultJson, textTable } from "./text-table";

/** `quietframe optimize`: the best figure over several parameters within their ranges. */
export function optimizeCommand(args: string[], io: CliIo): number {
  const request = optimizeRequest(args);
  io.out(request.print(runToEnd(request.steps())));
  return 0;
}

/** `quietframe optimize` as the binary runs it: a start at a time, Ctrl-C stops it between starts (exit status 130). */
export async function optimizeCommandAsync(args: string[], io: CliIo): Promise<number> {
  const request = optimizeRequest(args);
  const result = await untilInterrupted((signal) => runInSlices(request.steps(signal)));
  io.out(request.print(result));
  return 0;
}

function optimizeRequest(args: string[]): { steps(signal?: AbortSignal): Generator<unknown, OptimizeResult>; print(result: OptimizeResult): string } {
  const { values, positionals } = parseOptions("optimize", args, { ...DESIGN_OPTIONS, param: { type: "string", multiple: true }, starts: { type: "string" }, seed: { type: "string" } });
  const format = formatOption(values.format);
  const { description } = readSetupDescription(positionals);
  if (!values.param?.length) throw new QuietframeError({ path: "--param", problem: "is missing", allowed: 'one or more parameters, e.g. --param "probe.power=1 mW:10 W"' });
  const params: OptimizeParameter[] = values.param.map((text, i) => {
    const [target, range] = splitAssignment(text);
    return range === undefined ? { target } : { target, ...rangeOption(range, `--param[${i}]`) };
  });
  const options = { grid: gridOption(description, values), starts: wholeOption(values.starts, "--starts"), seed: wholeOption(values.seed, "--seed") };
  const figure = figureOption(values.figure);
  const names = { parameters: "--param", figure: "--figure", "options.starts": "--starts", "options.seed": "--seed" };
  return {
    steps: (signal) => stepsWithOptionNames(names, optimizeSteps(description, figure, params, { ...options, signal })),
    print: (result) => (format === "json" ? resultJson(result) : optimizeText(result)),
  };
}

function optimizeText(r: OptimizeResult): string {
  const head = `${r.figure.label}: ${shownFigure(r.figure, r.current)} now\n`;
  const starts = textTable(
    ["start", "status", "figure", "evaluations"],
    r.starts.map((s, i) => [String(i + 1), s.status, Number.isNaN(s.figure) ? "–" : shownFigure(r.figure, s.figure), String(s.evaluations)]),
    [true, false, true, true],
  );
  if (r.status !== "ok" || !r.optimum) return `${head}${r.message}\n\n${starts}`;
  const table = textTable(
    ["parameter", "optimum", "on a bound"],
    r.optimum.values.map((v) => [v.target, v.shown, v.onBound ? `${v.onBound.end} end (${v.onBound.kind})` : "no"]),
    [false, true, false],
  );
  return `${head}best: ${shownFigure(r.figure, r.optimum.figure)}\n\n${table}\n${starts}(${r.evaluations} evaluations)\n`;
}
