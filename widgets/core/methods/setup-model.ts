/**
 * The part of a methods text that describes a set-up as the engine modelled it: every
 * component with its parameter values (in the one way quietframe writes quantities), how light
 * and bodies are linked, and the formulas of the model actually used (the damping model's
 * susceptibility and thermal force, the spin ensemble's mapping and response, the definition
 * of every rate and linewidth with its factor convention, the dB sign of squeezing). Shared by
 * the kinds that compute from a set-up (explorer, trajectory).
 */
import { componentKind, log, squeezeFactorFromDb, type ResolvedSetup } from "../../../src/index";
import { classicalSentences } from "./classical-terms";
import { choiceWords, componentTypeWords, parameterWords } from "./parameter-names";
import type { Writer } from "./writers";

type Component = ResolvedSetup["components"][number];

/** One list item per component: its name, type and every parameter value the model used. */
export function componentItems(w: Writer, setup: ResolvedSetup): string[] {
  return setup.components.map((c) => {
    const kind = componentKind(c.type);
    const params: string[] = [];
    for (const p of kind?.params ?? []) {
      const value = c.values[p.name];
      if (value === undefined) continue;
      const words = parameterWords(c.type, p.name);
      const symbol = words.symbol ? ` ${w.math(words.symbol.markdown, words.symbol.latex)}` : "";
      const shown = p.kind === "choice" || typeof value === "string" ? w.text(choiceWords(String(value))) : w.qty(value, p.kind);
      params.push(`${w.text(words.words)}${symbol} = ${shown}`);
    }
    return `${w.code(c.name)} (${w.text(componentTypeWords(c.type))})${params.length ? `: ${params.join(", ")}` : ": no parameters"}`;
  });
}

/** Which way light travels and which bodies are linked. */
export function wiringSentences(w: Writer, setup: ResolvedSetup): string[] {
  const source = setup.source;
  const isMechanical = (pair: readonly [string, string]): boolean => pair.some((end) => end.endsWith(".mechanics") || end.endsWith(".body"));
  const link = (pair: readonly [string, string], joint: string): string => `${w.code(pair[0])} ${joint} ${w.code(pair[1])}`;
  const optical = source.connections.filter((p) => !isMechanical(p)).map((p) => link(p, w.math("→", "\\rightarrow")));
  const mechanical = source.connections.filter(isMechanical).map((p) => link(p, "–"));
  return [optical.length ? `Light travels ${optical.join(", ")}.` : "", mechanical.length ? `Mechanical links: ${mechanical.join(", ")}.` : ""].filter((s) => s !== "");
}

/** The conventions every set-up shares: spectral densities, quadratures, angles, Fourier transform. */
export function conventionSentence(w: Writer): string {
  return (
    `Spectral densities are one-sided and symmetrized (variance ${w.math("= ∫₀^∞ S(f) df", "= \\int_0^\\infty S(f)\\,\\mathrm{d}f")}, ` +
    `${w.math("Ω = 2πf", "\\Omega = 2\\pi f")}). Light quadratures are normalized so that vacuum noise is 1 (one-sided PSD of a quadrature), ` +
    `and quadrature angles are measured from the amplitude quadrature, in degrees. Fourier convention: ` +
    `${w.math("z(t) = ∫ z(Ω) e^{−iΩt} dΩ/2π", "z(t) = \\int z(\\Omega)\\, e^{-i\\Omega t}\\, \\mathrm{d}\\Omega/2\\pi")}. ` +
    `Rates are angular (rad/s) in formulas and written as ${w.math("rate/2π", "\\mathrm{rate}/2\\pi")} in hertz; every linewidth says whether it is the full width at half maximum (FWHM) or the half-width (HWHM).`
  );
}

/** The bodies of the set-up with the damping model of each (an oscillator's own, baths attached). */
interface BodyDamping {
  readonly component: Component;
  readonly free: boolean;
  readonly symmetric: boolean;
  readonly negative: boolean;
  readonly extraBaths: readonly Component[];
}

