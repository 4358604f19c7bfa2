import { describe, expect, test } from "vitest";
import { explorerFigureSpec } from "../../../widgets/explorer/budget-spec";
import { explorerUncheckedFields, parseExplorerState, toWidgetStateDocument } from "../../../widgets/explorer/document";
import { computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { exampleSetup } from "./examples";

type Layer = { mark: { type: string }; encoding: { y?: { datum?: number } } };

/** The levels of the horizontal rules on the ratio panel (the second panel of the stack). */
function ratioRules(spec: Record<string, unknown>): (number | undefined)[] {
  const panels = (spec as { vconcat: { layer: Layer[] }[] }).vconcat;
  return panels[1].layer.filter((l) => l.mark.type === "rule").map((l) => l.encoding.y?.datum);
}

describe("the explorer's target line (settings.targetDb)", () => {
  const setup = exampleSetup("cryogenic-membrane-squeezed.json");

  test("a state's target is drawn on the ratio panel beside the 0 dB line, and survives the state file", () => {
    const state = createExplorerState(setup, { settings: { targetDb: -3 } });
    expect(ratioRules(explorerFigureSpec(computeExplorer(state), state))).toEqual([0, -3]);
    const back = parseExplorerState(JSON.stringify(toWidgetStateDocument(state)));
    expect(back.settings.targetDb).toBe(-3);
    // Display only: the curves' fingerprint is the same with and without a target.
    expect(state.fingerprint).toBe(createExplorerState(setup).fingerprint);
    expect(explorerUncheckedFields(back, "state").map((f) => f.path)).toContain("state.settings.targetDb");
  });

  test("without a target only the 0 dB line is drawn", () => {
    const state = createExplorerState(setup);
    expect(ratioRules(explorerFigureSpec(computeExplorer(state), state))).toEqual([0]);
  });

  test.each([Number.NaN, Number.POSITIVE_INFINITY, 250, "-3 dB"])("a target of %s is refused, naming the field and what is allowed", (bad) => {
    expect(() => createExplorerState(setup, { settings: { targetDb: bad as number } })).toThrow(/settings\.targetDb.*dB relative to the SQL[\s\S]*from −100 to 100/);
    const doc = toWidgetStateDocument(createExplorerState(setup, { settings: { targetDb: -3 } }));
    const text = JSON.stringify(doc).replace('"targetDb":-3', `"targetDb":${JSON.stringify(bad) ?? "null"}`);
    expect(() => parseExplorerState(text)).toThrow(/settings\.targetDb/);
  });
});
