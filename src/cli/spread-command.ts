import { parseOptions } from "./options";
import { runInSlices, runToEnd, shownFigure, spreadSteps, type SpreadResult, type UncertaintySpec } from "../design";
import { spreadAnalysisOnThreads } from "../design/spread-threads";
import { QuietframeError } from "../errors";
import type { CliIo } from "./io";
import { DESIGN_OPTIONS, figureOption, formatOption, gridOption, readSetupDescription, splitAssignment, stepsWithOptionNames, wholeOption, withOptionNames, countOption } from "./design-args";
import { untilInterrupted } from "./stop-on-interrupt";
import { resultJson, textTable } from "./text-table";

/** `quietframe spread`: what uncertain parameters do to a figure (Monte Carlo beside first-order propagation). */
export function spreadCommand(args: string[], io: CliIo): number {
  const request = spreadRequest(args);
  if (request.threads > 1) {
    throw new QuietframeError({
      path: "--threads",
      value: request.threads,
      problem: "worker threads need the asynchronous runner",
      allowed: "runCliAsync (as the quietframe binary runs commands), or --threads 1",
    });
  }
  io.out(request.print(runToEnd(request.steps())));
  return 0;
}

/**
 * `quietframe spread` as the binary runs it: in this process a block of samples at a time, or
 * with --threads N on N worker threads (the same bits); Ctrl-C stops it between blocks or
 * chunks (exit status 130).
 */
export async function spreadCommandAsync(args: string[], io: CliIo): Promise<number> {
  const request = spreadRequest(args);
  const result = await untilInterrupted((signal) => (request.threads > 1 ? request.onThreads(signal) : runInSlices(request.steps(signal))));
  io.out(request.print(result));
  return 0;
}

interface SpreadRequest {
  /** Worker threads asked for (--threads, default 1: this process). */
  readonly threads: number;
  steps(signal?: AbortSignal): Generator<unknown, SpreadResult>;
  onThreads(signal: AbortSignal): Promise<SpreadResult>;
  print(result: SpreadResult): string;
}

function spreadRequest(args: string[]): SpreadRequest {
  const { values, positionals } = parseOptions("spread", args, {
    ...DESIGN_OPTIONS,
    uncertain: { type: "string", multiple: true },
    samples: { type: "string" },
    seed: { type: "string" },
    target: { type: "string" },
    threads: { type: "string" },
  });
  const threads = values.threads === undefined ? 1 : countOption(values.threads, "--threads", "worker threads");
  const format = formatOption(values.format);
  const { description } = readSetupDescription(positionals);
  if (!values.uncertain?.length) throw new QuietframeError({ path: "--uncertain", problem: "is missing", allowed: 'one or more, e.g. --uncertain "detector.efficiency=95 % ± 2 %"' });
  const uncertain: UncertaintySpec[] = values.uncertain.map((text, i) => {
    const [target, value] = splitAssignment(text);
    if (value === undefined)
      throw new QuietframeError({ path: `--uncertain[${i}]`, value: text, problem: "is not TARGET=VALUE ± SPREAD", allowed: '"detector.efficiency=95 % ± 2 %" or "cell.field=± 3 µT uniform"' });
    return { target, value };
  });
  const target = values.target === undefined ? undefined : /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(values.target.trim()) ? Number(values.target) : values.target;
  const options = { grid: gridOption(description, values), samples: wholeOption(values.samples, "--samples"), seed: wholeOption(values.seed, "--seed"), target, bands: format === "json" };
  const figure = figureOption(values.figure);
  const names = { target: "--target", figure: "--figure", "options.samples": "--samples", "options.seed": "--seed" };
  return {
    threads,
    steps: (signal) => stepsWithOptionNames(names, spreadSteps(description, figure, uncertain, { ...options, signal })),
    // The same checks as the steps, their errors named by the options as the steps name them.
    onThreads: (signal) =>
      spreadAnalysisOnThreads(description, figure, uncertain, { ...options, workers: threads, signal }).catch((e: unknown) =>
        withOptionNames(names, () => {
          throw e;
        }),
      ),
    print: (result) => (format === "json" ? resultJson(result) : spreadText(result)),
  };
}

function spreadText(r: SpreadResult): string {
  const f = (x: number): string => shownFigure(r.figure, x);
  const lines = [
    `${r.figure.label}: ${f(r.nominal)} at the centres; ${r.samples} samples, seed ${r.seed}`,
    ...r.uncertain.map((u) => `  ${u.target}: ${u.shown}${u.truncated ? `, truncated at its bounds by redrawing (${u.redrawn} redrawn)` : ""}`),
    "",
  ];
  const d = r.distribution;
  lines.push(
    textTable(
      ["", "median", "5 %", "95 %", "mean", "deviation"],
      [
        ["Monte Carlo", f(d.median), f(d.p5), f(d.p95), f(d.mean), d.deviation.toPrecision(4)],
        ["first order", f(r.linear.mean), "", "", f(r.linear.mean), r.linear.deviation.toPrecision(4)],
      ],
      [false, true, true, true, true, true],
    ),
  );
  lines.push(r.linear.note);
  for (const t of r.linear.terms) lines.push(`  ${t.target}: ∂F/∂p = ${t.derivative.toPrecision(5)} per SI unit, share of the variance ${(100 * t.share).toFixed(1)} %`);
  if (r.probability) lines.push(`probability of ${f(r.probability.target)} or better: ${(100 * r.probability.reached).toFixed(1)} % ± ${(100 * r.probability.standardError).toFixed(1)} %`);
  if (r.failed.unstable + r.failed.invalid > 0) lines.push(`samples without a value: ${r.failed.unstable} unstable, ${r.failed.invalid} refused; e.g. ${r.failed.message}`);
  lines.push(`(${r.evaluations} evaluations; noise bands over frequency with --format json)`);
  return lines.join("\n") + "\n";
}
