/**
 * The three methods buttons every kind's page shows: Markdown, LaTeX and the BibTeX file the
 * LaTeX reads (saved as <stem>-methods.bib, the name the LaTeX asks for).
 */
import type { MethodsDocument, MethodsOptions } from "../methods/document";
import { downloadText } from "./actions";

type Button = (label: string, title: string, action: () => unknown) => HTMLButtonElement;

export function methodsButtons(button: Button, stem: () => string, methods: (options: MethodsOptions) => MethodsDocument): HTMLButtonElement[] {
  const doc = (): MethodsDocument => methods({ stateFile: `${stem()}.json`, bibName: `${stem()}-methods` });
  return [
    button("Methods (Markdown)", "Save the methods text: model, formulas with their sources, settings, reproducing command", () =>
      downloadText(doc().markdown, `${stem()}-methods.md`, "text/markdown"),
    ),
    button("Methods (LaTeX)", "Save the methods text as LaTeX; it reads the BibTeX file of the next button", () => downloadText(doc().latex, `${stem()}-methods.tex`, "application/x-tex")),
    button("Methods (BibTeX)", "Save the references of the LaTeX methods text, with their DOIs", () => downloadText(doc().bibtex, `${stem()}-methods.bib`, "application/x-bibtex")),
  ];
}
