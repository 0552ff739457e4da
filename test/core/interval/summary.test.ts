import { describe, expect, it } from "vitest";
import { analyseIntervals, loadPointsOf } from "../../../src/core/interval/analyse.js";
import { simulateController } from "../../../src/core/interval/simulate.js";
import { roughControllerEstimate, summarise } from "../../../src/core/interval/summary.js";
import { expectClose } from "../../helpers/tolerance.js";
import { ITOL, syntheticYear } from "./fixtures.js";

/** A noisy plant year: weekday shifts and a seeded random spread (Park–Miller generator). */
function plantYear() {
  let seed = 12345;
  const rand = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
  return syntheticYear(96, (k, d) => {
    const on = d % 7 < 5 && k >= 24 && k < 88 ? 1 : 0;
    return { kW: 150 + 450 * on + 60 * rand(), kvar: 80 + 320 * on + 50 * rand() };
  });
}

describe("IntervalSummary", () => {
  const series = plantYear();
  const analysis = analyseIntervals(series, 0.95);
  const summary = summarise(analysis);
  const json = JSON.stringify(summary);

  it("is JSON, under 20 KB, and survives a round trip", () => {
    expect(json.length).toBeLessThan(20_000);
    expect(JSON.parse(json)).toEqual(summary);
  });

  it("holds the figures a bank design needs, rounded to 0.001 kvar", () => {
    expect(summary.summaryVersion).toBe(2);
    expect(summary.intervalCount).toBe(365 * 96);
    expect(summary.intervalMinutes).toBe(15);
    expect(summary.monthly).toHaveLength(12);
    expectClose(summary.minimumReactiveDemand.minKvar, analysis.minimumReactiveDemand.minKvar, { abs: 0.0005 }, "min kvar");
    expectClose(summary.neededKvar.hold95PctKvar, analysis.neededKvar.hold95PctKvar, { abs: 0.0005 }, "hold 95");
    expect(summary.durationCurve.kvar.length).toBeLessThanOrEqual(200);
    expect(summary.loadPoints.count.reduce((a, b) => a + b, 0)).toBe(365 * 96);
  });

  it("keeps the mean kW and kvar of every load-point cell (energy is preserved exactly)", () => {
    const lp = loadPointsOf(series);
    let p = 0,
      q = 0;
    lp.count.forEach((c, i) => ((p += c * lp.kW[i]!), (q += c * lp.kvar[i]!)));
    let p0 = 0,
      q0 = 0;
    for (let i = 0; i < series.length; i++) ((p0 += series.kW[i]!), (q0 += series.kvar[i]!));
    expectClose(p, p0, ITOL.sum, "Σ kW");
    expectClose(q, q0, ITOL.sum, "Σ kvar");
  });

  it("a rough controller estimate from the summary tracks the interval simulation", () => {
    const bank = { fixedKvar: 40, stepsKvar: [50, 50, 100, 100] };
    const sim = simulateController(series, bank, 0.95);
    const est = roughControllerEstimate(summary, bank, 0.95);
    const n = series.length;
    // where in its dead band the controller sits depends on time order, which a summary no longer has, and the
    // spread within a cell is lost: the simulation lies within the estimate's ranges, widened by 5 points on
    // shares and 0.005 on PF (cells are ~40 kW × ~16 kvar; common practice, no source)
    const within = (v: number, [lo, hi]: [number, number], slack: number, label: string) => {
      expect(v, `${label} ${v} in [${lo}, ${hi}]`).toBeGreaterThanOrEqual(Math.min(lo, hi) - slack);
      expect(v, `${label} ${v} in [${lo}, ${hi}]`).toBeLessThanOrEqual(Math.max(lo, hi) + slack);
    };
    within((sim.intervalsBelowTarget.after / n) * 100, est.belowTargetPctRange, 5, "below target %");
    within((sim.intervalsLeading.after / n) * 100, est.leadingPctRange, 5, "leading %");
    within(sim.total.billingPFAfter, est.billingPFAfterRange, 0.005, "billing PF after");
    expectClose(est.leadingBeyondLimitPct, (sim.intervalsLeading.afterBeyondLimit / n) * 100, { abs: 1 }, "leading beyond the limit %");
    expectClose(est.billingPFBefore, sim.total.billingPFBefore, { abs: 1e-6 }, "billing PF before (energy exact)");
  });

  it("is exact on a two-state day (each state is one cell): PF after 4/√17", () => {
    const s = syntheticYear(96, (k) => (k < 32 ? { kW: 200, kvar: 100 } : { kW: 600, kvar: 450 }));
    const est = roughControllerEstimate(summarise(analyseIntervals(s, 0.95)), { fixedKvar: 50, stepsKvar: [50, 100, 100] }, 0.95);
    expect(est.belowTargetPct).toBe(0);
    expect(est.leadingPct).toBe(0);
    expectClose(est.billingPFAfter, 4 / Math.sqrt(17), ITOL.pf, "billing PF after");
  });
});
