import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import * as ts from "typescript";
import { describe, expect, it } from "vitest";

/**
 * The model must give the same bits in Node and in the browser (the state fingerprint
 * promises it), so its code may not call the platform's transcendental functions, whose
 * rounding differs between engines, nor use `**` (which is Math.pow). It uses
 * src/numeric/portable-math.ts instead. Tokens are found with TypeScript's own scanner, so
 * comments and strings do not count.
 */
const ROOT = join(__dirname, "..", "..");
const FORBIDDEN = new Set([
  "exp",
  "expm1",
  "log",
  "log10",
  "log2",
  "log1p",
  "pow",
  "sin",
  "cos",
  "tan",
  "asin",
  "acos",
  "atan",
  "atan2",
  "sinh",
  "cosh",
  "tanh",
  "asinh",
  "acosh",
  "atanh",
  "hypot",
  "cbrt",
]);
const ALLOWED_FILES = new Set(["src/numeric/portable-math.ts"]);

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return sources(path);
    return name.endsWith(".ts") && !name.endsWith(".d.ts") ? [path] : [];
  });
}

function violations(file: string): string[] {
  const text = readFileSync(file, "utf8");
  const scanner = ts.createScanner(ts.ScriptTarget.Latest, true, ts.LanguageVariant.Standard, text);
  const found: string[] = [];
  const tokens: { kind: ts.SyntaxKind; text: string; pos: number }[] = [];
  // Brace depth inside each open template literal: a `}` at depth 0 resumes the template text.
  const templates: number[] = [];
  for (let kind = scanner.scan(); kind !== ts.SyntaxKind.EndOfFileToken; kind = scanner.scan()) {
    if (kind === ts.SyntaxKind.TemplateHead) templates.push(0);
    else if (kind === ts.SyntaxKind.OpenBraceToken && templates.length) templates[templates.length - 1]++;
    else if (kind === ts.SyntaxKind.CloseBraceToken && templates.length) {
      if (templates[templates.length - 1] === 0) {
        kind = scanner.reScanTemplateToken(false);
        if (kind === ts.SyntaxKind.TemplateTail) templates.pop();
      } else {
        templates[templates.length - 1]--;
      }
    }
    tokens.push({ kind, text: scanner.getTokenText(), pos: scanner.getTokenPos() });
  }
  const line = (pos: number): number => text.slice(0, pos).split("\n").length;
  tokens.forEach((t, i) => {
    if (t.kind === ts.SyntaxKind.AsteriskAsteriskToken || t.kind === ts.SyntaxKind.AsteriskAsteriskEqualsToken) {
      found.push(`line ${line(t.pos)}: ${t.text}`);
    }
    if (t.text === "Math" && tokens[i + 1]?.kind === ts.SyntaxKind.DotToken && FORBIDDEN.has(tokens[i + 2]?.text)) {
      found.push(`line ${line(t.pos)}: Math.${tokens[i + 2].text}`);
    }
  });
  return found;
}

describe("model code uses portable elementary functions only", () => {
  const files = [...sources(join(ROOT, "src")), ...sources(join(ROOT, "widgets"))].map((f) => relative(ROOT, f).split("\\").join("/")).filter((f) => !ALLOWED_FILES.has(f));

  it("scans the model's sources", () => {
    expect(files.length).toBeGreaterThan(50);
  });

  it.each(files)("%s calls no platform transcendental function and no **", (file) => {
    expect(violations(join(ROOT, file))).toEqual([]);
  });

  it("would catch both forms (the scanner sees through spacing and ignores comments and strings)", () => {
    const probe = join(ROOT, "test", "numeric", "fixtures", "platform-math-probe.ts.txt");
    expect(violations(probe)).toEqual(["line 2: Math.exp", "line 3: Math.hypot", "line 4: **"]);
  });
});
