import { describe, expect, it } from "vitest";
import { analyseIntervals } from "../../../src/core/interval/analyse.js";
import { expectClose } from "../../helpers/tolerance.js";
import { ITOL, seriesOf, syntheticYear } from "./fixtures.js";

// tan(acos 0.95) = √(1 − 0.95²)/0.95 (closed form)
const TAN95 = Math.sqrt(1 - 0.95 ** 2) / 0.95;

/** 2025 in 15-minute intervals: 00:00–08:00 at 200 kW / 100 kvar, 08:00–24:00 at 600 kW / 450 kvar. */
const piecewise = () => syntheticYear(96, (k) => (k < 32 ? { kW: 200, kvar: 100 } : { kW: 600, kvar: 450 }));

describe("analyseIntervals — piecewise-constant day (exact percentiles)", () => {
  const a = analyseIntervals(piecewise(), 0.95);

  it("counts and interval", () => {
    expect(a.intervalCount).toBe(365 * 96);
    expect(a.intervalMinutes).toBe(15);
    expect(a.coveredDays).toBe(365);
    expect(a.firstTimestamp).toBe("2025-01-01T00:00:00Z");
    expect(a.lastTimestamp).toBe("2025-12-31T23:45:00Z");
  });

  it("kvar percentiles: one third of intervals at 100, two thirds at 450 (nearest rank: P ≤ 33⅓ → 100)", () => {
    expect(a.kvar.percentiles).toEqual({
      P0: 100,
      P1: 100,
      P5: 100,
      P10: 100,
      P25: 100,
      P50: 450,
      P75: 450,
      P90: 450,
      P95: 450,
      P99: 450,
      P100: 450,
    });
    expect(a.minimumReactiveDemand).toEqual({ minKvar: 100, p1Kvar: 100, p5Kvar: 100 });
    // the curve: 450 kvar reached in ≤ 66⅔ % of the time, 100 kvar beyond
    const c = a.kvar.durationCurve;
    expect(c.kvar[c.exceedancePct.indexOf(66)]).toBe(450);
    expect(c.kvar[c.exceedancePct.indexOf(67)]).toBe(100);
  });

  it("needed kvar: max(0, Q − P·tan(acos 0.95)) — night 100 − 200·t, day 450 − 600·t", () => {
    const night = 100 - 200 * TAN95; // hand: 100 − 65.737 = 34.263
    const day = 450 - 600 * TAN95; // hand: 450 − 197.211 = 252.789
    expectClose(a.neededKvar.percentiles.P25, night, ITOL.exact, "needed P25");
    expectClose(a.neededKvar.percentiles.P50, day, ITOL.exact, "needed P50");
    expectClose(a.neededKvar.hold95PctKvar, day, ITOL.exact, "hold 95 %");
    expectClose(a.neededKvar.hold99PctKvar, day, ITOL.exact, "hold 99 %");
    expectClose(a.neededKvar.hold100PctKvar, day, ITOL.exact, "hold 100 %");
    expectClose(night, 34.263, { abs: 0.001 }, "hand value night");
  });

  it("PF distribution: day 600/750 = 0.8, night 200/√50000 = 0.894427; all below 0.95, none leading", () => {
    expectClose(a.pf.percentiles.P50, 0.8, ITOL.pf, "PF P50");
    expectClose(a.pf.percentiles.P100, 200 / Math.sqrt(200 ** 2 + 100 ** 2), ITOL.pf, "PF P100");
    expect(a.pf.intervalsBelowTarget).toBe(365 * 96);
    expect(a.pf.intervalsLeading).toBe(0);
  });

  it("monthly peaks and billing PF (hand calculation for January)", () => {
    expect(a.monthly.map((m) => m.month)).toEqual(Array.from({ length: 12 }, (_, i) => `2025-${String(i + 1).padStart(2, "0")}`));
    const jan = a.monthly[0]!;
    expect(jan.intervals).toBe(31 * 96);
    expect(jan.peakKW).toBe(600);
    expect(jan.peakKWAt).toBe("2025-01-01T08:00:00Z"); // first interval at the peak
    expect(jan.peakKVA).toBe(750); // √(600² + 450²)
    // kWh = 31 d × (8 h × 200 + 16 h × 600) = 31 × 11 200 = 347 200; kvarh = 31 × (8 × 100 + 16 × 450) = 248 000
    expectClose(jan.kWh, 347_200, ITOL.sum, "January kWh");
    expectClose(jan.kvarhLagging, 248_000, ITOL.sum, "January kvarh");
    expect(jan.kvarhLeading).toBe(0);
    // PF = kWh/√(kWh² + kvarh²) = 11 200/√(11 200² + 8 000²) = 0.813733
    expectClose(jan.billingPF, 11_200 / Math.hypot(11_200, 8_000), ITOL.pf, "January billing PF");
    expectClose(jan.billingPF, 0.813733, { abs: 1e-6 }, "January billing PF, hand value");
    expect(a.monthly[1]!.intervals).toBe(28 * 96);
    expectClose(a.total.kWh, 365 * 11_200, ITOL.sum, "year kWh");
  });
});

