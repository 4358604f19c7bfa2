/**
 * The two output formats of a methods text. User text (names, titles, values as written)
 * goes through `text`, which escapes it, so nothing a user types can change the markup.
 * Quantities go through `qty` (Unicode with a true minus sign, or siunitx), citations through
 * `cite` (numbered in Markdown, \cite keys for BibTeX in LaTeX). A writer collects the
 * sources it cited, so make a new one for each text.
 */
import { siunitxQuantity, unicodeQuantity, type QuantityKind } from "../../../src/index";
import { markdownReference, type CitationKey } from "./citations";

export type MethodsFormat = "markdown" | "latex";

export interface Writer {
  readonly format: MethodsFormat;
  /** User text, escaped; line breaks become spaces so it cannot start a heading or a list. */
  text(s: string): string;
  /** A formula: Unicode for Markdown, LaTeX math for LaTeX. */
  math(markdown: string, latex: string): string;
  /** Text already written for each format. */
  pick(both: { readonly markdown: string; readonly latex: string }): string;
  /** A quantity in SI units, rounded to `digits` significant digits ("1.467 MHz" / \qty{1.467}{\mega\hertz}). */
  qty(si: number, kind: QuantityKind, digits?: number): string;
  /** A unit as the engine writes it ("m/√Hz", "N²/Hz"): LaTeX gets upright math with a real root. */
  unit(text: string): string;
  /** Names and hashes in a fixed-width font. */
  code(s: string): string;
  quote(escaped: string): string;
  /** A citation of the sources: "[1, 2]" (Markdown) or "~\cite{a,b}" (LaTeX). */
  cite(...keys: CitationKey[]): string;
  /** The sources cited so far, in order of first citation. */
  cited(): readonly CitationKey[];
  heading(title: string): string;
  paragraph(title: string, body: string): string;
  list(items: readonly string[]): string;
  numbered(items: readonly string[]): string;
  /** The finished text (LaTeX: characters its default set-up does not know are written as commands). */
  finish(s: string): string;
}

