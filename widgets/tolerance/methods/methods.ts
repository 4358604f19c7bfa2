/**
 * The methods export of a tolerance map (Markdown, LaTeX, BibTeX): the set-up and its model,
 * the two parameters varied and how, the figure of merit with its dB sign, the grid, and what
 * the cells that have no value mean. The map carries its numbers, so the reproducing command
 * redraws it from them.
 */
import { validateSetup } from "../../../src/index";
import { methodsDocument, type MethodsDocument, type MethodsOptions } from "../../core/methods/document";
import { figureSentence } from "../../core/methods/figure-words";
import { parameterKind } from "../../core/methods/parameter-names";
import { reproduceSentence } from "../../core/methods/reproduce";
import { componentItems, conventionSentence, modelSentences, wiringSentences } from "../../core/methods/setup-model";
import type { Writer } from "../../core/methods/writers";
import type { ToleranceAxisData, ToleranceWidgetState } from "../model";

export function toleranceMethods(state: ToleranceWidgetState, options: MethodsOptions = {}): MethodsDocument {
  const setup = validateSetup(state.setup);
  const title = state.settings.title ?? (setup.name || "Tolerance map");
  return methodsDocument(
    `Methods: ${title}`,
    (w) => [
      w.paragraph(
        "Set-up",
        `Each cell of the map is the noise budget of the set-up${setup.name ? ` ${w.quote(w.text(setup.name))}` : ""} with two parameters changed; at its nominal values it consists of:`,
      ),
      w.list(componentItems(w, setup)),
      wiringSentences(w, setup).join(" "),
      w.paragraph("Conventions", conventionSentence(w)),
      w.paragraph("Model", modelSentences(w, setup).join(" ")),
      w.paragraph("Map", mapSentence(w, state)),
      w.paragraph("Reproducibility", reproduceSentence(w, { stateFile: options.stateFile, writtenBy: state.quietframe, fingerprint: null })),
    ],
    options,
  );
}

function axisSentence(w: Writer, state: ToleranceWidgetState, name: string, a: ToleranceAxisData): string {
  const n = a.values.length;
  const kind = parameterKind(state.setup, a.target);
  const shown = (k: number): string => (kind ? w.qty(a.values[k], kind, 6) : w.text(a.written[k]));
  return `${name}: ${w.code(a.target)} at ${n} ${a.scale === "log" ? "logarithmically" : "linearly"} spaced values from ${shown(0)} to ${shown(n - 1)}`;
}

function mapSentence(w: Writer, state: ToleranceWidgetState): string {
  const m = state.map;
  const failed = m.counts.unstable + m.counts.invalid;
  return (
    `${axisSentence(w, state, "Columns", m.x)}; ${axisSentence(w, state, "rows", m.y)}. Every cell's budget was evaluated at ${m.grid.points} logarithmically spaced frequencies from ${w.qty(m.grid.from, "frequency")} to ${w.qty(m.grid.to, "frequency")}. ` +
    `${figureSentence(w, m.figure)} ${m.counts.ok} cells have a value` +
    (failed ? `; ${m.counts.unstable} are unstable (a growing mode) and ${m.counts.invalid} were refused by validation, and are drawn without a value.` : ".")
  );
}
