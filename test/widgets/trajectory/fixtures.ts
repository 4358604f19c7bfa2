import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { SetupDescription } from "../../../src/setup/format";
import type { JointVariable } from "../../../src/timedomain/types";
import type { TrajectoryOptions } from "../../../widgets/trajectory/model";
import { REPO_ROOT } from "../../jupyter/env";

/** The shipped hybrid example: a membrane-like oscillator and a negative-mass spin reference in one beam. */
export const hybrid = JSON.parse(readFileSync(join(REPO_ROOT, "examples", "hybrid-spin-reference.json"), "utf8")) as SetupDescription;

export const SUM_X: JointVariable = {
  label: "x membrane + x cell",
  terms: [
    { component: "membrane", quadrature: "x", weight: 1 },
    { component: "cell", quadrature: "x", weight: 1 },
  ],
};
export const P_DIFF: JointVariable = {
  label: "p membrane − p cell",
  terms: [
    { component: "membrane", quadrature: "p", weight: 1 },
    { component: "cell", quadrature: "p", weight: -1 },
  ],
};
export const MEMBRANE_X: JointVariable = { label: "x membrane", terms: [{ component: "membrane", quadrature: "x", weight: 1 }] };

/** A short run (2,000 steps): enough to exercise every path, quick on a shared machine. */
export function shortRun(seed = 7): TrajectoryOptions {
  return {
    controls: [{ target: "cell.field", label: "bias field", min: "0.31 mT", max: "0.32 mT" }],
    simulation: { duration: "20 us", step: "10 ns", seed, samples: 401 },
    joint: [SUM_X, MEMBRANE_X],
    pair: ["membrane", "cell"],
    title: "Membrane and spin reference",
  };
}
