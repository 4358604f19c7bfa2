import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { QuietframeError } from "../../src/errors";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { cavityReadout, sumTerms } from "../helpers/setups";

/**
 * Precision at extreme scales, against the closed forms of Aspelmeyer, Kippenberg & Marquardt,
 * Rev. Mod. Phys. 86, 1391 (2014), Sec. VI.B, for a resonantly driven one-sided cavity
 * (one-sided, twice their double-sided spectra):
 *   back-action force  S_FF(Ω) = 2ħ²G²n̄κ / ((κ/2)² + Ω²), referred to displacement by |χ(Ω)|²,
 *   imprecision        S_xx(Ω) = κ/(8n̄G²) · (1 + 4Ω²/κ²),
 * with χ = 1/(m(Ω_m² − Ω² − iγΩ)) and G = ω_L/L for a moving end mirror.
 */
const LENGTH = 1e-3;
const WAVELENGTH = 1064e-9;
const G = (2 * Math.PI * SPEED_OF_LIGHT) / WAVELENGTH / LENGTH;
const EPS = Number.EPSILON;

interface Scales {
  mass: number;
  /** Mechanical resonance in Hz; 0 for a free mass. */
  fm: number;
  Q: number;
  linewidth: number;
  photons: number;
}

/** Worst relative errors of the back-action and imprecision terms over 1e-3 … 1e9 Hz. */
function worstErrors(s: Scales): { backAction: number; imprecision: number } {
  const body: Record<string, string | number> = s.fm > 0 ? { mass: `${s.mass} kg`, frequency: `${s.fm} Hz`, Q: s.Q, temperature: "0 K" } : { mass: `${s.mass} kg` };
  const doc = cavityReadout({
    bodyType: s.fm > 0 ? "oscillator" : "free-mass",
    body,
    cavity: { linewidth: `${s.linewidth} Hz`, photons: s.photons, length: `${LENGTH} m`, wavelength: `${WAVELENGTH} m` },
  });
  const b = evaluateSetup(loadSetup(doc), { from: 1e-3, to: 1e9, points: 25 }).budget;
  const ba = sumTerms(b.terms, "amplitude");
  const imp = sumTerms(b.terms, "phase");
  const kappa = 2 * Math.PI * s.linewidth;
  const wm = 2 * Math.PI * s.fm;
  const gamma = s.fm > 0 ? wm / s.Q : 0;
  let backAction = 0;
  let imprecision = 0;
  for (let i = 0; i < b.frequencies.length; i++) {
    const w = 2 * Math.PI * b.frequencies[i];
    const dr = s.mass * (wm * wm - w * w);
    const di = -s.mass * gamma * w;
    const chi2 = 1 / (dr * dr + di * di);
    const expectedBa = ((2 * HBAR * HBAR * G * G * s.photons * kappa) / ((kappa * kappa) / 4 + w * w)) * chi2;
    const expectedImp = (kappa / (8 * s.photons * G * G)) * (1 + (4 * w * w) / (kappa * kappa));
    backAction = Math.max(backAction, Math.abs(ba[i] / expectedBa - 1));
    imprecision = Math.max(imprecision, Math.abs(imp[i] / expectedImp - 1));
  }
  return { backAction, imprecision };
}

describe("precision when the time scales of one set-up are twelve decades apart", () => {
  it.each([1e-21, 1e3])("a 1e9 Hz cavity read at 1e-3 Hz: free mass of %d kg, to 1e-11", (mass) => {
    const e = worstErrors({ mass, fm: 0, Q: 0, linewidth: 1e9, photons: 1e6 });
    expect(e.backAction).toBeLessThan(1e-11);
    expect(e.imprecision).toBeLessThan(1e-11);
  });

  it.each([1e-21, 1e3])("a 1e9 Hz cavity and a 1 mHz oscillator (Q = 1e10) of %d kg, to 1e-10", (mass) => {
    const e = worstErrors({ mass, fm: 1e-3, Q: 1e10, linewidth: 1e9, photons: 1e6 });
    expect(e.backAction).toBeLessThan(1e-10);
    expect(e.imprecision).toBeLessThan(1e-10);
  });

  /*
   * On resonance the response of a mode of quality Q depends on Ω_m² − Ω², which rounding
   * knows only to about ε·Ω_m², against the damping term Ω_m²/Q: the problem itself has a
   * condition number about Q there, so no evaluation can do better than ~ε·Q (common
   * practice, no source). The grid 1e-3 … 1e9 Hz hits 1 mHz and 1 GHz resonances exactly.
   */
  const corners: Scales[] = [];
  for (const mass of [1e-21, 1e3]) for (const fm of [1e-3, 1e9]) for (const linewidth of [1e-3, 1e9]) for (const photons of [1, 1e12]) corners.push({ mass, fm, Q: 1e10, linewidth, photons });
  it.each(corners)("corner m = $mass kg, f_m = $fm Hz, κ/2π = $linewidth Hz, n = $photons: within 10·ε·Q of the closed forms", (s) => {
    const e = worstErrors(s);
    expect(e.backAction).toBeLessThan(10 * EPS * s.Q);
    expect(e.imprecision).toBeLessThan(10 * EPS * s.Q);
  });

  it("beyond the accepted Q the loss of precision is refused, not computed silently", () => {
    let caught: unknown;
    try {
      worstErrors({ mass: 1e-9, fm: 1e6, Q: 1e14, linewidth: 1e7, photons: 1e6 });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(QuietframeError);
    expect((caught as QuietframeError).path).toBe("components.body.Q");
    expect((caught as QuietframeError).problem).toMatch(/double precision/);
  });
});
