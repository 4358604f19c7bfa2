/** A body's thermal term has one name in every budget, whatever the damping model; its id (which fingerprints hash) is unchanged. */
import { describe, expect, test } from "vitest";
import { evaluate, prepare } from "../../src/pipeline";
import type { SetupDescription } from "../../src/setup/format";

function setup(damping: "viscous" | "symmetric", withBath: boolean): SetupDescription {
  return {
    format: "quietframe.setup",
    version: 1,
    name: "thermal term names",
    components: [
      { name: "light", type: "coherent" },
      { name: "osc", type: "oscillator", params: { mass: "10 ng", frequency: "1 MHz", Q: 1e5, temperature: "4 K", damping } },
      ...(withBath ? [{ name: "gas", type: "thermal-bath", params: { temperature: "300 K", dampingRate: "1 Hz" } }] : []),
      { name: "probe", type: "position-probe", params: { measurementRate: "1 kHz" } },
      { name: "detector", type: "homodyne", params: { angle: "90 deg" } },
    ],
    connections: [["light.out", "probe.in"], ["probe.out", "detector.in"], ["probe.mechanics", "osc.body"], ...(withBath ? [["gas.mechanics", "osc.body"] as [string, string]] : [])],
    readout: ["detector"],
    signal: { kind: "force", on: "osc" },
    grid: { from: "0.9 MHz", to: "1.1 MHz", points: 5 },
  } as SetupDescription;
}

const thermal = (s: SetupDescription) =>
  evaluate(prepare(s))
    .budget.terms.filter((t) => t.category === "thermal")
    .map((t) => ({ id: t.id, label: t.label }));

describe("thermal term names", () => {
  test("viscous and symmetric damping: the same name, the ids as before", () => {
    expect(thermal(setup("viscous", false))).toEqual([{ id: "osc: thermal force", label: "osc: thermal noise" }]);
    expect(thermal(setup("symmetric", false))).toEqual([{ id: "osc: thermal noise", label: "osc: thermal noise" }]);
  });

  test("an attached bath's term is named the same way", () => {
    expect(thermal(setup("viscous", true))).toEqual([
      { id: "osc: thermal force", label: "osc: thermal noise" },
      { id: "gas: thermal force", label: "gas: thermal noise" },
    ]);
  });
});
