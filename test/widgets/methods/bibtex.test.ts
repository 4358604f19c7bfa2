/**
 * The BibTeX file of a methods export: every entry parses under a strict reading of the
 * format, carries the fields its type needs, and a well-formed DOI; each kind's export cites
 * only entries its .bib holds.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, test } from "vitest";
import { bibtexEntry, CITATION_KEYS, citationDoi } from "../../../widgets/core/methods/citations";
import { widgetMethods } from "../../../widgets/methods";
import { WIDGET_KINDS } from "../../../widgets/registry";
import { KIND_METHODS } from "../../../widgets/methods";

interface Entry {
  type: string;
  key: string;
  fields: Record<string, string>;
}

/**
 * A strict parser for the subset of BibTeX the export writes (BibTeX's own grammar, "Tame the
 * BeaST" §2, 2006: @type{key, field = {value}, …}): braces must balance inside every value,
 * field names are unique, and nothing but whitespace lies between entries.
 */
function parseBibtex(text: string): Entry[] {
  const entries: Entry[] = [];
  let i = 0;
  const skipSpace = (): void => {
    while (i < text.length && /\s/.test(text[i])) i++;
  };
  const expectChar = (c: string): void => {
    if (text[i] !== c) throw new Error(`expected "${c}" at ${i}, found "${text.slice(i, i + 20)}"`);
    i++;
  };
  const word = (pattern: RegExp): string => {
    const start = i;
    while (i < text.length && pattern.test(text[i])) i++;
    if (i === start) throw new Error(`expected a name at ${i}`);
    return text.slice(start, i);
  };
  const bracedValue = (): string => {
    expectChar("{");
    let depth = 1;
    const start = i;
    while (depth > 0) {
      if (i >= text.length) throw new Error("unbalanced braces");
      const c = text[i];
      if (c === "\\")
        i++; // an escaped character
      else if (c === "{") depth++;
      else if (c === "}") depth--;
      i++;
    }
    return text.slice(start, i - 1);
  };
  skipSpace();
  while (i < text.length) {
    expectChar("@");
    const type = word(/[a-z]/);
    expectChar("{");
    const key = word(/[A-Za-z0-9_:-]/);
    const fields: Record<string, string> = {};
    skipSpace();
    while (text[i] === ",") {
      i++;
      skipSpace();
      if (text[i] === "}") break;
      const name = word(/[a-z]/);
      if (name in fields) throw new Error(`field ${name} twice in ${key}`);
      skipSpace();
      expectChar("=");
      skipSpace();
      fields[name] = bracedValue();
      skipSpace();
    }
    expectChar("}");
    entries.push({ type, key, fields });
    skipSpace();
  }
  return entries;
}

// Crossref's pattern for modern DOIs ("DOIs and matching regular expressions", Crossref blog, 2015).
const DOI = /^10\.\d{4,9}\/[-._;()/:A-Z0-9]+$/i;

// Required fields per entry type, from the BibTeX documentation (Patashnik, "BibTeXing", 1988, §3.1).
const REQUIRED: Record<string, string[]> = {
  article: ["author", "title", "journal", "year"],
  book: ["author", "title", "publisher", "year"],
};

describe("the sources' BibTeX", () => {
  test.each(CITATION_KEYS)("%s: parses, has its required fields and a well-formed DOI", (key) => {
    const [entry, ...more] = parseBibtex(bibtexEntry(key));
    expect(more).toEqual([]);
    expect(entry.key).toBe(key);
    for (const f of REQUIRED[entry.type]) expect(entry.fields[f], `${key}.${f}`).toBeTruthy();
    expect(entry.fields.doi).toBe(citationDoi(key));
    expect(entry.fields.doi).toMatch(DOI);
    expect(entry.fields.year).toMatch(/^\d{4}$/);
  });

  test("the parser refuses what BibTeX would misread", () => {
    expect(() => parseBibtex("@article{a, title = {unbalanced}")).toThrow();
    expect(() => parseBibtex("@article{a, title = {x}, title = {y}}")).toThrow(/twice/);
    expect(() => parseBibtex("text @article{a, title = {x}}")).toThrow();
  });
});

describe("every kind's methods export", () => {
  test("every registered kind has one", () => {
    expect(Object.keys(KIND_METHODS).sort()).toEqual(WIDGET_KINDS.map((k) => k.name).sort());
  });

  const STATES = join(__dirname, "..", "..", "..", "examples", "states");
  test.each(["design-ranking-free-mass.json", "entangled-two-beams.json", "explorer-squeezed-membrane.json", "tolerance-squeezing-efficiency.json", "trajectory-cryogenic-membrane.json"])(
    "%s: LaTeX cites only what its .bib holds, Markdown lists the same sources",
    (file) => {
      const doc = widgetMethods(readFileSync(join(STATES, file), "utf8"), { source: file, stateFile: file });
      const entries = parseBibtex(doc.bibtex);
      const cited = [...doc.latex.matchAll(/\\cite\{([^}]*)\}/g)].flatMap((m) => m[1].split(","));
      expect(cited.length).toBeGreaterThan(0);
      expect(new Set(cited)).toEqual(new Set(entries.map((e) => e.key)));
      for (const e of entries) expect(doc.markdown).toContain(`https://doi.org/${e.fields.doi}`);
      expect(doc.markdown).toContain(`quietframe render ${file} -o ${file.replace(".json", ".svg")}`);
      expect(doc.latex).toContain("\\usepackage{amsmath,siunitx}");
      // True minus signs in the Markdown prose (a hyphen before a digit would be a text hyphen).
      expect(doc.markdown).not.toMatch(/(^|[\s(=])-\d/m);
      expect(doc.markdown).not.toContain("(default)");
    },
  );
});
