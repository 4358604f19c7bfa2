/**
 * exactSiText writes an SI value as text that parses back to the same double, and remembers
 * that parse so a re-validation skips it: the remembered number must be what parseQuantity
 * makes of the text, bit for bit, for every kind and every finite double (the claim rests on
 * ECMAScript's Number::toString giving the shortest digits that round-trip, ECMA-262
 * §6.1.6.1.20, and on the SI unit's scale being exactly 1). Fixed seeds.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { exactSiText, resolveParams } from "../../src/setup/params";
import type { ComponentKind } from "../../src/components/types";
import { parseQuantity, QUANTITY_KINDS, type QuantityKind } from "../../src/units";

const anyFinite = fc.double({ noNaN: true, noDefaultInfinity: true }).filter((x) => x !== 0);

/** A component kind with one parameter of the given quantity kind and no range of its own. */
function oneParameterKind(kind: QuantityKind): ComponentKind<unknown> {
  return { type: "probe", params: [{ name: "value", kind, doc: "a test value" }] } as unknown as ComponentKind<unknown>;
}

describe("exactSiText", () => {
  it("writes text whose parse is the value itself, for every quantity kind (random doubles of every size and sign)", () => {
    for (const kind of QUANTITY_KINDS) {
      fc.assert(
        fc.property(anyFinite, (x) => {
          const text = exactSiText(x, kind);
          if (typeof text === "number") return Object.is(text, x);
          return Object.is(parseQuantity(text, kind, "value"), x);
        }),
        { seed: 20261205, numRuns: 300 },
      );
    }
  });

  it("resolving the text it wrote gives the value, as parsing the text afresh does", () => {
    fc.assert(
      fc.property(fc.constantFrom(...QUANTITY_KINDS.filter((k) => k !== "fraction" && k !== "count")), anyFinite, (kind, x) => {
        const text = exactSiText(x, kind);
        const { values } = resolveParams(oneParameterKind(kind), { value: text }, "c");
        return Object.is(values.value, x) && Object.is(values.value, typeof text === "number" ? text : parseQuantity(text, kind, "c.value"));
      }),
      { seed: 20261206, numRuns: 500 },
    );
  });

  it("leaves zeros to be parsed as written: −0 becomes the text of 0 and resolves to 0", () => {
    const text = exactSiText(-0, "mass");
    expect(text).toBe("0 kg");
    expect(Object.is(resolveParams(oneParameterKind("mass"), { value: text }, "c").values.value, 0)).toBe(true);
  });
});
