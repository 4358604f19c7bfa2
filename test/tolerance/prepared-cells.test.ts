/**
 * A map's cells are prepared through one SetupPreparer per plan; each cell must give exactly
 * what preparing the cell's whole set-up gives (the two values written into a copy of the
 * description, then prepare → evaluate): the same value bits, status and message, unstable
 * cells included. Reference: the whole-set-up path of the same pipeline (common practice, no
 * outside source: the claim under test is identity with it).
 */
import { describe, expect, it } from "vitest";
import { figureOfSetup } from "../../src/figures/of-setup";
import { applyValues } from "../../src/setup/apply-values";
import { logGrid } from "../../src/setup/grid";
import { CellStatus, cellValues, evaluateCell } from "../../src/tolerance/evaluate";
import { resolveToleranceSpec } from "../../src/tolerance/spec";
import { example } from "./helpers";

describe("tolerance cells prepared once per map", () => {
  it("give the whole set-up's outcome on every cell, bit for bit, failures and messages included", () => {
    const { plan } = resolveToleranceSpec(example("cryogenic-membrane-squeezed.json"), {
      // Detuning to the blue side anti-damps the membrane: some cells are unstable.
      x: { target: "cavity.detuning", from: "-60 kHz", to: "60 kHz", points: 7 },
      y: { target: "squeezer.squeezing", from: "-15 dB", to: "0 dB", points: 5 },
      grid: { from: "1.1 MHz", to: "1.3 MHz", points: 48 },
      figure: { kind: "margin-at", frequency: "1.16 MHz" },
    });
    const frequencies = logGrid(plan.grid);
    const statuses = new Set<number>();
    for (let j = 0; j < 5; j++) {
      for (let i = 0; i < 7; i++) {
        const whole = figureOfSetup(applyValues(plan.setup, cellValues(plan, i, j)), plan.figure, frequencies);
        const prepared = evaluateCell(plan, frequencies, i, j);
        expect(Object.is(prepared.value, whole.value)).toBe(true);
        expect(prepared.status).toBe(whole.status);
        expect(prepared.message).toBe(whole.message);
        statuses.add(prepared.status);
      }
    }
    expect(statuses).toEqual(new Set([CellStatus.ok, CellStatus.unstable]));
  });
});
