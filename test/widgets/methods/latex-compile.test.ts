/**
 * Every kind's LaTeX methods export compiles with Debian's TeX Live (pdflatex, bibtex, pdflatex
 * twice), with every citation resolved from the .bib written beside it and no LaTeX warning.
 * Integration: needs the texlive packages of scripts/ensure-system-deps.sh.
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, test } from "vitest";
import type { SetupDescription } from "../../../src/setup/format";
import { explorerMethods } from "../../../widgets/explorer/methods/methods";
import { computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { widgetMethods } from "../../../widgets/methods";

const STATES = join(__dirname, "..", "..", "..", "examples", "states");
const work = mkdtempSync(join(tmpdir(), "quietframe-latex-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function run(program: string, args: string[]): string {
  return execFileSync(program, args, { cwd: work, encoding: "utf8", stdio: ["ignore", "pipe", "pipe"], timeout: 120_000 });
}

/** The methods export of an explorer of a shipped set-up (one with classical noise terms, which no saved state has). */
function exampleExplorerMethods(file: string, stem: string) {
  const setup = JSON.parse(readFileSync(join(STATES, "..", file), "utf8")) as SetupDescription;
  const state = createExplorerState(setup);
  return explorerMethods(state, computeExplorer(state), { stateFile: `${stem}.json`, bibName: stem });
}

describe("LaTeX methods exports compile", () => {
  test.each(["design-ranking-free-mass", "entangled-two-beams", "explorer-squeezed-membrane", "tolerance-squeezing-efficiency", "trajectory-cryogenic-membrane", "explorer-laser-noise"])(
    "%s",
    (stem) => {
      const doc =
        stem === "explorer-laser-noise"
          ? exampleExplorerMethods("test-mirror-laser-noise.json", stem)
          : widgetMethods(readFileSync(join(STATES, `${stem}.json`), "utf8"), { source: `${stem}.json`, stateFile: `${stem}.json`, bibName: stem });
      writeFileSync(join(work, `${stem}.tex`), doc.latex);
      writeFileSync(join(work, `${stem}.bib`), doc.bibtex);
      const latex = ["-interaction=nonstopmode", "-halt-on-error", `${stem}.tex`];
      run("pdflatex", latex);
      const bibtex = run("bibtex", [stem]);
      expect(bibtex).not.toMatch(/error message|Warning--/);
      run("pdflatex", latex);
      run("pdflatex", latex);
      const log = readFileSync(join(work, `${stem}.log`), "latin1");
      expect(log).not.toMatch(/Citation `[^']*' .*undefined/);
      expect(log).not.toMatch(/LaTeX Warning|Package \w+ Warning|Missing character/);
      expect(
        readFileSync(join(work, `${stem}.pdf`))
          .subarray(0, 5)
          .toString(),
      ).toBe("%PDF-");
    },
  );
});
