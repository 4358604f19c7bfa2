import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { uncertaintyMargin } from "../../src/engine/covariance";
import { assemble } from "../../src/setup/assemble";
import { loadSetup } from "../../src/pipeline";
import { conditionalSteadyState, conditionalTransient, groundCovariance, riccatiResidual, simulateTrajectory } from "../../src/timedomain";

/**
 * A conditional state of a quantum system is a state: V + iΣ/2 ≥ 0 (Robertson–Schrödinger
 * uncertainty relation in covariance form; Simon, Mukunda & Dutta, Phys. Rev. A 49, 1567
 * (1994)). Checked for every example set-up, up to rounding of the largest variance.
 */
const EXAMPLES = join(__dirname, "..", "..", "examples");

describe.each(readdirSync(EXAMPLES).filter((f) => f.endsWith(".json")))("%s", (file) => {
  const model = assemble(loadSetup(readFileSync(join(EXAMPLES, file), "utf8"))).model;
  const n = model.nStates;
  const largest = (v: Float64Array) => Math.max(...Array.from({ length: n }, (_, i) => v[i * n + i]));

  it("steady conditional state: physical, ARE residual at rounding level", () => {
    const v = conditionalSteadyState(model);
    expect(uncertaintyMargin(model, v)).toBeGreaterThanOrEqual(-1e-12 * largest(v));
    expect(riccatiResidual(model, v)).toBeLessThan(1e-10);
  });

  it("conditional states along the way from the ground state, and in a seeded run, are physical", () => {
    const times = Float64Array.from({ length: 12 }, (_, i) => 1e-9 * 10 ** i);
    for (const v of conditionalTransient(model, groundCovariance(model), times)) {
      expect(uncertaintyMargin(model, v)).toBeGreaterThanOrEqual(-1e-12 * largest(v));
    }
    const r = simulateTrajectory(model, { duration: 2e-4, step: 1e-7, seed: 4, samples: 101 }, { joint: [] });
    expect(r.minUncertaintyMargin).toBeGreaterThanOrEqual(-1e-12 * largest(conditionalSteadyState(model)));
  });
});