describe("analyseIntervals — sinusoidal reactive demand (closed-form percentiles)", () => {
  // Q(t) = A + B·sin(2π(k + ½)/N) at N equally spaced instants a day, P constant. For θ uniform on a circle,
  // Pr[sin θ ≤ s] = ½ + asin(s)/π, so the p-quantile is A + B·sin(π(p − ½)). The sampled nearest-rank value
  // lies within 2/N in probability of p, hence within 2πB/N in kvar (the quantile's slope is at most πB).
  const A = 300,
    B = 200,
    N = 1440,
    P = 800;
  const s = syntheticYear(N, (k) => ({ kW: P, kvar: A + B * Math.sin((2 * Math.PI * (k + 0.5)) / N) }));
  const a = analyseIntervals(s, 0.95);
  const tol = { abs: (2 * Math.PI * B) / N };

  it("has 525 600 one-minute intervals", () => {
    expect(a.intervalCount).toBe(525_600);
    expect(a.intervalMinutes).toBe(1);
  });

  it.each([0, 1, 5, 10, 25, 50, 75, 90, 95, 99, 100])("P%s of kvar = A + B·sin(π(p − ½))", (p) => {
    expectClose(a.kvar.percentiles[`P${p}`], A + B * Math.sin(Math.PI * (p / 100 - 0.5)), tol, `kvar P${p}`);
  });

  it("needed kvar percentiles = max(0, Q_p − P·tan(acos 0.95)) (monotone in Q at constant P)", () => {
    for (const p of [50, 95, 99, 100]) {
      const q = A + B * Math.sin(Math.PI * (p / 100 - 0.5));
      expectClose(a.neededKvar.percentiles[`P${p}`], Math.max(0, q - P * TAN95), tol, `needed P${p}`);
    }
    expect(a.neededKvar.percentiles.P0).toBe(0); // Q_min = 100 < 800·0.3287 = 263
  });

  it("monthly billing PF: the sine averages out over whole days, PF = 800/√(800² + 300²)", () => {
    for (const m of a.monthly) expectClose(m.billingPF, P / Math.hypot(P, A), ITOL.pf, `billing PF ${m.month}`);
  });
});

describe("analyseIntervals — months in the series' time zone", () => {
  it("an interval at 2026-03-01T05:30Z is still February in America/Chicago (23:30 CST)", () => {
    const t = [Date.parse("2026-03-01T05:30:00Z"), Date.parse("2026-03-01T06:00:00Z"), Date.parse("2026-03-01T06:30:00Z")];
    const a = analyseIntervals(seriesOf(t, [500, 100, 100], [0, 10, 10], 30, "America/Chicago"), 0.95);
    expect(a.monthly.map((m) => [m.month, m.intervals, m.peakKW])).toEqual([
      ["2026-02", 1, 500],
      ["2026-03", 2, 100],
    ]);
    expect(a.monthly[0]!.peakKWAt).toBe("2026-02-28T23:30:00-06:00");
    // hand: March kWh = 2 × 100 kW × 0.5 h = 100; kvarh = 2 × 10 × 0.5 = 10 → PF = 100/√(100² + 10²) = 0.995037
    expectClose(a.monthly[1]!.billingPF, 100 / Math.hypot(100, 10), ITOL.pf, "March billing PF");
  });

  it("leading intervals: kvar < 0 counts as leading and the net kvarh subtracts it", () => {
    const t = [0, 1, 2, 3].map((i) => Date.UTC(2026, 0, 1) + i * 3_600_000);
    const a = analyseIntervals(seriesOf(t, [100, 100, 100, 100], [50, 50, -20, 0], 60), 0.95);
    expect(a.pf.intervalsLeading).toBe(1);
    const m = a.monthly[0]!;
    expect([m.kWh, m.kvarhLagging, m.kvarhLeading]).toEqual([400, 100, 20]);
    // hand: net 80 kvarh → 400/√(400² + 80²) = 0.980581; lagging only 400/√(400² + 100²) = 0.970143
    expectClose(m.billingPF, 400 / Math.hypot(400, 80), ITOL.pf, "net billing PF");
    expectClose(m.billingPFLaggingOnly, 400 / Math.hypot(400, 100), ITOL.pf, "lagging-only billing PF");
  });

  it("refuses an unsorted series", () => {
    expect(() => analyseIntervals(seriesOf([2, 1], [1, 1], [1, 1], 1), 0.95)).toThrow(RangeError);
  });
});
