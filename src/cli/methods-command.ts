/**
 * `quietframe methods`: the methods text of a saved widget state (any kind, or one widget of a
 * notebook) as Markdown on stdout or in a file, or as LaTeX with its BibTeX file beside it.
 */
import { basename, extname } from "node:path";
import { QuietframeError } from "../errors";
import { methodsOfLoaded } from "../../widgets/methods";
import { loadWidgetState } from "../../widgets/registry";
import { notebookWidgets, pickNotebookWidget } from "./notebook-widgets";
import { readText, writeAtomically } from "./files";
import { parseOptions } from "./options";
import type { CliIo } from "./io";

export const METHODS_USAGE = `  quietframe methods <state.json> [-o <out.md|out.tex>] [--widget N]
      The methods text of a saved widget state of any kind (or of a notebook's widget), from
      the model that computes it: set-up, formulas with their sources, conventions, grid or
      simulation settings, and the command and fingerprint that reproduce the figure.
      Markdown on stdout, or into out.md; out.tex writes LaTeX (siunitx units, \\cite) and
      the BibTeX file out.bib with the DOIs beside it.
`;

const METHODS_OPTIONS = {
  output: { type: "string", short: "o" },
  widget: { type: "string" },
} as const;

export function methodsCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parseOptions("methods", args, METHODS_OPTIONS);
  const [input, ...extra] = positionals;
  if (!input) throw new QuietframeError({ path: "<state.json>", problem: "no state file given", allowed: "a path to a widget-state JSON file or a notebook" });
  if (extra.length) throw new QuietframeError({ path: "<state.json>", value: positionals, problem: "only one state file at a time", allowed: "one path" });
  const output = values.output;
  const extension = output === undefined ? "md" : extname(output).slice(1).toLowerCase();
  if (extension !== "md" && extension !== "tex") {
    throw new QuietframeError({ path: "-o", value: output, problem: "has no methods format in its extension", allowed: "a file ending in .md (Markdown) or .tex (LaTeX, with a .bib beside it)" });
  }
  const which = values.widget === undefined ? undefined : /^\d+$/.test(values.widget) ? Number(values.widget) : NaN;
  const text = readText(input);
  const inNotebook = notebookWidgets(text, basename(input));
  const { kind, loaded } = inNotebook ? pickNotebookWidget(inNotebook, basename(input), which).load() : loadWidgetState(text, basename(input), { widget: which });
  const stem = output === undefined ? "methods" : basename(output, extname(output));
  const doc = methodsOfLoaded(kind.name, loaded, { stateFile: basename(input), bibName: /^[A-Za-z0-9._-]{1,100}$/.test(stem) ? stem : "methods" });
  for (const c of loaded.cautions) io.err(`caution: ${c}\n`);
  if (output === undefined) {
    io.out(doc.markdown);
    return 0;
  }
  if (extension === "md") {
    writeAtomically(output, doc.markdown);
    io.out(`wrote ${output}\n`);
    return 0;
  }
  const bib = `${output.slice(0, output.length - extname(output).length)}.bib`;
  if (!/^[A-Za-z0-9._-]{1,100}$/.test(stem)) {
    throw new QuietframeError({ path: "-o", value: output, problem: "has a file name BibTeX cannot read", allowed: "a name of letters, digits, '.', '-' or '_' ending in .tex" });
  }
  writeAtomically(bib, doc.bibtex);
  writeAtomically(output, doc.latex);
  io.out(`wrote ${output} and ${bib}\n`);
  return 0;
}
