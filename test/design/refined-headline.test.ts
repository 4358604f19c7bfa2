import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { refinedHeadline } from "../../src/design";
import { headlineFigures } from "../../src/engine/headline";
import { evaluate, prepare } from "../../src/pipeline";
import { probedBody } from "../helpers/setups";

const OMEGA_LASER = (2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9;
const MASS = 1e-3;

describe("headline figures that do not depend on the grid", () => {
  it("a free mass at the SQL-touching power for 100 Hz: the best margin is 0 dB at exactly 100 Hz even on a grid without that point (Kimble et al., PRD 65, 022002 (2001): (K + 1/K)/2 ≥ 1, equality at K = 1)", () => {
    const pSql = (HBAR * MASS * (2 * Math.PI * 100) ** 2 * SPEED_OF_LIGHT ** 2) / (8 * HBAR * OMEGA_LASER);
    const prepared = prepare(probedBody({ body: { mass: `${MASS} kg` }, probe: { power: `${pSql} W`, wavelength: "1064 nm" } }));
    const budget = evaluate(prepared, { from: 7, to: 9000, points: 37 }).budget;
    const h = refinedHeadline(prepared, budget);
    expect(h.gridBestMarginDb).toBeLessThan(-1e-3);
    expect(Math.abs(h.bestMarginDb)).toBeLessThan(1e-12);
    expect(Math.abs(h.bestMarginAt / 100 - 1)).toBeLessThan(1e-5);
    expect(h.belowSqlBands).toEqual([]);
  });

  it("squeezed input: the band below the SQL has the edges of the closed form (S_SQL/2)(K + 1/K)[cosh 2r − cos 2(θ + Φ) sinh 2r] = S_SQL, Φ = arccot K (Kimble et al. 2001)", () => {
    const power = 1000;
    const r = 0.5;
    const theta = -0.6;
    const sBa = (8 * HBAR * OMEGA_LASER * power) / SPEED_OF_LIGHT ** 2;
    const ratio = (f: number) => {
      const K = sBa / (HBAR * MASS * (2 * Math.PI * f) ** 2);
      return ((K + 1 / K) / 2) * (Math.cosh(2 * r) - Math.cos(2 * (theta + Math.atan(1 / K))) * Math.sinh(2 * r));
    };
    const prepared = prepare(probedBody({ body: { mass: `${MASS} kg` }, probe: { power: `${power} W` }, light: { name: "light", type: "squeezed", params: { r, angle: `${theta} rad` } } }));
    const h = refinedHeadline(prepared, evaluate(prepared, { from: 1, to: 1e4, points: 60 }).budget);
    expect(h.belowSqlBands).toHaveLength(1);
    const band = h.belowSqlBands[0];
    // The closed form's edges by bisection in log f between the refined edge's grid neighbours.
    const root = (lo: number, hi: number) => {
      for (let k = 0; k < 200; k++) {
        const mid = Math.sqrt(lo * hi);
        if (ratio(lo) - 1 > 0 === ratio(mid) - 1 > 0) lo = mid;
        else hi = mid;
      }
      return Math.sqrt(lo * hi);
    };
    expect(Math.abs(band.from / root(band.from * 0.8, band.from * 1.25) - 1)).toBeLessThan(1e-9);
    expect(Math.abs(band.to / root(band.to * 0.8, band.to * 1.25) - 1)).toBeLessThan(1e-9);
    expect(band).toMatchObject({ fromKind: "crossing", toKind: "crossing", betweenGridPoints: false });
    // The best margin is the closed form's maximum.
    let best = -Infinity;
    for (let f = band.from; f <= band.to; f *= 1.0001) best = Math.max(best, -10 * Math.log10(ratio(f)));
    expect(h.bestMarginDb).toBeGreaterThanOrEqual(best - 1e-9);
    expect(Math.abs(h.bestMarginDb - best)).toBeLessThan(1e-6);
  });

  it("the squeezed membrane example gives the same refined figures on its 801-point grid and on 2,000 points from 1 Hz to 1 GHz, while the grid figures differ; the grid headline is unchanged", () => {
    const prepared = prepare(readFileSync(join(__dirname, "..", "..", "examples", "cryogenic-membrane-squeezed.json"), "utf8"));
    const own = evaluate(prepared).budget;
    const wide = evaluate(prepared, { from: 1, to: 1e9, points: 2000 }).budget;
    const a = refinedHeadline(prepared, own);
    const b = refinedHeadline(prepared, wide);
    expect(Math.abs(a.gridBestMarginDb - b.gridBestMarginDb)).toBeGreaterThan(0.1);
    expect(Math.abs(a.bestMarginDb - b.bestMarginDb)).toBeLessThan(1e-9);
    expect(Math.abs(a.bestMarginAt / b.bestMarginAt - 1)).toBeLessThan(1e-6);
    expect(a.bestMarginDb).toBeGreaterThanOrEqual(a.gridBestMarginDb);
    expect(Math.abs(a.belowSqlBands[0].from / b.belowSqlBands[0].from - 1)).toBeLessThan(1e-9);
    expect(Math.abs(a.belowSqlBands[0].to / b.belowSqlBands[0].to - 1)).toBeLessThan(1e-9);
    expect(a.gridBestMarginDb).toBe(headlineFigures(own).bestMarginDb);
  });
});
