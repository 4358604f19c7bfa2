import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { parseQuantity, QUANTITY_KINDS, type QuantityKind } from "../../src/units";
import { unitSymbols } from "../../src/units/units";
import { withoutDeliberateNaN } from "./support";

// New input shapes beyond the existing robustness suite: non-ASCII digits, exponents at the
// edges of double precision, and units that look like real ones but are not.
const PATH = "components.body.field";
const RUNS = 10_000;
const TIMEOUT = 120_000;
const kindArb = fc.constantFrom<QuantityKind>(...QUANTITY_KINDS);

/** Describes what is wrong with parseQuantity's outcome (empty string when nothing is). */
function quantityDefect(value: unknown, kind: QuantityKind): string {
  let result: unknown;
  try {
    result = parseQuantity(value, kind, PATH);
  } catch (e) {
    if (!(e instanceof QuietframeError)) return `not a QuietframeError: ${String(e)}`;
    if (e.path !== PATH || !e.message.startsWith(PATH)) return `wrong path: ${e.message}`;
    const echoes = typeof value === "string" && /NaN|undefined/.test(value);
    if (!echoes && /NaN|undefined/.test(withoutDeliberateNaN(e.problem + (e.allowed ?? "")))) return `message mentions NaN/undefined: ${e.message}`;
    return "";
  }
  if (typeof result !== "number" || !Number.isFinite(result)) return `returned ${String(result)}`;
  if (kind === "fraction" && !(result >= 0 && result <= 1)) return `fraction out of [0, 1]: ${result}`;
  if (kind === "count" && !(result > 0)) return `count not positive: ${result}`;
  return "";
}

function check(value: unknown, kind: QuantityKind): void {
  const defect = quantityDefect(value, kind);
  if (defect) throw new Error(`${defect}\nkind: ${kind}\ninput: ${JSON.stringify(value)}`);
}

const ASCII_UNITS = [...new Set(QUANTITY_KINDS.flatMap((k) => unitSymbols(k)))];

/** Digits from other scripts, fullwidth forms and superscripts, which must not read as numbers silently wrong. */
const unicodeDigits = fc
  .array(
    fc.constantFrom(
      ..."0123456789",
      ..."٠١٢٣٤٥٦٧٨٩", // Arabic-Indic
      ..."۰۱۲۳۴۵۶۷۸۹", // Extended Arabic-Indic
      ..."०१२३४५६७८९", // Devanagari
      ..."０１２３４５６７８９", // fullwidth
      ..."⁰¹²³⁴⁵⁶⁷⁸⁹₀₁₂", // super- and subscripts
      ..."𝟎𝟏𝟐𝟗", // mathematical bold (astral)
      "½",
      "⅓",
      "Ⅻ",
      "．",
      "٫",
      "−",
      "－",
      "＋",
      "e",
      "E",
      ".",
      "-",
      "+",
    ),
    { minLength: 1, maxLength: 8 },
  )
  .map((cs) => cs.join(""));

/** Exponents near where doubles overflow or underflow, before unit prefixes scale them further. */
const edgeNumber = fc.oneof(
  fc.constantFrom(
    "1.7976931348623157e308",
    "1.7976931348623158e308",
    "1.8e308",
    "2e308",
    "9.99e307",
    "1e308",
    "4.9e-324",
    "5e-324",
    "2.4e-324",
    "2.5e-324",
    "1e-323",
    "2.2250738585072014e-308",
    "1e-330",
    "0e999999",
    "1e+308",
    "1E308",
    "-1.7976931348623157e308",
    "179769313486231570000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000",
    "0." + "0".repeat(330) + "1",
    "9007199254740993",
    "1e-9999999999",
    "1e9999999999",
  ),
  fc.tuple(fc.constantFrom("", "-", "+"), fc.integer({ min: 1, max: 9 }), fc.integer({ min: -340, max: 320 })).map(([s, m, e]) => `${s}${m}e${e}`),
);

