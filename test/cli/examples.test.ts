import { readdirSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { HBAR } from "../../src/constants";
import { runCli } from "../../src/cli/run";
import { freeMassDisplacementSql } from "../../src/reference/limits";

/**
 * `quietframe eval` on every shipped example prints finite numbers, and the SQL column
 * matches the closed form of the example's body to better than 1e-9 relative:
 * 2ħ/(mΩ²) for a free mass (Kimble et al. 2001), 2ħ|χ| with χ = 1/(m(Ω_m² − Ω² − iγΩ))
 * for an oscillator (Clerk et al. 2010), h_SQL² = 8ħ/(mΩ²L²) for the strain of an
 * interferometer with four test masses m and arms L (Kimble et al. 2001).
 */
const EXAMPLES = join(__dirname, "..", "..", "examples");

function evalJson(file: string) {
  let out = "";
  const code = runCli(["eval", join(EXAMPLES, file), "--format", "json", "--psd"], { out: (s) => (out += s), err: () => {} });
  expect(code).toBe(0);
  return JSON.parse(out) as { frequencies: { values: number[] }; columns: { id: string; values: (number | null)[] }[] };
}

const sqlClosedForm: Record<string, (f: number) => number> = {
  "free-test-mass.json": (f) => freeMassDisplacementSql(0.1, 2 * Math.PI * f),
  "test-mirror-classical-noise.json": (f) => freeMassDisplacementSql(0.1, 2 * Math.PI * f),
  "test-mirror-laser-noise.json": (f) => freeMassDisplacementSql(0.1, 2 * Math.PI * f),
  "cryogenic-membrane.json": (f) => membraneSql(f),
  "cryogenic-membrane-squeezed.json": (f) => membraneSql(f),
  "hybrid-spin-reference.json": (f) => hybridMembraneSql(f),
  "long-baseline-detector.json": (f) => (8 * HBAR) / (40 * (2 * Math.PI * f) ** 2 * 4000 ** 2),
};

/**
 * The membrane of hybrid-spin-reference.json (4 ng, 1.1 MHz, Q = 2e7) has symmetric (amplitude)
 * damping, χ = 1/(m(Ω_m² + γ²/4 − Ω² − iγΩ)) (the form of a Lindblad-damped mode, derived in
 * src/physics/mechanics.ts), so 2ħ|χ| = 2ħ/(m √((Ω_m² + γ²/4 − Ω²)² + γ²Ω²)).
 */
function hybridMembraneSql(f: number): number {
  const m = 4e-12;
  const wm = 2 * Math.PI * 1.1e6;
  const w = 2 * Math.PI * f;
  const gamma = wm / 2e7;
  return (2 * HBAR) / (m * Math.hypot(wm ** 2 + gamma ** 2 / 4 - w ** 2, gamma * w));
}

function membraneSql(f: number): number {
  const m = 5e-12;
  const wm = 2 * Math.PI * 1.2e6;
  const w = 2 * Math.PI * f;
  const gamma = wm / 1e8;
  // |χ| = 1/(m √((Ω_m² − Ω²)² + γ²Ω²))
  return (2 * HBAR) / (m * Math.hypot(wm ** 2 - w ** 2, gamma * w));
}

describe("shipped examples through the CLI", () => {
  it("every example has a closed-form SQL check here", () => {
    expect(
      readdirSync(EXAMPLES)
        .filter((f) => f.endsWith(".json"))
        .sort(),
    ).toEqual(Object.keys(sqlClosedForm).sort());
  });

  it.each(Object.keys(sqlClosedForm))("%s: finite numbers and the SQL column within 1e-9 of the closed form", (file) => {
    const doc = evalJson(file);
    for (const c of doc.columns) for (const v of c.values) expect(v !== null && Number.isFinite(v) && v >= 0).toBe(true);
    const sql = doc.columns.find((c) => c.id === "sql")!.values as number[];
    doc.frequencies.values.forEach((f, i) => {
      expect(Math.abs(sql[i] / sqlClosedForm[file](f) - 1), `at ${f} Hz`).toBeLessThan(1e-9);
    });
  });

  it("test-mirror-classical-noise.json: its classical terms are columns of their own", () => {
    const ids = evalJson("test-mirror-classical-noise.json").columns.map((c) => c.id);
    expect(ids.some((id) => id.startsWith("coil-driver"))).toBe(true);
    expect(ids.some((id) => id.startsWith("floor"))).toBe(true);
  });

  it("test-mirror-laser-noise.json: the drive laser's intensity and frequency noise are columns of their own", () => {
    const ids = evalJson("test-mirror-laser-noise.json").columns.map((c) => c.id);
    expect(ids.some((id) => id.startsWith("laser-rin"))).toBe(true);
    expect(ids.some((id) => id.startsWith("laser-frequency"))).toBe(true);
  });

  it("spectra/test-mirror-coil-driver-file.json reads the coil-driver spectrum from its CSV file: the same column as the inline table", () => {
    const inline = evalJson("test-mirror-classical-noise.json");
    const fromFile = evalJson(join("spectra", "test-mirror-coil-driver-file.json"));
    const column = (doc: typeof inline) => doc.columns.find((c) => c.id.startsWith("coil-driver"))!.values;
    expect(column(fromFile)).toEqual(column(inline));
  });
});
