/**
 * The `quietframe` command, runnable in-process (tests call runCli / runCliAsync with their own
 * output sinks): argument parsing, usage text, and dispatch to each command. Problems with the
 * input go to stderr with exit status 1 and nothing on stdout.
 */
import { readFileSync } from "node:fs";
import { QuietframeError, QuietframeErrors } from "../errors";
import type { CliIo } from "./io";
import { describeHeadline, headlineFigures } from "../engine/headline";
import { jsonNumbers, spectralDensityUnit, tableToCsv, tabulateBudget } from "../engine/tabulate";
import { COMPONENT_KINDS } from "../components/registry";
import { evaluate, FALLBACK_GRID, loadSetup, prepare } from "../pipeline";
import { parseJsonText } from "../setup/parse-json";
import { readSpectrumFiles } from "../setup/spectrum-files";
import { QUIETFRAME_VERSION } from "../version";
import { formatQuantity } from "../units/format";
import { gridFromOptions } from "./grid-options";
import { parseOptions } from "./options";
import { reachLines } from "./reach-lines";
import { didYouMean } from "../nearest-name";
import { RENDER_USAGE, renderCommand, reportCommand } from "./render";
import { KERNEL_USAGE, kernelCommand } from "./kernel-install";
import { EXTENSION_USAGE, extensionCommand } from "./extension-install";
import { DESIGN_USAGE } from "./design-args";
import { optimizeCommand, optimizeCommandAsync } from "./optimize-command";
import { rankCommand, rankCommandAsync } from "./rank-command";
import { solveCommand } from "./solve-command";
import { spreadCommand, spreadCommandAsync } from "./spread-command";
import { INTERRUPTED_EXIT, isStoppedRun } from "./stop-on-interrupt";
import { METHODS_USAGE, methodsCommand } from "./methods-command";
import { SWEEP_USAGE, sweepCommand } from "./sweep-command";

export type { CliIo } from "./io";

const USAGE = `quietframe ${QUIETFRAME_VERSION}: linear quantum-noise budgets below the standard quantum limit

usage:
  quietframe eval <setup.json> [--from F] [--to F] [--points N] [--format csv|json] [--psd]
      Signal-referred noise, its budget terms and the reference curves (SQL, zero-point,
      thermal) on a log-spaced grid. Frequencies like "10 Hz" or "2kHz". Amplitude spectral
      densities by default; --psd prints one-sided power spectral densities.
  quietframe summary <setup.json> [--from F] [--to F] [--points N] [--against other.json]
      The headline figures: largest margin below the SQL and where, the band below the SQL,
      and which noise term dominates where. For a strain set-up also the inspiral range and
      horizon (1.4 + 1.4 M☉, SNR 8) and, with --against, the volume gain over another set-up.
  quietframe check <setup.json>
      Validates a set-up and reports its size and stability.
  quietframe types [type]
      Lists component types, or one type's parameters and ports.
${DESIGN_USAGE}${SWEEP_USAGE}${RENDER_USAGE}${METHODS_USAGE}${KERNEL_USAGE}${EXTENSION_USAGE}`;

/** Every command word, for "did you mean" on a mistyped one. */
const COMMANDS = ["eval", "summary", "check", "types", "rank", "solve", "optimize", "spread", "sweep", "render", "report", "methods", "kernel", "help"];

/**
 * Commands that render figures (Vega renders asynchronously), run worker threads and chunks, or
 * run long enough to be stopped with Ctrl-C (rank, optimize, spread); runCliAsync runs them.
 */
const ASYNC_COMMANDS: Readonly<Record<string, (args: string[], io: CliIo) => Promise<number>>> = {
  render: renderCommand,
  report: reportCommand,
  sweep: sweepCommand,
  rank: rankCommandAsync,
  optimize: optimizeCommandAsync,
  spread: spreadCommandAsync,
};

/** Runs any CLI command, including render and report; resolves to the exit code. */
export async function runCliAsync(argv: string[], io: CliIo): Promise<number> {
  const command = argv[0] === undefined ? undefined : ASYNC_COMMANDS[argv[0]];
  if (!command) return runCli(argv, io);
  try {
    return await command(argv.slice(1), io);
  } catch (e) {
    return reportFailure(e, io);
  }
}