/** Real symbols with one character swapped for a lookalike, plus whole lookalike symbols. */
const LOOKALIKES: Record<string, string[]> = {
  K: ["\u212a", "Κ", "К"], // Kelvin sign, Greek kappa, Cyrillic ka
  k: ["к", "ĸ"],
  m: ["ｍ", "м"],
  g: ["ɡ", "ｇ"],
  H: ["Н", "Η"],
  z: ["ᴢ", "ｚ"],
  T: ["Т", "Τ"],
  s: ["ѕ", "ꜱ"],
  μ: ["µ", "u", "ц"],
  µ: ["μ", "u"],
  "°": ["º", "˚", "∘"],
  "%": ["％", "‰", "٪"],
  "/": ["∕", "⁄", "／"],
};
const lookalikeUnit = fc.oneof(
  fc.tuple(fc.constantFrom(...ASCII_UNITS), fc.nat(), fc.nat()).map(([u, at, pick]) => {
    const chars = [...u];
    if (chars.length === 0) return u;
    const i = at % chars.length;
    const options = LOOKALIKES[chars[i]];
    if (!options) return u + "\u200b"; // zero-width space after an otherwise real unit
    chars[i] = options[pick % options.length];
    return chars.join("");
  }),
  fc.constantFrom(
    "㎏",
    "㎑",
    "㎒",
    "㎓",
    "㎐",
    "㎜",
    "㎚",
    "㎽",
    "㏄",
    "℃",
    "℉",
    "Ω",
    "Hz\u0301",
    "k\u00adHz",
    "kHz\ufeff",
    "H z",
    "kHz.",
    "kHz,",
    "kHz)",
    "(kHz",
    "Hz Hz",
    "kkHz",
    "dBm",
    "dBc",
    "rad/s/s",
    "deg²",
    "K²",
    "1/K",
  ),
);
const spacing = fc.constantFrom("", " ", "\u00a0", "\u2009", "\u3000", "\u200b", "\t");

describe("parseQuantity on new shapes: finite number or QuietframeError (fast-check, seed 31337)", () => {
  it("the property itself accepts good input and rejects a raised TypeError", () => {
    expect(quantityDefect("40 kg", "mass")).toBe("");
    expect(quantityDefect("1.5 kHz", "frequency")).toBe("");
    expect(quantityDefect("40 Hz", "mass")).toBe("");
    expect(quantityDefect(0.5, "fraction")).toBe("");
    expect(quantityDefect(2, "fraction")).toBe(""); // a QuietframeError, not a value out of range
  });

  it(
    "numbers written in other scripts' digits, with and without units",
    () => {
      fc.assert(
        fc.property(unicodeDigits, spacing, fc.oneof(fc.constantFrom(...ASCII_UNITS), lookalikeUnit), kindArb, (n, sp, u, kind) => {
          check(`${n}${sp}${u}`, kind);
          check(n, kind);
        }),
        { seed: 31337, numRuns: RUNS },
      );
    },
    TIMEOUT,
  );

  it(
    "exponents at the float limits, scaled by every real unit",
    () => {
      fc.assert(
        fc.property(edgeNumber, spacing, fc.constantFrom(...ASCII_UNITS, ""), kindArb, (n, sp, u, kind) => {
          check(`${n}${sp}${u}`, kind);
          check(Number(n), kind);
        }),
        { seed: 31337, numRuns: RUNS },
      );
    },
    TIMEOUT,
  );

  it(
    "unit lookalikes after ordinary and extreme numbers",
    () => {
      fc.assert(
        fc.property(fc.oneof(edgeNumber, fc.double({ noNaN: true }).map(String), fc.constantFrom("1", "40", "0.5", "-3")), spacing, lookalikeUnit, kindArb, (n, sp, u, kind) => {
          check(`${n}${sp}${u}`, kind);
        }),
        { seed: 31337, numRuns: RUNS },
      );
    },
    TIMEOUT,
  );

  it("no lookalike of a kelvin, kilo or micro sign is silently read as the real unit", () => {
    // A lookalike either means the same thing deliberately or is refused; it must never change the value.
    for (const [fake, real, kind] of [
      ["6 \u212a", "6 K", "temperature"],
      ["6 Κ", "6 K", "temperature"],
      ["5 кg", "5 kg", "mass"],
      ["3 ｍW", "3 mW", "power"],
    ] as const) {
      let fakeValue: number | undefined;
      try {
        fakeValue = parseQuantity(fake, kind, PATH);
      } catch (e) {
        expect(e).toBeInstanceOf(QuietframeError);
      }
      if (fakeValue !== undefined) expect(fakeValue).toBe(parseQuantity(real, kind, PATH));
    }
  });
});
