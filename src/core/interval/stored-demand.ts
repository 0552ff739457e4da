import type { IntervalDemandInput } from "../inputs.js";
import type { IntervalSummary } from "./summary.js";

/** Most samples a stored summary expands to: an hour a sample over a year. */
export const INTERVAL_DEMAND_MAX_SAMPLES = 8760;

/**
 * How many times each load point is repeated: in proportion to its interval count, scaled down so the total is at
 * most `maxSamples`, and at least once for every non-empty point. The shares are rounded down and the samples left
 * go to the largest remainders, so the total is min(intervals, maxSamples) — a few more only when the at-least-once
 * rule lifts rare points from 0 (at most one sample per point).
 */
export function sampleCounts(count: readonly number[], maxSamples = INTERVAL_DEMAND_MAX_SAMPLES): number[] {
  const total = count.reduce((s, c) => s + Math.max(0, c), 0);
  if (total <= maxSamples) return count.map((c) => Math.max(0, c));
  const scale = maxSamples / total;
  const exact = count.map((c) => Math.max(0, c) * scale);
  const out = exact.map((x, i) => ((count[i] as number) > 0 ? Math.max(1, Math.floor(x)) : 0));
  let left = maxSamples - out.reduce((s, n) => s + n, 0);
  if (left <= 0) return out;
  const order = exact
    .map((x, i) => ({ i, rest: x - Math.floor(x) }))
    .filter(({ i }) => (out[i] as number) === Math.floor(exact[i] as number) && (count[i] as number) > 0)
    .sort((a, b) => b.rest - a.rest || a.i - b.i);
  for (const { i } of order) {
    if (left <= 0) break;
    out[i] = (out[i] as number) + 1;
    left--;
  }
  return out;
}

/**
 * The interval demand a sizing rests on, rebuilt from a stored summary: each (kW, kvar) load point repeated in
 * proportion to its interval count (see sampleCounts), the summary's interval length, and its months for savings
 * (with each month's own load points from summary version 2 on).
 *
 * Time order is lost: the samples are grouped by load point, not in the order the intervals came, and the spread
 * within a histogram cell is gone. Percentiles, coverage and the fixed/switched split of a bank design hold; switching
 * counts (and operations a day) computed from these samples are not meaningful.
 */
export function intervalDemandOf(s: IntervalSummary, maxSamples = INTERVAL_DEMAND_MAX_SAMPLES): IntervalDemandInput {
  const lp = s.loadPoints;
  const reps = sampleCounts(lp.count, maxSamples);
  const n = reps.reduce((a, r) => a + r, 0);
  const kW = new Float64Array(n);
  const kvar = new Float64Array(n);
  let k = 0;
  reps.forEach((r, i) => {
    kW.fill(lp.kW[i] as number, k, k + r);
    kvar.fill(lp.kvar[i] as number, k, k + r);
    k += r;
  });
  return {
    kW,
    kvar,
    intervalMinutes: s.intervalMinutes,
    months: s.monthly.map((m) => ({
      month: m.month,
      peakKW: m.peakKW,
      peakKVA: m.peakKVA,
      kWh: m.kWh,
      kvarhLagging: m.kvarhLagging,
      kvarhLeading: m.kvarhLeading,
      // version 2 on: what the economics needs to price any bank month by month
      ...(m.peakKWKvar !== undefined ? { peakKWKvar: m.peakKWKvar } : {}),
      ...(m.loadPoints ? { loadPoints: m.loadPoints } : {}),
    })),
  };
}
