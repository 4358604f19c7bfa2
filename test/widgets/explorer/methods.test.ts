import { describe, expect, test } from "vitest";
import { componentKind } from "../../../src/components/registry";
import { QuietframeError } from "../../../src/errors";
import { siunitxQuantity, unicodeQuantity } from "../../../src/units";
import { QUIETFRAME_VERSION } from "../../../src/version";
import { LATEX_BEGIN_MARK, LATEX_END_MARK } from "../../../widgets/core/methods/document";
import { parameterWords } from "../../../widgets/core/methods/parameter-names";
import { computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { escapeLatex, escapeMarkdown, explorerMethods, methodsText } from "../../../widgets/explorer/methods/methods";
import type { ExplorerState } from "../../../widgets/explorer/format";
import { exampleFiles, exampleSetup, exampleState } from "./examples";

const both = (state: ExplorerState) => {
  const computation = computeExplorer(state);
  const doc = explorerMethods(state, computation);
  return { computation, markdown: doc.markdown, latex: doc.latex, bibtex: doc.bibtex };
};

/** The part of the LaTeX a paper pastes: between the two marker comments. */
const latexBody = (latex: string): string => latex.slice(latex.indexOf(LATEX_BEGIN_MARK) + LATEX_BEGIN_MARK.length, latex.indexOf(LATEX_END_MARK));

// The references as published: journal, volume, first page, year (and the DOI the export prints).
const REFERENCES = {
  braginsky: ["Braginsky", "Khalili", "Quantum Measurement", "1992", "10.1017/CBO9780511622748"],
  clerk: ["Clerk", "82", "1155", "2010", "10.1103/RevModPhys.82.1155"],
  gardiner: ["Gardiner", "Collett", "31", "3761", "1985", "10.1103/PhysRevA.31.3761"],
  aspelmeyer: ["Aspelmeyer", "Kippenberg", "Marquardt", "86", "1391", "2014", "10.1103/RevModPhys.86.1391"],
  caves: ["Caves", "23", "1693", "1981", "10.1103/PhysRevD.23.1693"],
  kimble: ["Kimble", "65", "022002", "2001", "10.1103/PhysRevD.65.022002"],
  callen: ["Callen", "Welton", "83", "34", "1951", "10.1103/PhysRev.83.34"],
};
type Reference = keyof typeof REFERENCES;
const BIB_KEYS: Record<Reference, string> = {
  braginsky: "braginsky1992",
  clerk: "clerk2010",
  gardiner: "gardiner1985",
  aspelmeyer: "aspelmeyer2014",
  caves: "caves1981",
  kimble: "kimble2001",
  callen: "callen1951",
};

/** The numbered reference line (Markdown) that starts with the first author. */
function referenceLine(text: string, author: string): string | undefined {
  return text.split("\n").find((l) => /^\d+\. /.test(l) && l.includes(author));
}

function expectReferences(doc: { markdown: string; latex: string; bibtex: string }, present: Reference[], absent: Reference[]): void {
  for (const r of present) {
    const line = referenceLine(doc.markdown, REFERENCES[r][0]);
    expect(line, `reference ${r}`).toBeDefined();
    for (const part of REFERENCES[r]) expect(line, `${r}: ${part}`).toContain(part);
    // LaTeX cites the BibTeX key; the .bib holds the entry with its DOI.
    expect(doc.latex).toMatch(new RegExp(`\\\\cite\\{[^}]*\\b${BIB_KEYS[r]}\\b`));
    expect(doc.bibtex).toContain(`{${BIB_KEYS[r]},`);
    expect(doc.bibtex).toContain(`doi = {${REFERENCES[r][REFERENCES[r].length - 1]}}`);
  }
  for (const r of absent) {
    expect(doc.markdown, `no ${r}`).not.toContain(REFERENCES[r][0]);
    expect(doc.latex, `no ${r}`).not.toContain(BIB_KEYS[r]);
    expect(doc.bibtex, `no ${r}`).not.toContain(BIB_KEYS[r]);
  }
}

describe("explorer methods on the shipped examples", () => {
  test.each(exampleFiles())("%s: every parameter the model used, in words, with its value in quietframe's units", (file) => {
    const state = exampleState(file);
    const { computation, markdown, latex } = both(state);
    for (const c of computation.setup.components) {
      expect(markdown).toContain(`\`${c.name}\` (${c.type.replace(/-/g, " ")})`);
      expect(latex).toContain(`\\texttt{${c.name}} (${c.type.replace(/-/g, " ")})`);
      for (const p of componentKind(c.type)!.params) {
        const value = c.values[p.name];
        if (value === undefined) continue;
        const words = parameterWords(c.type, p.name).words;
        if (typeof value === "string" || p.kind === "choice") {
          expect(markdown, `${c.name}.${p.name}`).toContain(`= ${String(value).replace(/-/g, " ")}`);
          continue;
        }
        // Same value, same unit, in both: Unicode with a true minus, and siunitx.
        expect(markdown, `${c.name}.${p.name}`).toContain(`${escapeMarkdown(words)}`);
        expect(markdown, `${c.name}.${p.name}`).toContain(`= ${escapeMarkdown(unicodeQuantity(value, p.kind))}`);
        expect(latex, `${c.name}.${p.name}`).toContain(`= ${siunitxQuantity(value, p.kind)}`);
      }
    }
    // No internal names: no camelCase identifiers ("measurementRate"; unit symbols such as kHz or dB are not camelCase), no "(default)" marks, no hyphen used as a minus sign.
    for (const text of [markdown, latexBody(latex)]) {
      expect(text).not.toContain("(default)");
      expect(text.replace(/`[^`]*`|\\texttt\{[^}]*\}|sha256:[0-9a-f]+/g, "")).not.toMatch(/\b[a-z]{2,}[A-Z][a-z]+\w*\b/);
    }
    expect(markdown).not.toMatch(/(^|[\s(=])-\d/m);
    // In LaTeX, "-" is a minus sign only in math mode and inside siunitx's macros.
    expect(latexBody(latex).replace(/\$[^$]*\$/g, "")).not.toMatch(/(^|[\s(=])-\d/m);
  });

  test("hand-written values of the squeezed membrane: SI prefixes, one angle unit, scientific notation, dB sign and r", () => {
    const { markdown, latex } = both(exampleState("cryogenic-membrane-squeezed.json"));
    // Written by hand from the set-up file (siunitx 3 manual: \\qty, \\num, \\ang, \\decibel).
    expect(markdown).toContain("effective mass m = 5 ng");
    expect(latex).toContain("effective mass $m$ = \\qty{5}{\\nano\\gram}");
    expect(markdown).toContain("quality factor Q = 10⁸");
    expect(latex).toContain("quality factor $Q$ = \\num{1e8}");
    expect(latex).toContain("= \\ang{60}");
    expect(markdown).toContain("= 60°");
    expect(latex).toContain("= \\qty{-10}{\\decibel}");
    expect(markdown).toContain("= −10 dB");
    expect(latex).toContain("\\qty{1.2}{\\mega\\hertz}");
    // r = 10 ln 10 / 20 = 1.1513 (−10 dB of power is a factor 10: e^{−2r} = 0.1).
    expect(markdown).toContain("−10 dB means r = 1.151");
    expect(markdown).toContain("negative for noise below vacuum");
  });

  test.each(exampleFiles())("%s: version, grid, fingerprint, reproducing command and conventions", (file) => {
    const state = exampleState(file);
    const { computation, markdown, latex } = both(state);
    const f = computation.evaluation.budget.frequencies;
    for (const text of [markdown, latex]) {
      expect(text).toContain(computation.fingerprint);
      expect(text).toContain(`quietframe ${QUIETFRAME_VERSION}`);
      expect(text).toContain("quietframe render state.json -o state.svg --strict");
      expect(text).toContain("one-sided and symmetrized");
      expect(text).toContain("vacuum noise is 1");
      expect(text).toContain("little-endian");
      // Only a force signal referred to displacement says so; a strain stays a strain.
      expect(text.includes("expressed as displacement through")).toBe(computation.evaluation.budget.quantity.name === "displacement" && computation.setup.signal.kind === "force");
    }
    expect(markdown).toContain(`${state.settings.grid.points} logarithmically spaced frequencies from ${unicodeQuantity(f[0], "frequency")} to ${unicodeQuantity(f[f.length - 1], "frequency")}`);
    expect(latex).toContain(`${state.settings.grid.points} logarithmically spaced frequencies from ${siunitxQuantity(f[0], "frequency")} to ${siunitxQuantity(f[f.length - 1], "frequency")}`);
    expect(markdown).toContain("z(t) = ∫ z(Ω) e^{−iΩt} dΩ/2π");
    expect(latex).toContain("$z(t) = \\int z(\\Omega)\\, e^{-i\\Omega t}\\, \\mathrm{d}\\Omega/2\\pi$");
    expect(markdown).toContain(computation.table.unit);
  });

  test("squeezed membrane: squeezing, cavity, thermal and SQL references, the oscillator's SQL", () => {
    const doc = both(exampleState("cryogenic-membrane-squeezed.json"));
    expectReferences(doc, ["braginsky", "clerk", "gardiner", "aspelmeyer", "caves", "kimble", "callen"], []);
    expect(doc.markdown).toContain("S\\_x^SQL = 2ħ\\|χ(Ω)\\|");
    expect(doc.latex).toContain("$S_x^{\\mathrm{SQL}} = 2\\hbar|\\chi(\\Omega)|$");
  });

  test("free test mass: no squeezing or thermal references, the free-mass SQL", () => {
    const doc = both(exampleState("free-test-mass.json"));
    expectReferences(doc, ["braginsky", "clerk", "gardiner", "aspelmeyer"], ["caves", "kimble", "callen"]);
    expect(doc.markdown).toContain("S\\_x^SQL = 2ħ/(mΩ²)");
    expect(doc.latex).toContain("$S_x^{\\mathrm{SQL}} = 2\\hbar/(m\\Omega^2)$");
    expect(doc.markdown).not.toContain("Ω\\_m");
  });

  test("coherent-light membrane: thermal but no squeezing references", () => {
    expectReferences(both(exampleState("cryogenic-membrane.json")), ["braginsky", "clerk", "gardiner", "aspelmeyer", "callen"], ["caves", "kimble"]);
  });

  test("the controls' current values are the ones described", () => {
    const state = exampleState("cryogenic-membrane.json");
    const moved = { ...state, values: { ...state.values, "membrane.temperature": "20 mK", "cavity.photons": 5e7 } };
    const { markdown, latex } = both(moved);
    expect(markdown).toContain("bath temperature T = 20 mK");
    expect(markdown).not.toContain("bath temperature T = 6 K");
    expect(markdown).toContain("mean intracavity photon number n\\_c = 5 × 10⁷");
    expect(latex).toContain("bath temperature $T$ = \\qty{20}{\\milli\\kelvin}");
    expect(latex).toContain("\\num{5e7}");
  });

  test("a force-referred budget states the force SQL", () => {
    const setup = exampleSetup("cryogenic-membrane.json");
    setup.signal = { ...setup.signal, referTo: "force" };
    const { markdown } = both(createExplorerState(setup));
    expect(markdown).toContain("S\\_F^SQL = 2ħ/\\|χ(Ω)\\|");
    expect(markdown).toContain("expressed as force");
    expect(markdown).not.toContain("S\\_x = \\|χ\\|² S\\_F");
  });

  test("an interferometer whose idler phase comes from the recycling cavity's length states the length and the derivation", () => {
    const twoCarrier: Parameters<typeof createExplorerState>[0] = {
      format: "quietframe.setup",
      version: 1,
      components: [
        { name: "epr", type: "entangled-source", params: { r: 1 } },
        {
          name: "ifo",
          type: "interferometer",
          params: { mass: "40 kg", armLength: "4 km", armBandwidth: "100 Hz", power: "500 kW", idlerDetuning: "30 Hz", srmTransmission: 0.2, srDetuning: "90 deg", srcLength: "56 m" },
        },
        { name: "detector", type: "homodyne", params: { angle: "0 deg" } },
        { name: "idlerDetector", type: "homodyne", params: { angle: "0 deg" } },
      ],
      connections: [
        ["epr.out1", "ifo.in"],
        ["epr.out2", "ifo.idlerIn"],
        ["ifo.out", "detector.in"],
        ["ifo.idlerOut", "idlerDetector.in"],
      ],
      readout: ["detector", "idlerDetector"],
      signal: { kind: "strain", on: "ifo" },
    };
    const { markdown, latex } = both(createExplorerState(twoCarrier));
    expect(markdown).toContain("signal-recycling cavity length ℓ = 56 m");
    expect(markdown).toContain("one free spectral range above the signal carrier");
    expect(latex).toContain("\\phi_i = \\phi + \\Delta\\omega\\,\\ell/c");
    // Without srcLength the sentence is absent.
    delete (twoCarrier.components[1].params as Record<string, unknown>).srcLength;
    expect(both(createExplorerState(twoCarrier)).markdown).not.toContain("one free spectral range above");
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
    const { latex: document } = both(createExplorerState(setup));
    // The document ends once, where quietframe ends it; the user's text is inside the pasted part.
    expect(document.match(/\\end\{document\}/g)).toHaveLength(1);
    expect(document.trimEnd().endsWith("\\end{document}")).toBe(true);
    const latex = latexBody(document);
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
    // One heading: quietframe's own first line, with the user's text escaped inside it.
    expect(markdown.split("\n").filter((l) => l.startsWith("#"))).toEqual([markdown.split("\n")[0]]);
    expect(markdown.split("\n")[0]).toMatch(/^## Methods: a \\# /);
  });
});
