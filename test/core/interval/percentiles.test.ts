import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CURVE_PERCENTILES, durationCurve, nearestRank, percentiles, valuesAtRanks } from "../../../src/core/interval/percentiles.js";

describe("nearest-rank percentiles", () => {
  it("rank ⌈p·n/100⌉ − 1 (hand: n = 10 → P0 0, P10 0, P11 1, P50 4, P95 9, P100 9)", () => {
    expect([0, 10, 11, 50, 95, 100].map((p) => nearestRank(p, 10))).toEqual([0, 0, 1, 4, 9, 9]);
    expect(nearestRank(95, 525_600)).toBe(499_319); // 0.95 × 525 600 = 499 320 exactly
    expect(nearestRank(99.9, 1000)).toBe(998);
  });

  it("of 1 … 20 (hand: P5 = 1, P25 = 5, P50 = 10, P90 = 18, P100 = 20)", () => {
    const v = Float64Array.from({ length: 20 }, (_, i) => 20 - i);
    const p = percentiles(v, 20, [5, 25, 50, 90, 100]);
    expect(p).toEqual({ P5: 1, P25: 5, P50: 10, P90: 18, P100: 20 });
  });

  it("valuesAtRanks equals a full sort at every rank asked (random data with ties and negatives; oracle: Array sort)", () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.oneof(
            fc.integer({ min: -50, max: 50 }),
            fc.double({ min: -1e6, max: 1e6, noNaN: true }),
            fc.double({ noNaN: true, noDefaultInfinity: true }),
          ),
          { minLength: 1, maxLength: 3000 },
        ),
        fc.array(fc.nat(), { minLength: 1, maxLength: 40 }),
        (xs, rs) => {
          const v = Float64Array.from(xs);
          const sorted = [...xs].sort((a, b) => a - b);
          const ranks = rs.map((r) => r % xs.length);
          const got = Array.from(valuesAtRanks(v, xs.length, ranks), (x) => x + 0); // + 0: −0 and 0 tie
          expect(got).toEqual(ranks.map((r) => sorted[r]! + 0));
          const range = { min: sorted[0]!, max: sorted[sorted.length - 1]! }; // a caller that knows the range
          expect(Array.from(valuesAtRanks(v, xs.length, ranks, range), (x) => x + 0)).toEqual(got);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("only the first n values count", () => {
    const v = Float64Array.from([3, 1, 2, 1000, -1000]);
    expect(percentiles(v, 3, [0, 100])).toEqual({ P0: 1, P100: 3 });
  });

  it("duration curve runs from the peak (0 %) to the minimum (100 %) with ≤ 200 points", () => {
    const v = Float64Array.from({ length: 1000 }, (_, i) => i + 1); // 1 … 1000
    const { curve, percentiles: p } = durationCurve(v, 1000);
    expect(curve.kvar.length).toBe(CURVE_PERCENTILES.length);
    expect(curve.kvar.length).toBeLessThanOrEqual(200);
    expect(curve.exceedancePct[0]).toBe(0);
    expect(curve.kvar[0]).toBe(1000);
    expect(curve.exceedancePct.at(-1)).toBe(100);
    expect(curve.kvar.at(-1)).toBe(1);
    // hand: exceedance 10 % ↔ P90 = the 900th value = 900
    expect(curve.kvar[curve.exceedancePct.indexOf(10)]).toBe(900);
    expect(p.P90).toBe(900);
    for (let i = 1; i < curve.kvar.length; i++) expect(curve.kvar[i]!).toBeLessThanOrEqual(curve.kvar[i - 1]!);
  });
});