function bodies(setup: ResolvedSetup): BodyDamping[] {
  const byName = new Map(setup.components.map((c) => [c.name, c]));
  const out: BodyDamping[] = [];
  for (const c of setup.components) {
    if (c.type !== "oscillator" && c.type !== "free-mass") continue;
    const extraBaths = setup.source.connections
      .filter((pair) => pair.some((end) => end === `${c.name}.body`))
      .map((pair) => byName.get((pair[0] === `${c.name}.body` ? pair[1] : pair[0]).split(".")[0]))
      .filter((b): b is Component => b !== undefined && b.type === "thermal-bath");
    out.push({ component: c, free: c.type === "free-mass", symmetric: c.values.damping === "symmetric", negative: c.values.massSign === "negative", extraBaths });
  }
  return out;
}

/** The mechanical model of each body: susceptibility and thermal force of the damping model in use. */
function mechanicalSentences(w: Writer, setup: ResolvedSetup): string[] {
  const out: string[] = [];
  for (const b of bodies(setup)) {
    const name = w.code(b.component.name);
    const sign = b.negative ? ` The effective mass is negative (an inverted oscillator), so ${w.math("χ → −χ", "\\chi \\to -\\chi")} and ${w.math("m", "m")} below is its magnitude.` : "";
    const extra = b.extraBaths.length
      ? ` Attached viscous bath${b.extraBaths.length > 1 ? "s" : ""} ${b.extraBaths.map((x) => w.code(x.name)).join(", ")} add${b.extraBaths.length > 1 ? "" : "s"} the energy damping rate ${w.math("γ_v", "\\gamma_v")} (the sum of their rates) and each a white thermal force of the form below with its own rate and temperature.`
      : "";
    if (b.free) {
      const damped = b.extraBaths.length > 0;
      out.push(
        `${name} is a free mass: ${damped ? w.math("χ(Ω) = 1/(m(−Ω² − iγ_vΩ))", "\\chi(\\Omega) = 1/\\bigl(m(-\\Omega^2 - i\\gamma_v\\Omega)\\bigr)") : w.math("χ(Ω) = −1/(mΩ²)", "\\chi(\\Omega) = -1/(m\\Omega^2)")}.` +
          (damped
            ? ` Each attached viscous bath (energy damping rate ${w.math("γ_b", "\\gamma_b")}, temperature ${w.math("T_b", "T_b")}) brings a white thermal force of one-sided PSD ${w.math("S_F = 4mγ_b k_B T_b", "S_F = 4m\\gamma_b k_B T_b")}, the classical limit of the fluctuation–dissipation theorem (a free mass has no resonance at which to evaluate the quantum form)${w.cite("callen1951")}.`
            : ""),
      );
      continue;
    }
    const gv = b.extraBaths.length > 0;
    if (b.symmetric) {
      const chi = gv
        ? w.math("χ(Ω) = 1/(m(Ω_m² + (γ/2 − iΩ)(γ/2 + γ_v − iΩ)))", "\\chi(\\Omega) = 1/\\bigl(m(\\Omega_m^2 + (\\gamma/2 - i\\Omega)(\\gamma/2 + \\gamma_v - i\\Omega))\\bigr)")
        : w.math("χ(Ω) = 1/(m(Ω_m² + γ²/4 − Ω² − iγΩ))", "\\chi(\\Omega) = 1/\\bigl(m(\\Omega_m^2 + \\gamma^2/4 - \\Omega^2 - i\\gamma\\Omega)\\bigr)");
      const force = gv
        ? w.math(
            "S_F(Ω) = ħmγ coth(ħΩ_m/2k_BT) (Ω_m² + Ω² + (γ/2 + γ_v)²)/Ω_m",
            "S_F(\\Omega) = \\hbar m\\gamma \\coth(\\hbar\\Omega_m/2k_BT)\\,\\bigl(\\Omega_m^2 + \\Omega^2 + (\\gamma/2 + \\gamma_v)^2\\bigr)/\\Omega_m",
          )
        : w.math("S_F(Ω) = ħmγ coth(ħΩ_m/2k_BT) (Ω_m² + Ω² + γ²/4)/Ω_m", "S_F(\\Omega) = \\hbar m\\gamma \\coth(\\hbar\\Omega_m/2k_BT)\\,(\\Omega_m^2 + \\Omega^2 + \\gamma^2/4)/\\Omega_m");
      out.push(
        `${name} is an oscillator with symmetric (amplitude) damping, the Lindblad form that always gives a physical quantum state: in quadratures ${w.math("x = x_zpf X, p = p_zpf P", "x = x_{\\mathrm{zpf}}X,\\ p = p_{\\mathrm{zpf}}P")} with ${w.math("x_zpf p_zpf = ħ", "x_{\\mathrm{zpf}}p_{\\mathrm{zpf}} = \\hbar")}, ` +
          `${w.math("Ẋ = Ω_m P − (γ/2)X + √γ ξ_X", "\\dot X = \\Omega_m P - (\\gamma/2)X + \\sqrt{\\gamma}\\,\\xi_X")} and ${w.math("Ṗ = −Ω_m X − (γ/2)P + √γ ξ_P + F/p_zpf", "\\dot P = -\\Omega_m X - (\\gamma/2)P + \\sqrt{\\gamma}\\,\\xi_P + F/p_{\\mathrm{zpf}}")}, ` +
          `where ${w.math("γ = Ω_m/Q", "\\gamma = \\Omega_m/Q")} is the energy damping rate (FWHM of the resonance in rad/s) and ${w.math("ξ_X, ξ_P", "\\xi_X, \\xi_P")} are independent white noises of one-sided PSD ${w.math("2n̄ + 1 = coth(ħΩ_m/2k_BT)", "2\\bar n + 1 = \\coth(\\hbar\\Omega_m/2k_BT)")}, so the lone mode relaxes to the thermal variance ${w.math("n̄ + 1/2", "\\bar n + 1/2")}${w.cite("gardiner1985")}. ` +
          `Its susceptibility is ${chi}, and its thermal noise, referred to a force on the body, is ${force}${w.cite("callen1951")}.${extra}${sign}`,
      );
    } else {
      const chi = w.math("χ(Ω) = 1/(m(Ω_m² − Ω² − iγΩ))", "\\chi(\\Omega) = 1/\\bigl(m(\\Omega_m^2 - \\Omega^2 - i\\gamma\\Omega)\\bigr)");
      out.push(
        `${name} is an oscillator with viscous damping (Brownian motion): susceptibility ${chi}, where ${w.math("γ = Ω_m/Q", "\\gamma = \\Omega_m/Q")}${gv ? " plus the rates of the attached baths" : ""} is the energy damping rate (FWHM of the resonance in rad/s). ` +
          `Its thermal noise is a white force of one-sided PSD ${w.math("S_F = 2mγħΩ_m coth(ħΩ_m/2k_BT)", "S_F = 2m\\gamma\\hbar\\Omega_m \\coth(\\hbar\\Omega_m/2k_BT)")}, the quantum fluctuation–dissipation theorem evaluated at the resonance (the Markov approximation of a high-Q mode)${w.cite("callen1951")}.${extra}${sign}`,
      );
    }
  }
  return out;
}

