/**
 * The methods export in notebooks: `methods(w)` for any widget object, state or saved state
 * text gives Markdown, LaTeX and BibTeX; `saveMethods(w, "methods.tex")` writes the LaTeX and
 * its .bib beside it (or Markdown for a .md path).
 */
import { writeFileSync } from "node:fs";
import { basename, extname } from "node:path";
import { QuietframeError } from "../../src/index";
import { widgetMethods, type MethodsDocument, type MethodsOptions } from "../methods";

/** A notebook widget (explorer, trajectory, entangled panel, tolerance map, design answer), its `.state`, or a saved state as text. */
export type MethodsSource = { readonly state: unknown } | object | string;

function stateOf(source: MethodsSource): unknown {
  return typeof source === "object" && source !== null && "state" in source && typeof (source as { state: unknown }).state === "object" ? (source as { state: unknown }).state : source;
}

/** The methods export of a widget, recomputed from its state like `quietframe methods`. */
export function methods(source: MethodsSource, options: MethodsOptions = {}): MethodsDocument {
  return widgetMethods(stateOf(source), { source: "widget", ...options });
}

/** Writes the methods export: a .md path gets Markdown; a .tex path gets LaTeX and the .bib beside it. Returns the paths written. */
export function saveMethods(source: MethodsSource, path: string, options: MethodsOptions = {}): string[] {
  const extension = extname(path).toLowerCase();
  if (extension !== ".md" && extension !== ".tex") {
    throw new QuietframeError({ path: "path", value: path, problem: "has no methods format in its extension", allowed: "a file ending in .md (Markdown) or .tex (LaTeX, with a .bib beside it)" });
  }
  const stem = basename(path, extname(path));
  const doc = methods(source, { ...options, bibName: stem });
  if (extension === ".md") {
    writeFileSync(path, doc.markdown);
    return [path];
  }
  const bib = `${path.slice(0, path.length - extension.length)}.bib`;
  writeFileSync(bib, doc.bibtex);
  writeFileSync(path, doc.latex);
  return [path, bib];
}
