import { describe, expect, it } from "vitest";
import { fundamentalCurrentA, injectedCurrents, sixPulseSpectrum, validateSpectrum } from "../../../src/core/harmonics/harmonics-api.js";

describe("six-pulse spectrum", () => {
  it("holds 6k ± 1 up to 49 at 1/h", () => {
    const s = sixPulseSpectrum();
    // textbook idealisation I_h = I_1/h: orders 5, 7, 11, 13, …, 47, 49 → 16 lines
    expect(s.map((l) => l.order)).toEqual([5, 7, 11, 13, 17, 19, 23, 25, 29, 31, 35, 37, 41, 43, 47, 49]);
    const pct = new Map(s.map((l) => [l.order, l.pct]));
    // hand calculation: 100/5 = 20, 100/7 = 14.2857, 100/11 = 9.0909, 100/13 = 7.6923, 100/49 = 2.0408
    expect(pct.get(5)).toBeCloseTo(20, 10);
    expect(pct.get(7)).toBeCloseTo(14.2857, 4);
    expect(pct.get(11)).toBeCloseTo(9.0909, 4);
    expect(pct.get(13)).toBeCloseTo(7.6923, 4);
    expect(pct.get(49)).toBeCloseTo(2.0408, 4);
  });
});

describe("spectrum validation", () => {
  it.each([
    // common practice, no source: integer orders 2..50, non-negative percentages
    [[{ order: 1, pct: 5 }], "s[0].order"],
    [[{ order: 51, pct: 5 }], "s[0].order"],
    [[{ order: 5.5, pct: 5 }], "s[0].order"],
    [
      [
        { order: 5, pct: 20 },
        { order: 7, pct: -1 },
      ],
      "s[1].pct",
    ],
    [
      [
        { order: 5, pct: 20 },
        { order: 5, pct: 10 },
      ],
      "s[1].order",
    ],
  ])("flags %j at %s", (spectrum, path) => {
    expect(validateSpectrum(spectrum, "s").map((i) => i.path)).toEqual([path]);
  });

  it("flags a spectrum summing over 300 %", () => {
    // hand calculation: 150 + 150.5 = 300.5 > 300
    const issues = validateSpectrum(
      [
        { order: 3, pct: 150 },
        { order: 5, pct: 150.5 },
      ],
      "sources[2].spectrum",
    );
    expect(issues).toEqual([{ path: "sources[2].spectrum", message: "spectrum sums to more than 300 %" }]);
    // boundary: exactly 300 % is accepted
    expect(
      validateSpectrum(
        [
          { order: 3, pct: 150 },
          { order: 5, pct: 150 },
        ],
        "s",
      ),
    ).toEqual([]);
  });

  it("accepts the six-pulse spectrum", () => {
    expect(validateSpectrum(sixPulseSpectrum(), "s")).toEqual([]);
  });
});

describe("injected currents", () => {
  it("computes I_1 for 3-phase and 1-phase (line-to-neutral) loads", () => {
    // hand calculation: 300 000/(√3·480) = 360.844 A; 10 000/(480/√3) = 36.084 A
    expect(fundamentalCurrentA(300, 3, 480)).toBeCloseTo(360.844, 3);
    expect(fundamentalCurrentA(10, 1, 480)).toBeCloseTo(36.084, 3);
  });

  it("adds same-order currents arithmetically by default, or as RSS", () => {
    const sources = [
      { label: "a", kVA: 100, phases: 3 as const, isDrive: false, spectrum: [{ order: 5, pct: 30 }] },
      {
        label: "b",
        kVA: 200,
        phases: 3 as const,
        isDrive: false,
        spectrum: [
          { order: 5, pct: 20 },
          { order: 7, pct: 10 },
        ],
      },
    ];
    // hand calculation: I_1a = 120.281 A, I_1b = 240.563 A; I_5a = 36.084, I_5b = 48.113
    //   arithmetic: 84.197 A; RSS: √(36.084² + 48.113²) = 60.141 A; I_7 = 24.056 A either way
    const sum = injectedCurrents(sources, 480);
    expect(sum.byOrderA[5]).toBeCloseTo(84.197, 2);
    expect(sum.byOrderA[7]).toBeCloseTo(24.056, 2);
    expect(sum.orders).toEqual([5, 7]);
    expect(sum.fundamentalA).toBeCloseTo(360.844, 2);
    const rss = injectedCurrents(sources, 480, "rss");
    expect(rss.byOrderA[5]).toBeCloseTo(60.141, 2);
    expect(rss.byOrderA[7]).toBeCloseTo(24.056, 2);
  });

  it("gives a drive without a spectrum the six-pulse spectrum and a linear-spectrum source none", () => {
    // hand calculation: I_5 = 360.844/5 = 72.169 A; I_49 = 360.844/49 = 7.364 A
    const c = injectedCurrents([{ label: "vfd", kVA: 300, phases: 3, isDrive: true }], 480);
    expect(c.byOrderA[5]).toBeCloseTo(72.169, 3);
    expect(c.byOrderA[49]).toBeCloseTo(7.364, 3);
    expect(c.byOrderA[3]).toBe(0);
  });
});
