import { basename, extname } from "node:path";
import { describeHeadline } from "../engine/headline";
import { spectralDensityUnit } from "../engine/tabulate";
import { QuietframeError } from "../errors";
import { formatQuantity } from "../units/format";
import { loadSetup } from "../pipeline";
import { SLIDER_SCALES, type ControlSpec, type SliderScale } from "../../widgets/core/controls/control-spec";
import { kindOutput, OUTPUT_FORMATS, type OutputFormat } from "../../widgets/core/render/kind-output";
import { explorerKind } from "../../widgets/explorer/kind";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { loadWidgetState } from "../../widgets/registry";
import { checkReproduction } from "../../widgets/core/state/reproduction";
import { notebookWidgets, pickNotebookWidget } from "./notebook-widgets";
import { readText, writeAtomically } from "./files";
import { parseOptions } from "./options";
import type { CliIo } from "./io";

/**
 * `render` and `report`: files from saved widget states and set-ups. The application layer: it
 * reads and writes files; the widget registry finds a state's kind, and the kind reads,
 * recomputes and draws it.
 */

export { OUTPUT_FORMATS, type OutputFormat };

export const RENDER_USAGE = `  quietframe render <state.json> -o <out.html|out.svg|out.png|out.csv> [--format F] [--strict] [--scale S]
      Recomputes a saved widget state (an explorer, a trajectory widget whose simulation
      runs again from its seed, a tolerance map, an entangled-light panel or a design answer
      computed again from its question) and writes its figure: a standalone interactive page
      (html), the chart (svg, png at --scale, default 2) or the plotted numbers (csv). A
      tolerance map is computed again under --strict; without it, its stored numbers are
      checked against its fingerprint. Warns when the recomputed numbers differ from the stored fingerprint,
      when the state records none, or when another quietframe version wrote it; --strict
      makes a difference or a missing fingerprint an error and lists the fields the
      fingerprint does not cover, with the reason (docs/fingerprint.md).
      A saved notebook (.ipynb) works too: its widget outputs and live charts, in the order the
      notebook shows them (--widget N if several; the error lists them).
  quietframe report <setup.json> -o <report.html> [--control target[=min:max[:log|linear]][@label]]... [--title T]
      An interactive HTML report of a set-up with sliders for the given parameters, e.g.
      --control "membrane.temperature=10 mK:300 K@bath temperature"; each control is labelled
      with its unit and has a field for an exact value. Prints the headline figures.
`;

const RENDER_OPTIONS = {
  output: { type: "string", short: "o" },
  format: { type: "string" },
  strict: { type: "boolean", default: false },
  scale: { type: "string" },
  widget: { type: "string" },
} as const;

function widgetNumber(text: string | undefined): number | undefined {
  return text === undefined ? undefined : /^\d+$/.test(text) ? Number(text) : NaN;
}

export async function renderCommand(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseOptions("render", args, RENDER_OPTIONS);
  const [input, ...extra] = positionals;
  if (!input) throw new QuietframeError({ path: "<state.json>", problem: "no state file given", allowed: "a path to a widget-state JSON file" });
  if (extra.length) throw new QuietframeError({ path: "<state.json>", value: positionals, problem: "only one state file at a time", allowed: "one path" });
  const output = requireOutput(values.output);
  const format = outputFormat(values.format, output);
  const scale = pngScale(values.scale);
  const text = readText(input);
  // The registry finds the state's kind (an explorer, a trajectory whose simulation runs again, …).
  // A notebook: its widget outputs and live charts, one picked by --widget; otherwise a state file.
  const inNotebook = notebookWidgets(text, basename(input));
  const which = widgetNumber(values.widget);
  const picked = inNotebook ? pickNotebookWidget(inNotebook, basename(input), which).load() : loadWidgetState(text, basename(input), { widget: which });
  const kind = picked.kind;
  // A kind that recomputes asynchronously (a tolerance map) does so under --strict; a plain render draws its stored numbers.
  const loaded = values.strict === true && kind.recompute ? await kind.recompute(picked.loaded, basename(input)) : picked.loaded;
  const fingerprint = loaded.fingerprint;
  // Under --strict a doubt about the numbers is an error; the notes say what --strict leaves out and why.
  const reproduction = checkReproduction(loaded, input, values.strict === true);
  for (const w of reproduction.warnings) io.err(`warning: ${w}\n`);
  for (const n of reproduction.notes) io.err(`note: ${n}\n`);
  for (const w of loaded.warnings) io.err(`warning: ${w}\n`);
  for (const c of loaded.cautions) io.err(`caution: ${c}\n`);
  // The page keeps the stored fingerprint, so it too can tell its reader about a mismatch.
  const bytes = await kindOutput(kind, loaded, format, scale);
  writeAtomically(output, bytes);
  io.out(`wrote ${output} (${format}, ${bytes.length} bytes${fingerprint ? `, ${fingerprint.recomputed}` : ""})\n`);
  return 0;
}

const REPORT_OPTIONS = {
  output: { type: "string", short: "o" },
  control: { type: "string", multiple: true, default: [] as string[] },
  title: { type: "string" },
} as const;

