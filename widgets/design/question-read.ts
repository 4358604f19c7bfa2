/** Strict reading of a design question and its grid (shapes only: the engine checks the values when it computes). */
import type { OptimizeParameter, UncertaintySpec } from "../../src/index";
import { expectQuantity } from "../core/state/control-read";
import { expectArray, expectRecord } from "../core/state/strict-read";
import { finite, record, text, whole, word } from "./fields";
import { QUESTION_KINDS, type DesignQuestion, type GridText } from "./format";

const QUESTION_KEYS = {
  ranking: ["kind", "parameters", "scanPoints", "relativeStep"],
  optimum: ["kind", "parameters", "starts", "seed", "maxEvaluationsPerStart", "tolerance"],
  spread: ["kind", "uncertain", "samples", "seed", "target"],
} as const;

/** Reads a question field by field into a fresh object. */
export function checkQuestion(input: unknown, path: string): DesignQuestion {
  const kind = word(expectRecord(input, path, `a design question { "kind": ${QUESTION_KINDS.join(" | ")}, … }`).kind, QUESTION_KINDS, `${path}.kind`);
  const o = record(input, path, QUESTION_KEYS[kind], `a ${kind} question`);
  const optionalWhole = (key: string, min: number, max: number): number | undefined => (o[key] === undefined ? undefined : whole(o[key], `${path}.${key}`, min, max));
  const optionalFinite = (key: string): number | undefined => (o[key] === undefined ? undefined : finite(o[key], `${path}.${key}`));
  switch (kind) {
    case "ranking": {
      const parameters =
        o.parameters === undefined ? undefined : expectArray(o.parameters, `${path}.parameters`, 'an array of "component.parameter"').map((t, i) => text(t, `${path}.parameters[${i}]`, 200));
      return withDefined({ kind, parameters, scanPoints: optionalWhole("scanPoints", 3, 10_000), relativeStep: optionalFinite("relativeStep") });
    }
    case "optimum": {
      const parameters = expectArray(o.parameters, `${path}.parameters`, '[{ "target": "component.parameter", "min"?, "max"? }]').map((p, i): OptimizeParameter => {
        const at = `${path}.parameters[${i}]`;
        const q = record(p, at, ["target", "min", "max"], "a parameter to optimize");
        return withDefined({
          target: text(q.target, `${at}.target`, 200),
          min: q.min === undefined ? undefined : expectQuantity(q.min, `${at}.min`),
          max: q.max === undefined ? undefined : expectQuantity(q.max, `${at}.max`),
        });
      });
      return withDefined({
        kind,
        parameters,
        starts: optionalWhole("starts", 1, 100),
        seed: optionalWhole("seed", 0, 4294967295),
        maxEvaluationsPerStart: optionalWhole("maxEvaluationsPerStart", 10, 1_000_000),
        tolerance: optionalFinite("tolerance"),
      });
    }
    case "spread": {
      const uncertain = expectArray(o.uncertain, `${path}.uncertain`, '[{ "target": "component.parameter", "value": "95 % ± 2 %" }]').map((u, i): UncertaintySpec => {
        const at = `${path}.uncertain[${i}]`;
        const q = record(u, at, ["target", "value", "distribution"], "an uncertain parameter");
        return withDefined({
          target: text(q.target, `${at}.target`, 200),
          value: text(q.value, `${at}.value`, 200),
          distribution: q.distribution === undefined ? undefined : word(q.distribution, ["normal", "uniform"] as const, `${at}.distribution`),
        });
      });
      const target = o.target === undefined ? undefined : typeof o.target === "string" ? text(o.target, `${path}.target`, 200) : finite(o.target, `${path}.target`);
      return withDefined({ kind, uncertain, samples: optionalWhole("samples", 2, 100_000), seed: optionalWhole("seed", 0, 4294967295), target });
    }
  }
}

/** Reads an optional grid { from, to, points? }. */
export function checkGrid(input: unknown, path: string): GridText | undefined {
  if (input === undefined) return undefined;
  const o = record(input, path, ["from", "to", "points"], "a frequency grid");
  return withDefined({
    from: expectQuantity(o.from, `${path}.from`),
    to: expectQuantity(o.to, `${path}.to`),
    points: o.points === undefined ? undefined : whole(o.points, `${path}.points`, 2, 100_000),
  });
}

/** A copy without the keys whose value is undefined (JSON leaves them out anyway; equality tests should too). */
export function withDefined<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}
