/**
 * The drive laser's noise terms in what an explorer shows and exports: the methods text says
 * how each enters (with the conversion the engine uses), the CSV has a column for each, and the
 * fingerprint covers them. Reference: the engine's own budget (the claim is that the widget
 * carries it whole) and the conversions stated in docs/setup-format.md.
 */
import { describe, expect, test } from "vitest";
import { computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { explorerMethods } from "../../../widgets/explorer/methods/methods";
import { explorerKind } from "../../../widgets/explorer/kind";
import { exampleSetup } from "./examples";

const FILE = "test-mirror-laser-noise.json";

describe(`${FILE} in the explorer`, () => {
  const state = createExplorerState(exampleSetup(FILE));
  const computation = computeExplorer(state);

  test("the methods text names each laser term with how it enters", () => {
    const { markdown, latex } = explorerMethods(state, computation);
    expect(markdown).toContain("`laser-rin` is the relative intensity noise");
    expect(markdown).toContain("P\\_in S\\_RIN/(2ħω\\_L)"); // Markdown escapes the underscores
    expect(markdown).toContain("`laser-frequency` is the frequency noise");
    expect(markdown).toContain("δL = Lλδν/c");
    expect(markdown).toContain("held at its end values");
    expect(latex).toContain("\\delta L = L\\lambda\\,\\delta\\nu/c");
  });

  test("the CSV has a column for each laser term, and the fingerprint changes without them", () => {
    const csv = explorerKind.figure({ state, computation } as never).csv;
    const header = csv.split("\n")[0];
    expect(header).toContain("laser-rin: laser intensity at arm (classical)");
    expect(header).toContain("laser-frequency: laser frequency at arm (classical)");
    const quiet = computeExplorer(createExplorerState({ ...exampleSetup(FILE), classicalNoise: [] }));
    expect(quiet.fingerprint).not.toBe(computation.fingerprint);
  });
});
