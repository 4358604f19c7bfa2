import { describe, expect, test } from "vitest";
import { componentKind } from "../../../src/components/registry";
import { QuietframeError } from "../../../src/errors";
import { QUIETFRAME_VERSION } from "../../../src/version";
import { applyValues, computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { escapeLatex, escapeMarkdown, methodsText } from "../../../widgets/explorer/methods/methods";
import type { ExplorerState } from "../../../widgets/explorer/format";
import { exampleFiles, exampleSetup, exampleState } from "./examples";

const both = (state: ExplorerState) => {
  const computation = computeExplorer(state);
  return { computation, markdown: methodsText(state, computation, "markdown"), latex: methodsText(state, computation, "latex") };
};

// The references as the brief for this text lists them: journal, volume, first page, year.
const REFERENCES = {
  braginsky: ["Braginsky", "Khalili", "Quantum Measurement", "1992"],
  clerk: ["Clerk", "82", "1155", "2010"],
  gardiner: ["Gardiner", "Collett", "31", "3761", "1985"],
  aspelmeyer: ["Aspelmeyer", "Kippenberg", "Marquardt", "86", "1391", "2014"],
  caves: ["Caves", "23", "1693", "1981"],
  kimble: ["Kimble", "65", "022002", "2001"],
  callen: ["Callen", "Welton", "83", "34", "1951"],
};
type Reference = keyof typeof REFERENCES;

/** The numbered reference line that starts with the first author. */
function referenceLine(text: string, author: string): string | undefined {
  return text.split("\n").find((l) => /^(\d+\.|\s*\\item) /.test(l.trimStart()) && l.includes(author));
}

function expectReferences(text: string, present: Reference[], absent: Reference[]): void {
  for (const r of present) {
    const line = referenceLine(text, REFERENCES[r][0]);
    expect(line, `reference ${r}`).toBeDefined();
    for (const part of REFERENCES[r]) expect(line, `${r}: ${part}`).toContain(part);
  }
  for (const r of absent) expect(text, `no ${r}`).not.toContain(REFERENCES[r][0]);
}

describe("methodsText on the shipped examples", () => {
  test.each(exampleFiles())("%s: every parameter with its value as written, in both formats", (file) => {
    const state = exampleState(file);
    const { markdown, latex } = both(state);
    for (const c of applyValues(state.setup, state.values).components) {
      expect(markdown).toContain(`\`${c.name}\` (${c.type})`);
      expect(latex).toContain(`\\texttt{${c.name}} (${c.type})`);
      for (const [name, value] of Object.entries(c.params ?? {})) {
        const written = String(value);
        expect(markdown, `${c.name}.${name}`).toContain(`${name} = ${written}`);
        // Hand-escaped for LaTeX: only "%" occurs in the examples' values.
        expect(latex, `${c.name}.${name}`).toContain(`${name} = ${written.replace("%", "\\%")}`);
      }
      // Defaults are listed too, marked as such.
      for (const p of componentKind(c.type)!.params) {
        if (p.default !== undefined && !(p.name in (c.params ?? {}))) expect(markdown).toContain(`${p.name} = ${p.default} (default)`);
      }
    }
  });

  test.each(exampleFiles())("%s: version, grid, fingerprint and conventions", (file) => {
    const state = exampleState(file);
    const { computation, markdown, latex } = both(state);
    for (const text of [markdown, latex]) {
      expect(text).toContain(computation.fingerprint);
      expect(text).toContain(`quietframe ${QUIETFRAME_VERSION}`);
      expect(text).toContain(`${state.settings.grid.points} log-spaced frequencies from ${state.settings.grid.from} to ${state.settings.grid.to}`);
      expect(text).toContain("one-sided and symmetrized");
      expect(text).toContain("vacuum noise is 1");
      // Only a force signal referred to displacement says so; a strain stays a strain.
      expect(text.includes("expressed as displacement")).toBe(computation.evaluation.budget.quantity.name === "displacement" && computation.setup.signal.kind === "force");
    }
    expect(markdown).toContain("z(t) = ∫ z(Ω) e^{−iΩt} dΩ/2π");
    expect(latex).toContain("$z(t) = \\int z(\\Omega)\\, e^{-i\\Omega t}\\, d\\Omega/2\\pi$");
    expect(markdown).toContain(computation.table.unit);
    expect(latex).toContain(computation.table.unit.replace("√", "\\ensuremath{\\surd}"));
  });

  test("squeezed membrane: squeezing, cavity, thermal and SQL references, the oscillator's SQL", () => {
    const { markdown, latex } = both(exampleState("cryogenic-membrane-squeezed.json"));
    for (const text of [markdown, latex]) expectReferences(text, ["braginsky", "clerk", "gardiner", "aspelmeyer", "caves", "kimble", "callen"], []);
    expect(markdown).toContain("S\\_x^SQL = 2ħ\\|χ(Ω)\\|");
    expect(latex).toContain("$S_x^{\\mathrm{SQL}} = 2\\hbar|\\chi(\\Omega)|$");
  });

  test("free test mass: no squeezing or thermal references, the free-mass SQL", () => {
    const { markdown, latex } = both(exampleState("free-test-mass.json"));
    for (const text of [markdown, latex]) expectReferences(text, ["braginsky", "clerk", "gardiner", "aspelmeyer"], ["caves", "kimble", "callen"]);
    expect(markdown).toContain("S\\_x^SQL = 2ħ/(mΩ²)");
    expect(latex).toContain("$S_x^{\\mathrm{SQL}} = 2\\hbar/(m\\Omega^2)$");
    expect(markdown).not.toContain("Ω\\_m");
  });

  test("coherent-light membrane: thermal but no squeezing references", () => {
    const { markdown } = both(exampleState("cryogenic-membrane.json"));
    expectReferences(markdown, ["braginsky", "clerk", "gardiner", "aspelmeyer", "callen"], ["caves", "kimble"]);
  });

  test("the controls' current values are the ones described", () => {
    const state = exampleState("cryogenic-membrane.json");
    const moved = { ...state, values: { ...state.values, "membrane.temperature": "20 mK", "cavity.photons": 5e7 } };
    const { markdown, latex } = both(moved);
    expect(markdown).toContain("temperature = 20 mK");
    expect(markdown).not.toContain("temperature = 6 K");
    expect(markdown).toContain("photons = 50000000");
    expect(latex).toContain("temperature = 20 mK");
  });

  test("a force-referred budget states the force SQL", () => {
    const setup = exampleSetup("cryogenic-membrane.json");
    setup.signal = { ...setup.signal, referTo: "force" };
    const { markdown } = both(createExplorerState(setup));
    expect(markdown).toContain("S\\_F^SQL = 2ħ/\\|χ(Ω)\\|");
    expect(markdown).toContain("expressed as force");
    expect(markdown).not.toContain("S\\_x = \\|χ\\|² S\\_F");
  });

  test("an unknown format is a QuietframeError", () => {
    const state = exampleState("free-test-mass.json");
    expect(() => methodsText(state, computeExplorer(state), "html" as "markdown")).toThrow(QuietframeError);
    expect(() => methodsText(state, computeExplorer(state), "html" as "markdown")).toThrow(/^format = "html"/);
  });
});

describe("user text cannot change the markup", () => {
  const hostile = "a # $ % & _ { } ~ ^ \\ b <script>alert(1)</script> *x* [l](u) |t| `c`";

  test("escapeLatex: each special character (hand-written LaTeX, text mode)", () => {
    expect(escapeLatex("#$%&_{}")).toBe("\\#\\$\\%\\&\\_\\{\\}");
    expect(escapeLatex("~")).toBe("\\textasciitilde{}");
    expect(escapeLatex("^")).toBe("\\textasciicircum{}");
    expect(escapeLatex("\\")).toBe("\\textbackslash{}");
    expect(escapeLatex("\\end{document}")).toBe("\\textbackslash{}end\\{document\\}");
    expect(escapeLatex("<|>")).toBe("\\textless{}\\textbar{}\\textgreater{}");
    expect(escapeLatex("50 µm, 90°")).toBe("50 \\ensuremath{\\mu}m, 90\\ensuremath{^\\circ}");
    expect(escapeLatex("a\nb\r\n\nc")).toBe("a b c");
    expect(escapeLatex("plain text 1.2 MHz")).toBe("plain text 1.2 MHz");
  });

  test("escapeMarkdown: backslash escapes, one line", () => {
    expect(escapeMarkdown("*a* _b_ `c` [d](e) <f> #g |h| ~i~ &j; $k$ \\")).toBe("\\*a\\* \\_b\\_ \\`c\\` \\[d\\](e) \\<f\\> \\#g \\|h\\| \\~i\\~ \\&j; \\$k\\$ \\\\");
    expect(escapeMarkdown("x\n# heading\n- item")).toBe("x \\# heading - item");
  });

  test("a hostile set-up name in LaTeX: escaped, braces balanced, no command from the user", () => {
    const setup = { ...exampleSetup("free-test-mass.json"), name: `${hostile}\n\\end{document}` };
    const { latex } = both(createExplorerState(setup));
    expect(latex).toContain("a \\# \\$ \\% \\& \\_ \\{ \\} \\textasciitilde{} \\textasciicircum{} \\textbackslash{} b \\textless{}script\\textgreater{}alert(1)\\textless{}/script\\textgreater{}");
    expect(latex).not.toContain("\\end{document}");
    const unescaped = (ch: string): number => [...latex.matchAll(new RegExp(`(?<!\\\\)\\${ch}`, "g"))].length;
    expect(unescaped("{")).toBe(unescaped("}"));
    expect(unescaped("$") % 2).toBe(0);
    expect(latex).not.toMatch(/(?<!\\)[%#&]/);
  });

  test("a hostile set-up name in Markdown: no HTML, no emphasis, no heading", () => {
    const setup = { ...exampleSetup("free-test-mass.json"), name: `${hostile}\n# Injected heading` };
    const { markdown } = both(createExplorerState(setup));
    // Every "<" is backslash-escaped, so no HTML tag can open.
    expect(markdown).not.toMatch(/(?<!\\)</);
    expect(markdown).toContain("\\<script\\>alert(1)\\</script\\> \\*x\\* \\[l\\](u) \\|t\\| \\`c\\`");
    expect(markdown.split("\n").some((l) => l.startsWith("#"))).toBe(false);
  });
});
