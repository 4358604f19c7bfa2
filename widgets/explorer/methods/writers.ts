/**
 * The two output formats of the methods text. User text (names, titles, values as written)
 * goes through `text`, which escapes it, so nothing a user types can change the markup.
 */
export type MethodsFormat = "markdown" | "latex";

export interface Writer {
  /** User text, escaped; line breaks become spaces so it cannot start a heading or a list. */
  text(s: string): string;
  /** A formula: Unicode for Markdown, LaTeX math for LaTeX. */
  math(markdown: string, latex: string): string;
  /** Text already written for each format (citations). */
  pick(both: { readonly markdown: string; readonly latex: string }): string;
  /** Names and hashes in a fixed-width font. */
  code(s: string): string;
  quote(escaped: string): string;
  paragraph(title: string, body: string): string;
  list(items: readonly string[]): string;
  numbered(items: readonly string[]): string;
  /** The finished document (LaTeX: characters its default set-up does not know are written as commands). */
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

function latexUnicode(s: string): string {
  return s.replace(/[µμ°Ωχħ√²−×→–—…]/g, (c) => LATEX_UNICODE[c]);
}

function oneLine(s: string): string {
  return s.replace(/\s*[\r\n\u2028\u2029]+\s*/g, " ");
}

const markdown: Writer = {
  text: escapeMarkdown,
  math: (md) => escapeMarkdown(md),
  pick: (both) => both.markdown,
  code: (s) => (/[`\r\n]/.test(s) ? escapeMarkdown(s) : `\`${s}\``),
  quote: (escaped) => `“${escaped}”`,
  paragraph: (title, body) => `**${title}.**${body ? ` ${body}` : ""}`,
  list: (items) => items.map((i) => `- ${i}`).join("\n"),
  numbered: (items) => items.map((item, k) => `${k + 1}. ${item}`).join("\n"),
  finish: (s) => s,
};

const latex: Writer = {
  text: escapeLatex,
  math: (_md, tex) => `$${tex}$`,
  pick: (both) => both.latex,
  code: (s) => `\\texttt{${escapeLatex(s)}}`,
  quote: (escaped) => `\`\`${escaped}''`,
  paragraph: (title, body) => `\\paragraph{${title}.}${body ? ` ${body}` : ""}`,
  list: (items) => ["\\begin{itemize}", ...items.map((i) => `  \\item ${i}`), "\\end{itemize}"].join("\n"),
  numbered: (items) => ["\\begin{enumerate}", ...items.map((i) => `  \\item ${i}`), "\\end{enumerate}"].join("\n"),
  // Fixed prose may hold the same symbols as user text; the mapping leaves escaped text unchanged.
  finish: latexUnicode,
};

export function writerFor(format: MethodsFormat): Writer {
  return format === "latex" ? latex : markdown;
}
