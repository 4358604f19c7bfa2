/**
 * The methods export of an entangled-light panel (Markdown, LaTeX, BibTeX): the source and its
 * losses, the covariance convention, the closed forms of the variances shown and the
 * entanglement measures, with the panel's values.
 */
import { methodsDocument, type MethodsDocument, type MethodsOptions } from "../../core/methods/document";
import { reproduceSentence } from "../../core/methods/reproduce";
import type { Writer } from "../../core/methods/writers";
import { entangledFingerprint } from "../csv";
import { spectrumFrequencies, type EntangledComputation, type EntangledState } from "../model";

export function entangledMethods(state: EntangledState, computation: EntangledComputation, options: MethodsOptions = {}): MethodsDocument {
  return methodsDocument(
    `Methods: ${state.title}`,
    (w) => [
      w.paragraph("Source", sourceSentence(w, state, computation)),
      w.paragraph("Conventions", conventionSentence(w)),
      w.paragraph("Closed forms", closedFormSentence(w)),
      w.paragraph("Measures", measuresSentence(w, computation)),
      ...(state.bandwidth === null ? [] : [w.paragraph("Spectra", spectrumSentence(w, state))]),
      w.paragraph(
        "Reproducibility",
        `${reproduceSentence(w, { stateFile: options.stateFile, writtenBy: state.quietframe, fingerprint: entangledFingerprint(computation), hashes: "the panel's CSV tables in their order (spectra, summary numbers, covariance, contours; docs/fingerprint.md)", recomputed: true })} Every number above follows from the closed forms at the stated values.`,
      ),
    ],
    options,
  );
}

function sourceSentence(w: Writer, state: EntangledState, c: EntangledComputation): string {
  const squeeze =
    state.squeeze.unit === "dB"
      ? `two-mode squeezing ${w.qty(state.squeeze.value, "decibel")} (written as ${w.math("10 log₁₀ e^{−2r}", "10\\log_{10}e^{-2r}")}, negative below vacuum), that is ${w.math("r", "r")} = ${w.qty(c.r, "number")}`
      : `squeeze factor ${w.math("r", "r")} = ${w.qty(c.r, "number")}`;
  const band =
    state.bandwidth === null
      ? "The source is white (broadband)."
      : `The two modes are those of a non-degenerate parametric oscillator below threshold with equal linewidths ${w.math("κ/2π", "\\kappa/2\\pi")} = ${w.qty(state.bandwidth, "frequency")} (FWHM); the squeezing is the one at zero sideband frequency, and the variances below are of the modes at zero sideband frequency.`;
  return (
    `A two-mode squeezed (EPR) source with ${squeeze}, amplitude quadratures correlated and phase quadratures anti-correlated${w.cite("weedbrook2012")}. ` +
    `Arm 1 reaches its detector with power transmission ${w.math("η_1", "\\eta_1")} = ${w.qty(state.efficiency1, "fraction")} and arm 2 with ${w.math("η_2", "\\eta_2")} = ${w.qty(state.efficiency2, "fraction")}; loss admits vacuum in the lost fraction. ${band}`
  );
}

function conventionSentence(w: Writer): string {
  return (
    `Covariance matrix ${w.math("V_ij = ⟨{z_i, z_j}⟩/2 − ⟨z_i⟩⟨z_j⟩", "V_{ij} = \\langle\\{z_i, z_j\\}\\rangle/2 - \\langle z_i\\rangle\\langle z_j\\rangle")} over ${w.math("z = (X_1, P_1, X_2, P_2)", "z = (X_1, P_1, X_2, P_2)")} with ${w.math("[X_j, P_j] = i", "[X_j, P_j] = i")}, so vacuum has ${w.math("V = I/2", "V = I/2")} (each quadrature's vacuum variance is 1/2). ` +
    `Levels in dB are ${w.math("10 log₁₀", "10\\log_{10}")} of a variance relative to the vacuum variance of the same quantity (1/2 for one quadrature, 1 for ${w.math("X_1 − X_2", "X_1 - X_2")}); negative means below vacuum.`
  );
}

