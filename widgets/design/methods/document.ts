/**
 * The methods export of a design answer (Markdown, LaTeX, BibTeX): the set-up and its model,
 * the figure of merit, the search method with every setting (the paragraph of ../methods.ts)
 * and its sources, and the command and fingerprint that reproduce the answer.
 */
import { validateSetup } from "../../../src/index";
import { methodsDocument, type MethodsDocument, type MethodsOptions } from "../../core/methods/document";
import { reproduceSentence } from "../../core/methods/reproduce";
import { componentItems, conventionSentence, modelSentences, wiringSentences } from "../../core/methods/setup-model";
import type { Writer } from "../../core/methods/writers";
import type { DesignState } from "../format";
import { designMethods } from "../methods";

export function designMethodsDocument(state: DesignState, options: MethodsOptions = {}): MethodsDocument {
  const setup = validateSetup(state.setup);
  return methodsDocument(
    `Methods: ${state.title ?? (setup.name || "Design answer")}`,
    (w) => [
      w.paragraph("Set-up", `The answer was computed from the noise budget of the set-up${setup.name ? ` ${w.quote(w.text(setup.name))}` : ""}, which at its nominal values consists of:`),
      w.list(componentItems(w, setup)),
      wiringSentences(w, setup).join(" "),
      w.paragraph("Conventions", conventionSentence(w)),
      w.paragraph("Model", modelSentences(w, setup).join(" ")),
      w.paragraph("Search", `${w.text(designMethods(state))}${sources(w, state)}`),
      w.paragraph(
        "Reproducibility",
        reproduceSentence(w, { stateFile: options.stateFile, writtenBy: state.quietframe, fingerprint: state.fingerprint, hashes: "every number of the answer in the order it is stored" }),
      ),
    ],
    options,
  );
}

/** The published methods the search used. */
function sources(w: Writer, state: DesignState): string {
  switch (state.question.kind) {
    case "ranking":
      return ` Sources: Ridders' extrapolated differences${w.cite("ridders1982")}.`;
    case "optimum":
      return ` Sources: the Nelder–Mead simplex${w.cite("nelder1965")}; random starts from ${w.text("xoshiro128**")}${w.cite("blackman2021")}.`;
    case "spread":
      return ` Sources: ${w.text("xoshiro128**")} uniform numbers${w.cite("blackman2021")}, ziggurat normals${w.cite("marsaglia2000")}, sample quantiles of definition 7${w.cite("hyndman1996")}, Ridders' extrapolated differences${w.cite("ridders1982")}.`;
  }
}
