import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parseDecimal } from "../../../src/core/interval/numbers.js";

const p = (text: string, comma = false) => parseDecimal(text, 0, text.length, comma);

describe("parseDecimal", () => {
  it("reads plain decimals exactly (reference: the literal's own value)", () => {
    expect(p("412.351")).toBe(412.351);
    expect(p("-0.25")).toBe(-0.25);
    expect(p("+7")).toBe(7);
    expect(p(".5")).toBe(0.5);
    expect(p("5.")).toBe(5);
    expect(p("  12.5 ")).toBe(12.5);
    expect(p("1e3")).toBe(1000); // exponent: the Number() fallback
  });

  it("reads a decimal comma only when asked", () => {
    expect(p("1,5", true)).toBe(1.5);
    expect(p("1,5", false)).toBeNaN();
  });

  it("refuses what is not a number", () => {
    for (const bad of ["", " ", "-", ".", "abc", "12a", "1.2.3", "1,2,3", "0x10", "--1", "1 2", "Infinity", "NaN"]) expect(p(bad), bad).toBeNaN();
  });

  it("agrees with Number() on random decimals of up to 17 significant digits (independent oracle)", () => {
    fc.assert(
      fc.property(fc.integer({ min: -1e15, max: 1e15 }), fc.integer({ min: 0, max: 9 }), (int, digits) => {
        const text = (int / 10 ** digits).toFixed(digits);
        expect(p(text)).toBe(Number(text));
      }),
      { numRuns: 2000 },
    );
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e12, max: 1e12 }), (x) => {
        const text = String(x);
        expect(p(text)).toBe(Number(text));
      }),
      { numRuns: 2000 },
    );
  });
});
