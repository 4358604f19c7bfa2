/** Every stored number of a trajectory run as CSV. */
import { csvField, type JointVariable, type TrajectoryResult } from "../../src/index";
import { engineDuanLabel, jointDuanSum } from "./duan";
import { partCurve } from "./series";

/**
 * The stored numbers of a run as CSV: one row per stored time point, times in seconds, every
 * number in shortest round-trip form, so the file reproduces the computed doubles exactly.
 */
export function trajectoryCsv(r: TrajectoryResult, joint: readonly JointVariable[] = []): string {
  const columns: { name: string; values: ArrayLike<number> }[] = [{ name: "time [s]", values: r.time }];
  for (const j of r.joint) {
    columns.push({ name: `${j.label}: true value`, values: j.truth });
    columns.push({ name: `${j.label}: estimate`, values: j.estimate });
    columns.push({ name: `${j.label}: conditional variance`, values: j.conditional });
    columns.push({ name: `${j.label}: unconditional variance`, values: j.unconditional });
    for (const name of Object.keys(j.parts).sort()) columns.push({ name: `${j.label}: conditional variance, ${partCurve(name)}`, values: j.parts[name] });
  }
  const e = r.entanglement;
  if (e) {
    columns.push({ name: "EPR variance x", values: e.eprX });
    columns.push({ name: "EPR variance p", values: e.eprP });
    const modes = `1 = ${e.pair[0]}, 2 = ${e.pair[1]}`;
    columns.push({ name: `Duan sum ${engineDuanLabel(e.pair)}, ${modes}`, values: e.duanSum });
    const other = jointDuanSum(joint, r, e.pair);
    if (other) columns.push({ name: `Duan sum ${other.label}, ${modes}`, values: other.values });
    columns.push({ name: "log-negativity [ebit]", values: e.logNegativity });
    columns.push({ name: "unconditional log-negativity [ebit]", values: e.unconditionalLogNegativity });
  }
  for (const rec of r.records) columns.push({ name: `record ${rec.output}`, values: rec.values });
  const lines = [columns.map((c) => csvField(c.name)).join(",")];
  for (let i = 0; i < r.time.length; i++) lines.push(columns.map((c) => String(c.values[i])).join(","));
  return `${lines.join("\n")}\n`;
}
