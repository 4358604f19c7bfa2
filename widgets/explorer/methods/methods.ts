/**
 * The methods export of an explorer state (Markdown, LaTeX, BibTeX): the set-up at the
 * state's values, the formulas of the model that computed the curves, the reference curves,
 * the frequency grid, and the command and fingerprint that reproduce the figure.
 */
import { QuietframeError, QUIETFRAME_VERSION } from "../../../src/index";
import { methodsDocument, methodsIn, type MethodsDocument, type MethodsOptions } from "../../core/methods/document";
import { reproduceSentence } from "../../core/methods/reproduce";
import { componentItems, conventionSentence, modelSentences, wiringSentences } from "../../core/methods/setup-model";
import type { MethodsFormat, Writer } from "../../core/methods/writers";
import type { ExplorerComputation } from "../model";
import type { ExplorerState } from "../format";

export type { MethodsFormat } from "../../core/methods/writers";
export { escapeLatex, escapeMarkdown } from "../../core/methods/writers";

/** The three files of an explorer's methods export. */
export function explorerMethods(state: ExplorerState, computation: ExplorerComputation, options: MethodsOptions = {}): MethodsDocument {
  const title = state.settings.title ?? (computation.setup.name || "Noise budget");
  return methodsDocument(
    `Methods: ${title}`,
    (w) => [
      w.paragraph("Noise model", modelIntroduction(w, computation)),
      w.list(componentItems(w, computation.setup)),
      [...wiringSentences(w, computation.setup), readoutSentence(w, computation)].join(" "),
      w.paragraph("Conventions", `${conventionSentence(w)} ${displaySentence(w, computation)}`),
      w.paragraph("Model", modelSentences(w, computation.setup).join(" ")),
      ...referenceParagraph(w, computation),
      w.paragraph("Frequency grid", gridSentence(w, state, computation)),
      w.paragraph(
        "Reproducibility",
        reproduceSentence(w, {
          stateFile: options.stateFile,
          writtenBy: state.quietframe,
          fingerprint: computation.fingerprint,
          hashes: "the frequencies and the PSD of the total, of every budget term and of every reference curve, in the order plotted",
        }),
      ),
    ],
    options,
  );
}

/** One format of the export (the page's download buttons). */
export function methodsText(state: ExplorerState, computation: ExplorerComputation, format: MethodsFormat): string {
  if (format !== "markdown" && format !== "latex") {
    throw new QuietframeError({ path: "format", value: format, problem: "is not a methods text format", allowed: "markdown, latex" });
  }
  return methodsIn(explorerMethods(state, computation), format);
}

function modelIntroduction(w: Writer, computation: ExplorerComputation): string {
  const name = computation.setup.name ? ` ${w.quote(w.text(computation.setup.name))}` : "";
  const single = computation.evaluation.budget.readout.length === 1;
  const spectrum = single
    ? w.math("S(Ω) = Σ_g H_g(Ω) N_g H_g(Ω)† / |h(Ω)|²", "S(\\Omega) = \\sum_g H_g(\\Omega) N_g H_g(\\Omega)^\\dagger / |h(\\Omega)|^2")
    : w.math("S(Ω) = 1 / (h† S_y⁻¹ h)", "S(\\Omega) = 1/(h^\\dagger S_y^{-1} h)");
  return (
    `Noise spectra were computed with quietframe ${w.text(QUIETFRAME_VERSION)}, which assembles the set-up${name} into a linear ` +
    `state-space model ${w.math("ẋ = A x + B w + b s, y = C x + D w", "\\dot x = A x + B w + b s,\\ y = C x + D w")} driven by white noise inputs ${w.math("w", "w")} ` +
    `(vacuum and excess noise of light, and the thermal noise of each damping bath in the white form stated below) and evaluates the signal-referred noise ${spectrum}, where ${w.math("H = C(−iΩ − A)⁻¹B + D", "H = C(-i\\Omega - A)^{-1} B + D")}, ` +
    `${w.math("h", "h")} is the response to the signal ${w.math("s", "s")} and the sum runs over independent groups of noise inputs ` +
    `${w.math("g", "g")} with one-sided noise matrices ${w.math("N_g", "N_g")}; each group is one term of the budget. The set-up consists of:`
  );
}