/**
 * Runs one synchronous CLI command; returns the exit code. Nothing is printed to out unless
 * the command succeeds. render and report need runCliAsync.
 */
export function runCli(argv: string[], io: CliIo): number {
  try {
    const [command, ...rest] = argv;
    switch (command) {
      case "eval":
        return evalCommand(rest, io);
      case "check":
        return checkCommand(rest, io);
      case "summary":
        return summaryCommand(rest, io);
      case "types":
        return typesCommand(rest, io);
      case "kernel":
        return kernelCommand(rest, io);
      case "extension":
        return extensionCommand(rest, io);
      case "rank":
        return rankCommand(rest, io);
      case "solve":
        return solveCommand(rest, io);
      case "optimize":
        return optimizeCommand(rest, io);
      case "spread":
        return spreadCommand(rest, io);
      case "methods":
        return methodsCommand(rest, io);
      case undefined:
        io.err(USAGE);
        return 2;
      case "help":
      case "--help":
      case "-h":
        io.out(USAGE);
        return 0;
      case "--version":
        io.out(`${QUIETFRAME_VERSION}\n`);
        return 0;
      case "render":
      case "report":
      case "sweep":
        io.err(`quietframe: '${command}' runs asynchronously; call runCliAsync\n`);
        return 2;
      default:
        io.err(`quietframe: unknown command '${command}'${didYouMean(command, COMMANDS)}\n\n${USAGE}`);
        return 2;
    }
  } catch (e) {
    return reportFailure(e, io);
  }
}

/** User-facing problems become messages and an exit status; anything else is a bug and is rethrown. */
function reportFailure(e: unknown, io: CliIo): number {
  if (e instanceof QuietframeError || e instanceof QuietframeErrors) {
    io.err(`quietframe: ${e.message.split("\n").join("\nquietframe: ")}\n`);
    return 1;
  }
  if (isStoppedRun(e)) {
    io.err(`quietframe: ${e.message}\n`);
    return INTERRUPTED_EXIT;
  }
  throw e;
}

function readSetupFile(path: string | undefined) {
  if (!path) throw new QuietframeError({ path: "<setup.json>", problem: "no set-up file given", allowed: "a path to a set-up JSON file" });
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (e) {
    throw new QuietframeError({ path, problem: `cannot be read (${(e as NodeJS.ErrnoException).code ?? "error"})`, allowed: "a readable file" });
  }
  return loadSetup(readSpectrumFiles(parseJsonText(text, path), path), path);
}

const GRID_OPTIONS = {
  from: { type: "string" },
  to: { type: "string" },
  points: { type: "string" },
} as const;

function evalCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parseOptions("eval", args, { ...GRID_OPTIONS, format: { type: "string", default: "csv" }, psd: { type: "boolean", default: false } });
  if (positionals.length > 1) throw new QuietframeError({ path: "<setup.json>", value: positionals, problem: "only one set-up file at a time", allowed: "one path" });
  if (values.format !== "csv" && values.format !== "json") {
    throw new QuietframeError({ path: "--format", value: values.format, problem: "is not an output format", allowed: "csv or json" });
  }
  const setup = readSetupFile(positionals[0]);
  const grid = gridFromOptions(setup.grid ?? FALLBACK_GRID, values);
  const result = evaluate(prepare(setup), grid);
  const table = tabulateBudget(result.budget, values.psd ? "power" : "amplitude");
  for (const c of result.cautions) io.err(`caution: ${c}\n`);
  for (const w of result.warnings) io.err(`warning: ${w}\n`);
  if (values.format === "csv") {
    io.out(tableToCsv(table));
  } else {
    const doc = {
      quietframe: QUIETFRAME_VERSION,
      setup: setup.name,
      signal: setup.signal,
      quantity: result.budget.quantity.name,
      spectralDensity: table.spectralDensity === "amplitude" ? "one-sided amplitude spectral density" : "one-sided power spectral density",
      unit: table.unit,
      readout: result.budget.readout,
      frequencies: { unit: "Hz", values: Array.from(table.frequencies) },
      columns: table.columns.map((c) => ({ id: c.id, label: c.label, values: jsonNumbers(c.values) })),
      stability: result.stability.summary,
      warnings: result.warnings,
      cautions: result.cautions,
    };
    io.out(JSON.stringify(doc, null, 2) + "\n");
  }
  return 0;
}

function summaryCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parseOptions("summary", args, { ...GRID_OPTIONS, against: { type: "string" } });
  const setup = readSetupFile(positionals[0]);
  const grid = gridFromOptions(setup.grid ?? FALLBACK_GRID, values);
  const result = evaluate(prepare(setup), grid);
  // The reference is evaluated on the same frequencies, so the two ranges integrate the same band.
  const against = values.against === undefined ? undefined : { budget: evaluate(prepare(readSetupFile(values.against)), grid).budget, name: values.against };
  const q = result.budget.quantity;
  const frequencies = result.budget.frequencies;
  io.out(
    `${setup.name || positionals[0]}\n` +
      `${frequencies.length} frequencies from ${formatQuantity(frequencies[0], "frequency", 6)} to ${formatQuantity(frequencies[frequencies.length - 1], "frequency", 6)}; ${setup.signal.kind} on '${setup.signal.on}' referred to ${q.name}\n` +
      describeHeadline(headlineFigures(result.budget), spectralDensityUnit(q.unit, "power")) +
      "\n" +
      reachLines(result.budget, against) +
      result.warnings.map((w) => `warning: ${w}\n`).join("") +
      result.cautions.map((c) => `caution: ${c}\n`).join(""),
  );
  return 0;
}

function checkCommand(args: string[], io: CliIo): number {
  const { positionals } = parseOptions("check", args, {});
  const setup = readSetupFile(positionals[0]);
  // Two frequencies are enough to know the referred quantity and that the signal reaches the readout.
  // With classical noise terms, the two are the ends of the grid `eval` uses, so that a spectrum
  // that does not cover that grid is reported here too.
  const ends = setup.classical.length ? (setup.grid ?? FALLBACK_GRID) : { from: 1, to: 10 };
  const result = evaluate(prepare(setup), { from: ends.from, to: ends.to, points: 2 });
  const m = result.assembled.model;
  io.out(
    `${positionals[0]}: valid quietframe set-up${setup.name ? ` "${setup.name}"` : ""}\n` +
      `  ${setup.components.length} components, ${m.nStates} states, ${m.nInputs} noise inputs in ${m.groups.length} groups, ${setup.readout.length} readout(s)\n` +
      `  signal: ${setup.signal.kind} on '${setup.signal.on}', noise referred to ${result.budget.quantity.name} [${result.budget.quantity.unit}]\n` +
      `  dynamics: ${result.stability.summary}\n` +
      result.cautions.map((c) => `  caution: ${c}\n`).join(""),
  );
  return 0;
}

function typesCommand(args: string[], io: CliIo): number {
  const [type] = args;
  if (!type) {
    for (const k of COMPONENT_KINDS.values()) io.out(`${k.type.padEnd(16)} ${k.summary}\n`);
    return 0;
  }
  const kind = COMPONENT_KINDS.get(type);
  if (!kind) throw new QuietframeError({ path: "type", value: type, problem: "is not a known component type", allowed: [...COMPONENT_KINDS.keys()].join(", "), choices: [...COMPONENT_KINDS.keys()] });
  io.out(`${kind.type}: ${kind.summary}\n\nparameters:\n`);
  for (const p of kind.params) {
    const dflt = "default" in p && p.default !== undefined ? ` (default ${JSON.stringify(p.default)})` : p.optional ? " (optional)" : " (required)";
    io.out(`  ${p.name.padEnd(16)} ${p.kind === "choice" ? p.choices.join("|") : p.kind}${dflt}\n      ${p.doc}\n`);
  }
  io.out(`ports:\n`);
  for (const p of kind.ports) io.out(`  ${p.name.padEnd(16)} ${p.kind}${p.optional ? " (optional)" : ""}: ${p.doc}\n`);
  return 0;
}
