/** The "methods" paragraph of an explorer state (Markdown or LaTeX) with its references. */
import { componentKind, QuietframeError, QUIETFRAME_VERSION, type SetupDescription } from "../../../src/index";
import { applyValues, type ExplorerComputation } from "../model";
import type { ExplorerState } from "../format";
import { CITATIONS, type CitationKey } from "./citations";
import { writerFor, type MethodsFormat, type Writer } from "./writers";

export type { MethodsFormat } from "./writers";
export { escapeLatex, escapeMarkdown } from "./writers";

/**
 * A methods paragraph for a paper: the set-up with every parameter as written, the
 * conventions, the formulas behind the reference curves with their sources (only those the
 * components use) and the fingerprint that ties the text to the figure's numbers.
 */
export function methodsText(state: ExplorerState, computation: ExplorerComputation, format: MethodsFormat): string {
  if (format !== "markdown" && format !== "latex") {
    throw new QuietframeError({ path: "format", value: format, problem: "is not a methods text format", allowed: "markdown, latex" });
  }
  const w = writerFor(format);
  const setup = applyValues(state.setup, state.values);
  const cited: CitationKey[] = [];
  const cite = (...keys: CitationKey[]): string => {
    for (const k of keys) if (!cited.includes(k)) cited.push(k);
    return ` (${keys.map((k) => w.pick(CITATIONS[k].inline)).join("; ")})`;
  };
  const parts = [
    w.paragraph("Noise model", modelSentence(w, setup, computation)),
    w.list(setup.components.map((c) => componentItem(w, c))),
    wiringSentence(w, setup, computation),
    w.paragraph("Conventions", conventionsSentence(w, computation)),
    w.paragraph("Formulas", formulaSentences(w, setup, computation, cite).join(" ")),
    w.paragraph("Reproducibility", reproducibilitySentence(w, state, computation)),
  ];
  if (cited.length) parts.push(w.paragraph("References", ""), w.numbered(cited.map((k) => w.pick(CITATIONS[k].full))));
  return w.finish(`${parts.join("\n\n")}\n`);
}

function modelSentence(w: Writer, setup: SetupDescription, computation: ExplorerComputation): string {
  const name = setup.name ? ` ${w.quote(w.text(setup.name))}` : "";
  const single = computation.evaluation.budget.readout.length === 1;
  const spectrum = single
    ? w.math("S(Ω) = Σ_g H_g(Ω) N_g H_g(Ω)† / |h(Ω)|²", "S(\\Omega) = \\sum_g H_g(\\Omega) N_g H_g(\\Omega)^\\dagger / |h(\\Omega)|^2")
    : w.math("S(Ω) = 1 / (h† S_y⁻¹ h)", "S(\\Omega) = 1/(h^\\dagger S_y^{-1} h)");
  return (
    `Noise spectra were computed with quietframe ${w.text(QUIETFRAME_VERSION)}, which assembles the set-up${name} into a linear ` +
    `state-space model ${w.math("ẋ = A x + B w + b s, y = C x + D w", "\\dot x = A x + B w + b s,\\ y = C x + D w")} driven by white ` +
    `quantum and thermal noise inputs ${w.math("w", "w")} and evaluates the signal-referred noise ${spectrum}, where ${w.math("H = C(−iΩ − A)⁻¹B + D", "H = C(-i\\Omega - A)^{-1} B + D")}, ` +
    `${w.math("h", "h")} is the response to the signal ${w.math("s", "s")} and the sum runs over independent groups of noise inputs ` +
    `${w.math("g", "g")} with one-sided noise matrices ${w.math("N_g", "N_g")}. The set-up consists of:`
  );
}

function componentItem(w: Writer, c: SetupDescription["components"][number]): string {
  const kind = componentKind(c.type);
  const given = c.params ?? {};
  const params: string[] = [];
  for (const p of kind?.params ?? []) {
    if (Object.prototype.hasOwnProperty.call(given, p.name)) params.push(`${p.name} = ${w.text(String(given[p.name]))}`);
    else if (p.default !== undefined) params.push(`${p.name} = ${w.text(String(p.default))} (default)`);
  }
  return `${w.code(c.name)} (${w.text(c.type)})${params.length ? `: ${params.join(", ")}` : ": no parameters"}`;
}

