/**
 * A methods export in its three files: Markdown, LaTeX (a document that compiles on its own;
 * the part between the two marker comments is what goes into a paper) and the BibTeX file
 * with the DOIs of the sources the LaTeX cites. Each kind writes its text once against a
 * `Writer`; this module runs it for both formats and adds the references.
 */
import { QuietframeError, QUIETFRAME_VERSION } from "../../../src/index";
import { bibtexEntry } from "./citations";
import { markdownReferences, writerFor, type MethodsFormat, type Writer } from "./writers";

export interface MethodsDocument {
  readonly markdown: string;
  readonly latex: string;
  readonly bibtex: string;
}

export interface MethodsOptions {
  /** File name of the saved state, used in the reproducing command (default "state.json"). */
  stateFile?: string;
  /** Name of the BibTeX file the LaTeX reads, without ".bib" (default "methods"). */
  bibName?: string;
}

/** The text of a kind for one writer: paragraphs in order (headings and lists allowed). */
export type MethodsBody = (w: Writer) => string[];

export const LATEX_BEGIN_MARK = "% --- methods text: begin ---";
export const LATEX_END_MARK = "% --- methods text: end ---";

/** Names of the packages the LaTeX needs, in its preamble (siunitx for units, amsmath for the formulas). */
export const LATEX_PACKAGES = ["amsmath", "siunitx"] as const;

/** Runs a kind's text for both formats and adds the reference list and the BibTeX file. */
export function methodsDocument(title: string, body: MethodsBody, options: MethodsOptions = {}): MethodsDocument {
  const bibName = checkBibName(options.bibName ?? "methods");
  const md = writerFor("markdown");
  const mdParts = [md.heading(md.text(title)), ...body(md)];
  if (md.cited().length) mdParts.push(md.paragraph("References", ""), markdownReferences(md.cited()));
  const tex = writerFor("latex");
  const texBody = body(tex);
  const preamble = [
    `% Methods text written by quietframe ${QUIETFRAME_VERSION}. It compiles on its own (pdflatex, then bibtex on the .aux,`,
    `% then pdflatex twice); in a paper, load ${LATEX_PACKAGES.join(" and ")} and paste the part between the markers.`,
    "\\documentclass{article}",
    `\\usepackage{${LATEX_PACKAGES.join(",")}}`,
    "\\begin{document}",
  ];
  const latex = [
    LATEX_BEGIN_MARK,
    tex.heading(tex.text(title)),
    ...texBody,
    LATEX_END_MARK,
    ...(tex.cited().length ? ["\\bibliographystyle{unsrt}", `\\bibliography{${bibName}}`] : []),
    "\\end{document}",
  ];
  return {
    markdown: md.finish(`${mdParts.join("\n\n")}\n`),
    latex: tex.finish(`${preamble.join("\n")}\n\n${latex.join("\n\n")}\n`),
    bibtex: tex.cited().map(bibtexEntry).join("\n"),
  };
}

/** The text of one format, as the page's buttons and the notebook save it. */
export function methodsIn(doc: MethodsDocument, format: MethodsFormat | "bibtex"): string {
  if (format === "markdown") return doc.markdown;
  if (format === "latex") return doc.latex;
  if (format === "bibtex") return doc.bibtex;
  throw new QuietframeError({ path: "format", value: format, problem: "is not a methods text format", allowed: "markdown, latex, bibtex" });
}

function checkBibName(name: string): string {
  // BibTeX reads the name raw inside \bibliography{…}: letters, digits, "-", "_" and "." only.
  if (!/^[A-Za-z0-9._-]{1,100}$/.test(name)) {
    throw new QuietframeError({ path: "bibName", value: name, problem: "cannot be read by BibTeX as a file name", allowed: "1 to 100 letters, digits, '.', '-' or '_' (no spaces)" });
  }
  return name;
}