function readoutSentence(w: Writer, computation: ExplorerComputation): string {
  const budget = computation.evaluation.budget;
  const setup = computation.setup;
  const readout =
    budget.readout.length === 1
      ? `The output of ${w.code(budget.readout[0])} is read`
      : `The outputs of ${budget.readout.map((r) => w.code(r)).join(", ")} are combined with the optimal frequency-dependent weights ${w.math("w = S_y⁻¹ h", "w = S_y^{-1} h")}`;
  const type = setup.components.find((c) => c.name === setup.signal.on)?.type ?? "body";
  return `${readout}; the signal is a ${w.text(setup.signal.kind)} on ${w.code(setup.signal.on)} (${w.text(type.replace(/-/g, " "))}), and the noise is referred to it and expressed as ${w.text(budget.quantity.name)}.`;
}

function displaySentence(w: Writer, computation: ExplorerComputation): string {
  const table = computation.table;
  return table.spectralDensity === "amplitude"
    ? `Figures show amplitude spectral densities ${w.math("√S", "\\sqrt{S}")} in ${w.unit(table.unit)}.`
    : `Figures show power spectral densities ${w.math("S", "S")} in ${w.unit(table.unit)}.`;
}

/** The reference curves drawn beside the budget, each with its formula and source. */
function referenceParagraph(w: Writer, computation: ExplorerComputation): string[] {
  const budget = computation.evaluation.budget;
  const setup = computation.setup;
  const refs = new Set(budget.references.map((r) => r.id));
  const force = budget.quantity.name === "force";
  const targetType = setup.components.find((c) => c.name === setup.signal.on)?.type;
  const out: string[] = [];
  if (budget.quantity.name === "displacement" && setup.signal.kind === "force") {
    out.push(`Force noise is expressed as displacement through the bare susceptibility of the body, ${w.math("S_x = |χ|² S_F", "S_x = |\\chi|^2 S_F")}.`);
  }
  if (refs.has("sql") && targetType === "interferometer") {
    const strain = budget.quantity.name === "strain";
    const sql = strain ? w.math("h_SQL² = 8ħ/(mΩ²L²)", "h_{\\mathrm{SQL}}^2 = 8\\hbar/(m\\Omega^2L^2)") : w.math("S_ΔL^SQL = 8ħ/(mΩ²)", "S_{\\Delta L}^{\\mathrm{SQL}} = 8\\hbar/(m\\Omega^2)");
    out.push(`The standard quantum limit shown is ${sql}${w.cite("kimble2001")}.`);
  } else if (refs.has("sql")) {
    const sql =
      targetType === "free-mass"
        ? force
          ? w.math("S_F^SQL = 2ħmΩ²", "S_F^{\\mathrm{SQL}} = 2\\hbar m\\Omega^2")
          : w.math("S_x^SQL = 2ħ/(mΩ²)", "S_x^{\\mathrm{SQL}} = 2\\hbar/(m\\Omega^2)")
        : force
          ? w.math("S_F^SQL = 2ħ/|χ(Ω)|", "S_F^{\\mathrm{SQL}} = 2\\hbar/|\\chi(\\Omega)|")
          : w.math("S_x^SQL = 2ħ|χ(Ω)|", "S_x^{\\mathrm{SQL}} = 2\\hbar|\\chi(\\Omega)|");
    out.push(`The standard quantum limit shown is ${sql}${w.cite("braginsky1992", "clerk2010")}.`);
  }
  if (refs.has("zero-point")) out.push(`The zero-point reference is ${w.math("S_x = 2ħ|Im χ(Ω)|", "S_x = 2\\hbar|\\mathrm{Im}\\,\\chi(\\Omega)|")}${w.cite("callen1951")}.`);
  if (refs.has("thermal")) {
    out.push(
      `The thermal reference curve is the frequency-dependent quantum fluctuation–dissipation force ${w.math("S_F(Ω) = Σ_b 2mγ_bħΩ coth(ħΩ/2k_BT_b)", "S_F(\\Omega) = \\sum_b 2m\\gamma_b\\hbar\\Omega\\coth(\\hbar\\Omega/2k_BT_b)")} over the body's baths${w.cite("callen1951")}; ` +
        `it is a reference, not a budget term (the budget's thermal terms use the white forms stated above, equal to it at the resonance).`,
    );
  }
  return out.length ? [w.paragraph("Reference curves", out.join(" "))] : [];
}

function gridSentence(w: Writer, state: ExplorerState, computation: ExplorerComputation): string {
  const f = computation.evaluation.budget.frequencies;
  const own = computation.setup.source.grid;
  const note = own ? ` (the state's settings; the set-up's own grid is not used when the settings give one)` : "";
  return `Curves were evaluated at ${state.settings.grid.points} logarithmically spaced frequencies from ${w.qty(f[0], "frequency")} to ${w.qty(f[f.length - 1], "frequency")}${note}.`;
}