function spinSentences(w: Writer, setup: ResolvedSetup): string[] {
  const spins = setup.components.filter((c) => c.type === "spin-ensemble");
  if (!spins.length) return [];
  const names = spins.map((c) => w.code(c.name)).join(", ");
  return [
    `The spin ensemble ${names} is mapped onto one bosonic mode by the Holstein–Primakoff approximation${w.cite("holstein1940")}: the transverse collective spin components divided by ${w.math("√|⟨J_x⟩|", "\\sqrt{|\\langle J_x\\rangle|}")}, with the macroscopic spin ${w.math("|⟨J_x⟩| = pNF", "|\\langle J_x\\rangle| = pNF")}, form quadratures ${w.math("X, P", "X, P")} with ${w.math("[X, P] = i", "[X, P] = i")}, valid while their variance stays below 1 % of ${w.math("pNF", "pNF")}. ` +
      `It is read by travelling light through the Faraday interaction (the light's polarization quadratures mapped onto its amplitude and phase quadratures)${w.cite("hammerer2010")}: ` +
      `${w.math("Ẋ = sΩ_L P − (γ/2)X + noise", "\\dot X = s\\Omega_L P - (\\gamma/2)X + \\text{noise}")}, ${w.math("Ṗ = −sΩ_L X − (γ/2)P + noise + k q_1,in", "\\dot P = -s\\Omega_L X - (\\gamma/2)P + \\text{noise} + k\\,q_{1,\\mathrm{in}}")}, ${w.math("q_2,out = q_2,in + kX", "q_{2,\\mathrm{out}} = q_{2,\\mathrm{in}} + kX")}, ` +
      `where ${w.math("s = +1", "s = +1")} for a spin in its lowest-energy state (positive mass) and ${w.math("−1", "-1")} in its highest (negative mass), ${w.math("Ω_L", "\\Omega_L")} is the Larmor frequency (given, or ${w.math("γ_g B", "\\gamma_g B")}), ` +
      `${w.math("γ = γ_0 + γ_p", "\\gamma = \\gamma_0 + \\gamma_p")} is the total linewidth (FWHM of the spin noise peak in rad/s: intrinsic ${w.math("γ_0 = 2/T_2", "\\gamma_0 = 2/T_2")} or 2π times the given linewidth, plus the probe broadening ${w.math("γ_p", "\\gamma_p")}), ` +
      `each decoherence channel brings white noise of one-sided PSD ${w.math("2n_s + 1", "2n_s + 1")} per quadrature entering through ${w.math("√γ_0", "\\sqrt{\\gamma_0}")} and ${w.math("√γ_p", "\\sqrt{\\gamma_p}")}, and ${w.math("k = 2√Γ", "k = 2\\sqrt{\\Gamma}")} with the readout rate ${w.math("Γ = x_zpf² S̄_FF/ħ²", "\\Gamma = x_{\\mathrm{zpf}}^2\\bar S_{FF}/\\hbar^2")} (${w.math("S̄_FF", "\\bar S_{FF}")} the double-sided back-action PSD, the same definition as a position probe's measurement rate). ` +
      `The response of ${w.math("X", "X")} to a drive on ${w.math("P", "P")} is ${w.math("χ_s(Ω) = sΩ_L/(Ω_L² + γ²/4 − Ω² − iγΩ)", "\\chi_s(\\Omega) = s\\Omega_L/(\\Omega_L^2 + \\gamma^2/4 - \\Omega^2 - i\\gamma\\Omega)")}, the form of a symmetrically damped oscillator.`,
  ];
}

