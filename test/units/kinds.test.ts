import { describe, expect, it } from "vitest";
import { isQuantityKind, parseQuantity, QUANTITY_KIND_INFO, QUANTITY_KINDS } from "../../src/units";
import { crossKindCollisions, unitSymbols } from "../../src/units/units";
import { expectProblem } from "./helpers";

describe("quantity kinds", () => {
  it("lists the thirteen kinds", () => {
    expect([...QUANTITY_KINDS].sort()).toEqual(
      ["angle", "count", "decibel", "fraction", "frequency", "gyromagneticRatio", "length", "magneticField", "mass", "number", "power", "temperature", "time"].sort(),
    );
  });
  it("isQuantityKind accepts exactly the kinds", () => {
    for (const k of QUANTITY_KINDS) expect(isQuantityKind(k)).toBe(true);
    for (const x of ["Mass", "weight", "", "toString", 3, null, undefined, {}, ["mass"]]) expect(isQuantityKind(x)).toBe(false);
  });
  it("only fraction, count and number accept bare numbers", () => {
    const bare = QUANTITY_KINDS.filter((k) => !QUANTITY_KIND_INFO[k].needsUnit);
    expect(bare.sort()).toEqual(["count", "fraction", "number"]);
  });
});

describe("unit tables", () => {
  it("no symbol belongs to two kinds", () => {
    expect(crossKindCollisions()).toEqual([]);
  });

  it("every symbol parses for its own kind and is named as that kind by every other kind", () => {
    for (const kind of QUANTITY_KINDS) {
      for (const sym of unitSymbols(kind)) {
        expect(Number.isFinite(parseQuantity(`0.5 ${sym}`, kind, "f")), `${sym} as ${kind}`).toBe(true);
        for (const other of QUANTITY_KINDS) {
          if (other === kind) continue;
          // "Gs" (gigasecond) in a field slot gets a more useful hint than "is a time".
          const expected = sym === "Gs" && other === "magneticField" ? /would be gigaseconds/ : new RegExp(`is ${QUANTITY_KIND_INFO[kind].phrase}, but this field is`);
          expectProblem(() => parseQuantity(`0.5 ${sym}`, other, "f"), "f", expected);
        }
      }
    }
  });

  it("'m' alone is the metre, 'mm' the millimetre, 'Mm' the megametre; 'mK' and 'mHz' are milli", () => {
    expect(parseQuantity("2 m", "length", "f")).toBe(2);
    expect(parseQuantity("2 mm", "length", "f")).toBe(2e-3);
    expect(parseQuantity("2 Mm", "length", "f")).toBe(2e6);
    expect(parseQuantity("2 mK", "temperature", "f")).toBe(2e-3);
    expect(parseQuantity("2 mHz", "frequency", "f")).toBe(2e-3);
    expect(parseQuantity("2 MHz", "frequency", "f")).toBe(2e6);
  });
});
