import { round, tanPhi } from "../conventions.js";
import type { IntervalAnalysis } from "./analyse.js";
import { createController, DEFAULT_LEADING_LIMIT_PF, type ControllerOptions } from "./controller.js";
import { billingPF } from "./months.js";
import type { CapacitorBank, DurationCurve, LoadPoints, Percentiles } from "./types.js";

export const SUMMARY_VERSION = 1;
/** Months kept in a summary (the latest ones). */
export const SUMMARY_MAX_MONTHS = 36;

/**
 * The figures of an analysis without the raw series: JSON-serialisable, well under 20 KB, enough for a bank design
 * (minimum reactive demand, kvar and needed-kvar percentiles, duration curve, monthly peaks) and for a rough
 * controller estimate from the (kW, kvar) load points. kW/kvar/kVA rounded to 0.001, PF to 1e-6, energy to 0.1.
 */
export interface IntervalSummary {
  summaryVersion: typeof SUMMARY_VERSION;
  targetPF: number;
  intervalMinutes: number;
  intervalCount: number;
  firstTimestamp: string;
  lastTimestamp: string;
  coveredDays: number;
  timeZone: string;
  kW: { max: number; mean: number; percentiles: Percentiles };
  kvar: { mean: number; percentiles: Percentiles };
  minimumReactiveDemand: { minKvar: number; p1Kvar: number; p5Kvar: number };
  neededKvar: { percentiles: Percentiles; hold95PctKvar: number; hold99PctKvar: number; hold100PctKvar: number };
  pf: { percentiles: Percentiles; intervalsBelowTarget: number; intervalsLeading: number };
  durationCurve: DurationCurve;
  monthly: { month: string; intervals: number; peakKW: number; peakKVA: number; kWh: number; kvarhLagging: number; kvarhLeading: number; billingPF: number }[];
  monthsOmitted: number;
  total: { kWh: number; kvarhLagging: number; kvarhLeading: number; billingPF: number };
  loadPoints: LoadPoints;
}

const r3 = (v: number) => round(v, 3);
const r6 = (v: number) => round(v, 6);
const r1 = (v: number) => round(v, 1);
const mapP = (p: Percentiles, f: (v: number) => number): Percentiles => Object.fromEntries(Object.entries(p).map(([k, v]) => [k, f(v)]));

export function summarise(a: IntervalAnalysis): IntervalSummary {
  const months = a.monthly.slice(-SUMMARY_MAX_MONTHS);
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
    minimumReactiveDemand: { minKvar: r3(a.minimumReactiveDemand.minKvar), p1Kvar: r3(a.minimumReactiveDemand.p1Kvar), p5Kvar: r3(a.minimumReactiveDemand.p5Kvar) },
    neededKvar: {
      percentiles: mapP(a.neededKvar.percentiles, r3),
      hold95PctKvar: r3(a.neededKvar.hold95PctKvar),
      hold99PctKvar: r3(a.neededKvar.hold99PctKvar),
      hold100PctKvar: r3(a.neededKvar.hold100PctKvar),
    },
    pf: { percentiles: mapP(a.pf.percentiles, r6), intervalsBelowTarget: a.pf.intervalsBelowTarget, intervalsLeading: a.pf.intervalsLeading },
    durationCurve: { exceedancePct: a.kvar.durationCurve.exceedancePct, kvar: a.kvar.durationCurve.kvar.map(r3) },
    monthly: months.map((m) => ({
      month: m.month,
      intervals: m.intervals,
      peakKW: r3(m.peakKW),
      peakKVA: r3(m.peakKVA),
      kWh: r1(m.kWh),
      kvarhLagging: r1(m.kvarhLagging),
      kvarhLeading: r1(m.kvarhLeading),
      billingPF: r6(m.billingPF),
    })),
    monthsOmitted: a.monthly.length - months.length,
    total: { kWh: r1(a.total.kWh), kvarhLagging: r1(a.total.kvarhLagging), kvarhLeading: r1(a.total.kvarhLeading), billingPF: r6(a.total.billingPF) },
    loadPoints: { ...a.loadPoints, kW: a.loadPoints.kW.map(r3), kvar: a.loadPoints.kvar.map(r3) },
  };
}

export interface RoughControllerEstimate {
  /** Share of intervals with the PF below target after correction, percent. */
  belowTargetPct: number;
  leadingPct: number;
  leadingBeyondLimitPct: number;
  billingPFBefore: number;
  billingPFAfter: number;
  note: string;
}

/**
 * A controller estimate from a summary alone: each load point (a histogram cell's mean kW and kvar, weighted by its
 * interval count) is corrected by the same rule as simulateController, as a fresh decision. Time order is lost: no
 * switching counts, and the controller's hold band (which keeps steps in as the load falls) is not seen, so the
 * leading share is a lower bound and the billing PF after a slight underestimate.
 */
export function roughControllerEstimate(s: IntervalSummary, bank: CapacitorBank, targetPF: number, opts: ControllerOptions = {}): RoughControllerEstimate {
  const controller = createController(bank, targetPF, opts);
  const tanTarget = tanPhi(targetPF);
  const tanLead = tanPhi(opts.leadingLimitPF ?? DEFAULT_LEADING_LIMIT_PF);
  const lp = s.loadPoints;
  let total = 0, below = 0, lead = 0, beyond = 0, p = 0, qBefore = 0, qAfter = 0;
  for (let i = 0; i < lp.count.length; i++) {
    const w = lp.count[i] as number, kW = lp.kW[i] as number, kvar = lp.kvar[i] as number;
    const qa = kvar - controller.fixedKvar - controller.switchedKvar(controller.decide(kW, kvar, 0));
    total += w;
    if (qa > kW * tanTarget + 1e-9) below += w;
    if (qa < -1e-9) lead += w;
    if (qa < -kW * tanLead - 1e-9) beyond += w;
    p += w * kW;
    qBefore += w * kvar;
    qAfter += w * qa;
  }
  const pct = (x: number) => (total > 0 ? (x / total) * 100 : 0);
  return {
    belowTargetPct: pct(below),
    leadingPct: pct(lead),
    leadingBeyondLimitPct: pct(beyond),
    billingPFBefore: billingPF(p, qBefore),
    billingPFAfter: billingPF(p, qAfter),
    note: `estimated from ${lp.count.length} load points (a ${lp.kWBins} × ${lp.kvarBins} kW × kvar histogram) without time order: no switching counts, leading share a lower bound; simulateController on the series is exact`,
  };
}