function opticalSentences(w: Writer, setup: ResolvedSetup): string[] {
  const types = new Set(setup.components.map((c) => c.type));
  const out: string[] = [];
  if (types.has("cavity")) {
    out.push(
      `Each cavity is a single optical mode with the input–output relation ${w.math("a_out = a_in − √κ_in a", "a_{\\mathrm{out}} = a_{\\mathrm{in}} - \\sqrt{\\kappa_{\\mathrm{in}}}\\, a")}${w.cite("gardiner1985")}, ` +
        `where ${w.math("κ", "\\kappa")} is the energy decay rate (the full linewidth, FWHM, in rad/s), ${w.math("κ_in", "\\kappa_{\\mathrm{in}}")} its part through the coupling mirror and ${w.math("Δ = ω_L − ω_c", "\\Delta = \\omega_L - \\omega_c")} the detuning (positive is blue); ` +
        `the mean intracavity photon number and the input power are related by ${w.math("n_c = κ_in P_in/(ħω_L(κ²/4 + Δ²))", "n_c = \\kappa_{\\mathrm{in}}P_{\\mathrm{in}}/\\bigl(\\hbar\\omega_L(\\kappa^2/4 + \\Delta^2)\\bigr)")}. ` +
        `The radiation-pressure coupling to the mechanics is linearized about the mean field, ${w.math("G = g_0 √n_c", "G = g_0\\sqrt{n_c}")}${w.cite("aspelmeyer2014")}.`,
    );
    if (setup.components.some((c) => c.type === "cavity" && c.values.detuning !== 0)) {
      // Only a detuned cavity has a mean field turned from its drive; resonant texts stay as they were.
      out.push(
        `The quadratures of the light at a detuned cavity's ports, and so every squeezing and readout angle, refer to the carrier of the laser that drives it (the homodyne's local oscillator is taken from that laser); ` +
          `the mode's own quadratures are those of its mean field ${w.math("ā = √κ_in ā_in/(κ/2 − iΔ)", "\\bar a = \\sqrt{\\kappa_{\\mathrm{in}}}\\,\\bar a_{\\mathrm{in}}/(\\kappa/2 - i\\Delta)")}, turned from the laser's by ${w.math("θ = arg(κ/2 + iΔ)", "\\theta = \\arg(\\kappa/2 + i\\Delta)")}, ` +
          `so the incoming light enters the mode turned by ${w.math("−θ", "-\\theta")} and the reflected light leaves turned back by ${w.math("+θ", "+\\theta")}.`,
      );
    }
  }
  if (types.has("position-probe")) {
    out.push(
      `A position probe reads the body's position into the phase quadrature of reflected light and pushes it with the amplitude quadrature; it is quantum limited, imprecision × back-action = ${w.math("ħ²", "\\hbar^2")} (one-sided PSDs)${w.cite("braginsky1992", "clerk2010")}. ` +
        `Its strength is the reflected power ${w.math("P", "P")} (back-action force PSD ${w.math("S_F = 8ħωP/c²", "S_F = 8\\hbar\\omega P/c^2")}) or the measurement rate ${w.math("Γ_meas = x_zpf² S̄_FF/ħ²", "\\Gamma_{\\mathrm{meas}} = x_{\\mathrm{zpf}}^2\\bar S_{FF}/\\hbar^2")} with ${w.math("S̄_FF", "\\bar S_{FF}")} the double-sided back-action force PSD.`,
    );
  }
  if (types.has("interferometer")) {
    out.push(
      `The interferometer follows the two-photon input–output relations of a tuned Michelson interferometer with arm cavities of half-width ${w.math("γ", "\\gamma")} (HWHM in rad/s: the intracavity field decays at ${w.math("γ", "\\gamma")}) and circulating power ${w.math("P_arm", "P_{\\mathrm{arm}}")}${w.cite("kimble2001")}.`,
    );
    if (setup.components.some((c) => c.type === "interferometer" && c.values.srcLength !== undefined)) {
      out.push(
        `The idler carrier sits one free spectral range above the signal carrier, ${w.math("Δω = 2π(c/2L + Δ_i/2π)", "\\Delta\\omega = 2\\pi(c/2L + \\Delta_i/2\\pi)")}; its one-way phase in the signal-recycling cavity of length ${w.math("ℓ", "\\ell")} is ` +
          `${w.math("φ_i = φ + Δω ℓ/c", "\\phi_i = \\phi + \\Delta\\omega\\,\\ell/c")} modulo 2π, the one-way phase growing with the carrier frequency.`,
      );
    }
  }
  const squeezers = setup.components.filter((c) => c.type === "squeezed" || c.type === "entangled-source");
  for (const c of squeezers) {
    const r = typeof c.values.r === "number" ? c.values.r : squeezeFactorFromDb(c.values.squeezing as number);
    const db = typeof c.values.squeezing === "number" ? c.values.squeezing : (-20 * r) / log(10);
    const two = c.type === "entangled-source";
    out.push(
      `${w.code(c.name)}: ${two ? "two-mode squeezing" : "squeezing"} is written in dB as ${w.math("10 log₁₀ e^{−2r}", "10\\log_{10}e^{-2r}")}, negative for noise below vacuum; ` +
        `${w.qty(db, "decibel")} means ${w.math("r", "r")} = ${w.qty(r, "number")}. ` +
        (two
          ? `The noise of ${w.math("X_1 − X_2", "X_1 - X_2")} and of ${w.math("P_1 + P_2", "P_1 + P_2")} is ${w.math("e^{−2r}", "e^{-2r}")} of vacuum (at zero sideband frequency for a source of finite linewidth; its linewidth ${w.math("κ", "\\kappa")} is the FWHM of each mode)${w.cite("weedbrook2012")}.`
          : `The squeezed quadrature has noise ${w.math("e^{−2r}", "e^{-2r}")} of vacuum and the orthogonal one ${w.math("e^{2r}", "e^{2r}")}${w.cite("caves1981", "kimble2001")}.`),
    );
  }
  if (types.has("homodyne") || types.has("loss") || types.has("beam-splitter")) {
    out.push(
      `Optical loss and detection inefficiency admit vacuum noise in the lost fraction of the power; a homodyne detector at angle ${w.math("φ", "\\phi")} reads ${w.math("cos φ · amplitude + sin φ · phase", "\\cos\\phi\\cdot\\text{amplitude} + \\sin\\phi\\cdot\\text{phase}")}.`,
    );
  }
  return out;
}

/** The model's formulas, component by component, each with its source. */
export function modelSentences(w: Writer, setup: ResolvedSetup): string[] {
  return [...mechanicalSentences(w, setup), ...spinSentences(w, setup), ...opticalSentences(w, setup), ...classicalSentences(w, setup)];
}