export async function reportCommand(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseOptions("report", args, REPORT_OPTIONS);
  const [input, ...extra] = positionals;
  if (!input) throw new QuietframeError({ path: "<setup.json>", problem: "no set-up file given", allowed: "a path to a set-up JSON file" });
  if (extra.length) throw new QuietframeError({ path: "<setup.json>", value: positionals, problem: "only one set-up file at a time", allowed: "one path" });
  const output = requireOutput(values.output);
  const format = outputFormat(undefined, output);
  if (format !== "html") throw new QuietframeError({ path: "-o", value: output, problem: "a report is an HTML page", allowed: "a file name ending in .html (use render for svg, png or csv)" });
  const setupText = readText(input);
  // Validate first, so set-up problems are reported against the file (with line numbers).
  const setup = loadSetup(setupText, input);
  const controls = (values.control ?? []).map((spec, i) => parseControlOption(spec, i));
  const state = asOptionErrors(() => createExplorerState(JSON.parse(setupText), { controls, settings: values.title === undefined ? {} : { title: values.title } }));
  const computation = computeExplorer(state);
  for (const w of computation.evaluation.warnings) io.err(`warning: ${w}\n`);
  for (const c of computation.evaluation.cautions) io.err(`caution: ${c}\n`);
  const bytes = await kindOutput(
    explorerKind,
    {
      state,
      computation,
      fingerprint: { stored: state.fingerprint, recomputed: computation.fingerprint, writtenBy: state.quietframe },
      warnings: computation.evaluation.warnings,
      cautions: computation.evaluation.cautions,
    },
    "html",
    2,
  );
  writeAtomically(output, bytes);
  const grid = computation.evaluation.budget.frequencies;
  io.out(
    `${setup.name || input}\n` +
      `${grid.length} frequencies from ${formatQuantity(grid[0], "frequency", 6)} to ${formatQuantity(grid[grid.length - 1], "frequency", 6)}; noise referred to ${computation.evaluation.budget.quantity.name}\n` +
      describeHeadline(computation.headline, spectralDensityUnit(computation.evaluation.budget.quantity.unit, "power")) +
      `\nwrote ${output} (interactive report, ${bytes.length} bytes; controls: ${state.controls.map((c) => c.target).join(", ") || "none"})\n`,
  );
  return 0;
}

/** Control problems are named after the --control option the user typed, not the state field. */
function asOptionErrors<T>(fn: () => T): T {
  try {
    return fn();
  } catch (e) {
    if (e instanceof QuietframeError && /^controls[.[]/.test(e.path)) {
      throw new QuietframeError({ path: e.path.replace(/^controls\[(\d+)\]/, "--control[$1]").replace(/^controls\./, "--control "), value: e.value, problem: e.problem, allowed: e.allowed });
    }
    throw e;
  }
}

/** "target", "target=min:max" or "target=min:max:log", each optionally followed by "@label" → a control spec. */
export function parseControlOption(option: string, index: number): ControlSpec {
  const path = `--control[${index}]`;
  const at = option.indexOf("@");
  const label = at < 0 ? undefined : option.slice(at + 1).trim();
  if (label !== undefined && (label === "" || label.length > 80)) {
    throw new QuietframeError({ path, value: option, problem: "has an empty or over-long label after @", allowed: '1 to 80 characters, e.g. "membrane.temperature=10 mK:300 K@bath temperature"' });
  }
  const withLabel = (spec: ControlSpec): ControlSpec => (label === undefined ? spec : { ...spec, label });
  const text = at < 0 ? option : option.slice(0, at);
  const eq = text.indexOf("=");
  const target = (eq < 0 ? text : text.slice(0, eq)).trim();
  if (!/^[^.\s]+\.[^.\s]+$/.test(target)) {
    throw new QuietframeError({ path, value: text, problem: "does not name a parameter", allowed: '"component.parameter" or "component.parameter=min:max", e.g. "membrane.temperature=10 mK:300 K"' });
  }
  if (eq < 0) return withLabel({ target });
  const parts = text
    .slice(eq + 1)
    .split(":")
    .map((s) => s.trim());
  let scale: SliderScale | undefined;
  if (parts.length === 3 && (SLIDER_SCALES as readonly string[]).includes(parts[2])) scale = parts.pop() as SliderScale;
  if (parts.length !== 2 || !parts[0] || !parts[1]) {
    throw new QuietframeError({ path, value: text, problem: "does not give a range", allowed: '"target=min:max" or "target=min:max:log", e.g. "membrane.temperature=10 mK:300 K"' });
  }
  const bound = (s: string): string | number => (/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(s) ? Number(s) : s);
  return withLabel({ target, min: bound(parts[0]), max: bound(parts[1]), ...(scale ? { scale } : {}) });
}

function requireOutput(output: string | undefined): string {
  if (!output) throw new QuietframeError({ path: "-o", problem: "no output file given", allowed: "-o <file> with extension .html, .svg, .png or .csv" });
  return output;
}

function outputFormat(given: string | undefined, output: string): OutputFormat {
  const fromExtension = extname(output).slice(1).toLowerCase();
  const format = given ?? fromExtension;
  if (!(OUTPUT_FORMATS as readonly string[]).includes(format)) {
    throw new QuietframeError({
      path: given === undefined ? "-o" : "--format",
      value: given ?? output,
      problem: given === undefined ? "has no output format in its extension" : "is not an output format",
      allowed: `${OUTPUT_FORMATS.join(", ")} (from the extension of -o, or --format)`,
    });
  }
  return format as OutputFormat;
}

function pngScale(text: string | undefined): number {
  if (text === undefined) return 2;
  const scale = Number(text);
  if (!(scale >= 0.1 && scale <= 16)) throw new QuietframeError({ path: "--scale", value: text, problem: "is not a usable scale", allowed: "a number from 0.1 to 16" });
  return scale;
}
