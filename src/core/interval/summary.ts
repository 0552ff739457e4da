import { round, tanPhi } from "../conventions.js";
import type { IntervalAnalysis } from "./analyse.js";
import { createController, DEFAULT_LEADING_LIMIT_PF, type ControllerOptions } from "./controller.js";
import { billingPF } from "./months.js";
import type { CapacitorBank, DurationCurve, LoadPoints, Percentiles } from "./series-types.js";

/**
 * 2: each month also keeps its own load points and the kvar at its peak kW (the economics prices any bank month by
 * month from them). Version-1 summaries, stored before, lack both and stay readable.
 */
export const SUMMARY_VERSION = 2;
/** Months kept in a summary (the latest ones). */
export const SUMMARY_MAX_MONTHS = 36;

/**
 * The figures of an analysis without the raw series: JSON-serialisable, well under 20 KB, enough for a bank design
 * (minimum reactive demand, kvar and needed-kvar percentiles, duration curve, monthly peaks) and for a rough
 * controller estimate from the (kW, kvar) load points. kW/kvar/kVA rounded to 0.001, PF to 1e-6, energy to 0.1.
 */
export interface IntervalSummary extends Pick<
  IntervalAnalysis,
  "targetPF" | "intervalMinutes" | "intervalCount" | "firstTimestamp" | "lastTimestamp" | "coveredDays" | "timeZone" | "kW"
> {
  summaryVersion: typeof SUMMARY_VERSION | 1;
  kvar: { mean: number; percentiles: Percentiles };
  minimumReactiveDemand: { minKvar: number; p1Kvar: number; p5Kvar: number };
  neededKvar: { percentiles: Percentiles; hold95PctKvar: number; hold99PctKvar: number; hold100PctKvar: number };
  pf: { percentiles: Percentiles; intervalsBelowTarget: number; intervalsLeading: number };
  durationCurve: DurationCurve;
  monthly: SummaryMonth[];
  monthsOmitted: number;
  total: { kWh: number; kvarhLagging: number; kvarhLeading: number; billingPF: number };
  loadPoints: LoadPoints;
}

/** A month of a summary; `peakKWKvar` and `loadPoints` are absent from version-1 summaries. */
export interface SummaryMonth {
  month: string;
  intervals: number;
  peakKW: number;
  peakKVA: number;
  kWh: number;
  kvarhLagging: number;
  kvarhLeading: number;
  billingPF: number;
  peakKWKvar?: number;
  loadPoints?: LoadPoints;
}

const r3 = (v: number) => round(v, 3);
const r6 = (v: number) => round(v, 6);
const r1 = (v: number) => round(v, 1);
const mapP = (p: Percentiles, f: (v: number) => number): Percentiles => Object.fromEntries(Object.entries(p).map(([k, v]) => [k, f(v)]));

export function summarise(a: IntervalAnalysis): IntervalSummary {
  const months = a.monthly.slice(-SUMMARY_MAX_MONTHS);
  const monthPoints = a.monthlyLoadPoints.slice(-SUMMARY_MAX_MONTHS);
  return {
    summaryVersion: SUMMARY_VERSION,
    targetPF: a.targetPF,
    intervalMinutes: a.intervalMinutes,
    intervalCount: a.intervalCount,
    firstTimestamp: a.firstTimestamp,
    lastTimestamp: a.lastTimestamp,
    coveredDays: r3(a.coveredDays),
    timeZone: a.timeZone,
    kW: { max: r3(a.kW.max), mean: r3(a.kW.mean), percentiles: mapP(a.kW.percentiles, r3) },
    kvar: { mean: r3(a.kvar.mean), percentiles: mapP(a.kvar.percentiles, r3) },
    minimumReactiveDemand: {
      minKvar: r3(a.minimumReactiveDemand.minKvar),
      p1Kvar: r3(a.minimumReactiveDemand.p1Kvar),
      p5Kvar: r3(a.minimumReactiveDemand.p5Kvar),
    },
    neededKvar: {
      percentiles: mapP(a.neededKvar.percentiles, r3),
      hold95PctKvar: r3(a.neededKvar.hold95PctKvar),
      hold99PctKvar: r3(a.neededKvar.hold99PctKvar),
      hold100PctKvar: r3(a.neededKvar.hold100PctKvar),
    },
    pf: { percentiles: mapP(a.pf.percentiles, r6), intervalsBelowTarget: a.pf.intervalsBelowTarget, intervalsLeading: a.pf.intervalsLeading },
    durationCurve: { exceedancePct: a.kvar.durationCurve.exceedancePct, kvar: a.kvar.durationCurve.kvar.map(r3) },
    monthly: months.map((m, k) => ({
      month: m.month,
      intervals: m.intervals,
      peakKW: r3(m.peakKW),
      peakKVA: r3(m.peakKVA),
      kWh: r1(m.kWh),
      kvarhLagging: r1(m.kvarhLagging),
      kvarhLeading: r1(m.kvarhLeading),
      billingPF: r6(m.billingPF),
      peakKWKvar: r3(m.peakKWKvar),
      loadPoints: roundPoints(monthPoints[k] as LoadPoints),
    })),
    monthsOmitted: a.monthly.length - months.length,
    total: { kWh: r1(a.total.kWh), kvarhLagging: r1(a.total.kvarhLagging), kvarhLeading: r1(a.total.kvarhLeading), billingPF: r6(a.total.billingPF) },
    loadPoints: roundPoints(a.loadPoints),
  };
}