function wiringSentence(w: Writer, setup: SetupDescription, computation: ExplorerComputation): string {
  const types = new Map(setup.components.map((c) => [c.name, c.type]));
  const isMechanical = (pair: [string, string]): boolean => pair.some((end) => end.endsWith(".mechanics") || end.endsWith(".body"));
  const link = (pair: [string, string], joint: string): string => `${w.code(pair[0])} ${joint} ${w.code(pair[1])}`;
  const optical = setup.connections.filter((p) => !isMechanical(p)).map((p) => link(p, w.math("→", "\\rightarrow")));
  const mechanical = setup.connections.filter(isMechanical).map((p) => link(p, "–"));
  const budget = computation.evaluation.budget;
  const readout =
    budget.readout.length === 1
      ? `The output of ${w.code(budget.readout[0])} is read`
      : `The outputs of ${budget.readout.map((r) => w.code(r)).join(", ")} are combined with the optimal frequency-dependent weights ${w.math("w = S_y⁻¹ h", "w = S_y^{-1} h")}`;
  const target = setup.signal.on;
  const bodyType = types.get(target) ?? "body";
  const sentences = [
    optical.length ? `Light travels ${optical.join(", ")}.` : "",
    mechanical.length ? `Mechanical links: ${mechanical.join(", ")}.` : "",
    `${readout}; the signal is a ${w.text(setup.signal.kind)} on ${w.code(target)} (${w.text(bodyType)}), and the noise is referred to it and expressed as ${w.text(budget.quantity.name)}.`,
  ];
  return sentences.filter((s) => s !== "").join(" ");
}

function conventionsSentence(w: Writer, computation: ExplorerComputation): string {
  const table = computation.table;
  const density =
    table.spectralDensity === "amplitude"
      ? `amplitude spectral densities ${w.math("√S", "\\sqrt{S}")} in ${w.text(table.unit)}`
      : `power spectral densities ${w.math("S", "S")} in ${w.text(table.unit)}`;
  return (
    `Spectral densities are one-sided and symmetrized (variance ${w.math("= ∫₀^∞ S(f) df", "= \\int_0^\\infty S(f)\\,df")}, ` +
    `${w.math("Ω = 2πf", "\\Omega = 2\\pi f")}); figures show ${density}. Light quadratures are normalized so that vacuum noise is 1, ` +
    `and quadrature angles are measured from the amplitude quadrature. Fourier convention: ` +
    `${w.math("z(t) = ∫ z(Ω) e^{−iΩt} dΩ/2π", "z(t) = \\int z(\\Omega)\\, e^{-i\\Omega t}\\, d\\Omega/2\\pi")}.`
  );
}

