import { expect, test } from "vitest";
import { compile } from "vega-lite";
import { explorerFigureSpec } from "../../../widgets/explorer/budget-spec";
import { computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { exampleFiles, exampleSetup } from "./examples";

/**
 * Vega-Lite's compiler warns (on the page's console, in every front-end) when panels of one
 * chart disagree, e.g. layers giving the same scale different explicit domains. A budget
 * chart must compile silently: the front-end suites treat a console warning as a failure.
 */
function compileWarnings(spec: Record<string, unknown>): string[] {
  const warnings: string[] = [];
  const logger = {
    level: () => logger,
    warn: (...parts: unknown[]) => {
      warnings.push(parts.join(" "));
      return logger;
    },
    info: () => logger,
    debug: () => logger,
    error: (...parts: unknown[]) => {
      warnings.push(parts.join(" "));
      return logger;
    },
  };
  compile(spec as unknown as Parameters<typeof compile>[0], { logger: logger as never });
  return warnings;
}

test.each(exampleFiles())("%s: the budget chart (with its target line) compiles without a Vega-Lite warning", (file) => {
  const state = createExplorerState(exampleSetup(file), { settings: { targetDb: -3 } });
  expect(compileWarnings(explorerFigureSpec(computeExplorer(state), state))).toEqual([]);
});
