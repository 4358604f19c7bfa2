/** `quietframe methods` in-process, and the notebook API's methods(): the same text from a state file, a widget or its state. */
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, test } from "vitest";
import { runCli } from "../../src/cli/run";
import { methods, saveMethods } from "../../widgets/notebook/methods";
import { entangledPanel } from "../../widgets/entangled/notebook";
import { widgetMethods } from "../../widgets/methods";

const STATES = join(__dirname, "..", "..", "examples", "states");
const dir = mkdtempSync(join(tmpdir(), "quietframe-methods-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function cli(...argv: string[]): { code: number; out: string; err: string } {
  let out = "";
  let err = "";
  const code = runCli(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

describe("quietframe methods", () => {
  test("Markdown on stdout, the same as the widgets' export", () => {
    const file = join(STATES, "explorer-squeezed-membrane.json");
    const r = cli("methods", file);
    expect(r.code).toBe(0);
    expect(r.out).toBe(widgetMethods(readFileSync(file, "utf8"), { source: "explorer-squeezed-membrane.json", stateFile: "explorer-squeezed-membrane.json" }).markdown);
    expect(r.out).toContain("quietframe render explorer-squeezed-membrane.json -o explorer-squeezed-membrane.svg --strict");
  });

  test("out.tex writes the LaTeX and out.bib beside it, which the LaTeX reads", () => {
    const out = join(dir, "paper-methods.tex");
    const r = cli("methods", join(STATES, "trajectory-cryogenic-membrane.json"), "-o", out);
    expect(r.code).toBe(0);
    expect(r.out).toBe(`wrote ${out} and ${join(dir, "paper-methods.bib")}\n`);
    const tex = readFileSync(out, "utf8");
    expect(tex).toContain("\\bibliography{paper-methods}");
    expect(tex).toContain("seed 7");
    expect(readFileSync(join(dir, "paper-methods.bib"), "utf8")).toContain("@article{kalman1961,");
  });

  test("out.md writes Markdown", () => {
    const out = join(dir, "entangled.md");
    expect(cli("methods", join(STATES, "entangled-two-beams.json"), "-o", out).code).toBe(0);
    expect(readFileSync(out, "utf8")).toContain("Duan sum");
  });

  test.each([
    [["methods"], /<state\.json>: no state file given/],
    [["methods", "a.json", "b.json"], /only one state file/],
    [["methods", join(STATES, "entangled-two-beams.json"), "-o", "x.pdf"], /-o = "x\.pdf".*no methods format.*\.md.*\.tex/],
    [["methods", join(STATES, "entangled-two-beams.json"), "-o", join(dir, "two words.tex")], /file name BibTeX cannot read/],
    [["methods", join(dir, "missing.json")], /cannot be read \(ENOENT\)/],
  ])("%j: a clear error, exit 1, nothing on stdout", (argv, message) => {
    const r = cli(...(argv as string[]));
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    expect(r.err).toMatch(message);
  });

  test("a tampered state is refused like render refuses it", () => {
    const text = readFileSync(join(STATES, "entangled-two-beams.json"), "utf8").replace('"efficiency1": 0.9', '"efficiency1": 1.9');
    const path = join(dir, "tampered.json");
    writeFileSync(path, text);
    const r = cli("methods", path);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/efficiency1/);
    expect(existsSync(join(dir, "tampered.md"))).toBe(false);
  });
});

describe("the notebook API", () => {
  test("methods(widget) equals methods(widget.state) and names the panel's values", () => {
    const panel = entangledPanel({ squeezingDb: -6, efficiency1: 0.8, efficiency2: 0.7 });
    const doc = methods(panel);
    expect(doc).toEqual(methods(panel.state));
    expect(doc.markdown).toContain("η\\_1 = 80 %");
    expect(doc.latex).toContain("\\qty{-6}{\\decibel}");
  });

  test("saveMethods writes .tex and .bib, or .md; other extensions are refused", () => {
    const panel = entangledPanel({ r: 1 });
    const tex = join(dir, "panel.tex");
    expect(saveMethods(panel, tex)).toEqual([tex, join(dir, "panel.bib")]);
    expect(readFileSync(tex, "utf8")).toContain("\\bibliography{panel}");
    expect(saveMethods(panel, join(dir, "panel.md"))).toEqual([join(dir, "panel.md")]);
    expect(() => saveMethods(panel, join(dir, "panel.docx"))).toThrow(/no methods format/);
  });
});
