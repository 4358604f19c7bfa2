/**
 * Words and symbols for components and parameters in a methods text: a paper says "effective
 * mass m" and "Larmor frequency f_L", not "mass" or "larmorFrequency". Parameters not listed
 * here are named by splitting the identifier into lower-case words.
 */

export interface ParameterWords {
  readonly words: string;
  /** The symbol as Unicode and as LaTeX math, where the paper's formulas use one. */
  readonly symbol?: { readonly markdown: string; readonly latex: string };
}

import { componentKind, type QuantityKind, type SetupDescription } from "../../../src/index";

const sym = (markdown: string, latex: string) => ({ markdown, latex });

/** By component type, then parameter name. */
const PARAMETERS: Readonly<Record<string, Readonly<Record<string, ParameterWords>>>> = {
  oscillator: {
    mass: { words: "effective mass", symbol: sym("m", "m") },
    frequency: { words: "resonance frequency", symbol: sym("Ω_m/2π", "\\Omega_m/2\\pi") },
    Q: { words: "quality factor", symbol: sym("Q", "Q") },
    temperature: { words: "bath temperature", symbol: sym("T", "T") },
    massSign: { words: "sign of the effective mass" },
    damping: { words: "damping model" },
  },
  "free-mass": { mass: { words: "mass", symbol: sym("m", "m") } },
  "thermal-bath": {
    temperature: { words: "bath temperature", symbol: sym("T", "T") },
    dampingRate: { words: "energy damping rate", symbol: sym("γ/2π", "\\gamma/2\\pi") },
  },
  cavity: {
    linewidth: { words: "full linewidth (FWHM)", symbol: sym("κ/2π", "\\kappa/2\\pi") },
    detuning: { words: "detuning", symbol: sym("Δ/2π", "\\Delta/2\\pi") },
    inputCoupling: { words: "input-coupling fraction", symbol: sym("κ_in/κ", "\\kappa_{\\mathrm{in}}/\\kappa") },
    wavelength: { words: "wavelength", symbol: sym("λ", "\\lambda") },
    photons: { words: "mean intracavity photon number", symbol: sym("n_c", "n_c") },
    power: { words: "input power", symbol: sym("P_in", "P_{\\mathrm{in}}") },
    g0: { words: "vacuum optomechanical coupling", symbol: sym("g_0/2π", "g_0/2\\pi") },
    length: { words: "cavity length", symbol: sym("L", "L") },
  },
  "position-probe": {
    power: { words: "reflected probe power", symbol: sym("P", "P") },
    wavelength: { words: "wavelength", symbol: sym("λ", "\\lambda") },
    measurementRate: { words: "measurement rate", symbol: sym("Γ_meas/2π", "\\Gamma_{\\mathrm{meas}}/2\\pi") },
  },
  "spin-ensemble": {
    atoms: { words: "number of atoms", symbol: sym("N", "N") },
    spin: { words: "spin of each atom", symbol: sym("F", "F") },
    polarization: { words: "polarization", symbol: sym("p", "p") },
    occupation: { words: "occupation of the spin oscillator", symbol: sym("n_s", "n_s") },
    larmorFrequency: { words: "Larmor frequency", symbol: sym("Ω_L/2π", "\\Omega_L/2\\pi") },
    carrierOffset: { words: "carrier offset of the reading light", symbol: sym("Δ/2π", "\\Delta/2\\pi") },
    field: { words: "bias field", symbol: sym("B", "B") },
    gyromagneticRatio: { words: "gyromagnetic ratio", symbol: sym("γ_g", "\\gamma_g") },
    linewidth: { words: "intrinsic linewidth (FWHM)", symbol: sym("γ_0/2π", "\\gamma_0/2\\pi") },
    t2: { words: "transverse coherence time", symbol: sym("T_2", "T_2") },
    probeBroadening: { words: "probe broadening (FWHM)", symbol: sym("γ_p/2π", "\\gamma_p/2\\pi") },
    readoutRate: { words: "readout rate", symbol: sym("Γ/2π", "\\Gamma/2\\pi") },
    orientation: { words: "orientation" },
  },
  interferometer: {
    mass: { words: "mass of each test mass", symbol: sym("m", "m") },
    armLength: { words: "arm length", symbol: sym("L", "L") },
    armBandwidth: { words: "arm-cavity half-width (HWHM)", symbol: sym("γ/2π", "\\gamma/2\\pi") },
    power: { words: "circulating arm power", symbol: sym("P_arm", "P_{\\mathrm{arm}}") },
    wavelength: { words: "wavelength", symbol: sym("λ", "\\lambda") },
    opticalLoss: { words: "round-trip loss per arm", symbol: sym("ε", "\\epsilon") },
    srmTransmission: { words: "signal-recycling mirror power transmission", symbol: sym("T_s", "T_{\\mathrm{s}}") },
    srDetuning: { words: "one-way detuning phase of the signal-recycling cavity", symbol: sym("φ", "\\phi") },
    signalBandwidth: { words: "half-width of the signal-recycled arm mode (HWHM)", symbol: sym("ε/2π", "\\epsilon/2\\pi") },
    signalDetuning: { words: "detuning of the signal-recycled arm mode", symbol: sym("λ/2π", "\\lambda/2\\pi") },
    idlerDetuning: { words: "detuning of the idler carrier from the nearest arm resonance", symbol: sym("Δ_i/2π", "\\Delta_i/2\\pi") },
    idlerSrDetuning: { words: "one-way detuning phase of the signal-recycling cavity at the idler carrier", symbol: sym("φ_i", "\\phi_i") },
    srcLength: { words: "signal-recycling cavity length", symbol: sym("ℓ", "\\ell") },
    lengthControl: { words: "arm-length control" },
  },
  "filter-cavity": {
    length: { words: "filter-cavity length", symbol: sym("L_f", "L_{\\mathrm{f}}") },
    detuning: { words: "filter-cavity detuning", symbol: sym("Δ_f/2π", "\\Delta_{\\mathrm{f}}/2\\pi") },
    inputTransmission: { words: "input-mirror power transmission", symbol: sym("T_f", "T_{\\mathrm{f}}") },
    roundTripLoss: { words: "round-trip loss besides the input mirror", symbol: sym("ε_f", "\\epsilon_{\\mathrm{f}}") },
  },
  squeezed: {
    squeezing: { words: "squeezing (noise of the squeezed quadrature relative to vacuum)", symbol: sym("10 log₁₀ e^{−2r}", "10\\log_{10}e^{-2r}") },
    r: { words: "squeeze factor", symbol: sym("r", "r") },
    angle: { words: "squeezing angle from the amplitude quadrature", symbol: sym("θ", "\\theta") },
  },
  "entangled-source": {
    squeezing: { words: "two-mode squeezing", symbol: sym("10 log₁₀ e^{−2r}", "10\\log_{10}e^{-2r}") },
    r: { words: "two-mode squeeze factor", symbol: sym("r", "r") },
    wavelength1: { words: "wavelength of beam 1", symbol: sym("λ_1", "\\lambda_1") },
    wavelength2: { words: "wavelength of beam 2", symbol: sym("λ_2", "\\lambda_2") },
    efficiency1: { words: "transmission of arm 1", symbol: sym("η_1", "\\eta_1") },
    efficiency2: { words: "transmission of arm 2", symbol: sym("η_2", "\\eta_2") },
    bandwidth: { words: "linewidth of each mode (FWHM)", symbol: sym("κ/2π", "\\kappa/2\\pi") },
  },
  homodyne: {
    angle: { words: "readout angle from the amplitude quadrature", symbol: sym("φ", "\\phi") },
    efficiency: { words: "quantum efficiency", symbol: sym("η", "\\eta") },
  },
  "beam-splitter": { transmission: { words: "power transmission", symbol: sym("T", "T") } },
  loss: { transmission: { words: "power transmission", symbol: sym("η", "\\eta") } },
  coherent: {
    amplitudeExcess: { words: "amplitude noise above shot noise" },
    phaseExcess: { words: "phase noise above shot noise" },
  },
};

/** "measurementRate" → "measurement rate"; "g0" stays "g0". */
export function identifierWords(name: string): string {
  return name
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .replace(/[-_]+/g, " ")
    .toLowerCase();
}

export function parameterWords(type: string, name: string): ParameterWords {
  return PARAMETERS[type]?.[name] ?? { words: identifierWords(name) };
}

/** "position-probe" → "position probe". */
export function componentTypeWords(type: string): string {
  return identifierWords(type);
}

/** Choice values in words: "negative-mass" → "negative mass". */
export function choiceWords(value: string): string {
  return identifierWords(value);
}

/** The quantity kind of "component.parameter" in a set-up, or undefined for a choice or an unknown target. */
export function parameterKind(setup: SetupDescription, target: string): QuantityKind | undefined {
  const dot = target.indexOf(".");
  const type = setup.components.find((c) => c.name === target.slice(0, dot))?.type;
  const spec = type ? componentKind(type)?.params.find((p) => p.name === target.slice(dot + 1)) : undefined;
  return spec && spec.kind !== "choice" ? spec.kind : undefined;
}