function closedFormSentence(w: Writer): string {
  return (
    `With ${w.math("a_j = η_j cosh 2r + 1 − η_j", "a_j = \\eta_j\\cosh 2r + 1 - \\eta_j")} and ${w.math("c = √(η_1η_2) sinh 2r", "c = \\sqrt{\\eta_1\\eta_2}\\,\\sinh 2r")}, ` +
    `${w.math("V = ½ [[a_1, 0, c, 0], [0, a_1, 0, −c], [c, 0, a_2, 0], [0, −c, 0, a_2]]", "V = \\tfrac12\\begin{pmatrix} a_1 & 0 & c & 0\\\\ 0 & a_1 & 0 & -c\\\\ c & 0 & a_2 & 0\\\\ 0 & -c & 0 & a_2\\end{pmatrix}")}, so ` +
    `${w.math("Var(X_1 − X_2) = Var(P_1 + P_2) = (a_1 + a_2 − 2c)/2", "\\mathrm{Var}(X_1 - X_2) = \\mathrm{Var}(P_1 + P_2) = (a_1 + a_2 - 2c)/2")} (${w.math("e^{−2r}", "e^{-2r}")} without loss) and ` +
    `${w.math("Var(X_1 | X_2) = (a_1 − c²/a_2)/2", "\\mathrm{Var}(X_1 \\mid X_2) = (a_1 - c^2/a_2)/2")}, the variance of arm 1's amplitude quadrature given an ideal homodyne measurement of arm 2's (the Schur complement of ${w.math("V", "V")}).`
  );
}

function measuresSentence(w: Writer, c: EntangledComputation): string {
  return (
    `Duan sum ${w.math("Var(X_1 − X_2) + Var(P_1 + P_2)", "\\mathrm{Var}(X_1 - X_2) + \\mathrm{Var}(P_1 + P_2)")} = ${w.qty(c.duanSum, "number")}, where every separable state has at least ${w.qty(c.duanBound, "number")}, so a smaller value proves entanglement${w.cite("duan2000")}; ` +
    `logarithmic negativity ${w.math("E_N = max(0, −log₂ 2ν̃₋)", "E_N = \\max(0, -\\log_2 2\\tilde\\nu_-)")} = ${w.qty(c.logNegativity, "number")} ebits, with ${w.math("ν̃₋", "\\tilde\\nu_-")} the smaller symplectic eigenvalue of the partially transposed covariance${w.cite("vidal2002")}; ` +
    `${w.math("Var(X_1 − X_2)", "\\mathrm{Var}(X_1 - X_2)")} = ${w.qty(c.eprX, "number")}, ${w.math("Var(P_1 + P_2)", "\\mathrm{Var}(P_1 + P_2)")} = ${w.qty(c.eprP, "number")}, ${w.math("Var(X_1 | X_2)", "\\mathrm{Var}(X_1 \\mid X_2)")} = ${w.qty(c.conditionalVariance, "number")} (${w.qty(c.conditionalDb, "decibel")} relative to vacuum).`
  );
}

function spectrumSentence(w: Writer, state: EntangledState): string {
  const f = spectrumFrequencies(state.bandwidth);
  return (
    `Spectra are shown at ${f.length} logarithmically spaced sideband frequencies from ${w.qty(f[0], "frequency")} to ${w.qty(f[f.length - 1], "frequency")}. At angular sideband frequency ${w.math("Ω", "\\Omega")} the cavity filters the squeezed and anti-squeezed combinations: ` +
    `${w.math("e^{−2r(Ω)} = ((κ/2 − ε)² + Ω²)/((κ/2 + ε)² + Ω²)", "e^{-2r(\\Omega)} = \\bigl((\\kappa/2 - \\epsilon)^2 + \\Omega^2\\bigr)/\\bigl((\\kappa/2 + \\epsilon)^2 + \\Omega^2\\bigr)")} with the pump parameter ${w.math("ε = (κ/2) tanh(r/2)", "\\epsilon = (\\kappa/2)\\tanh(r/2)")}, and the closed forms above hold with ${w.math("r(Ω)", "r(\\Omega)")}.`
  );
}
