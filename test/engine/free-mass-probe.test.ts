import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { freeMassDisplacementSql, freeMassForceSql } from "../../src/reference/limits";
import { expectAllClose } from "../helpers/close";
import { probedBody, sumTerms } from "../helpers/setups";

const MASS = 1e-3; // kg
const WAVELENGTH = 1064e-9;
const OMEGA_LASER = (2 * Math.PI * SPEED_OF_LIGHT) / WAVELENGTH;

/** Reflected power whose back-action force PSD 8ħωP/c² equals ħ m Ω_q² (the SQL is touched at Ω_q). */
function powerTouchingAt(fq: number): number {
  const omegaQ = 2 * Math.PI * fq;
  return (HBAR * MASS * omegaQ ** 2 * SPEED_OF_LIGHT ** 2) / (8 * HBAR * OMEGA_LASER);
}

function run(power: number, efficiency: number, referTo: "displacement" | "force", points = 201) {
  const s = loadSetup(probedBody({ body: { mass: `${MASS} kg` }, probe: { power: `${power} W`, wavelength: "1064 nm" }, efficiency, referTo }));
  return evaluateSetup(s, { from: 1, to: 1e4, points }).budget;
}

describe("free mass read by a quantum-limited position probe", () => {
  const power = powerTouchingAt(100);

  it("prints the free-mass SQL 2ħ/(mΩ²) beside the budget (Kimble et al., PRD 65, 022002 (2001))", () => {
    const b = run(power, 1, "displacement");
    const sql = b.references.find((r) => r.id === "sql")!;
    expectAllClose(
      sql.psd,
      Array.from(b.frequencies, (f) => freeMassDisplacementSql(MASS, 2 * Math.PI * f)),
      1e-12,
      "SQL",
    );
    const force = run(power, 1, "force").references.find((r) => r.id === "sql")!;
    expectAllClose(
      force.psd,
      Array.from(b.frequencies, (f) => freeMassForceSql(MASS, 2 * Math.PI * f)),
      1e-12,
      "force SQL",
    );
  });

  it("has imprecision × back-action = ħ²/η, one-sided (Braginsky & Khalili 1992; Clerk et al., RMP 82, 1155 (2010))", () => {
    for (const eta of [1, 0.8, 0.3]) {
      const xb = run(power, eta, "displacement");
      const fb = run(power, eta, "force");
      const imprecision = sumTerms(xb.terms, "phase quadrature", "detection");
      const backAction = sumTerms(fb.terms, "amplitude quadrature");
      const product = imprecision.map((v, i) => v * backAction[i]);
      expectAllClose(product, new Float64Array(product.length).fill(HBAR ** 2 / eta), 1e-9, `η = ${eta}`);
    }
  });

  it("matches the closed form S_x = ħ²/(ηS_F) + S_F/(m²Ω⁴) with S_F = 8ħωP/c² (derived from the probe's definition)", () => {
    const eta = 0.9;
    const b = run(power, eta, "displacement");
    const sF = (8 * HBAR * OMEGA_LASER * power) / SPEED_OF_LIGHT ** 2;
    const expected = Array.from(b.frequencies, (f) => HBAR ** 2 / (eta * sF) + sF / (MASS ** 2 * (2 * Math.PI * f) ** 4));
    expectAllClose(b.total, expected, 1e-9, "total");
  });

  it("touches the SQL at exactly one frequency and stays above it elsewhere (η = 1)", () => {
    // 201 log points over 1 Hz – 10 kHz put a grid point exactly at 100 Hz.
    const b = run(power, 1, "displacement");
    const sql = b.references.find((r) => r.id === "sql")!.psd;
    const ratio = b.total.map((v, i) => v / sql[i]);
    const at100 = b.frequencies.findIndex((f) => Math.abs(f - 100) < 1e-9);
    expect(at100).toBeGreaterThan(0);
    expect(Math.abs(ratio[at100] - 1)).toBeLessThan(1e-9);
    const touching = Array.from(ratio).filter((r) => r < 1 + 1e-9).length;
    expect(touching).toBe(1);
    expect(Math.min(...ratio)).toBeGreaterThanOrEqual(1 - 1e-12);
  });

  it("the SQL-touching frequency moves as √P: four times the power doubles it", () => {
    const b = run(4 * power, 1, "displacement");
    const sql = b.references.find((r) => r.id === "sql")!.psd;
    const at200 = b.frequencies.reduce((best, f, i) => (Math.abs(f - 200) < Math.abs(b.frequencies[best] - 200) ? i : best), 0);
    const atf = b.frequencies[at200];
    // Exact closed form at the nearest grid point: (K + 1/K)/2 with K = (200/f)².
    const K = (200 / atf) ** 2;
    expect(Math.abs(b.total[at200] / sql[at200] - (K + 1 / K) / 2)).toBeLessThan(1e-9);
  });

  it("reports a free mass as marginal (no stationary state) but evaluates spectra", () => {
    const s = loadSetup(probedBody({ body: { mass: "1 kg" }, probe: { power: "1 mW" } }));
    const e = evaluateSetup(s, { from: 10, to: 100, points: 3 });
    expect(e.stability.growing).toHaveLength(0);
    expect(e.stability.undamped.length).toBeGreaterThan(0);
    expect(e.warnings.join(" ")).toMatch(/marginal.*'body'/);
  });
});
