import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import type { SetupDescription } from "../../../src/setup/format";
import { explorerMethods } from "../../../widgets/explorer/methods/methods";
import { computeExplorer, createExplorerState } from "../../../widgets/explorer/model";

/**
 * The methods text of classical noise on an interferometer's test masses states what the entry
 * means (one test mass's spectrum, four independent alike masses) and the conversion to strain
 * the engine uses, S_h = 4S_F/(m²Ω⁴L²) and S_h = 4S_x/L² (derived in src/components/interferometer.ts;
 * test/engine/test-mass-noise.test.ts checks the numbers against the strain SQL of Kimble et al.,
 * Phys. Rev. D 65, 022002 (2001)).
 */
describe("methods text: force and displacement noise of an interferometer's test masses", () => {
  const example = JSON.parse(readFileSync(join(__dirname, "..", "..", "..", "examples", "long-baseline-detector.json"), "utf8")) as SetupDescription;
  const points = [1, 10, 100, 1e4].map((f): [number, number] => [f, 1e-15 / f]);
  const setup: SetupDescription = {
    ...example,
    classicalNoise: [
      { name: "suspension", enters: "force", on: "ifo", spectrum: { unit: "N/√Hz", points } },
      { name: "coating", enters: "displacement", on: "ifo", spectrum: { unit: "am/√Hz", points } },
      { name: "gravityGradient", enters: "strain", on: "ifo", spectrum: { unit: "1/√Hz", points: points.map(([f, a]): [number, number] => [f, a * 1e-9]) } },
    ],
  };
  const state = createExplorerState(setup);
  const { markdown, latex } = explorerMethods(state, computeExplorer(state));

  it("says each term is one test mass's spectrum, the four independent and alike, with its conversion to strain", () => {
    expect(markdown).toContain("`suspension` is a classical force noise on each test mass of `ifo`");
    expect(markdown).toContain("`coating` is a classical displacement noise of each test mass of `ifo`");
    expect(markdown.match(/the four test masses are taken as independent and alike/g)).toHaveLength(2);
    expect(markdown).toContain("S\\_h = 4S\\_F/(m²Ω⁴L²)");
    expect(markdown).toContain("S\\_h = 4S\\_x/L²");
    expect(latex).toContain("S_h = 4S_F/(m^2\\Omega^4L^2)");
    expect(latex).toContain("S_h = 4S_x/L^2");
  });

  it("keeps the strain sentence for a strain term on the same interferometer", () => {
    expect(markdown).toContain("`gravityGradient` is a classical strain noise on `ifo`, adding directly to the strain-referred noise.");
  });
});
