import { expect, test } from "vitest";
import { COMPONENT_KINDS } from "../../../src/components/registry";
import { parameterWords } from "../../../widgets/core/methods/parameter-names";

/**
 * A methods text names each parameter in words with the symbol its formulas use ("arm length
 * L", "signal-recycling mirror power transmission T_s"), never an identifier. Every numeric
 * parameter of every component type therefore has a symbol; only the noise levels of a coherent
 * source, written in dB above shot noise, are named in words alone.
 */
const WORDS_ONLY = new Set(["coherent.amplitudeExcess", "coherent.phaseExcess"]);

test("every numeric parameter of every component type has words and a symbol for a methods text", () => {
  const missing: string[] = [];
  for (const [type, kind] of COMPONENT_KINDS) {
    for (const p of kind.params) {
      if (p.kind === "choice" || WORDS_ONLY.has(`${type}.${p.name}`)) continue;
      if (!parameterWords(type, p.name).symbol) missing.push(`${type}.${p.name}`);
    }
  }
  expect(missing).toEqual([]);
});