const MARKDOWN_SPECIAL = /[\\`*_[\]<>#|~&$]/g;

/** Backslash escapes (CommonMark: any ASCII punctuation) for the characters that start Markdown or HTML or math. */
export function escapeMarkdown(s: string): string {
  return oneLine(s).replace(MARKDOWN_SPECIAL, "\\$&");
}

const LATEX_SPECIAL: Readonly<Record<string, string>> = {
  "\\": "\\textbackslash{}",
  "{": "\\{",
  "}": "\\}",
  "#": "\\#",
  $: "\\$",
  "%": "\\%",
  "&": "\\&",
  _: "\\_",
  "~": "\\textasciitilde{}",
  "^": "\\textasciicircum{}",
  // In LaTeX's default font encoding these print as other glyphs.
  "<": "\\textless{}",
  ">": "\\textgreater{}",
  "|": "\\textbar{}",
};

// Characters that appear in units and labels but are not set up in a default LaTeX document.
const LATEX_UNICODE: Readonly<Record<string, string>> = {
  µ: "\\ensuremath{\\mu}",
  μ: "\\ensuremath{\\mu}",
  "°": "\\ensuremath{^\\circ}",
  Ω: "\\ensuremath{\\Omega}",
  χ: "\\ensuremath{\\chi}",
  ħ: "\\ensuremath{\\hbar}",
  "√": "\\ensuremath{\\surd}",
  "²": "\\ensuremath{^2}",
  "−": "\\ensuremath{-}",
  "×": "\\ensuremath{\\times}",
  "→": "\\ensuremath{\\rightarrow}",
  "–": "--",
  "—": "---",
  "…": "\\ldots{}",
};

/** LaTeX text-mode escaping of user text: the ten special characters, < > |, and a few symbols. */
export function escapeLatex(s: string): string {
  return latexUnicode(oneLine(s).replace(/[\\{}#$%&_~^<>|]/g, (c) => LATEX_SPECIAL[c]));
}

const SUPERSCRIPTS = "⁻⁰¹²³⁴⁵⁶⁷⁸⁹";

function latexUnicode(s: string): string {
  // Exponents as typeset text writes them ("10⁻⁷") become math superscripts first.
  const raised = s.replace(/[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+/g, (run) => `\\ensuremath{^{${[...run].map((c) => (c === "⁻" ? "-" : String(SUPERSCRIPTS.indexOf(c) - 1))).join("")}}}`);
  return raised.replace(/[µμ°Ωχħ√−×→–—…]/g, (c) => LATEX_UNICODE[c]);
}

/** "m/√Hz" → $\mathrm{m}/\sqrt{\mathrm{Hz}}$; text that is not a plain unit is escaped instead. */
export function latexUnit(text: string): string {
  if (!/^[A-Za-zµ0-9/√²·]+$/.test(text)) return escapeLatex(text);
  const math = text
    .replace(/[A-Za-z]+/g, (w) => `\\mathrm{${w}}`)
    .replace(/µ/g, "\\mu")
    .replace(/√(\\mathrm\{[A-Za-z]+\})/g, "\\sqrt{$1}")
    .replace(/²/g, "^{2}")
    .replace(/·/g, "\\,");
  return `$${math}$`;
}

function oneLine(s: string): string {
  return s.replace(/\s*[\r\n\u2028\u2029]+\s*/g, " ");
}

function markdownWriter(): Writer {
  const cited: CitationKey[] = [];
  return {
    format: "markdown",
    text: escapeMarkdown,
    math: (md) => escapeMarkdown(md),
    pick: (both) => both.markdown,
    qty: (si, kind, digits) => escapeMarkdown(unicodeQuantity(si, kind, digits)),
    unit: escapeMarkdown,
    code: (s) => (/[`\r\n]/.test(s) ? escapeMarkdown(s) : `\`${s}\``),
    quote: (escaped) => `“${escaped}”`,
    cite: (...keys) => {
      for (const k of keys) if (!cited.includes(k)) cited.push(k);
      // Numbered like the reference list at the end.
      return ` \\[${keys.map((k) => `${cited.indexOf(k) + 1}`).join(", ")}\\]`;
    },
    cited: () => cited,
    heading: (title) => `## ${title}`,
    paragraph: (title, body) => `**${title}.**${body ? ` ${body}` : ""}`,
    list: (items) => items.map((i) => `- ${i}`).join("\n"),
    numbered: (items) => items.map((item, k) => `${k + 1}. ${item}`).join("\n"),
    finish: (s) => s,
  };
}

function latexWriter(): Writer {
  const cited: CitationKey[] = [];
  return {
    format: "latex",
    text: escapeLatex,
    math: (_md, tex) => `$${tex}$`,
    pick: (both) => both.latex,
    qty: (si, kind, digits) => siunitxQuantity(si, kind, digits),
    unit: latexUnit,
    code: (s) => `\\texttt{${escapeLatex(s)}}`,
    quote: (escaped) => `\`\`${escaped}''`,
    cite: (...keys) => {
      for (const k of keys) if (!cited.includes(k)) cited.push(k);
      return `~\\cite{${keys.join(",")}}`;
    },
    cited: () => cited,
    heading: (title) => `\\section*{${title}}`,
    paragraph: (title, body) => `\\paragraph{${title}.}${body ? ` ${body}` : ""}`,
    list: (items) => ["\\begin{itemize}", ...items.map((i) => `  \\item ${i}`), "\\end{itemize}"].join("\n"),
    numbered: (items) => ["\\begin{enumerate}", ...items.map((i) => `  \\item ${i}`), "\\end{enumerate}"].join("\n"),
    // Fixed prose may hold the same symbols as user text; the mapping leaves escaped text unchanged.
    finish: latexUnicode,
  };
}

/** A new writer (with no sources cited yet) for the format. */
export function writerFor(format: MethodsFormat): Writer {
  return format === "latex" ? latexWriter() : markdownWriter();
}

/** The Markdown reference list of the sources a writer cited, numbered as its citations. */
export function markdownReferences(keys: readonly CitationKey[]): string {
  return keys.map((k, i) => `${i + 1}. ${markdownReference(k)}`).join("\n");
}
