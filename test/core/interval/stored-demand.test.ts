import { describe, expect, it } from "vitest";
import { INTERVAL_DEMAND_MAX_SAMPLES, intervalDemandOf, sampleCounts } from "../../../src/core/interval/stored-demand.js";
import { analyseIntervals } from "../../../src/core/interval/analyse.js";
import { summarise, type IntervalSummary } from "../../../src/core/interval/summary.js";
import { syntheticYear } from "./fixtures.js";

const sum = (a: ArrayLike<number>) => Array.from(a).reduce((s, v) => s + v, 0);

/** A hand-made summary: only the fields the mapping reads matter. */
function summaryWith(points: { kW: number[]; kvar: number[]; count: number[] }, monthly: IntervalSummary["monthly"] = []): IntervalSummary {
  const s = summarise(
    analyseIntervals(
      syntheticYear(24, () => ({ kW: 100, kvar: 50 }), 2),
      0.95,
    ),
  );
  return { ...s, intervalMinutes: 15, loadPoints: { kWBins: 16, kvarBins: 24, ...points }, monthly };
}

describe("sampleCounts", () => {
  it("keeps the counts when they fit", () => {
    expect(sampleCounts([3, 1, 2], 10)).toEqual([3, 1, 2]);
  });

  it("scales exactly when the shares are whole: 35 040 quarter-hours → 8 760 (× 0.25)", () => {
    // hand: 30 000·0.25 = 7 500, 5 000·0.25 = 1 250, 40·0.25 = 10
    expect(sampleCounts([30_000, 5_000, 40])).toEqual([7_500, 1_250, 10]);
  });

  it("gives the samples left after rounding down to the largest remainders", () => {
    // hand: scale 10/29; exact 3.448, 3.448, 3.103 → floors 3, 3, 3 (9); the one left goes to the first .448 (tie: lower index)
    expect(sampleCounts([10, 10, 9], 10)).toEqual([4, 3, 3]);
    // exact 6.667, 2.222, 1.111 (counts 60, 20, 10, max 10): floors 6, 2, 1 = 9; the one left goes to .667
    expect(sampleCounts([60, 20, 10], 10)).toEqual([7, 2, 1]);
  });

  it("keeps at least one sample of every non-empty point, and none of an empty one", () => {
    // hand: 10 000 and 1 at 100 samples → 99.99 and 0.0099 → 99 and (lifted) 1 = 100
    expect(sampleCounts([10_000, 1, 0], 100)).toEqual([99, 1, 0]);
    // lifting may pass the limit by at most one per lifted point: 9.98 → 9, 0.00998 → 1, 0.00998 → 1
    const c = sampleCounts([1_000, 1, 1], 10);
    expect(c).toEqual([9, 1, 1]);
  });
});

describe("intervalDemandOf", () => {
  it("repeats each load point by its count, in point order, with the summary's interval length", () => {
    const d = intervalDemandOf(summaryWith({ kW: [200, 600], kvar: [100, -20], count: [2, 3] }));
    expect(Array.from(d.kW)).toEqual([200, 200, 600, 600, 600]);
    expect(Array.from(d.kvar)).toEqual([100, 100, -20, -20, -20]);
    expect(d.intervalMinutes).toBe(15);
  });

  it("maps the months to the engine's MonthlyDemand", () => {
    const month = {
      month: "2025-01",
      intervals: 2976,
      peakKW: 600,
      peakKVA: 750,
      kWh: 347_200,
      kvarhLagging: 248_000,
      kvarhLeading: 0,
      billingPF: 0.8137,
    };
    const d = intervalDemandOf(summaryWith({ kW: [1], kvar: [1], count: [1] }, [month]));
    expect(d.months).toEqual([{ month: "2025-01", peakKW: 600, peakKVA: 750, kWh: 347_200, kvarhLagging: 248_000, kvarhLeading: 0 }]);
  });

  it("a year of quarter-hours: 8 760 samples with the shares and the kvar-weighted mean of the data", () => {
    // 00–08 h 200 kW / 100 kvar (32 of 96 intervals a day), 08–24 h 600 kW / 450 kvar: 11 680 and 23 360 intervals
    const s = summarise(
      analyseIntervals(
        syntheticYear(96, (k) => (k < 32 ? { kW: 200, kvar: 100 } : { kW: 600, kvar: 450 })),
        0.95,
      ),
    );
    expect(s.intervalCount).toBe(35_040);
    const d = intervalDemandOf(s);
    expect(d.kW.length).toBe(INTERVAL_DEMAND_MAX_SAMPLES);
    const low = Array.from(d.kvar).filter((q) => q === 100).length;
    expect(low).toBe(2_920); // 11 680 · 8 760/35 040
    expect(d.kvar.length - low).toBe(5_840);
    // mean kvar: (1·100 + 2·450)/3 = 333.33…, as in the data
    expect(sum(d.kvar) / d.kvar.length).toBeCloseTo(1000 / 3, 9);
    expect(d.intervalMinutes).toBe(15);
    expect(d.months?.map((m) => m.month)).toHaveLength(12);
    expect(d.months?.[0]).toMatchObject({ month: "2025-01", peakKW: 600, peakKVA: 750, kWh: 31 * 11_200, kvarhLagging: 31 * 8_000, kvarhLeading: 0 });
  });
});
