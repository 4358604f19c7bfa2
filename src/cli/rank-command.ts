import { parseOptions } from "./options";
import { rankSteps, runInSlices, runToEnd, shownFigure, type Ranking } from "../design";
import type { CliIo } from "./io";
import { DESIGN_OPTIONS, figureOption, formatOption, gridOption, readSetupDescription, stepsWithOptionNames, wholeOption } from "./design-args";
import { untilInterrupted } from "./stop-on-interrupt";
import { resultJson, textTable } from "./text-table";

/** `quietframe rank`: the parameters of a set-up ranked by what they do for a figure of merit. */
export function rankCommand(args: string[], io: CliIo): number {
  const request = rankRequest(args);
  io.out(request.print(runToEnd(request.steps())));
  return 0;
}

/** `quietframe rank` as the binary runs it: a parameter at a time, Ctrl-C stops it between parameters (exit status 130). */
export async function rankCommandAsync(args: string[], io: CliIo): Promise<number> {
  const request = rankRequest(args);
  const ranking = await untilInterrupted((signal) => runInSlices(request.steps(signal)));
  io.out(request.print(ranking));
  return 0;
}

function rankRequest(args: string[]): { steps(signal?: AbortSignal): Generator<unknown, Ranking>; print(ranking: Ranking): string } {
  const { values, positionals } = parseOptions("rank", args, { ...DESIGN_OPTIONS, param: { type: "string", multiple: true }, scan: { type: "string" } });
  const format = formatOption(values.format);
  const { description } = readSetupDescription(positionals);
  const options = { parameters: values.param, grid: gridOption(description, values), scanPoints: wholeOption(values.scan, "--scan") };
  const figure = figureOption(values.figure);
  const names = { "options.parameters": "--param", "options.scanPoints": "--scan", figure: "--figure" };
  return {
    steps: (signal) => stepsWithOptionNames(names, rankSteps(description, figure, { ...options, signal })),
    print: (ranking) => (format === "json" ? resultJson(ranking) : rankingText(ranking)),
  };
}

export function rankingText(r: Ranking): string {
  const dB = (x: number | null, digits = 3): string => (x === null ? "–" : `${x >= 0 ? "+" : ""}${x.toFixed(digits)}`);
  const rows = r.parameters.map((p, i) => [
    String(i + 1),
    p.target,
    p.shown,
    dB(p.gainPer1Percent, 4),
    p.gainPer1PercentError === null ? "–" : p.gainPer1PercentError.toExponential(1),
    dB(p.gainFor10Percent),
    p.helps,
    p.bound ? `${p.bound.inclusive ? "" : "(open) "}${p.bound.shown}` : "none",
    p.best ? p.best.shown : "–",
    p.best ? dB(p.best.gainDb) : "–",
    p.best ? p.best.at : "–",
  ]);
  const notes = r.parameters.filter((p) => p.message).map((p) => `note: ${p.target}: ${p.message}\n`);
  return (
    `${r.figure.label}: ${shownFigure(r.figure, r.current)} now; gains in dB, positive = better${r.figure.better === "lower" ? " (lower noise)" : ""}\n\n` +
    textTable(["#", "parameter", "value", "dB per +1 %", "error", "dB for 10 %", "helps", "bound that way", "best alone at", "gain dB", "where"], rows, [
      true,
      false,
      true,
      true,
      true,
      true,
      false,
      false,
      true,
      true,
      false,
    ]) +
    notes.join("") +
    `(${r.evaluations} evaluations; "dB for 10 %": computed with the value moved 10 % the helping way, stopped at the bound)\n`
  );
}
