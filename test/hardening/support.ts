import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { QuietframeError, QuietframeErrors } from "../../src/errors";

/** The shipped example set-ups, as text and parsed, read from the repository's examples folder. */
export const EXAMPLES_DIR = join(__dirname, "..", "..", "examples");
export const EXAMPLE_FILES = readdirSync(EXAMPLES_DIR)
  .filter((f) => f.endsWith(".json"))
  .sort();
export const EXAMPLE_TEXTS: readonly string[] = EXAMPLE_FILES.map((f) => readFileSync(join(EXAMPLES_DIR, f), "utf8"));
export const exampleObject = (i: number): any => JSON.parse(EXAMPLE_TEXTS[i]);

/** Every path to a value inside a JSON value, as key lists (the empty list is the root). */
export function jsonPaths(v: unknown, prefix: (string | number)[] = []): (string | number)[][] {
  const out: (string | number)[][] = [prefix];
  if (Array.isArray(v)) v.forEach((x, i) => out.push(...jsonPaths(x, [...prefix, i])));
  else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) out.push(...jsonPaths(x, [...prefix, k]));
  return out;
}

/** Own property names of the built-in prototypes, to detect pollution. */
function prototypeSnapshot(): string {
  return [Object.prototype, Array.prototype, Function.prototype, String.prototype].map((p) => Reflect.ownKeys(p).map(String).sort().join(",")).join("|");
}
const CLEAN = prototypeSnapshot();

export function prototypesAreClean(): boolean {
  const probe = {} as Record<string, unknown>;
  return probe.polluted === undefined && (probe as { isAdmin?: unknown }).isAdmin === undefined && prototypeSnapshot() === CLEAN;
}

/** Values that are wrong in interesting ways: wrong types, odd units, extreme numbers. */
export const UNIT_WORDS = [
  "kg",
  "g",
  "ng",
  "mg",
  "Hz",
  "kHz",
  "MHz",
  "GHz",
  "rad/s",
  "K",
  "mK",
  "m",
  "nm",
  "cm",
  "km",
  "W",
  "mW",
  "kW",
  "s",
  "ms",
  "deg",
  "rad",
  "%",
  "dB",
  "T",
  "mT",
  "G",
  "GHz/T",
  "Hz/T",
  "°C",
  "°F",
  "kelvin",
  "KHz",
  "hz",
  "µg",
  "μg",
  "ｋｇ",
  "\u212a",
  "k Hz",
  "",
  " ",
  "/",
  "1/s",
];
export const oddNumber = fc.oneof(
  fc.constantFrom(0, -0, 1, -1, 1e308, -1e308, 1.7976931348623157e308, 5e-324, -5e-324, 1e-320, 2 ** 53, 2 ** 53 + 2, 0.1, 1e20, -1e-20),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.integer(),
);
export const oddNumberText = fc.oneof(
  oddNumber.map(String),
  fc.constantFrom("1e400", "-1e400", "1e-400", "5e-324", "1.8e308", "1.7976931348623157e308", ".5", "5.", "+1", "0x10", "1_000", "1e", "--1", ""),
);
export const unitString = fc.oneof(
  fc.tuple(oddNumberText, fc.constantFrom("", " ", "  ", "\t"), fc.oneof(fc.constantFrom(...UNIT_WORDS), fc.string({ maxLength: 5 }))).map(([n, s, u]) => `${n}${s}${u}`),
  fc.constantFrom(...UNIT_WORDS),
);
export const wrongValue: fc.Arbitrary<unknown> = fc.oneof(
  unitString,
  oddNumber,
  fc.constantFrom(null, true, false, [], {}, [1, 2], { value: 1, unit: "kg" }, "", "yes"),
  fc.jsonValue({ maxDepth: 2 }),
);
export const hostileKey = fc.oneof(
  fc.constantFrom("__proto__", "constructor", "prototype", "toString", "hasOwnProperty", "valueOf", "polluted", "isAdmin"),
  fc.constantFrom("name", "type", "params", "format", "version", "mass", "from", "to", "points", "kind", "on"),
  fc.string({ maxLength: 6 }),
);

export type Mutation =
  | { op: "delete"; pick: number }
  | { op: "replace"; pick: number; value: unknown }
  | { op: "duplicate"; pick: number; value: unknown }
  | { op: "addKey"; pick: number; key: string; value: unknown }
  | { op: "protoPayload"; pick: number; key: string };

export const mutationArb: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ op: fc.constant("delete" as const), pick: fc.nat() }),
  fc.record({ op: fc.constant("replace" as const), pick: fc.nat(), value: wrongValue }),
  fc.record({ op: fc.constant("duplicate" as const), pick: fc.nat(), value: wrongValue }),
  fc.record({ op: fc.constant("addKey" as const), pick: fc.nat(), key: hostileKey, value: wrongValue }),
  fc.record({ op: fc.constant("protoPayload" as const), pick: fc.nat(), key: fc.constantFrom("__proto__", "constructor", "prototype") }),
);