function roundPoints(lp: LoadPoints): LoadPoints {
  return { ...lp, kW: lp.kW.map(r3), kvar: lp.kvar.map(r3) };
}

export interface RoughControllerEstimate {
  /** Share of intervals with the PF below target after correction, percent. */
  belowTargetPct: number;
  leadingPct: number;
  leadingBeyondLimitPct: number;
  billingPFBefore: number;
  /** With the least kvar that meets the target in every load point (a fresh decision). */
  billingPFAfter: number;
  /** Between the least and the most kvar the dead band may hold; the simulation lies about within these ranges. */
  belowTargetPctRange: [number, number];
  leadingPctRange: [number, number];
  billingPFAfterRange: [number, number];
  note: string;
}

/**
 * A controller estimate from a summary alone: each load point (a histogram cell's mean kW and kvar, weighted by its
 * interval count) gets the kvar a fresh controller decision switches (the least reaching the target within the
 * leading limit), and, for ranges, the least and the most kvar its dead band would hold. Time order is lost (no
 * switching counts, no way to know where in the band the controller sits) and so is the spread within a cell.
 */
export function roughControllerEstimate(
  s: IntervalSummary,
  bank: CapacitorBank,
  targetPF: number,
  opts: ControllerOptions = {},
): RoughControllerEstimate {
  const c = createController(bank, targetPF, opts);
  const tanTarget = tanPhi(targetPF);
  const tanLead = tanPhi(opts.leadingLimitPF ?? DEFAULT_LEADING_LIMIT_PF);
  const th = c.thresholdKvar;
  const lp = s.loadPoints;
  const acc = { total: 0, p: 0, q: 0, below: [0, 0, 0], lead: [0, 0, 0], beyond: 0, qAfter: [0, 0, 0] };
  for (let i = 0; i < lp.count.length; i++) {
    const w = lp.count[i] as number,
      kW = lp.kW[i] as number,
      kvar = lp.kvar[i] as number;
    const residual = kvar - c.fixedKvar;
    const target = kW * tanTarget; // kvar left at the target PF
    const ceiling = residual + kW * tanLead; // most switched kvar within the leading limit
    const pickWithin = (wanted: number) => {
      const k = c.leastAtLeast(wanted);
      return k <= ceiling + 1e-9 ? k : c.largestAtMost(ceiling);
    };
    const fresh = c.freshKvar(kW, kvar);
    const least = Math.min(fresh, pickWithin(residual - target - th));
    const most = Math.max(fresh, c.largestAtMost(Math.min(residual + th, ceiling)));
    [fresh, least, most].forEach((kvarOn, j) => {
      const left = residual - kvarOn;
      if (left > target + 1e-9) acc.below[j]! += w;
      if (left < -1e-9) acc.lead[j]! += w;
      acc.qAfter[j]! += w * left;
    });
    if (residual - fresh < -kW * tanLead - 1e-9) acc.beyond += w;
    acc.total += w;
    acc.p += w * kW;
    acc.q += w * kvar;
  }
  const pct = (x: number) => (acc.total > 0 ? (x / acc.total) * 100 : 0);
  const pf = (j: number) => billingPF(acc.p, acc.qAfter[j] as number);
  return {
    belowTargetPct: pct(acc.below[0]!),
    leadingPct: pct(acc.lead[0]!),
    leadingBeyondLimitPct: pct(acc.beyond),
    billingPFBefore: billingPF(acc.p, acc.q),
    billingPFAfter: pf(0),
    belowTargetPctRange: [pct(acc.below[0]!), pct(acc.below[1]!)],
    leadingPctRange: [pct(acc.lead[0]!), pct(acc.lead[2]!)],
    billingPFAfterRange: [pf(1), pf(2)],
    note: `estimated from ${lp.count.length} load points (a ${lp.kWBins} × ${lp.kvarBins} kW × kvar histogram) without time order (no switching counts); simulateController on the series is exact`,
  };
}
