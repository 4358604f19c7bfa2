/** Typeset quantities: the same rounded value and unit as formatQuantity, in Unicode and siunitx 3. */
import { describe, expect, test } from "vitest";
import { formatQuantity, parseQuantity, siunitxQuantity, unicodeQuantity, QUANTITY_KINDS, type QuantityKind } from "../../src/units";

// Macro names from the siunitx 3 manual (CTAN, 2022): \qty, \num, \ang, prefixes \nano … \mega, units \gram, \hertz, \decibel, \percent.
const CASES: [number, QuantityKind, string, string][] = [
  [1.467e6, "frequency", "1.467 MHz", "\\qty{1.467}{\\mega\\hertz}"],
  [750e3, "power", "750 kW", "\\qty{750}{\\kilo\\watt}"],
  [5e-12, "mass", "5 ng", "\\qty{5}{\\nano\\gram}"],
  [40, "mass", "40 kg", "\\qty{40}{\\kilo\\gram}"],
  [1.988e30, "mass", "1.988 × 10³⁰ kg", "\\qty{1.988e30}{\\kilo\\gram}"],
  [1.064e-6, "length", "1.064 µm", "\\qty{1.064}{\\micro\\metre}"],
  [0.02, "temperature", "20 mK", "\\qty{20}{\\milli\\kelvin}"],
  [-10, "decibel", "−10 dB", "\\qty{-10}{\\decibel}"],
  [Math.PI / 2, "angle", "90°", "\\ang{90}"],
  [-Math.PI / 3, "angle", "−60°", "\\ang{-60}"],
  [0.95, "fraction", "95 %", "\\qty{95}{\\percent}"],
  [2e7, "number", "2 × 10⁷", "\\num{2e7}"],
  [1e8, "count", "10⁸", "\\num{1e8}"],
  [2.5e-7, "number", "2.5 × 10⁻⁷", "\\num{2.5e-7}"],
  [3.5e9, "gyromagneticRatio", "3.5 GHz/T", "\\qty{3.5}{\\giga\\hertz\\per\\tesla}"],
  [314.3e-6, "magneticField", "314.3 µT", "\\qty{314.3}{\\micro\\tesla}"],
  [3600, "time", "3600 s", "\\qty{3600}{\\second}"],
  [0, "frequency", "0 Hz", "\\qty{0}{\\hertz}"],
];

describe("unicodeQuantity and siunitxQuantity", () => {
  test.each(CASES)("%s %s → %s and %s (hand-written)", (si, kind, unicode, latex) => {
    expect(unicodeQuantity(si, kind)).toBe(unicode);
    expect(siunitxQuantity(si, kind)).toBe(latex);
  });

  test.each(QUANTITY_KINDS)("%s: the Unicode text states formatQuantity's value (read back through the parser)", (kind) => {
    for (const si of [1.2345e-9, 0.5, 3, 1234.5, 6.02e23, -0.75]) {
      if ((kind === "fraction" || kind === "count" || kind === "temperature" || kind === "mass") && si < 0) continue;
      if (kind === "fraction" && si > 1) continue;
      const plain = unicodeQuantity(si, kind)
        .replace("−", "-")
        .replace(/ × 10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)/, (_, e: string) => `e${[...e].map((c) => ("⁻⁰¹²³⁴⁵⁶⁷⁸⁹".indexOf(c) === 0 ? "-" : String("⁻⁰¹²³⁴⁵⁶⁷⁸⁹".indexOf(c) - 1))).join("")}`);
      expect(parseQuantity(plain, kind, "q"), `${kind} ${si}: ${plain}`).toBe(parseQuantity(formatQuantity(si, kind), kind, "q"));
    }
  });

  test("non-finite values cannot be typeset for LaTeX (an internal error, never a wrong number)", () => {
    expect(() => siunitxQuantity(Number.NaN, "frequency")).toThrow(/cannot be typeset/);
  });
});