/** JSON text of an object whose own keys are exactly `entries` (keys may repeat, `__proto__` stays an own key). */
function objectText(entries: [string, unknown][]): string {
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${toText(v)}`).join(",")}}`;
}

/**
 * JSON text of a value in which plain objects are written key by key; `extra` adds keys to
 * the object at one path (repeated keys and `__proto__` written literally into the text).
 */
function toText(v: unknown, at: (string | number)[] = [], edit?: { path: (string | number)[]; extra: [string, unknown][] }): string {
  if (Array.isArray(v)) return `[${v.map((x, i) => toText(x, [...at, i], edit)).join(",")}]`;
  if (v && typeof v === "object") {
    const entries: [string, unknown][] = Object.entries(v);
    const here = edit && edit.path.length === at.length && edit.path.every((k, i) => k === at[i]);
    if (!here) return `{${entries.map(([k, x]) => `${JSON.stringify(k)}:${toText(x, [...at, k], edit)}`).join(",")}}`;
    return objectText([...entries, ...edit.extra]);
  }
  return JSON.stringify(v) ?? "null";
}

/** Applies one mutation to a JSON document (parsed from text, so the original is untouched) and returns text. */
export function mutatedText(original: unknown, m: Mutation): string {
  const doc = JSON.parse(JSON.stringify(original));
  const all = jsonPaths(doc);
  const path = all[m.pick % all.length];
  const parentOf = (p: (string | number)[]): any => p.slice(0, -1).reduce((o: any, k) => o[k], doc);
  const objects = all.filter((p) => {
    const v = p.reduce((o: any, k) => o[k], doc);
    return v && typeof v === "object" && !Array.isArray(v);
  });
  if (objects.length === 0 && m.op !== "delete" && m.op !== "replace") return JSON.stringify(doc);
  switch (m.op) {
    case "delete": {
      if (path.length === 0) return "";
      const parent = parentOf(path);
      const last = path[path.length - 1];
      if (Array.isArray(parent)) parent.splice(last as number, 1);
      else delete parent[last];
      return JSON.stringify(doc);
    }
    case "replace": {
      if (path.length === 0) return JSON.stringify(m.value) ?? "null";
      parentOf(path)[path[path.length - 1]] = m.value;
      return JSON.stringify(doc);
    }
    case "duplicate": {
      // The same key written twice in one object: JSON.parse keeps the last one.
      const target = objects[m.pick % objects.length];
      const obj = target.reduce((o: any, k) => o[k], doc);
      const keys = Object.keys(obj);
      if (keys.length === 0) return toText(doc, [], { path: target, extra: [["dup", m.value]] });
      const key = keys[m.pick % keys.length];
      return toText(doc, [], { path: target, extra: [[key, m.value]] });
    }
    case "addKey": {
      const target = objects[m.pick % objects.length];
      return toText(doc, [], { path: target, extra: [[m.key, m.value]] });
    }
    case "protoPayload": {
      const target = objects[m.pick % objects.length];
      return toText(doc, [], { path: target, extra: [[m.key, { polluted: "yes", isAdmin: true, prototype: { polluted: "yes" } }]] });
    }
  }
}

/** The one deliberate mention of NaN in a message: the refusal of non-finite numbers. */
export const withoutDeliberateNaN = (message: string): string => message.replaceAll("NaN and infinity are not allowed", "");

/** Whether `s` (or the strings inside the JSON it holds) mentions NaN or undefined itself. */
export function inputMentionsForbidden(text: string): boolean {
  const re = /NaN|undefined/;
  if (re.test(text)) return true;
  try {
    return re.test(JSON.stringify(JSON.parse(text)));
  } catch {
    return false;
  }
}

/** The problems of a user-facing error, or undefined for any other throwable. */
export function problemsOf(e: unknown): QuietframeError[] | undefined {
  if (e instanceof QuietframeError) return [e];
  if (e instanceof QuietframeErrors) return e.problems.every((p) => p instanceof QuietframeError) ? e.problems : undefined;
  return undefined;
}

/** Describes why `e` is not an acceptable user-facing error (empty string when it is). */
export function errorDefect(e: unknown, mayMentionForbidden: boolean): string {
  const problems = problemsOf(e);
  if (!problems) return `not a QuietframeError: ${e instanceof Error ? `${e.name}: ${e.message}\n${e.stack}` : String(e)}`;
  if (problems.length === 0) return "QuietframeErrors with no problems";
  for (const p of problems) {
    if (typeof p.path !== "string" || p.path.trim() === "") return `problem without a path: ${p.message}`;
    if (typeof p.problem !== "string" || p.problem.trim() === "") return `problem without a description: ${p.message}`;
    if (!mayMentionForbidden && /NaN|undefined/.test(withoutDeliberateNaN(p.message))) return `message mentions NaN/undefined: ${p.message}`;
  }
  if (!mayMentionForbidden && /NaN|undefined/.test(withoutDeliberateNaN((e as Error).message))) return `message mentions NaN/undefined: ${(e as Error).message}`;
  return "";
}