function formulaSentences(w: Writer, setup: SetupDescription, computation: ExplorerComputation, cite: (...k: CitationKey[]) => string): string[] {
  const types = new Set(setup.components.map((c) => c.type));
  const budget = computation.evaluation.budget;
  const refs = new Set(budget.references.map((r) => r.id));
  const force = budget.quantity.name === "force";
  const targetType = setup.components.find((c) => c.name === setup.signal.on)?.type;
  const out: string[] = [];
  if (types.has("oscillator")) {
    out.push(
      `The mechanical susceptibility is ${w.math("χ(Ω) = 1/(m(Ω_m² − Ω² − iγΩ))", "\\chi(\\Omega) = 1/(m(\\Omega_m^2 - \\Omega^2 - i\\gamma\\Omega))")} with ${w.math("γ = Ω_m/Q", "\\gamma = \\Omega_m/Q")}.`,
    );
  }
  if (types.has("free-mass")) out.push(`A free mass has ${w.math("χ(Ω) = −1/(mΩ²)", "\\chi(\\Omega) = -1/(m\\Omega^2)")}.`);
  if (budget.quantity.name === "displacement") {
    out.push(`Force noise is expressed as displacement through the bare susceptibility, ${w.math("S_x = |χ|² S_F", "S_x = |\\chi|^2 S_F")}.`);
  }
  if (refs.has("sql") && targetType === "interferometer") {
    const strain = budget.quantity.name === "strain";
    const sql = strain ? w.math("h_SQL² = 8ħ/(mΩ²L²)", "h_{\\mathrm{SQL}}^2 = 8\\hbar/(m\\Omega^2L^2)") : w.math("S_ΔL^SQL = 8ħ/(mΩ²)", "S_{\\Delta L}^{\\mathrm{SQL}} = 8\\hbar/(m\\Omega^2)");
    out.push(`The interferometer follows the two-photon input–output relations of a tuned Michelson with arm cavities; the standard quantum limit shown is ${sql}${cite("kimble2001")}.`);
  } else if (refs.has("sql")) {
    const sql =
      targetType === "free-mass"
        ? force
          ? w.math("S_F^SQL = 2ħmΩ²", "S_F^{\\mathrm{SQL}} = 2\\hbar m\\Omega^2")
          : w.math("S_x^SQL = 2ħ/(mΩ²)", "S_x^{\\mathrm{SQL}} = 2\\hbar/(m\\Omega^2)")
        : force
          ? w.math("S_F^SQL = 2ħ/|χ(Ω)|", "S_F^{\\mathrm{SQL}} = 2\\hbar/|\\chi(\\Omega)|")
          : w.math("S_x^SQL = 2ħ|χ(Ω)|", "S_x^{\\mathrm{SQL}} = 2\\hbar|\\chi(\\Omega)|");
    out.push(`The standard quantum limit shown is ${sql}${cite("braginsky1992", "clerk2010")}.`);
  }
  if (types.has("position-probe")) {
    out.push(`The position probe is quantum limited: imprecision × back-action = ${w.math("ħ²", "\\hbar^2")} (one-sided)${cite("braginsky1992", "clerk2010")}.`);
  }
  if (types.has("cavity")) {
    out.push(
      `Each cavity is a single optical mode with the input–output relation ${w.math("a_out = a_in − √κ_in a", "a_{\\mathrm{out}} = a_{\\mathrm{in}} - \\sqrt{\\kappa_{\\mathrm{in}}}\\, a")}${cite("gardiner1985")} ` +
        `and linearized radiation-pressure coupling to the mechanics${cite("aspelmeyer2014")}.`,
    );
  }
  if (types.has("squeezed")) {
    out.push(`Squeezed vacuum has noise ${w.math("e^{−2r}", "e^{-2r}")} of vacuum along the squeezing angle and ${w.math("e^{2r}", "e^{2r}")} orthogonal to it${cite("caves1981", "kimble2001")}.`);
  }
  if (refs.has("thermal") || refs.has("zero-point") || types.has("thermal-bath")) {
    out.push(
      `Thermal forces follow the quantum fluctuation–dissipation theorem, ${w.math("S_F(Ω) = 2mγħΩ coth(ħΩ/2k_BT)", "S_F(\\Omega) = 2m\\gamma\\hbar\\Omega\\coth(\\hbar\\Omega/2k_BT)")}, ` +
        `and the zero-point reference is ${w.math("S_x = 2ħ|Im χ(Ω)|", "S_x = 2\\hbar|\\mathrm{Im}\\,\\chi(\\Omega)|")}${cite("callen1951")}.`,
    );
  }
  if (types.has("homodyne") || types.has("loss")) {
    out.push("Optical loss and detection inefficiency admit vacuum noise in the lost fraction.");
  }
  return out;
}

function reproducibilitySentence(w: Writer, state: ExplorerState, computation: ExplorerComputation): string {
  const g = state.settings.grid;
  const writtenBy = state.quietframe === QUIETFRAME_VERSION ? "" : ` (the state file was written by quietframe ${w.text(state.quietframe)})`;
  return (
    `Curves were evaluated at ${g.points} log-spaced frequencies from ${w.text(g.from)} to ${w.text(g.to)}. ` +
    `Their fingerprint, the SHA-256 hash of the IEEE-754 doubles of every curve, is ${w.code(computation.fingerprint)}; ` +
    `recomputing the accompanying widget-state file with quietframe ${w.text(QUIETFRAME_VERSION)} reproduces it bit for bit${writtenBy}.`
  );
}
