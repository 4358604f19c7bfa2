import { QuietframeError } from "../errors";
import type { ChoiceParam, ComponentKind, ParamValues, QuantityParam } from "../components/types";
import { formatQuantity, parseQuantity, QUANTITY_KIND_INFO, type QuantityKind } from "../units";
import { unitScale } from "../units/units";

/**
 * Parses one component's parameters into SI numbers, once, at the edge. Unknown names,
 * wrong units and out-of-range values are all reported with the field's full path.
 */
export function resolveParams(kind: ComponentKind<unknown>, raw: Record<string, unknown>, path: string): { values: ParamValues; given: Set<string> } {
  const values: Record<string, number | string | undefined> = {};
  const given = new Set<string>();
  const known = new Set(kind.params.map((p) => p.name));
  for (const key of Object.keys(raw)) {
    if (!known.has(key)) {
      throw new QuietframeError({
        path: `${path}.${key}`,
        value: raw[key],
        problem: `'${kind.type}' has no parameter '${key}'`,
        allowed: kind.params.length ? kind.params.map((p) => p.name).join(", ") : "no parameters",
      });
    }
  }
  for (const spec of kind.params) {
    const fieldPath = `${path}.${spec.name}`;
    const present = Object.prototype.hasOwnProperty.call(raw, spec.name) && raw[spec.name] !== undefined;
    if (present) given.add(spec.name);
    const input = present ? raw[spec.name] : spec.default;
    if (input === undefined) {
      if (spec.optional) continue;
      throw new QuietframeError({ path: fieldPath, problem: "is required", allowed: describeAllowed(spec) });
    }
    values[spec.name] = spec.kind === "choice" ? resolveChoice(spec, input, fieldPath) : resolveQuantity(spec, input, fieldPath);
  }
  return { values, given };
}

function resolveChoice(spec: ChoiceParam, input: unknown, path: string): string {
  if (typeof input !== "string" || !spec.choices.includes(input)) {
    throw new QuietframeError({ path, value: input, problem: "is not one of the choices", allowed: spec.choices.map((c) => `"${c}"`).join(" or "), choices: spec.choices });
  }
  return input;
}

function resolveQuantity(spec: QuantityParam, input: unknown, path: string): number {
  const v = typeof input === "string" ? parseText(input, spec.kind, path) : parseQuantity(input, spec.kind, path);
  const tooLow = spec.min !== undefined && (spec.minExclusive ? v <= spec.min : v < spec.min);
  const tooHigh = spec.max !== undefined && (spec.maxExclusive ? v >= spec.max : v > spec.max);
  if (tooLow || tooHigh) {
    const why = spec.rangeReason ? `: ${spec.rangeReason}` : "";
    throw new QuietframeError({ path, value: input, problem: `is out of range${why}`, allowed: describeRange(spec) });
  }
  return v;
}

/**
 * parseQuantity of a string, remembered: the same text of the same kind always parses to the
 * same number (the path only names the field in an error, and errors are not remembered), and
 * re-validating a set-up for each value set would otherwise parse its unchanged texts again.
 */
function parseText(text: string, kind: QuantityKind, path: string): number {
  const key = textKey(kind, text);
  const known = parsedTexts.get(key);
  if (known !== undefined) return known;
  const v = parseQuantity(text, kind, path);
  if (parsedTexts.size >= MAX_PARSED_TEXTS) parsedTexts.clear();
  parsedTexts.set(key, v);
  return v;
}

/** Texts remembered at most (a few hundred bytes each); the memory starts over when full. */
const MAX_PARSED_TEXTS = 4096;
const parsedTexts = new Map<string, number>();
const textKey = (kind: QuantityKind, text: string): string => `${kind}\u0000${text}`;

/**
 * An SI value as text in the SI unit of its kind that parses back to exactly the same double
 * (shortest round-trip digits): a number for kinds without a unit, else "<digits> <unit>".
 * The text's parse is remembered too, so a search that writes each trial this way and
 * re-validates the set-up does not parse it again: with the SI unit's scale exactly 1, the
 * parse is Number("<digits>e0"), which is x itself for every finite x but ±0 ("0" loses the sign
 * of −0, so zeros are parsed as written).
 */
export function exactSiText(x: number, kind: QuantityKind): string | number {
  const unit = QUANTITY_KIND_INFO[kind].siUnit;
  if (unit === "") return x;
  const text = `${String(x)} ${unit}`;
  if (Number.isFinite(x) && x !== 0 && hasUnitScale(kind, unit)) {
    if (parsedTexts.size >= MAX_PARSED_TEXTS) parsedTexts.clear();
    parsedTexts.set(textKey(kind, text), x);
  }
  return text;
}

/** Whether `unit` of `kind` is the SI unit itself: no power of ten, no factor. */
function hasUnitScale(kind: QuantityKind, unit: string): boolean {
  const scale = unitScale(kind, unit);
  return scale !== undefined && scale.pow10 === 0 && scale.factor === 1;
}

export function describeRange(spec: QuantityParam): string {
  const show = (x: number): string => formatQuantity(x, spec.kind);
  const lo = spec.min === undefined ? "" : `${show(spec.min)} ${spec.minExclusive ? "<" : "≤"} `;
  const hi = spec.max === undefined ? "" : ` ${spec.maxExclusive ? "<" : "≤"} ${show(spec.max)}`;
  return lo || hi ? `${lo}${spec.name}${hi}` : `any ${spec.kind}`;
}

function describeAllowed(spec: QuantityParam | ChoiceParam): string {
  return spec.kind === "choice" ? spec.choices.join(" or ") : `${describeRange(spec)}; ${spec.doc}`;
}
